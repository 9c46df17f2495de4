// The course as a path: each lesson with its progress, and a "continue" link: to assigned work that is
// due soon, or back to exactly where the student stopped (the lesson and the part last worked on).
import { Link } from "react-router";
import type { ContinueTarget, LessonProgress } from "~/lib/course.server";

export function ContinueCard({ target, lessons }: { target: ContinueTarget | null; lessons: LessonProgress[] }) {
  if (!target) {
    return (
      <section className="card mb-8 border-2 border-ok" aria-label="Course finished">
        <p className="font-reading text-[length:var(--text-step-1)]">You have finished every lesson. Well done!</p>
      </section>
    );
  }
  const lesson = lessons.find((l) => l.slug === target.slug);
  const stopped = target.stoppedAt ? lessons.find((l) => l.slug === target.stoppedAt!.slug) : undefined;
  const heading = target.due ? (target.due.passed ? "Past its due date" : "Due soon") : lesson?.started ? "Pick up where you stopped" : "Start here";
  return (
    <section className="card mb-8 flex flex-wrap items-center justify-between gap-4 border-2 border-spruce" aria-labelledby="continue-heading">
      <div>
        <h2 id="continue-heading" className="text-[length:var(--text-step-1)]">
          {heading}
        </h2>
        <p className="text-ink-soft">
          Lesson {lesson?.number}: {lesson?.title}
          {target.due ? ` · ${target.due.passed ? "was due" : "due"} ${target.due.text}` : ""}
        </p>
        {stopped ? (
          <p className="mt-1 text-[length:var(--text-step--1)]">
            Or go back to{" "}
            <Link to={placeHref(target.stoppedAt!)} data-testid="stopped-link">
              lesson {stopped.number}, where you stopped
            </Link>
            .
          </p>
        ) : null}
      </div>
      <Link to={placeHref(target)} className="btn" data-testid="continue-link">
        {lesson?.started ? "Continue" : "Start the lesson"}
      </Link>
    </section>
  );
}

const placeHref = ({ slug, place }: { slug: string; place: string | null }) => `/learn/${slug}${place ? `#${place}` : ""}`;

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
