// /teach/classes/:classId/lessons/:slug: one lesson in one class. Item analysis of each exercise (right
// at the first try, tries on average, the usual wrong answers) and the written answers to review.
import { Link } from "react-router";
import type { Route } from "./+types/teach.classes.$classId.lessons.$slug";
import { db } from "~/db/client.server";
import { assertSameOrigin } from "~/lib/auth.server";
import { analyseItems, classAttempts } from "~/lib/teaching/analysis.server";
import { classAssignments } from "~/lib/teaching/assignments.server";
import { classHeading } from "~/lib/teaching/classes.server";
import { requireTeacherClass } from "~/lib/teaching/guard.server";
import { requireLesson } from "~/lib/teaching/lesson-guard.server";
import { reviewAction } from "~/lib/teaching/review-action.server";
import { classRoster } from "~/lib/teaching/roster.server";
import { LATE_POLICY_WORDS, rubricTotal } from "~/lib/teaching/shared";
import { lessonAnswersForClass } from "~/lib/teaching/student-work.server";
import { formatDue } from "~/lib/teaching/time";
import { ClaimEvidenceReasoning } from "~/components/teaching/claim-evidence-reasoning";
import { ReviewForm } from "~/components/teaching/review-form";
import { ClassHeader } from "~/components/teaching/ui";
import { SlidingBox } from "~/components/sliding-box";
import { hasWriting, writtenAnswerView } from "~/lib/teaching/review.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  const { klass } = await requireTeacherClass(request, params.classId);
  const lesson = requireLesson(params.slug);
  const [attempts, students, answers, assigned] = await Promise.all([
    classAttempts({ db }, klass.id, lesson.slug),
    classRoster({ db }, klass.id),
    lessonAnswersForClass({ db }, klass.id, lesson.slug),
    classAssignments({ db }, klass.id),
  ]);
  const assignment = assigned.find((a) => a.lessonSlug === lesson.slug);
  const tz = klass.timeZone;
  return {
    klass: classHeading(klass),
    lesson: { slug: lesson.slug, number: lesson.number, title: lesson.title },
    assignment: assignment
      ? { dueText: formatDue(assignment.dueAt, tz), opensText: formatDue(assignment.opensAt, tz), policy: LATE_POLICY_WORDS[assignment.latePolicy], penalty: assignment.latePenaltyPercent }
      : null,
    items: analyseItems(lesson.slug, attempts, students.length),
    answers: answers.filter(hasWriting).map((a) => ({
      studentId: a.studentId,
      displayName: a.displayName,
      ...writtenAnswerView(a, tz),
      needsReview: a.handedInAt !== null && (!a.reviewedAt || a.reviewedAt < a.handedInAt),
    })),
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  assertSameOrigin(request);
  const { klass, user } = await requireTeacherClass(request, params.classId);
  requireLesson(params.slug);
  return reviewAction(klass, user.id, Object.fromEntries(await request.formData()));
}

