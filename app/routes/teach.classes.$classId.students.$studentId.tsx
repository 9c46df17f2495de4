// /teach/classes/:classId/students/:studentId: one student's work, lesson by lesson (every attempt,
// their own readings with charts, written answers with the review form, photos of set-ups), and what
// the teacher can do for them: more tries or time (applied quietly), a new password, another class.
import { useState } from "react";
import { Form, Link, data, useNavigation, type ShouldRevalidateFunctionArgs } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/teach.classes.$classId.students.$studentId";
import { db } from "~/db/client.server";
import { assertSameOrigin } from "~/lib/auth.server";
import { choiceLabelReader } from "~/lib/course.server";
import { lessonExercises, listLessons } from "~/lib/lessons.server";
import { analyseReadings, formatToResolution } from "~/lib/science";
import { classAccommodations, setAccommodation } from "~/lib/teaching/assignments.server";
import { classHeading } from "~/lib/teaching/classes.server";
import { gradebookView, loadGradebook } from "~/lib/teaching/gradebook.server";
import { notFound, requireTeacherClass } from "~/lib/teaching/guard.server";
import { reviewAction } from "~/lib/teaching/review-action.server";
import { MAX_EXTRA_ATTEMPTS, MAX_EXTRA_DAYS, rangeWords, readWholeNumber, rubricTotal, type GradebookCell } from "~/lib/teaching/shared";
import { findClassStudent, moveStudent, moveTargets, removeFromClass, setStudentPassword } from "~/lib/teaching/roster.server";
import { loadStudentWork } from "~/lib/teaching/student-work.server";
import { DAY_MS, formatDue, formatMoment } from "~/lib/teaching/time";
import { triesAsRead } from "~/lib/teaching/words";
import { plural } from "~/lib/plural";
import { ReadingsAnalysis } from "~/components/lesson/readings-entry";
import { ClaimEvidenceReasoning } from "~/components/teaching/claim-evidence-reasoning";
import { ReviewForm } from "~/components/teaching/review-form";
import { ClassHeader, Notice, SelectField, TextField } from "~/components/teaching/ui";
import { hasWriting, writtenAnswerView } from "~/lib/teaching/review.server";
import { SendButton } from "~/components/send-button";

const STUDENT_NOT_FOUND = "There is no such student in this class.";

const intentSchema = z.discriminatedUnion("intent", [
  z.object({
    intent: z.literal("password"),
    // A guard against pasted essays; the password rules themselves (setStudentPassword) say the real limits.
    password: z.string().max(256, "A password can be at most 256 characters long. Shorten it, or leave the field empty for one made up for you.").default(""),
  }),
  z.object({ intent: z.literal("move"), toClassId: z.uuid("Choose a class.") }),
  z.object({ intent: z.literal("remove") }),
  z.object({
    intent: z.literal("accommodation"),
    scope: z.string().max(40),
    // Read by readWholeNumber in the action: an empty field is refused there, never taken for 0.
    extraAttempts: z.string().default(""),
    extraDays: z.string().default(""),
  }),
]);

