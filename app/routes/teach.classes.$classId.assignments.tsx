// /teach/classes/:classId/assignments: which lessons the class has to do, from when, by when, and
// what happens to late work. Dates are typed and shown in the class's time zone. The accommodations
// given to single students are listed here for the teacher only.
import { Form, Link, data, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/teach.classes.$classId.assignments";
import { db } from "~/db/client.server";
import { latePolicy } from "~/db/schema.server";
import { assertSameOrigin } from "~/lib/auth.server";
import { listLessons } from "~/lib/lessons.server";
import { assignedMessage, assignLesson, classAccommodations, classAssignments, unassignLesson } from "~/lib/teaching/assignments.server";
import { LATE_POLICY_WORDS, lateRuleInWords, MAX_PENALTY_PERCENT, rangeWords, readWholeNumber } from "~/lib/teaching/shared";
import { classHeading } from "~/lib/teaching/classes.server";
import { requireTeacherClass } from "~/lib/teaching/guard.server";
import { classRoster } from "~/lib/teaching/roster.server";
import { DAY_MS, dateToZonedInput, formatDue, zonedInputToDate } from "~/lib/teaching/time";
import { ClassHeader, closeOnEscape, Notice, TakeOffTheList } from "~/components/teaching/ui";
import { SendButton } from "~/components/send-button";

const intentSchema = z.discriminatedUnion("intent", [
  z.object({
    intent: z.literal("assign"),
    slug: z.string().min(1).max(80),
    // An empty or unreadable date is named beside its field by the action.
    opensAt: z.string().default(""),
    dueAt: z.string().default(""),
    latePolicy: z.enum(latePolicy.enumValues, { error: "Choose what happens to late work." }),
    latePenaltyPercent: z.string().default("0"),
  }),
  z.object({ intent: z.literal("unassign"), assignmentId: z.uuid(), slug: z.string().max(80) }),
]);

export async function loader({ request, params }: Route.LoaderArgs) {
  const { klass } = await requireTeacherClass(request, params.classId);
  const [assigned, accommodations, students] = await Promise.all([
    classAssignments({ db }, klass.id),
    classAccommodations({ db }, klass.id),
    classRoster({ db }, klass.id),
  ]);
  const tz = klass.timeZone;
  const now = new Date();
  // A new assignment opens now and is due in a week at 5 pm, unless the teacher says otherwise.
  const weekAhead = dateToZonedInput(new Date(now.getTime() + 7 * DAY_MS), tz).slice(0, 10) + "T17:00";
  const lessons = listLessons().map((lesson) => {
    const a = assigned.find((x) => x.lessonSlug === lesson.slug);
    return {
      slug: lesson.slug,
      number: lesson.number,
      title: lesson.title,
      minutes: lesson.minutes,
      assignment: a
        ? {
            id: a.id,
            opensAt: dateToZonedInput(a.opensAt, tz),
            dueAt: dateToZonedInput(a.dueAt, tz),
            dueText: formatDue(a.dueAt, tz, now),
            opensText: formatDue(a.opensAt, tz, now),
            latePolicy: a.latePolicy,
            latePenaltyPercent: a.latePenaltyPercent,
            lateRule: lateRuleInWords(a.latePolicy, a.latePenaltyPercent),
          }
        : null,
      defaults: { opensAt: dateToZonedInput(now, tz), dueAt: weekAhead },
    };
  });
  const nameOf = new Map(students.map((s) => [s.id, s.displayName]));
  const titleOf = new Map(assigned.map((a) => [a.id, lessons.find((l) => l.slug === a.lessonSlug)?.title ?? a.lessonSlug]));
  return {
    klass: classHeading(klass),
    timeZone: tz,
    lessons,
    accommodations: accommodations
      .filter((a) => nameOf.has(a.studentId))
      .map((a) => ({
        studentId: a.studentId,
        student: nameOf.get(a.studentId)!,
        scope: a.assignmentId ? (titleOf.get(a.assignmentId) ?? "one lesson") : "Every lesson of the class",
        extraAttempts: a.extraAttempts,
        extraDays: a.extraDays,
      }))
      .sort((x, y) => x.student.localeCompare(y.student)),
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  assertSameOrigin(request);
  const { klass } = await requireTeacherClass(request, params.classId);
  const parsed = intentSchema.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) {
    return data({ slug: "", errors: { form: parsed.error.issues[0]?.message ?? "That request was not understood." } as Record<string, string> }, { status: 400 });
  }
  const input = parsed.data;
  if (input.intent === "unassign") {
    await unassignLesson({ db }, klass, input.assignmentId);
    return { slug: input.slug, done: "Taken off the class's list. The students' work stays." };
  }
  const errors: Record<string, string> = {};
  const opensAt = zonedInputToDate(input.opensAt, klass.timeZone);
  const dueAt = zonedInputToDate(input.dueAt, klass.timeZone);
  if (!opensAt) errors.opensAt = "Give the opening as a date and a time.";
  if (!dueAt) errors.dueAt = "Give the due date as a date and a time.";
  // The credit lost per day counts only when late work loses credit; then it is 1 to 100 (percent), digits only.
  const penaltyRead = input.latePolicy === "penalty" ? readWholeNumber(input.latePenaltyPercent, 1, MAX_PENALTY_PERCENT) : ({ ok: true, value: 0 } as const);
  if (!penaltyRead.ok) errors.latePenaltyPercent = penaltyRead.message;
  const penalty = penaltyRead.ok ? penaltyRead.value : 0;
  if (Object.keys(errors).length > 0) return data({ slug: input.slug, errors }, { status: 400 });
  const assignment = { slug: input.slug, opensAt: opensAt!, dueAt: dueAt!, latePolicy: input.latePolicy, latePenaltyPercent: penalty };
  const result = await assignLesson({ db }, klass, assignment);
  if (!result.ok) return data({ slug: input.slug, errors: { [result.field]: result.message } as Record<string, string> }, { status: 400 });
  return { slug: input.slug, ...assignedMessage(assignment, klass.timeZone) };
}

export default function Assignments({ loaderData, actionData }: Route.ComponentProps) {
  const { klass, timeZone, lessons, accommodations } = loaderData;
  const busy = useNavigation().state === "submitting";
  const answer = actionData as { slug: string; done?: string; caution?: string; errors?: Record<string, string> } | undefined;
  return (
    <div className="mx-auto max-w-6xl px-5 py-10">
      <ClassHeader klass={klass} />
      <p className="mb-6 text-ink-soft">
        Assign a lesson with the day it opens and the day it is due. Times are in <span className="font-mono">{timeZone}</span> (change it in the{" "}
        <Link to={`/teach/classes/${klass.id}/settings`}>class settings</Link>). Students see their assigned lessons and due dates on their own page.
      </p>
      {answer?.errors?.form && !answer.slug ? <Notice tone="problem">{answer.errors.form}</Notice> : null}
      <ol className="space-y-5">
        {lessons.map((lesson) => {
          const mine = answer?.slug === lesson.slug ? answer : undefined;
          const a = lesson.assignment;
          return (
            <li key={lesson.slug} className="card" data-lesson={lesson.slug}>
              <div className="mb-3 flex flex-wrap items-baseline justify-between gap-2">
                <h2 className="text-[length:var(--text-step-1)]">
                  Lesson {lesson.number}: {lesson.title}
                </h2>
                <p className="text-[length:var(--text-step--1)] text-ink-soft">
                  {a ? (
                    <>
                      <strong className="text-ok">Assigned</strong> · opens {a.opensText} · due {a.dueText} · <span data-testid="late-rule">{a.lateRule}</span>
                    </>
                  ) : (
                    "Not assigned"
                  )}
                </p>
              </div>
              {mine?.done ? <Notice tone="done">{mine.done}</Notice> : null}
              {mine?.caution ? <Notice tone="info">{mine.caution}</Notice> : null}
              {mine?.errors?.form || mine?.errors?.slug ? <Notice tone="problem">{mine.errors.form ?? mine.errors.slug}</Notice> : null}
              <details open={Boolean(mine?.errors && Object.keys(mine.errors).length > 0)} className="group" onKeyDown={closeOnEscape}>
                <summary className="cursor-pointer font-bold text-spruce">
                  {a ? (
                    <>
                      Change the dates or the late-work rule<span className="sr-only"> of lesson {lesson.number}</span>
                    </>
                  ) : (
                    `Assign lesson ${lesson.number}…`
                  )}
                </summary>
                <div className="mt-3">
                  <AssignForm lesson={lesson} errors={mine?.errors ?? {}} busy={busy} />
                  {a ? <TakeOffTheList assignmentId={a.id} slug={lesson.slug} busy={busy} whoseWork="the students'" /> : null}
                </div>
              </details>
            </li>
          );
        })}
      </ol>

      <section className="mt-10" aria-labelledby="accommodations">
        <h2 id="accommodations" className="mb-2 text-[length:var(--text-step-1)]">More tries or more time for single students</h2>
        <p className="mb-3 text-ink-soft">
          Set these on a student's page. They apply quietly: the student simply has more tries or a later due date, and nobody else sees it.
        </p>
        {accommodations.length === 0 ? (
          <p>No student has any yet.</p>
        ) : (
          <ul className="space-y-1">
            {accommodations.map((a, i) => (
              <li key={i}>
                <Link to={`/teach/classes/${klass.id}/students/${a.studentId}`}>{a.student}</Link>: {a.scope} —{" "}
                {[a.extraAttempts ? `${a.extraAttempts} more ${a.extraAttempts === 1 ? "try" : "tries"}` : null, a.extraDays ? `${a.extraDays} more ${a.extraDays === 1 ? "day" : "days"}` : null]
                  .filter(Boolean)
                  .join(", ")}
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}

type LessonRow = Route.ComponentProps["loaderData"]["lessons"][number];

function AssignForm({ lesson, errors, busy }: { lesson: LessonRow; errors: Record<string, string>; busy: boolean }) {
  const a = lesson.assignment;
  const id = (name: string) => `${lesson.slug}-${name}`;
  const error = (name: string) =>
    errors[name] ? (
      <p id={id(`${name}-error`)} className="mt-1 text-[length:var(--text-step--1)] font-bold text-danger">
        {errors[name]}
      </p>
    ) : null;
  return (
    <Form method="post" preventScrollReset noValidate key={a ? `${a.opensAt}|${a.dueAt}|${a.latePolicy}|${a.latePenaltyPercent}` : "new"}>
      <input type="hidden" name="intent" value="assign" />
      <input type="hidden" name="slug" value={lesson.slug} />
      {/* The late-work menu gets the widest column, so its choices are read whole. */}
      <div className="grid gap-x-4 sm:grid-cols-2 lg:grid-cols-[minmax(0,1fr)_minmax(0,1fr)_minmax(0,1.4fr)_minmax(0,0.9fr)]">
        <div className="mb-3">
          <label htmlFor={id("opens")} className="mb-1 block font-bold">Opens</label>
          <input id={id("opens")} name="opensAt" type="datetime-local" className="field" required defaultValue={a?.opensAt ?? lesson.defaults.opensAt} aria-invalid={errors.opensAt ? true : undefined} aria-describedby={errors.opensAt ? id("opensAt-error") : undefined} />
          {error("opensAt")}
        </div>
        <div className="mb-3">
          <label htmlFor={id("due")} className="mb-1 block font-bold">Due</label>
          <input id={id("due")} name="dueAt" type="datetime-local" className="field" required defaultValue={a?.dueAt ?? lesson.defaults.dueAt} aria-invalid={errors.dueAt ? true : undefined} aria-describedby={errors.dueAt ? id("dueAt-error") : undefined} />
          {error("dueAt")}
        </div>
        <div className="mb-3">
          <label htmlFor={id("policy")} className="mb-1 block font-bold">Late work</label>
          <select id={id("policy")} name="latePolicy" className="field" defaultValue={a?.latePolicy ?? "accept"}>
            {Object.entries(LATE_POLICY_WORDS).map(([value, label]) => (
              <option key={value} value={value}>
                {label}
              </option>
            ))}
          </select>
        </div>
        <div className="mb-3">
          <label htmlFor={id("penalty")} className="mb-1 block font-bold">Credit lost per day late (%)</label>
          <input
            id={id("penalty")}
            name="latePenaltyPercent"
            type="text"
            inputMode="numeric"
            autoComplete="off"
            className="field"
            defaultValue={a?.latePenaltyPercent || 10}
            aria-describedby={errors.latePenaltyPercent ? `${id("penalty-hint")} ${id("latePenaltyPercent-error")}` : id("penalty-hint")}
            aria-invalid={errors.latePenaltyPercent ? true : undefined}
          />
          <p id={id("penalty-hint")} className="mt-1 text-[length:var(--text-step--1)] text-ink-soft">
            The share of a late answer's credit lost for each day late, in percent: a whole number {rangeWords(1, MAX_PENALTY_PERCENT)}. Used only when late work loses credit.
          </p>
          {error("latePenaltyPercent")}
        </div>
      </div>
      <SendButton className="btn" busy={busy}>
        {a ? "Save the changes" : `Assign lesson ${lesson.number}`}
      </SendButton>
    </Form>
  );
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Lessons assigned · ${data?.klass.name ?? "Class"} — Bendwise` }];
