// CSV exports with papaparse: UTF-8 with a byte-order mark (so spreadsheet programs read accents and
// other scripts correctly), CRLF line ends, formulas neutralised (a name starting with "=" stays text),
// and sent as an attachment.
import Papa from "papaparse";
import { choiceLabelReader } from "~/lib/course.server";
import type { ClassAttempt } from "./analysis.server";
import type { Gradebook } from "./gradebook.server";
import { formatMoment } from "./time";
import { outcomeWords, readableAnswer } from "./words";

const BOM = "\uFEFF";

export function toCsv(fields: string[], rows: (string | number | null)[][]): string {
  return BOM + Papa.unparse({ fields, data: rows.map((r) => r.map((v) => (v === null ? "" : v))) }, { newline: "\r\n", escapeFormulae: true }) + "\r\n";
}

/** A file name that any system accepts: letters, digits and hyphens. */
export function fileSlug(text: string): string {
  return text
    .normalize("NFKD")
    .replace(/[^\x20-\x7e]/g, "")
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/^-|-$/g, "")
    .slice(0, 60) || "class";
}

export function csvResponse(body: string, filename: string): Response {
  return new Response(body, {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="${filename}"`,
      "Cache-Control": "private, no-store",
      "X-Content-Type-Options": "nosniff",
    },
  });
}

/** One row per student, a score column per assigned lesson, then totals; a last row with the class averages. */
export function gradebookCsv(book: Gradebook): string {
  const lessonColumns = book.lessons.map((l) => `${l.number ? `Lesson ${l.number}: ` : ""}${l.title} (score %)`);
  const fields = ["Student", "Username", "Student number", ...lessonColumns, "Lessons complete", `Lessons assigned`, "Average score of open lessons (%)"];
  const rows = book.rows.map((r) => [
    r.student.displayName,
    r.student.username ?? "",
    r.student.studentNumber ?? "",
    ...book.lessons.map((l) => r.cells[l.assignmentId]?.score ?? (l.opened ? 0 : null)),
    r.lessonsComplete,
    book.lessons.length,
    r.averageScore,
  ]);
  const mean = (values: (number | null)[]) => {
    const present = values.filter((v): v is number => v !== null);
    return present.length > 0 ? Math.round(present.reduce((a, b) => a + b, 0) / present.length) : null;
  };
  const averages = [
    "Class average",
    "",
    "",
    ...book.lessons.map((l) => mean(book.rows.map((r) => r.cells[l.assignmentId]?.score ?? (l.opened ? 0 : null)))),
    mean(book.rows.map((r) => r.lessonsComplete)),
    book.lessons.length,
    mean(book.rows.map((r) => r.averageScore)),
  ];
  return toCsv(fields, book.rows.length > 0 ? [...rows, averages] : rows);
}

/** Every attempt at one exercise of lesson `slug` by the class's students, in the class's time zone. */
export function attemptsCsv(slug: string, attempts: ClassAttempt[], timeZone: string): string {
  const labelsOf = choiceLabelReader();
  const tries = new Map<string, number>();
  const rows = attempts.map((a) => {
    const n = (tries.get(a.studentId) ?? 0) + 1;
    tries.set(a.studentId, n);
    return [
      a.displayName,
      a.username ?? "",
      a.studentNumber ?? "",
      n,
      formatMoment(a.createdAt, timeZone),
      a.createdAt.toISOString(),
      readableAnswer(a.rawAnswer, labelsOf(a.studentId, slug, a.exerciseId)),
      a.parsedValue,
      a.parsedUnit ?? "",
      a.correct ? "yes" : "no",
      outcomeWords(a.outcome),
      a.slipCode ?? "",
    ];
  });
  return toCsv(
    ["Student", "Username", "Student number", "Attempt", `Time (${timeZone})`, "Time (UTC, ISO 8601)", "Answer", "Value read", "Unit read", "Right", "Outcome", "Slip code"],
    rows,
  );
}