/** "Due Sat 12 Dec, 5:00 pm (3 days added for this student; the class's is Wed 9 Dec, 5:00 pm)": the student's own due date. */
function dueLine(lesson: { dueAt: string; dueText: string }, cell: GradebookCell | undefined, timeZone: string): string {
  const extraDays = cell ? Math.round((Date.parse(cell.dueAt) - Date.parse(lesson.dueAt)) / DAY_MS) : 0;
  if (!cell || extraDays <= 0) return `Due ${lesson.dueText}`;
  return `Due ${formatDue(cell.dueAt, timeZone)} (${extraDays} ${extraDays === 1 ? "day" : "days"} added for this student; the class's is ${lesson.dueText})`;
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { klass, user } = await requireTeacherClass(request, params.classId);
  const studentId = z.uuid().safeParse(params.studentId);
  if (!studentId.success) notFound(STUDENT_NOT_FOUND);
  const student = await findClassStudent({ db }, klass.id, studentId.data);
  if (!student) notFound(STUDENT_NOT_FOUND);
  const [work, book, accommodations, targets] = await Promise.all([
    loadStudentWork({ db }, student.id),
    loadGradebook({ db }, klass.id),
    classAccommodations({ db }, klass.id),
    moveTargets({ db }, klass, user.id),
  ]);
  const tz = klass.timeZone;
  const view = gradebookView(book, tz);
  const row = view.rows.find((r) => r.student.id === student.id);
  const course = listLessons();
  const assignedSlugs = view.lessons.map((l) => l.slug);
  const worked = [...work.attempts, ...work.readings, ...work.answers, ...work.photos].map((x) => x.lessonSlug);
  const slugs = [...new Set([...assignedSlugs, ...worked])].sort((a, b) => a.localeCompare(b));
  const labelsOf = choiceLabelReader();
  const lessons = slugs.map((slug) => {
    const summary = course.find((l) => l.slug === slug);
    const assignment = view.lessons.find((l) => l.slug === slug);
    const { exercises } = lessonExercises(slug);
    return {
      slug,
      title: summary ? `Lesson ${summary.number}: ${summary.title}` : slug,
      assignment: assignment ? { dueLine: dueLine(assignment, row?.cells[assignment.assignmentId], tz), cell: row?.cells[assignment.assignmentId] ?? null } : null,
      exercises: exercises.map((e) => ({
        id: e.id,
        title: e.title,
        attempts: triesAsRead(
          work.attempts.filter((a) => a.lessonSlug === slug && a.exerciseId === e.id).map((a) => ({ ...a, at: formatMoment(a.createdAt, tz) })),
          labelsOf(student.id, slug, e.id),
        ),
      })),
      readings: work.readings
        .filter((r) => r.lessonSlug === slug)
        .map((r) => {
          const points = r.points as { forceN: number; readingCm?: number; returnReadingCm?: number; broke?: boolean }[];
          return {
            id: r.readingsId,
            material: r.material,
            mode: r.mode,
            unloadedCm: r.unloadedCm,
            resolutionCm: r.resolutionCm,
            points,
            analysis: analyseReadings({ mode: r.mode, unloadedCm: r.unloadedCm ?? undefined, resolutionCm: r.resolutionCm, points }),
          };
        }),
      answers: work.answers
        .filter((a) => a.lessonSlug === slug && hasWriting(a))
        .map((a) => writtenAnswerView(a, tz)),
      photos: work.photos.filter((p) => p.lessonSlug === slug).map((p) => ({ id: p.id, photoId: p.photoId, at: formatMoment(p.createdAt, tz) })),
    };
  });
  const mine = accommodations.filter((a) => a.studentId === student.id);
  return {
    klass: classHeading(klass),
    student,
    row: row ? { lessonsComplete: row.lessonsComplete, averageScore: row.averageScore } : null,
    lessonCount: view.lessons.length,
    lessons,
    accommodations: mine.map((a) => ({
      scope: a.assignmentId ?? "class",
      label: a.assignmentId ? (view.lessons.find((l) => l.assignmentId === a.assignmentId)?.title ?? "one lesson") : "Every lesson of this class",
      extraAttempts: a.extraAttempts,
      extraDays: a.extraDays,
    })),
    scopes: [{ value: "class", label: "Every lesson of this class" }, ...view.lessons.map((l) => ({ value: l.assignmentId, label: `Only ${l.number ? `lesson ${l.number}: ` : ""}${l.title}` }))],
    targets,
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  assertSameOrigin(request);
  const { klass, user } = await requireTeacherClass(request, params.classId);
  const studentId = z.uuid().safeParse(params.studentId);
  if (!studentId.success) notFound(STUDENT_NOT_FOUND);
  const form = Object.fromEntries(await request.formData());
  if (form.intent === "review") return reviewAction(klass, user.id, form);
  const student = await findClassStudent({ db }, klass.id, studentId.data);
  if (!student) notFound(STUDENT_NOT_FOUND);
  const parsed = intentSchema.safeParse(form);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    return data({ intent: String(form.intent ?? ""), error: issue?.message ?? "That request was not understood." }, { status: 400 });
  }
  const input = parsed.data;
  switch (input.intent) {
    case "password": {
      const result = await setStudentPassword({ db }, user.id, student.id, input.password);
      if (!result.ok) return data({ intent: input.intent, error: result.message }, { status: result.status });
      return { intent: input.intent, done: `${student.displayName}'s new password is`, password: result.password };
    }
    case "move": {
      const result = await moveStudent({ db }, klass, user.id, student.id, input.toClassId);
      if (!result.ok) return data({ intent: input.intent, error: result.message }, { status: 400 });
      return { intent: input.intent, done: `${student.displayName} is now in ${result.toName}.`, movedTo: input.toClassId };
    }
    case "remove": {
      const result = await removeFromClass({ db }, klass, student.id);
      return {
        intent: input.intent,
        done: `${student.displayName} is no longer in ${klass.name}.${result.seatFreed ? " Their seat is free for another student." : ""} Their account and work are kept.`,
        removed: true,
      };
    }
    case "accommodation": {
      const assignmentId = input.scope === "class" ? null : z.uuid().safeParse(input.scope).data;
      if (assignmentId === undefined) return data({ intent: input.intent, error: "Choose which lessons this is for." }, { status: 400 });
      const values = { scope: input.scope, extraAttempts: input.extraAttempts, extraDays: input.extraDays };
      const tries = readWholeNumber(input.extraAttempts, 0, MAX_EXTRA_ATTEMPTS);
      const days = readWholeNumber(input.extraDays, 0, MAX_EXTRA_DAYS);
      if (!tries.ok || !days.ok) {
        const fieldErrors = { extraAttempts: tries.ok ? undefined : tries.message, extraDays: days.ok ? undefined : days.message };
        return data({ intent: input.intent, error: "Nothing was saved: fix what is marked below (0 and 0 removes the extra tries and days).", fieldErrors, values }, { status: 400 });
      }
      const result = await setAccommodation({ db }, klass, { studentId: student.id, assignmentId, extraAttempts: tries.value, extraDays: days.value });
      if (!result.ok) return data({ intent: input.intent, error: result.message, values }, { status: 400 });
      return {
        intent: input.intent,
        done:
          tries.value === 0 && days.value === 0
            ? "Removed. The class's usual tries and due dates apply."
            : "Saved. It applies from now on, without any sign on the student's page.",
      };
    }
  }
}

