// /family/lessons/:slug: one lesson across the family's children, with the same item-level view a
// teacher has — each exercise's tries, right at the first try, the usual wrong answers grouped by the
// slip the checker named — and the written answers to review. The teaching model's functions, on the
// family's class.
import { Link, data } from "react-router";
import type { Route } from "./+types/family.lessons.$slug";
import { ClaimEvidenceReasoning } from "~/components/teaching/claim-evidence-reasoning";
import { ReviewForm } from "~/components/teaching/review-form";
import { db } from "~/db/client.server";
import { assertSameOrigin, requireRole } from "~/lib/auth.server";
import { choiceLabelReader } from "~/lib/course.server";
import { householdClass, householdsOf } from "~/lib/family/household.server";
import { findLesson } from "~/lib/lessons.server";
import { analyseItems, classAttempts } from "~/lib/teaching/analysis.server";
import { classAssignments } from "~/lib/teaching/assignments.server";
import { reviewAction } from "~/lib/teaching/review-action.server";
import { classRoster } from "~/lib/teaching/roster.server";
import { rubricTotal } from "~/lib/teaching/shared";
import { lessonAnswersForClass } from "~/lib/teaching/student-work.server";
import { formatDue, formatMoment } from "~/lib/teaching/time";
import { readableAnswer } from "~/lib/teaching/words";
import { hasWriting, writtenAnswerView } from "~/lib/teaching/review.server";