export default function ClassLesson({ loaderData }: Route.ComponentProps) {
  const { klass, lesson, assignment, items, answers } = loaderData;
  const handedIn = answers.filter((a) => a.handedIn);
  const waiting = handedIn.filter((a) => a.needsReview).length;
  return (
    <div className="mx-auto max-w-6xl px-5 py-10">
      <ClassHeader klass={klass} title={`Lesson ${lesson.number}: ${lesson.title}`} />
      <p className="mb-6 text-ink-soft">
        {assignment ? `Opens ${assignment.opensText} · due ${assignment.dueText} · ${assignment.policy}${assignment.penalty ? ` (${assignment.penalty}% of a late answer's credit a day)` : ""}.` : "Not assigned to this class."}{" "}
        <Link to={`/learn/${lesson.slug}`}>Open the lesson as students see it</Link>
      </p>

      <section aria-labelledby="items" className="mb-10">
        <h2 id="items" className="mb-3 text-[length:var(--text-step-2)]">How each exercise went</h2>
        {/* On a narrow screen the table keeps readable columns (each header on one or two lines) and
            scrolls sideways inside its own box, the exercise names staying in view; the box says it slides. */}
        <SlidingBox label="Item analysis of the lesson's exercises" className="rounded-lg border border-rule bg-card" testId="item-analysis">
          <table className="w-full min-w-[44rem] border-collapse text-left text-[length:var(--text-step--1)]">
            <caption className="sr-only">Item analysis of the lesson's exercises</caption>
            <thead>
              <tr className="border-b-2 border-rule align-bottom">
                <th scope="col" className="sticky left-0 z-10 w-40 bg-card px-3 py-2">Exercise</th>
                <th scope="col" className="w-24 px-3 py-2">Tried</th>
                <th scope="col" className="w-32 px-3 py-2">Right at the first try</th>
                <th scope="col" className="w-28 px-3 py-2">Tries on average</th>
                <th scope="col" className="px-3 py-2">Most common kind of wrong answer</th>
              </tr>
            </thead>
            <tbody>
              {items.map((item) => (
                <tr key={item.exerciseId} className="border-b border-rule align-top" data-exercise={item.exerciseId}>
                  <th scope="row" className="sticky left-0 z-10 w-40 bg-card px-3 py-2 font-normal">
                    <Link to={`/teach/classes/${klass.id}/lessons/${lesson.slug}/exercises/${item.exerciseId}`}>{item.title}</Link>
                    {item.required ? null : <span className="block text-ink-soft">optional</span>}
                  </th>
                  <td className="px-3 py-2">
                    {item.studentsTried} of {item.studentsInClass}
                  </td>
                  <td className="px-3 py-2">{item.rightFirstTryPercent === null ? "—" : `${item.rightFirstTryPercent}% (${item.rightFirstTry})`}</td>
                  <td className="px-3 py-2">{item.averageAttempts ?? "—"}</td>
                  <td className="px-3 py-2">{item.wrongGroups[0]
                      ? `${item.wrongGroups[0].label} (${item.wrongGroups[0].attempts}×)${item.wrongGroups[0].examples[0] ? `, e.g. “${item.wrongGroups[0].examples[0].answer}”` : ""}`
                      : "—"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </SlidingBox>
      </section>

      <section aria-labelledby="answers">
        <h2 id="answers" className="mb-2 text-[length:var(--text-step-2)]">Written answers</h2>
        <p className="mb-4 text-ink-soft">
          {handedIn.length} handed in{waiting > 0 ? `, ${waiting} waiting for your review` : ""}. Score each part 0–2; the student reads your comment on their lesson page.
        </p>
        {answers.length === 0 ? <p>No written answers yet.</p> : null}
        {answers.map((a) => (
          <article key={`${a.studentId}-${a.answerId}`} className="card mb-4" aria-labelledby={`a-${a.studentId}-${a.answerId}`}>
            <h3 id={`a-${a.studentId}-${a.answerId}`} className="mb-2 font-reading text-[length:var(--text-step-1)]">
              <Link to={`/teach/classes/${klass.id}/students/${a.studentId}`}>{a.displayName}</Link>{" "}
              <span className="font-ui text-[length:var(--text-step--1)] font-normal text-ink-soft">
                {a.handedIn ? `handed in ${a.handedInText}` : "draft"}
                {a.scores ? ` · reviewed: ${rubricTotal(a.scores)} of 6` : a.needsReview ? " · waiting for review" : ""}
              </span>
            </h3>
            <ClaimEvidenceReasoning answer={a} />
            <ReviewForm of={`${a.displayName}'s answer`} action={`/teach/classes/${klass.id}/lessons/${lesson.slug}`} answer={{ studentId: a.studentId, slug: lesson.slug, answerId: a.answerId, handedIn: a.handedIn, scores: a.scores, comment: a.comment }} />
          </article>
        ))}
      </section>
    </div>
  );
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.lesson.title ?? "Lesson"} · ${data?.klass.name ?? "Class"} — Bendwise` }];