type Answer = {
  intent: string;
  error?: string;
  done?: string;
  password?: string;
  movedTo?: string;
  removed?: boolean;
  fieldErrors?: { extraAttempts?: string; extraDays?: string };
  values?: { scope: string; extraAttempts: string; extraDays: string };
};

/**
 * After a move or a removal the student is no longer in this class, so this page's loader would answer
 * 404: the page keeps what it shows and says where they went instead of loading again.
 */
export function shouldRevalidate({ actionResult, defaultShouldRevalidate }: ShouldRevalidateFunctionArgs) {
  const answer = actionResult as Answer | undefined;
  if (answer?.movedTo || answer?.removed) return false;
  return defaultShouldRevalidate;
}

export default function StudentPage({ loaderData, actionData }: Route.ComponentProps) {
  const { klass, student, row, lessonCount, lessons, accommodations, scopes, targets } = loaderData;
  const busy = useNavigation().state === "submitting";
  const answer = actionData as Answer | undefined;
  const accommodationAnswer = answer?.intent === "accommodation" ? answer : undefined;
  // The tries and days fields start from what the chosen lessons have now, so changing one of them
  // never quietly sets the other back to 0; after a refusal they keep what was typed.
  const [scope, setScope] = useState(accommodationAnswer?.values?.scope ?? "class");
  const own = accommodations.find((a) => a.scope === scope);
  const classWide = accommodations.find((a) => a.scope === "class");
  // A lesson without its own setting follows the class-wide one.
  const current = own ?? (scope === "class" ? undefined : classWide);
  const typed = accommodationAnswer?.values?.scope === scope ? accommodationAnswer.values : undefined;
  const about = (intent: string) =>
    answer?.intent === intent ? (
      answer.error ? (
        <Notice tone="problem">{answer.error}</Notice>
      ) : answer.done ? (
        <Notice tone="done">
          {answer.done}
          {answer.password ? (
            <>
              {" "}
              <strong className="font-mono" data-testid="new-password">{answer.password}</strong>. It is shown only now; their other sessions have ended.
            </>
          ) : null}
          {answer.movedTo ? (
            <>
              {" "}
              <Link to={`/teach/classes/${answer.movedTo}/students/${student.id}`}>Open them there</Link>.
            </>
          ) : null}
        </Notice>
      ) : null
    ) : null;

  if (answer?.removed || answer?.movedTo) {
    return (
      <div className="mx-auto max-w-6xl px-5 py-10">
        <ClassHeader klass={klass} />
        {about(answer.intent)}
        <p>
          <Link to={`/teach/classes/${klass.id}/roster`}>Back to the students of {klass.name}</Link>
        </p>
      </div>
    );
  }

  return (
    <div className="mx-auto max-w-6xl px-5 py-10">
      <ClassHeader klass={klass} title={student.displayName} />
      <p className="mb-6 text-ink-soft">
        Username <span className="font-mono text-ink">{student.username}</span> · grades {student.gradeBand ?? "—"}
        {student.studentNumber ? ` · student number ${student.studentNumber}` : ""}
        {row ? ` · ${row.lessonsComplete} of ${lessonCount} assigned lessons done · average ${row.averageScore === null ? "—" : `${row.averageScore}%`}` : ""}
      </p>
      {/* What can be done for the student sits below all their work: on a phone, many screens down. */}
      <nav aria-label={`For ${student.displayName}`} className="mb-6 flex flex-wrap gap-x-4 gap-y-1 text-[length:var(--text-step--1)]">
        <a href="#more">More tries or more time</a>
        <a href="#password">New password</a>
        <a href="#move">Another class</a>
      </nav>

      {lessons.length === 0 ? <p className="mb-8">No lessons are assigned yet, and {student.displayName} has not worked on any.</p> : null}
      {lessons.map((lesson) => (
        <section key={lesson.slug} className="card mb-6" aria-labelledby={`lesson-${lesson.slug}`}>
          <h2 id={`lesson-${lesson.slug}`} className="mb-1 text-[length:var(--text-step-1)]">{lesson.title}</h2>
          <p className="mb-3 text-[length:var(--text-step--1)] text-ink-soft">
            {lesson.assignment ? (
              <>
                <span data-testid="student-due">{lesson.assignment.dueLine}</span>
                {lesson.assignment.cell
                  ? ` · ${lesson.assignment.cell.requiredDone} of ${lesson.assignment.cell.requiredTotal} parts done${lesson.assignment.cell.score !== null ? ` · score ${lesson.assignment.cell.score}%` : ""}${lesson.assignment.cell.overdue ? " · overdue" : lesson.assignment.cell.finishedLate ? " · finished late" : ""}`
                  : ""}
              </>
            ) : (
              "Not assigned to this class"
            )}
          </p>

          <h3 className="mb-2 font-bold">Exercises</h3>
          <ul className="mb-4 space-y-2">
            {lesson.exercises.map((e) => (
              <li key={e.id}>
                <span className="font-bold">{e.title}</span>{" "}
                {e.attempts.length === 0 ? <span className="text-ink-soft">— no tries yet</span> : null}
                {e.attempts.length > 0 ? (
                  <ol className="mt-1 space-y-0.5 pl-1 text-[length:var(--text-step--1)]">
                    {e.attempts.map((a) => (
                      <li key={a.id}>
                        <span className="text-ink-soft">{a.label}:</span> <span className="font-mono wrap-anywhere">{a.answer || "(empty)"}</span> —{" "}
                        {a.right ? <strong className="text-ok">right</strong> : <span className="text-danger">{a.what}</span>}{" "}
                        <span className="text-ink-soft">· {a.at}</span>
                      </li>
                    ))}
                  </ol>
                ) : null}
              </li>
            ))}
          </ul>

          {lesson.readings.map((r) => (
            <div key={r.id} className="mb-4">
              <h3 className="mb-1 font-bold">
                Their readings{r.material ? `: ${r.material}` : ""} ({r.mode === "bend" ? "bending" : "stretching"}, unloaded {r.unloadedCm === null ? "—" : formatToResolution(r.unloadedCm, r.resolutionCm)} cm)
              </h3>
              <div className="overflow-x-auto">
                <table className="mb-2 border-collapse text-left text-[length:var(--text-step--1)]">
                  <caption className="sr-only">Readings</caption>
                  <thead>
                    <tr className="border-b border-rule">
                      <th scope="col" className="py-1 pr-4">Force (N)</th>
                      <th scope="col" className="py-1 pr-4">Reading (cm)</th>
                      <th scope="col" className="py-1 pr-4">After unloading (cm)</th>
                    </tr>
                  </thead>
                  <tbody>
                    {r.points.map((p, i) => (
                      <tr key={i} className="border-b border-rule">
                        <td className="py-1 pr-4">{p.forceN}</td>
                        <td className="py-1 pr-4">{p.readingCm === undefined ? "—" : formatToResolution(p.readingCm, r.resolutionCm)}{p.broke ? " (broke)" : ""}</td>
                        <td className="py-1 pr-4">{p.returnReadingCm === undefined ? "—" : formatToResolution(p.returnReadingCm, r.resolutionCm)}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
              <ReadingsAnalysis analysis={r.analysis} title={`${student.displayName}'s readings${r.material ? ` (${r.material})` : ""}`} whose={`${student.displayName}'s`} />
            </div>
          ))}

          {lesson.answers.map((a) => (
            <div key={a.answerId} className="mb-4" id={`answer-${lesson.slug}-${a.answerId}`}>
              <h3 className="mb-1 font-bold">
                Written answer {a.handedIn ? `· handed in ${a.handedInText}` : "· draft"}
                {a.scores ? ` · reviewed: ${rubricTotal(a.scores)} of 6` : ""}
              </h3>
              <ClaimEvidenceReasoning answer={a} />
              <ReviewForm of={`the answer in “${lesson.title}”`} action={`/teach/classes/${klass.id}/students/${student.id}`} answer={{ studentId: student.id, slug: lesson.slug, answerId: a.answerId, handedIn: a.handedIn, scores: a.scores, comment: a.comment }} />
            </div>
          ))}

          {lesson.photos.length > 0 ? (
            <div>
              <h3 className="mb-1 font-bold">Photos of the set-up</h3>
              <ul className="flex flex-wrap gap-3">
                {lesson.photos.map((p) => (
                  <li key={p.id}>
                    <a href={`/photos/${p.id}`}>
                      <img src={`/photos/${p.id}`} alt={`${student.displayName}'s set-up (${p.photoId}), ${p.at}`} className="h-40 w-auto rounded border border-rule" loading="lazy" />
                    </a>
                  </li>
                ))}
              </ul>
            </div>
          ) : null}
        </section>
      ))}

      <h2 className="mt-10 mb-4 text-[length:var(--text-step-2)]">For {student.displayName}</h2>
      <div className="grid gap-6 md:grid-cols-2">
        <section className="card" aria-labelledby="more">
          <h3 id="more" className="mb-2 font-reading text-[length:var(--text-step-1)]">More tries or more time</h3>
          <p className="mb-3 text-ink-soft">Applied quietly: {student.displayName} simply gets the tries and the later due date. Nobody else sees it.</p>
          {about("accommodation")}
          {accommodations.length > 0 ? (
            <ul className="mb-3 list-disc pl-5">
              {accommodations.map((a) => (
                <li key={a.scope}>
                  {a.label}: {plural(a.extraAttempts, "more try", "more tries")}, {plural(a.extraDays, "more day", "more days")}
                </li>
              ))}
            </ul>
          ) : null}
          <Form method="post" preventScrollReset noValidate>
            <input type="hidden" name="intent" value="accommodation" />
            <SelectField label="For" name="scope" options={scopes} value={scope} onChange={(e) => setScope(e.currentTarget.value)} />
            <p className="mb-3 text-[length:var(--text-step--1)]" data-testid="accommodation-now">
              {current
                ? `Now: ${plural(current.extraAttempts, "more try", "more tries")} per exercise and ${plural(current.extraDays, "more day", "more days")}${own ? "" : ", from the setting for every lesson"}.`
                : "Now: the class's usual tries and due dates."}
            </p>
            <div className="grid grid-cols-2 gap-3" key={`${scope}|${current?.extraAttempts ?? 0}|${current?.extraDays ?? 0}`}>
              {(
                [
                  { name: "extraAttempts", label: "More tries per exercise", max: MAX_EXTRA_ATTEMPTS },
                  { name: "extraDays", label: "More days", max: MAX_EXTRA_DAYS },
                ] as const
              ).map((f) => (
                <TextField
                  key={f.name}
                  label={f.label}
                  hint={`A whole number ${rangeWords(0, f.max)}.`}
                  name={f.name}
                  type="text"
                  inputMode="numeric"
                  autoComplete="off"
                  defaultValue={typed?.[f.name] ?? String(current?.[f.name] ?? 0)}
                  error={accommodationAnswer?.fieldErrors?.[f.name]}
                />
              ))}
            </div>
            <p className="mb-3 text-[length:var(--text-step--1)] text-ink-soft">One lesson's setting replaces the class-wide one for that lesson. 0 and 0 removes it.</p>
            <SendButton className="btn" busy={busy}>Save</SendButton>
          </Form>
        </section>

        <section className="card" aria-labelledby="password">
          <h3 id="password" className="mb-2 font-reading text-[length:var(--text-step-1)]">New password</h3>
          <p className="mb-3 text-ink-soft">For a student who forgot theirs. Their other sessions end.</p>
          {about("password")}
          <Form method="post" preventScrollReset>
            <input type="hidden" name="intent" value="password" />
            <TextField label="New password (optional)" hint="Leave it empty and Bendwise makes up one that is easy to type." name="password" type="text" autoComplete="off" maxLength={256} />
            <SendButton className="btn" busy={busy}>Set a new password</SendButton>
          </Form>
        </section>

        <section className="card" aria-labelledby="move">
          <h3 id="move" className="mb-2 font-reading text-[length:var(--text-step-1)]">Another class</h3>
          {about("move")}
          {targets.length === 0 ? (
            <p className="text-ink-soft">You have no other class at this school to move {student.displayName} to.</p>
          ) : (
            <Form
              method="post"
              preventScrollReset
              onSubmit={(e) => {
                const to = e.currentTarget.elements.namedItem("toClassId") as HTMLSelectElement | null;
                const toName = to?.selectedOptions[0]?.text ?? "the other class";
                if (!window.confirm(`Move ${student.displayName} from ${klass.name} to ${toName}? Their account and work are kept; that class's lessons and due dates apply.`)) e.preventDefault();
              }}
            >
              <input type="hidden" name="intent" value="move" />
              <SelectField label="Move to" name="toClassId" options={targets.map((t) => ({ value: t.id, label: `${t.name} (${t.schoolYear})` }))} />
              <SendButton className="btn" busy={busy}>Move</SendButton>
            </Form>
          )}
          <hr className="my-4 border-rule" />
          {about("remove")}
          <Form method="post" preventScrollReset onSubmit={(e) => { if (!window.confirm(`Take ${student.displayName} out of ${klass.name}? Their account and work are kept.`)) e.preventDefault(); }}>
            <input type="hidden" name="intent" value="remove" />
            <SendButton className="btn btn-quiet" busy={busy}>Take out of this class</SendButton>
          </Form>
        </section>
      </div>
    </div>
  );
}


export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.student.displayName ?? "Student"} · ${data?.klass.name ?? "Class"} — Bendwise` }];
