// /teach/classes/:classId/lessons/:slug/exercises/:exerciseId: one exercise in one class. The item
// analysis in full (the wrong answers grouped by the slip the checker named, with the usual answers in
// each group) and every student's tries; the tries download as CSV.
import { Link } from "react-router";
import type { Route } from "./+types/teach.classes.$classId.lessons.$slug.exercises.$exerciseId";
import { db } from "~/db/client.server";
import { analyseItems, classAttempts } from "~/lib/teaching/analysis.server";
import { classHeading } from "~/lib/teaching/classes.server";
import { requireTeacherClass } from "~/lib/teaching/guard.server";
import { choiceLabelReader } from "~/lib/course.server";
import { requireExercise, requireLesson } from "~/lib/teaching/lesson-guard.server";
import { classRoster } from "~/lib/teaching/roster.server";
import { formatMoment } from "~/lib/teaching/time";
import { triesAsRead } from "~/lib/teaching/words";
import { ClassHeader } from "~/components/teaching/ui";

export async function loader({ request, params }: Route.LoaderArgs) {
  const { klass } = await requireTeacherClass(request, params.classId);
  const lesson = requireLesson(params.slug);
  const exercise = requireExercise(lesson.slug, params.exerciseId);
  const [attempts, students] = await Promise.all([classAttempts({ db }, klass.id, lesson.slug, exercise.id), classRoster({ db }, klass.id)]);
  const item = analyseItems(lesson.slug, attempts, students.length).find((i) => i.exerciseId === exercise.id)!;
  const labelsOf = choiceLabelReader();
  const byStudent = students.map((s) => ({
    id: s.id,
    displayName: s.displayName,
    attempts: triesAsRead(
      attempts.filter((a) => a.studentId === s.id).map((a) => ({ ...a, at: formatMoment(a.createdAt, klass.timeZone) })),
      labelsOf(s.id, lesson.slug, exercise.id),
    ),
  }));
  return { klass: classHeading(klass), lesson: { slug: lesson.slug, number: lesson.number, title: lesson.title }, item, byStudent };
}

export default function ExerciseAnalysis({ loaderData }: Route.ComponentProps) {
  const { klass, lesson, item, byStudent } = loaderData;
  return (
    <div className="mx-auto max-w-6xl px-5 py-10">
      <ClassHeader klass={klass} title={item.title} />
      <p className="mb-6">
        <Link to={`/teach/classes/${klass.id}/lessons/${lesson.slug}`}>← Lesson {lesson.number}: {lesson.title}</Link>
      </p>
      <dl className="mb-8 grid gap-4 sm:grid-cols-4" data-testid="item-analysis">
        <div className="card">
          <dt className="text-ink-soft">Tried</dt>
          <dd className="text-[length:var(--text-step-2)] font-bold">
            {item.studentsTried} of {item.studentsInClass}
          </dd>
        </div>
        <div className="card">
          <dt className="text-ink-soft">Right at the first try</dt>
          <dd className="text-[length:var(--text-step-2)] font-bold" data-testid="right-first">{item.rightFirstTryPercent === null ? "—" : `${item.rightFirstTryPercent}%`}</dd>
        </div>
        <div className="card">
          <dt className="text-ink-soft">Tries on average</dt>
          <dd className="text-[length:var(--text-step-2)] font-bold" data-testid="average-tries">{item.averageAttempts ?? "—"}</dd>
        </div>
        <div className="card">
          <dt className="text-ink-soft">Right in the end</dt>
          <dd className="text-[length:var(--text-step-2)] font-bold">{item.rightInTheEnd}</dd>
        </div>
      </dl>

      <section aria-labelledby="wrong" className="mb-10">
        <h2 id="wrong" className="mb-3 text-[length:var(--text-step-2)]">The usual wrong answers</h2>
        {item.wrongGroups.length === 0 ? (
          <p>No wrong answers yet.</p>
        ) : (
          <ol className="space-y-3">
            {item.wrongGroups.map((g) => (
              <li key={g.key} className="card" data-group={g.key}>
                <p className="font-bold">{g.label}</p>
                <p className="text-ink-soft">
                  {g.attempts} {g.attempts === 1 ? "answer" : "answers"} from {g.students} {g.students === 1 ? "student" : "students"}
                </p>
                <p className="mt-1">
                  For example:{" "}
                  {g.examples.map((e, i) => (
                    <span key={e.answer}>
                      {i > 0 ? ", " : ""}
                      <span className="font-mono wrap-anywhere">{e.answer || "(empty)"}</span>
                      {e.count > 1 ? ` (${e.count}×)` : ""}
                    </span>
                  ))}
                </p>
              </li>
            ))}
          </ol>
        )}
      </section>

      <section aria-labelledby="tries">
        <div className="mb-3 flex flex-wrap items-baseline justify-between gap-3">
          <h2 id="tries" className="text-[length:var(--text-step-2)]">Every try</h2>
          <a className="btn btn-quiet" href={`/teach/classes/${klass.id}/lessons/${lesson.slug}/exercises/${item.exerciseId}/csv`} download>
            Download the tries as CSV
          </a>
        </div>
        <ul className="space-y-2">
          {byStudent.map((s) => (
            <li key={s.id}>
              <Link to={`/teach/classes/${klass.id}/students/${s.id}`}>{s.displayName}</Link>
              {s.attempts.length === 0 ? <span className="text-ink-soft"> — no tries yet</span> : null}
              {s.attempts.length > 0 ? (
                <ol className="mt-1 space-y-0.5 pl-1 text-[length:var(--text-step--1)]">
                  {s.attempts.map((a) => (
                    <li key={a.id}>
                      <span className="text-ink-soft">{a.label}:</span> <span className="font-mono wrap-anywhere">{a.answer || "(empty)"}</span> — {a.right ? <strong className="text-ok">right</strong> : <span className="text-danger">{a.what}</span>}{" "}
                      <span className="text-ink-soft">· {a.at}</span>
                    </li>
                  ))}
                </ol>
              ) : null}
            </li>
          ))}
        </ul>
      </section>
    </div>
  );
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.item.title ?? "Exercise"} · ${data?.klass.name ?? "Class"} — Bendwise` }];
