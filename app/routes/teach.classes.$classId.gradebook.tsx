// /teach/classes/:classId/gradebook: students × assigned lessons, with completion and score, and the
// filters "not started", "late" and "stuck". While the page is open it refreshes itself about every
// 30 seconds from the JSON route through a fetcher (no reload), and pauses while the tab is hidden.
// `?refresh=<seconds>` (2 to 30) shortens the interval; the browser tests use it to stay fast.
import { useEffect, useRef, useState } from "react";
import { Link, useFetcher, useSearchParams, type ShouldRevalidateFunctionArgs } from "react-router";
import type { Route } from "./+types/teach.classes.$classId.gradebook";
import { db } from "~/db/client.server";
import { classHeading } from "~/lib/teaching/classes.server";
import { gradebookView, loadGradebook, type GradebookView } from "~/lib/teaching/gradebook.server";
import { AVERAGE_RULE, GRADEBOOK_FILTERS, STUCK_AFTER_WRONG, filterRows, type GradebookFilter } from "~/lib/teaching/shared";
import { formatClockTime } from "~/lib/teaching/time";
import { requireTeacherClass } from "~/lib/teaching/guard.server";
import { ClassHeader, Percent } from "~/components/teaching/ui";
import { GradebookTable } from "~/components/teaching/gradebook-table";

export const DEFAULT_REFRESH_SECONDS = 30;

export async function loader({ request, params }: Route.LoaderArgs) {
  const { klass } = await requireTeacherClass(request, params.classId);
  const book = await loadGradebook({ db }, klass.id);
  const asked = Number(new URL(request.url).searchParams.get("refresh"));
  const refreshSeconds = Number.isFinite(asked) && asked >= 2 && asked <= DEFAULT_REFRESH_SECONDS ? asked : DEFAULT_REFRESH_SECONDS;
  return { klass: classHeading(klass), timeZone: klass.timeZone, gradebook: gradebookView(book, klass.timeZone), refreshSeconds };
}

// Changing the filter only changes the query string; the rows are already here.
export function shouldRevalidate({ currentUrl, nextUrl, formMethod, defaultShouldRevalidate }: ShouldRevalidateFunctionArgs) {
  if (!formMethod && currentUrl.pathname === nextUrl.pathname) {
    const strip = (u: URL) => {
      const p = new URLSearchParams(u.search);
      p.delete("show");
      return p.toString();
    };
    if (strip(currentUrl) === strip(nextUrl)) return false;
  }
  return defaultShouldRevalidate;
}

/**
 * Asks the JSON route every `seconds` while the tab is visible, and at once when it becomes visible
 * again. Each ask sends the revision shown (`?since=`): the route answers "unchanged" while it holds,
 * or the whole new gradebook, which is kept here until the next one.
 */
function useLiveGradebook(classId: string, seconds: number, initial: GradebookView) {
  const fetcher = useFetcher<{ gradebook: GradebookView } | { unchanged: true; revision: string }>();
  const fetched = fetcher.data && "gradebook" in fetcher.data ? fetcher.data.gradebook : undefined;
  const [latest, setLatest] = useState<GradebookView | undefined>(undefined);
  useEffect(() => {
    if (fetched) setLatest(fetched);
  }, [fetched]);
  // The newer of the page's data and the last one fetched (the page's is newer right after a navigation).
  const book = latest && latest.generatedAt > initial.generatedAt ? latest : initial;
  // When the page last checked, from each answer the fetcher gets ("unchanged" included).
  const [checkedAt, setCheckedAt] = useState<Date | null>(null);
  useEffect(() => {
    if (fetcher.data) setCheckedAt(new Date());
  }, [fetcher.data]);

  const url = `/api/teach/classes/${classId}/gradebook?since=${encodeURIComponent(book.revision ?? "")}`;
  const current = useRef({ load: fetcher.load, url, busy: false });
  current.current = { load: fetcher.load, url, busy: fetcher.state !== "idle" };
  useEffect(() => {
    const refresh = () => {
      if (document.visibilityState === "visible" && !current.current.busy) void current.current.load(current.current.url);
    };
    const timer = window.setInterval(refresh, seconds * 1000);
    const onVisibility = () => {
      if (document.visibilityState === "visible") refresh();
    };
    document.addEventListener("visibilitychange", onVisibility);
    return () => {
      window.clearInterval(timer);
      document.removeEventListener("visibilitychange", onVisibility);
    };
  }, [classId, seconds]);
  return { book, checkedAt, refreshing: fetcher.state === "loading", refreshNow: () => void fetcher.load(url) };
}

