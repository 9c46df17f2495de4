// CSV exports with papaparse: UTF-8 with a byte-order mark (so spreadsheet programs read accents and
// other scripts correctly), CRLF line ends, formulas neutralised (a name starting with "=" stays text),
// and sent as an attachment.
import Papa from "papaparse";
import { choiceLabelReader } from "~/lib/course.server";
import type { ClassAttempt } from "./analysis.server";
import type { Gradebook } from "./gradebook.server";
import { countedScore, lessonAverage } from "./shared";
import { spreadsheetMoment } from "./time";
import { NO_TRY_OUTCOMES } from "~/lib/answer-checker";
import { outcomeWords, readableAnswer, wrongAnswerGroup } from "./words";

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

/** The average's column says its rule (AVERAGE_RULE in shared.ts) in short. */
export const AVERAGE_COLUMN = "Average score (%): lessons started or past due, not started then 0";

/**
 * One row per student, a score column per assigned lesson, then totals; a last row for the class.
 * Scores follow the gradebook's AVERAGE_RULE throughout: a lesson's cell is empty while it does not
 * count for that student yet (not started and not yet due), 0 when it counts and was not started;
 * the class's lesson columns and average are means of what counts; its lessons are totals.
 */
export function gradebookCsv(book: Gradebook): string {
  const lessonColumns = book.lessons.map((l) => `${l.number ? `Lesson ${l.number}: ` : ""}${l.title} (score %)`);
  const fields = ["Student", "Username", "Student number", ...lessonColumns, "Lessons complete", "Lessons assigned", AVERAGE_COLUMN];
  const rows = book.rows.map((r) => [
    r.student.displayName,
    r.student.username ?? "",
    r.student.studentNumber ?? "",
    ...book.lessons.map((l) => countedScore(r.cells[l.assignmentId])),
    r.lessonsComplete,
    book.lessons.length,
    r.averageScore,
  ]);
  const classRow = [
    "Whole class: average scores, lessons in total",
    "",
    "",
    ...book.lessons.map((l) => lessonAverage(book.rows, l.assignmentId)),
    book.rows.reduce((sum, r) => sum + r.lessonsComplete, 0),
    book.lessons.length * book.rows.length,
    book.summary.averageScore,
  ];
  return toCsv(fields, book.rows.length > 0 ? [...rows, classRow] : rows);
}

/**
 * Every attempt at one exercise of lesson `slug` by the class's students, its time in the class's time
 * zone as spreadsheets read dates ("2026-12-11 16:05:09"), in the words of the exercise's page: "Try 2" or "Not counted" (an answer that could not be read uses
 * no try), and what was wrong as the page says it (the slip's words when one was recognised).
 */
export function attemptsCsv(slug: string, attempts: ClassAttempt[], timeZone: string): string {
  const labelsOf = choiceLabelReader();
  const tries = new Map<string, number>();
  const rows = attempts.map((a) => {
    let label = "Not counted";
    if (!NO_TRY_OUTCOMES.has(a.outcome)) {
      const n = (tries.get(a.studentId) ?? 0) + 1;
      tries.set(a.studentId, n);
      label = `Try ${n}`;
    }
    return [
      a.displayName,
      a.username ?? "",
      a.studentNumber ?? "",
      label,
      spreadsheetMoment(a.createdAt, timeZone),
      a.createdAt.toISOString(),
      readableAnswer(a.rawAnswer, labelsOf(a.studentId, slug, a.exerciseId)),
      a.parsedValue,
      a.parsedUnit ?? "",
      a.correct ? "yes" : "no",
      a.correct ? outcomeWords(a.outcome) : wrongAnswerGroup(a.slipCode, a.outcome).label,
      a.slipCode ?? "",
    ];
  });
  return toCsv(
    ["Student", "Username", "Student number", "Try", `Time (${timeZone})`, "Time (UTC, ISO 8601)", "Answer", "Value read", "Unit read", "Right", "Outcome", "Slip code"],
    rows,
  );
}
