// /family/lessons: the parent as the teacher of the household. Assign lessons with the day they open
// and the day they are due (typed in the parent's own time zone), and see each child against each
// assigned lesson — the teaching model's assignments and gradebook, on the family's class.
import { useEffect, useState } from "react";
import { Form, Link, data, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/family.lessons";
import { Notice } from "~/components/auth-forms";
import { TakeOffTheList } from "~/components/teaching/ui";
import { db } from "~/db/client.server";
import { latePolicy } from "~/db/schema.server";
import { assertSameOrigin, requireRole } from "~/lib/auth.server";
import { householdClass, householdsOf } from "~/lib/family/household.server";
import { listLessons } from "~/lib/lessons.server";
import { assignedMessage, assignLesson, classAssignments, unassignLesson } from "~/lib/teaching/assignments.server";
import { setClassTimeZone } from "~/lib/teaching/classes.server";
import { gradebookView, loadGradebook } from "~/lib/teaching/gradebook.server";
import { LATE_POLICY_WORDS } from "~/lib/teaching/shared";
import { DAY_MS, dateToZonedInput, formatDue, isTimeZone, zonedInputToDate } from "~/lib/teaching/time";
import { SendButton } from "~/components/send-button";

const intentSchema = z.discriminatedUnion("intent", [
  z.object({
    intent: z.literal("assign"),
    slug: z.string().min(1).max(80),
    opensAt: z.string().min(1, "Give the opening date and time."),
    dueAt: z.string().min(1, "Give the due date and time."),
    latePolicy: z.enum(latePolicy.enumValues, { error: "Choose what happens to late work." }),
    timeZone: z.string().max(64).default(""),
  }),
  z.object({ intent: z.literal("unassign"), assignmentId: z.uuid(), slug: z.string().max(80) }),
]);

async function parentHousehold(request: Request) {
  const { user } = await requireRole(request, ["parent"]);
  const [household] = await householdsOf({ db }, user);
  if (!household) throw new Response("Lessons are planned for a family, and you are not a parent in one.", { status: 403 });
  return { user, household };
}

export async function loader({ request }: Route.LoaderArgs) {
  const { user, household } = await parentHousehold(request);
  // The family's class is the adapter to the teaching model; it is made (once) on first need.
  const klass = await householdClass({ db }, household, user.id);
  const tz = klass.timeZone;
  const [assigned, book] = await Promise.all([classAssignments({ db }, klass.id), loadGradebook({ db }, klass.id)]);
  const now = new Date();
  const weekAhead = dateToZonedInput(new Date(now.getTime() + 7 * DAY_MS), tz).slice(0, 10) + "T17:00";
  const view = gradebookView(book, tz, now);
  return {
    household: { name: household.name },
    timeZone: tz,
    lessons: listLessons().map((lesson) => {
      const a = assigned.find((x) => x.lessonSlug === lesson.slug);
      return {
        slug: lesson.slug,
        number: lesson.number,
        title: lesson.title,
        minutes: lesson.minutes,
        assignment: a
          ? { id: a.id, opensAt: dateToZonedInput(a.opensAt, tz), dueAt: dateToZonedInput(a.dueAt, tz), dueText: formatDue(a.dueAt, tz, now), latePolicy: a.latePolicy }
          : null,
        defaults: { opensAt: dateToZonedInput(now, tz), dueAt: weekAhead },
      };
    }),
    gradebook: {
      lessons: view.lessons.map((l) => ({ assignmentId: l.assignmentId, slug: l.slug, number: l.number, title: l.title, dueText: l.dueText })),
      rows: view.rows.map((r) => ({ id: r.student.id, displayName: r.student.displayName, cells: r.cells, lessonsComplete: r.lessonsComplete, averageScore: r.averageScore })),
    },
  };
}

export async function action({ request }: Route.ActionArgs) {
  assertSameOrigin(request);
  const { user, household } = await parentHousehold(request);
  const parsed = intentSchema.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) return data({ slug: "", errors: { form: parsed.error.issues[0]?.message ?? "That request was not understood." } as Record<string, string> }, { status: 400 });
  const input = parsed.data;
  const klass = await householdClass({ db }, household, user.id, input.intent === "assign" ? input.timeZone : undefined);
  if (input.intent === "unassign") {
    await unassignLesson({ db }, klass, input.assignmentId);
    return { slug: input.slug, done: "Taken off the list. Your children's work on it stays." };
  }
  // The parent is the only teacher of the family: due dates follow the time zone of the browser they plan in.
  if (isTimeZone(input.timeZone) && input.timeZone !== klass.timeZone) {
    await setClassTimeZone({ db }, klass, input.timeZone);
    klass.timeZone = input.timeZone;
  }
  const errors: Record<string, string> = {};
  const opensAt = zonedInputToDate(input.opensAt, klass.timeZone);
  const dueAt = zonedInputToDate(input.dueAt, klass.timeZone);
  if (!opensAt) errors.opensAt = "Give the opening as a date and a time.";
  if (!dueAt) errors.dueAt = "Give the due date as a date and a time.";
  if (Object.keys(errors).length > 0) return data({ slug: input.slug, errors }, { status: 400 });
  const assignment = { slug: input.slug, opensAt: opensAt!, dueAt: dueAt!, latePolicy: input.latePolicy, latePenaltyPercent: 0 };
  const result = await assignLesson({ db }, klass, assignment);
  if (!result.ok) return data({ slug: input.slug, errors: { [result.field]: result.message } as Record<string, string> }, { status: 400 });
  return { slug: input.slug, ...assignedMessage(assignment, klass.timeZone) };
}

