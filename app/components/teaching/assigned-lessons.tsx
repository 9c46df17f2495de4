// On a student's /learn page: the lessons their teachers assigned, with the student's own due dates
// (an accommodation simply shows as their due date), soonest first.
import { Link } from "react-router";
import type { AssignedLesson } from "~/lib/teaching/assignments.server";

export function AssignedLessons({ lessons, done }: { lessons: AssignedLesson[]; done: Record<string, boolean> }) {
  if (lessons.length === 0) return null;
  return (
    <section aria-labelledby="assigned-heading" className="card mb-8" data-testid="assigned-lessons">
      <h2 id="assigned-heading" className="mb-3 text-[length:var(--text-step-1)]">
        Assigned by your teacher
      </h2>
      <ul className="space-y-2">
        {lessons.map((l) => (
          <li key={`${l.slug}-${l.className}`} className="flex flex-wrap items-baseline justify-between gap-x-4">
            <span>
              {l.opened ? <Link to={`/learn/${l.slug}`}>Lesson {l.number}: {l.title}</Link> : <span>Lesson {l.number}: {l.title}</span>}
              {done[l.slug] ? <strong className="ml-2 text-ok">✓ Finished</strong> : null}
            </span>
            <span className="text-[length:var(--text-step--1)] text-ink-soft">
              {l.opened ? "" : "opens soon · "}due {l.dueText}
              {l.latePolicy === "closed" ? " · closes then" : ""}
            </span>
          </li>
        ))}
      </ul>
    </section>
  );
}
