// The gradebook's table: a row per student, a column per assigned lesson. Every state is written in
// words (never colour alone), and the first column stays in view when the table scrolls sideways; a
// table wider than the screen (a phone) says so above it, or the averages at its right end go unseen.
import { Link } from "react-router";
import { SlidingBox } from "~/components/sliding-box";
import type { GradebookView } from "~/lib/teaching/gradebook.server";
import type { GradebookCell, GradebookRow } from "~/lib/teaching/shared";

export function GradebookTable({ classId, book, rows }: { classId: string; book: GradebookView; rows: GradebookRow[] }) {
  return (
    <SlidingBox label="Gradebook: students by assigned lessons" className="rounded-lg border border-rule bg-card" testId="gradebook">
      <table className="w-full border-collapse text-left text-[length:var(--text-step--1)]">
        <caption className="sr-only">Gradebook: students by assigned lessons</caption>
        <thead>
          <tr className="border-b-2 border-rule align-bottom">
            <th scope="col" className="sticky left-0 z-10 min-w-28 bg-card px-3 py-2">Student</th>
            {book.lessons.map((l) => (
              <th key={l.assignmentId} scope="col" className="min-w-36 px-3 py-2">
                <Link to={`/teach/classes/${classId}/lessons/${l.slug}`}>{l.number ? `L${l.number}: ` : ""}{l.title}</Link>
                <span className="block font-normal text-ink-soft">
                  {l.opened ? "" : `assigned from ${l.opensText} · `}due {l.dueText}
                </span>
              </th>
            ))}
            <th scope="col" className="px-3 py-2">Lessons done</th>
            <th scope="col" className="px-3 py-2">Average</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((row) => (
            <tr key={row.student.id} className="border-b border-rule align-top" data-student={row.student.username ?? row.student.id}>
              <th scope="row" className="sticky left-0 z-10 min-w-28 bg-card px-3 py-2 font-normal">
                <Link to={`/teach/classes/${classId}/students/${row.student.id}`}>{row.student.displayName}</Link>
              </th>
              {book.lessons.map((l) => (
                <td key={l.assignmentId} className="px-3 py-2" data-lesson={l.slug}>
                  <Cell cell={row.cells[l.assignmentId]} />
                </td>
              ))}
              <td className="px-3 py-2">
                {row.lessonsComplete} of {book.lessons.length}
              </td>
              <td className="px-3 py-2" data-testid="average">{row.averageScore === null ? <span title="No lesson counts yet: none started, none past its due date">—</span> : `${row.averageScore}%`}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </SlidingBox>
  );
}

function Cell({ cell }: { cell: GradebookCell | undefined }) {
  if (!cell) return <span className="text-ink-soft">—</span>;
  const progress = `${cell.requiredDone} of ${cell.requiredTotal}`;
  return (
    <div data-status={cell.status} data-testid="cell">
      {cell.status === "complete" ? (
        <strong className="text-ok">✓ Done</strong>
      ) : cell.status === "working" ? (
        <span title="Parts done: the required exercises and written answers">{progress} done</span>
      ) : (
        <span className="text-ink-soft">Not started</span>
      )}
      {cell.score !== null ? (
        <span className="ml-1" title="Score: the required exercises right, with the late rule applied">
          <span className="text-ink-soft">· score </span>
          <strong data-testid="score">{cell.score}%</strong>
        </span>
      ) : null}
      <span className="mt-0.5 flex flex-wrap gap-1">
        {cell.overdue ? <Tag tone="danger">Overdue</Tag> : cell.finishedLate ? <Tag tone="danger">Late</Tag> : null}
        {cell.stuckOn.length > 0 ? <Tag tone="ember">Stuck on {cell.stuckOn.length}</Tag> : null}
        {cell.toReview > 0 ? <Tag tone="spruce">{cell.toReview} to review</Tag> : null}
      </span>
    </div>
  );
}

function Tag({ tone, children }: { tone: "danger" | "ember" | "spruce"; children: React.ReactNode }) {
  const style = { danger: "border-danger text-danger", ember: "border-ember text-ember", spruce: "border-spruce text-spruce" }[tone];
  return <span className={`rounded border px-1.5 text-[0.8rem] font-bold ${style}`}>{children}</span>;
}
