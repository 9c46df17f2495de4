// The course as a path: each lesson with its progress, and a "continue" link back to exactly where
// the student stopped (the lesson and the part of it they last worked on).
import { Link } from "react-router";
import type { LessonProgress } from "~/lib/course.server";

export function ContinueCard({ target, lessons }: { target: { slug: string; place: string | null } | null; lessons: LessonProgress[] }) {
  if (!target) {
    return (
      <section className="card mb-8 border-2 border-ok" aria-label="Course finished">
        <p className="font-reading text-[length:var(--text-step-1)]">You have finished every lesson. Well done!</p>
      </section>
    );
  }
  const lesson = lessons.find((l) => l.slug === target.slug);
  const href = `/learn/${target.slug}${target.place ? `#${target.place}` : ""}`;
  return (
    <section className="card mb-8 flex flex-wrap items-center justify-between gap-4 border-2 border-spruce" aria-labelledby="continue-heading">
      <div>
        <h2 id="continue-heading" className="text-[length:var(--text-step-1)]">
          {lesson?.started ? "Pick up where you stopped" : "Start here"}
        </h2>
        <p className="text-ink-soft">
          Lesson {lesson?.number}: {lesson?.title}
        </p>
      </div>
      <Link to={href} className="btn" data-testid="continue-link">
        {lesson?.started ? "Continue" : "Start the lesson"}
      </Link>
    </section>
  );
}

export function CoursePath({ lessons, dueDates = {} }: { lessons: LessonProgress[]; dueDates?: Record<string, string> }) {
  return (
    <ol className="relative space-y-4 border-l-4 border-rule pl-6" aria-label="Your course">
      {lessons.map((lesson) => {
        const share = lesson.requiredTotal === 0 ? 0 : lesson.requiredDone / lesson.requiredTotal;
        const state = lesson.complete ? "Finished" : lesson.started ? "Under way" : "Not started";
        return (
          <li key={lesson.slug} className="relative" data-testid={`path-${lesson.slug}`}>
            <span
              aria-hidden="true"
              className={`absolute -left-[2.3rem] top-4 h-6 w-6 rounded-full border-4 ${lesson.complete ? "border-ok bg-ok" : lesson.started ? "border-spruce bg-paper" : "border-rule bg-paper"}`}
            />
            <Link to={`/learn/${lesson.slug}`} className="card block no-underline text-ink hover:border-spruce">
              <span className="flex flex-wrap items-baseline justify-between gap-2">
                <span className="font-reading text-[length:var(--text-step-1)] font-semibold text-spruce">
                  {lesson.number}. {lesson.title}
                </span>
                <span className="text-[length:var(--text-step--1)] text-ink-soft">
                  {state} · {lesson.requiredDone} of {lesson.requiredTotal} parts done · about {lesson.minutes} min
                  {dueDates[lesson.slug] ? ` · due ${dueDates[lesson.slug]}` : ""}
                </span>
              </span>
              <span className="mt-1 block text-ink-soft">{lesson.summary}</span>
              <span className="mt-3 block h-2 overflow-hidden rounded bg-spruce-wash" role="progressbar" aria-label={`Lesson ${lesson.number} progress`} aria-valuemin={0} aria-valuemax={lesson.requiredTotal} aria-valuenow={lesson.requiredDone}>
                <span className="block h-full bg-spruce" style={{ width: `${Math.round(share * 100)}%` }} />
              </span>
            </Link>
          </li>
        );
      })}
    </ol>
  );
}