export default function GradebookPage({ loaderData }: Route.ComponentProps) {
  const { klass, refreshSeconds } = loaderData;
  const { book, checkedAt, refreshing, refreshNow } = useLiveGradebook(klass.id, refreshSeconds, loaderData.gradebook);
  const [params] = useSearchParams();
  const filter = (GRADEBOOK_FILTERS.find((f) => f.value === params.get("show"))?.value ?? "everyone") as GradebookFilter;
  const rows = filterRows(book.rows, filter);
  const counts: Record<GradebookFilter, number> = {
    everyone: book.rows.length,
    "not-started": book.summary.notStarted,
    late: book.summary.late,
    stuck: book.summary.stuck,
  };
  const withParams = (show: GradebookFilter) => {
    const next = new URLSearchParams(params);
    if (show === "everyone") next.delete("show");
    else next.set("show", show);
    const text = next.toString();
    return text ? `?${text}` : ".";
  };

  return (
    <div className="mx-auto max-w-6xl px-5 py-10">
      <ClassHeader klass={klass} />
      <div className="mb-4 flex flex-wrap items-baseline justify-between gap-3">
        <p>
          {book.summary.students} {book.summary.students === 1 ? "student" : "students"} · {book.summary.lessons}{" "}
          {book.summary.lessons === 1 ? "lesson" : "lessons"} assigned · lesson work done: <Percent value={book.summary.completePercent} /> ·
          average score: <Percent value={book.summary.averageScore} />
          {book.summary.averagedStudents < book.summary.students ? (
            <span data-testid="averaged-students">
              {" "}
              (of the {book.summary.averagedStudents} {book.summary.averagedStudents === 1 ? "student" : "students"} with a lesson that counts yet)
            </span>
          ) : null}
          {book.summary.toReview > 0 ? <> · <strong>{book.summary.toReview}</strong> written {book.summary.toReview === 1 ? "answer" : "answers"} to review</> : null}
        </p>
        <p className="flex flex-wrap gap-3">
          <a className="btn btn-quiet" href={`/teach/classes/${klass.id}/gradebook/csv`} download>
            Download as CSV
          </a>
        </p>
      </div>

      <nav aria-label="Show" className="mb-3 flex flex-wrap gap-2">
        {GRADEBOOK_FILTERS.map((f) => (
          <Link
            key={f.value}
            to={withParams(f.value)}
            preventScrollReset
            aria-current={filter === f.value ? "true" : undefined}
            title={f.means}
            className={`rounded-full border-2 px-3 py-1 font-bold no-underline ${filter === f.value ? "border-spruce bg-spruce text-white hover:text-white" : "border-spruce text-spruce hover:bg-spruce-wash"}`}
          >
            {f.label} ({counts[f.value]})
          </Link>
        ))}
      </nav>
      {filter === "everyone" ? null : (
        <p className="mb-2" data-testid="filter-means">
          {GRADEBOOK_FILTERS.find((f) => f.value === filter)!.means}
        </p>
      )}
      <p className="mb-4 text-[length:var(--text-step--1)] text-ink-soft" data-testid="gradebook-updated">
        Updated {checkedAt ? formatClockTime(checkedAt, loaderData.timeZone) : loaderData.gradebook.updatedText} · refreshes every {refreshSeconds} s while this page is open{" "}
        <button type="button" className="ml-2 underline text-spruce" onClick={refreshNow} disabled={refreshing}>
          {refreshing ? "Refreshing…" : "Refresh now"}
        </button>
      </p>

      {book.lessons.length === 0 ? (
        <p>
          No lessons are assigned yet. <Link to={`/teach/classes/${klass.id}/assignments`}>Assign a lesson</Link> and the gradebook fills in as students work.
        </p>
      ) : book.rows.length === 0 ? (
        <p>
          No students yet. <Link to={`/teach/classes/${klass.id}/roster`}>Add students</Link>.
        </p>
      ) : rows.length === 0 ? (
        <p data-testid="gradebook-empty-filter">Nobody in this class matches “{GRADEBOOK_FILTERS.find((f) => f.value === filter)?.label}”.</p>
      ) : (
        <GradebookTable classId={klass.id} book={book} rows={rows} />
      )}
      <Legend />
    </div>
  );
}

function Legend() {
  return (
    <details className="mt-6 text-[length:var(--text-step--1)]">
      <summary className="cursor-pointer font-bold text-spruce">What the gradebook shows</summary>
      <ul className="mt-2 list-disc space-y-1 pl-5">
        <li>Each cell: how many of the lesson's required parts are done (exercises right or out of tries, written answers handed in) and the score.</li>
        <li>Score: the share of required exercises answered right; late answers count as the lesson's late-work rule says.</li>
        <li>Overdue: past the student's due date and not finished. Late: finished after the due date.</li>
        <li>Stuck on N: N exercises with {STUCK_AFTER_WRONG} or more wrong answers and none right yet.</li>
        <li>N to review: written answers handed in, or handed in again, since your last review.</li>
        <li data-testid="average-rule">Average: {AVERAGE_RULE} The class's average score is the mean of its students' averages.</li>
      </ul>
    </details>
  );
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Gradebook · ${data?.klass.name ?? "Class"} — Bendwise` }];