/** The browser's own time zone, sent with each form so due dates mean what the parent typed. */
function useBrowserTimeZone(fallback: string) {
  const [zone, setZone] = useState(fallback);
  useEffect(() => setZone(Intl.DateTimeFormat().resolvedOptions().timeZone || fallback), [fallback]);
  return zone;
}

export default function FamilyLessons({ loaderData, actionData }: Route.ComponentProps) {
  const { household, timeZone, lessons, gradebook } = loaderData;
  const busy = useNavigation().state !== "idle";
  const browserZone = useBrowserTimeZone(timeZone);
  const answer = actionData as { slug: string; done?: string; caution?: string; errors?: Record<string, string> } | undefined;
  return (
    <div className="mx-auto max-w-5xl px-5 py-10">
      <p className="mb-1">
        <Link to="/family">{household.name}</Link>
      </p>
      <h1 className="mb-2 text-[length:var(--text-step-3)]">Lessons and due dates</h1>
      <p className="mb-6 text-ink-soft">
        Children can open any lesson at any time. Assigning one gives it a due date: it shows on their page, and you see here who has done it. Times are in{" "}
        <span className="font-mono">{browserZone}</span>.
      </p>
      {answer?.errors?.form && !answer.slug ? <Notice tone="problem">{answer.errors.form}</Notice> : null}

      {gradebook.lessons.length > 0 && gradebook.rows.length > 0 ? (
        <section aria-labelledby="overview" className="mb-10">
          <h2 id="overview" className="mb-3 text-[length:var(--text-step-2)]">
            Assigned lessons at a glance
          </h2>
          <div className="overflow-x-auto rounded-lg border border-rule bg-card">
            <table className="w-full border-collapse text-left text-[length:var(--text-step--1)]" data-testid="family-gradebook">
              <caption className="sr-only">Your children by assigned lessons</caption>
              <thead>
                <tr className="border-b-2 border-rule align-bottom">
                  <th scope="col" className="px-3 py-2">Child</th>
                  {gradebook.lessons.map((l) => (
                    <th key={l.assignmentId} scope="col" className="min-w-32 px-3 py-2">
                      <Link to={`/family/lessons/${l.slug}`}>
                        {l.number ? `${l.number}. ` : ""}
                        {l.title}
                      </Link>
                      <span className="block font-normal text-ink-soft">due {l.dueText}</span>
                    </th>
                  ))}
                  <th scope="col" className="px-3 py-2">Average</th>
                </tr>
              </thead>
              <tbody>
                {gradebook.rows.map((r) => (
                  <tr key={r.id} className="border-b border-rule align-top">
                    <th scope="row" className="px-3 py-2 font-normal">
                      <Link to={`/family/children/${r.id}`}>{r.displayName}</Link>
                    </th>
                    {gradebook.lessons.map((l) => {
                      const c = r.cells[l.assignmentId];
                      return (
                        <td key={l.assignmentId} className="px-3 py-2" data-status={c?.status}>
                          {!c ? "—" : c.status === "complete" ? <strong className="text-ok">Done</strong> : c.status === "working" ? `${c.requiredDone} of ${c.requiredTotal}` : <span className="text-ink-soft">Not started</span>}
                          {c?.score !== null && c?.score !== undefined ? <span className="ml-1 font-bold">{c.score}%</span> : null}
                          {c?.overdue ? <span className="block font-bold text-danger">Overdue</span> : null}
                          {c && c.stuckOn.length > 0 ? <span className="block font-bold text-ember">Stuck on {c.stuckOn.length}</span> : null}
                          {c && c.toReview > 0 ? <span className="block text-spruce">{c.toReview} to review</span> : null}
                        </td>
                      );
                    })}
                    <td className="px-3 py-2">{r.averageScore === null ? "—" : `${r.averageScore}%`}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </section>
      ) : null}

      <h2 className="mb-3 text-[length:var(--text-step-2)]">The course</h2>
      <ol className="space-y-4">
        {lessons.map((lesson) => {
          const mine = answer?.slug === lesson.slug ? answer : undefined;
          const a = lesson.assignment;
          const errors = mine?.errors ?? {};
          const id = (name: string) => `${lesson.slug}-${name}`;
          return (
            <li key={lesson.slug} className="card" data-lesson={lesson.slug}>
              <div className="mb-3 flex flex-wrap items-baseline justify-between gap-2">
                <h3 className="text-[length:var(--text-step-1)]">
                  Lesson {lesson.number}: {lesson.title} <span className="text-[length:var(--text-step--1)] font-normal text-ink-soft">· about {lesson.minutes} min</span>
                </h3>
                <p className="text-[length:var(--text-step--1)]">
                  {a ? (
                    <>
                      <strong className="text-ok">Assigned</strong>, due {a.dueText} · <Link to={`/family/lessons/${lesson.slug}`}>How it went</Link>
                    </>
                  ) : (
                    <span className="text-ink-soft">Not assigned</span>
                  )}
                </p>
              </div>
              {mine?.done ? <Notice tone="done">{mine.done}</Notice> : null}
              {mine?.caution ? <Notice tone="info">{mine.caution}</Notice> : null}
              {errors.form || errors.slug ? <Notice tone="problem">{errors.form ?? errors.slug}</Notice> : null}
              <Form method="post" key={a ? `${a.opensAt}|${a.dueAt}|${a.latePolicy}` : "new"}>
                <input type="hidden" name="intent" value="assign" />
                <input type="hidden" name="slug" value={lesson.slug} />
                <input type="hidden" name="timeZone" value={browserZone} />
                <div className="grid gap-x-4 sm:grid-cols-3">
                  <div className="mb-3">
                    <label htmlFor={id("opens")} className="mb-1 block font-bold">Opens</label>
                    <input id={id("opens")} name="opensAt" type="datetime-local" className="field" required defaultValue={a?.opensAt ?? lesson.defaults.opensAt} aria-invalid={errors.opensAt ? true : undefined} aria-describedby={errors.opensAt ? id("opensAt-error") : undefined} />
                    {errors.opensAt ? <p id={id("opensAt-error")} className="mt-1 text-[length:var(--text-step--1)] font-bold text-danger">{errors.opensAt}</p> : null}
                  </div>
                  <div className="mb-3">
                    <label htmlFor={id("due")} className="mb-1 block font-bold">Due</label>
                    <input id={id("due")} name="dueAt" type="datetime-local" className="field" required defaultValue={a?.dueAt ?? lesson.defaults.dueAt} aria-invalid={errors.dueAt ? true : undefined} aria-describedby={errors.dueAt ? id("dueAt-error") : undefined} />
                    {errors.dueAt ? <p id={id("dueAt-error")} className="mt-1 text-[length:var(--text-step--1)] font-bold text-danger">{errors.dueAt}</p> : null}
                  </div>
                  <div className="mb-3">
                    <label htmlFor={id("policy")} className="mb-1 block font-bold">After the due date</label>
                    <select id={id("policy")} name="latePolicy" className="field" defaultValue={a?.latePolicy === "closed" ? "closed" : "accept"}>
                      <option value="accept">{LATE_POLICY_WORDS.accept}</option>
                      <option value="closed">{LATE_POLICY_WORDS.closed}</option>
                    </select>
                  </div>
                </div>
                <div className="flex flex-wrap gap-3">
                  <SendButton className="btn" busy={busy}>
                    {a ? "Save the dates" : `Assign lesson ${lesson.number}`}
                  </SendButton>
                </div>
              </Form>
              {a ? <TakeOffTheList assignmentId={a.id} slug={lesson.slug} busy={busy} whoseWork="your children's" /> : null}
            </li>
          );
        })}
      </ol>
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Lessons and due dates — Bendwise" }];