async function parentLesson(request: Request, slug: string | undefined) {
  const { user } = await requireRole(request, ["parent"]);
  const [household] = await householdsOf({ db }, user);
  if (!household) throw new Response("Lessons are planned for a family, and you are not a parent in one.", { status: 403 });
  const lesson = slug ? findLesson(slug) : undefined;
  if (!lesson) throw new Response("There is no such lesson in the course.", { status: 404, headers: { "Content-Type": "text/plain; charset=utf-8" } });
  return { user, household, lesson };
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { user, household, lesson } = await parentLesson(request, params.slug);
  // The family's class is the adapter to the teaching model; it is made (once) on first need.
  const klass = await householdClass({ db }, household, user.id);
  const tz = klass.timeZone;
  const [attempts, children, answers, assigned] = await Promise.all([
    classAttempts({ db }, klass.id, lesson.slug),
    classRoster({ db }, klass.id),
    lessonAnswersForClass({ db }, klass.id, lesson.slug),
    classAssignments({ db }, klass.id),
  ]);
  const assignment = assigned.find((a) => a.lessonSlug === lesson.slug);
  const labelsOf = choiceLabelReader();
  return {
    household: { name: household.name },
    lesson: { slug: lesson.slug, number: lesson.number, title: lesson.title },
    dueText: assignment ? formatDue(assignment.dueAt, tz) : null,
    children: children.length,
    items: analyseItems(lesson.slug, attempts, children.length),
    tries: attempts.map((a) => ({ id: a.id, exerciseId: a.exerciseId, child: a.displayName, answer: readableAnswer(a.rawAnswer, labelsOf(a.studentId, lesson.slug, a.exerciseId)), right: a.correct, at: formatMoment(a.createdAt, tz) })),
    answers: answers.filter(hasWriting).map((a) => ({
      studentId: a.studentId,
      displayName: a.displayName,
      ...writtenAnswerView(a, tz),
    })),
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  assertSameOrigin(request);
  const { user, household } = await parentLesson(request, params.slug);
  const form = Object.fromEntries(await request.formData());
  if (form.intent !== "review") return data({ error: "That request was not understood." }, { status: 400 });
  return reviewAction(await householdClass({ db }, household, user.id), user.id, form);
}

export default function FamilyLesson({ loaderData }: Route.ComponentProps) {
  const { household, lesson, dueText, items, answers, children, tries } = loaderData;
  return (
    <div className="mx-auto max-w-5xl px-5 py-10">
      <p className="mb-1">
        <Link to="/family">{household.name}</Link> · <Link to="/family/lessons">Lessons and due dates</Link>
      </p>
      <h1 className="mb-1 text-[length:var(--text-step-3)]">
        Lesson {lesson.number}: {lesson.title}
      </h1>
      <p className="mb-6 text-ink-soft">
        {dueText ? `Due ${dueText}.` : "Not assigned."} <Link to={`/learn/${lesson.slug}`}>Open the lesson as your children see it</Link>
      </p>

      <section aria-labelledby="items" className="mb-10">
        <h2 id="items" className="mb-3 text-[length:var(--text-step-2)]">
          How each exercise went
        </h2>
        {children === 0 ? <p className="mb-3">Add a child first: this overview covers your children's tries.</p> : null}
        <div className="overflow-x-auto rounded-lg border border-rule bg-card">
          <table className="w-full border-collapse text-left text-[length:var(--text-step--1)]" data-testid="item-analysis">
            <caption className="sr-only">Each exercise of the lesson across your children</caption>
            <thead>
              <tr className="border-b-2 border-rule">
                <th scope="col" className="px-3 py-2">Exercise</th>
                <th scope="col" className="px-3 py-2">Tried</th>
                <th scope="col" className="px-3 py-2">Right at the first try</th>
                <th scope="col" className="px-3 py-2">Tries on average</th>
                <th scope="col" className="px-3 py-2">Usual wrong answers</th>
              </tr>
            </thead>
            <tbody>
              {items.map((item) => (
                <tr key={item.exerciseId} className="border-b border-rule align-top" data-exercise={item.exerciseId}>
                  <th scope="row" className="px-3 py-2 font-normal">
                    {item.title}
                    {item.required ? null : <span className="block text-ink-soft">optional</span>}
                  </th>
                  <td className="px-3 py-2">
                    {item.studentsTried} of {item.studentsInClass}
                  </td>
                  <td className="px-3 py-2">{item.rightFirstTryPercent === null ? "—" : `${item.rightFirstTryPercent}% (${item.rightFirstTry})`}</td>
                  <td className="px-3 py-2">{item.averageAttempts ?? "—"}</td>
                  <td className="px-3 py-2">
                    {item.wrongGroups.length === 0
                      ? "—"
                      : item.wrongGroups.map((g) => (
                          <span key={g.key} className="block">
                            {g.label} ({g.attempts}×{g.examples[0] ? `, e.g. “${g.examples[0].answer}”` : ""})
                          </span>
                        ))}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        {tries.length > 0 ? (
          <details className="mt-3">
            <summary className="cursor-pointer font-bold text-spruce">Every try, child by child ({tries.length})</summary>
            <ul className="mt-2 space-y-0.5 text-[length:var(--text-step--1)]">
              {tries.map((t) => (
                <li key={t.id}>
                  {t.child} · {items.find((i) => i.exerciseId === t.exerciseId)?.title ?? t.exerciseId}: <span className="font-mono wrap-anywhere">{t.answer}</span> —{" "}
                  {t.right ? <strong className="text-ok">right</strong> : <span className="text-danger">not right</span>} <span className="text-ink-soft">· {t.at}</span>
                </li>
              ))}
            </ul>
          </details>
        ) : null}
      </section>

      <section aria-labelledby="answers">
        <h2 id="answers" className="mb-2 text-[length:var(--text-step-2)]">
          Written answers
        </h2>
        <p className="mb-4 text-ink-soft">Score each part 0–2 and leave a comment; your child reads it on their lesson page.</p>
        {answers.length === 0 ? <p>No written answers yet.</p> : null}
        {answers.map((a) => (
          <article key={`${a.studentId}-${a.answerId}`} className="card mb-4">
            <h3 className="mb-2 text-[length:var(--text-step-1)]">
              <Link to={`/family/children/${a.studentId}`}>{a.displayName}</Link>{" "}
              <span className="text-[length:var(--text-step--1)] font-normal text-ink-soft">
                {a.handedIn ? `handed in ${a.handedInText}` : "draft"}
                {a.scores ? ` · reviewed: ${rubricTotal(a.scores)} of 6` : ""}
              </span>
            </h3>
            <ClaimEvidenceReasoning answer={a} />
            <ReviewForm of={`${a.displayName}'s answer`} action={`/family/lessons/${lesson.slug}`} answer={{ studentId: a.studentId, slug: lesson.slug, answerId: a.answerId, handedIn: a.handedIn, scores: a.scores, comment: a.comment }} />
          </article>
        ))}
      </section>
    </div>
  );
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.lesson.title ?? "Lesson"} · family — Bendwise` }];
