// On a student's /learn page: the lessons their teachers assigned, with the student's own due dates
// (an accommodation simply shows as their due date), soonest first.
import { Link } from "react-router";
import type { AssignedLesson } from "~/lib/teaching/assignments.server";
import { lateRuleInWords } from "~/lib/teaching/shared";

// The course is self-paced: a lesson assigned from a later day can be opened now as any other; the
// day says when it joins the list of work expected.
export function AssignedLessons({ lessons, done, by }: { lessons: AssignedLesson[]; done: Record<string, boolean>; by: "teacher" | "parent" }) {
  if (lessons.length === 0) return null;
  return (
    <section aria-labelledby="assigned-heading" className="card mb-8" data-testid="assigned-lessons">
      <h2 id="assigned-heading" className="mb-3 text-[length:var(--text-step-1)]">
        Assigned by your {by}
      </h2>
      <ul className="space-y-2">
        {lessons.map((l) => (
          <li key={`${l.slug}-${l.className}`} className="flex flex-wrap items-baseline justify-between gap-x-4">
            <span>
              <Link to={`/learn/${l.slug}`}>Lesson {l.number}: {l.title}</Link>
              {done[l.slug] ? <strong className="ml-2 text-ok">✓ Finished</strong> : null}
            </span>
            <span className="text-[length:var(--text-step--1)] text-ink-soft">
              {l.opened ? "" : `assigned from ${l.opensText} · `}due {l.dueText}
              {l.latePolicy === "accept" ? "" : ` · ${lateRuleInWords(l.latePolicy, l.latePenaltyPercent)}`}
            </span>
          </li>
        ))}
      </ul>
    </section>
  );
}
