// Reads a table of readings pasted or typed as text: one loading step per line,
// "force, reading[, reading after unloading][, broke]", and single cells as typed in a form.
//
// How a line is split (each line on its own):
// - tabs or semicolons separate the columns, and a comma is a decimal comma: "1; 2,5";
// - otherwise commas separate the columns ("1, 2.5", "1,2.5"), unless every comma sits between two
//   digits and spaces separate the columns, when the commas are decimal commas: "1 2,5";
// - a line whose commas could be read more than one way is refused, not guessed: "1, 2,5" (is it
//   2.5, or 2 and 5?) and "1,2,5" (three columns, or 1 and 2.5, or 1.2 and 5?). A line with a
//   decimal point uses points for decimals, so its commas separate columns.
// A number may carry its column's unit ("3 N", "19.5 cm"); another unit ("19.5 mm") is named.
import type { ReadingPoint } from "./science";

export interface ReadingsTextResult {
  points: ReadingPoint[];
  /** the line (counted from 1) each point came from, for naming it in a problem */
  lines: number[];
  problems: string[];
}

const BROKE_WORDS = new Set(["broke", "broken", "b", "yes", "x", "true"]);

/** Units a student may write after a number, by how they are written in lower case. */
const UNITS = new Map(Object.entries({ n: "N", newton: "N", newtons: "N", cm: "cm", mm: "mm", m: "m", g: "g", kg: "kg" }));

/** One cell read as a number in its column's unit: the value, or why not (a unit of another column, too long). */
export type CellReading = { ok: true; value: number } | { ok: false; value?: number; unit?: string; tooLong?: true };

/**
 * Most characters a number may have: 20 is far more than any reading needs ("0.000001", "123.45"), and
 * fewer than a pasted run of digits; longer text is called too long, not "not a number".
 */
export const MOST_NUMBER_CHARS = 20;

/** Typed text quoted back in a problem, cut to its first `most` characters and "…" so a long paste is not echoed whole. */
export function echo(typed: string, most = MOST_NUMBER_CHARS): string {
  return typed.length > most ? `${typed.slice(0, most)}…` : typed;
}

/**
 * One number as typed, with the column's unit allowed after it ("19.5 cm", "3N", "19,5 cm" when
 * decimalComma). Not ok when empty or not a number, or when it carries another unit (then `unit`
 * names that unit and `value` is the number).
 */
export function readCell(text: string, unit: "N" | "cm", decimalComma: boolean): CellReading {
  let numberText = text.trim();
  let given: string | undefined;
  // The letters at the end, found by a scan rather than a regular expression that could backtrack on long text.
  let start = numberText.length;
  while (start > 0 && /[a-z]/i.test(numberText[start - 1])) start--;
  const before = numberText.slice(0, start).trimEnd();
  const written = UNITS.get(numberText.slice(start).toLowerCase());
  if (written !== undefined && /[\d.]$/.test(before)) {
    numberText = before;
    given = written;
  }
  // Number("") is 0: an empty cell is no number.
  if (numberText === "") return { ok: false };
  // Digits and signs only, but too many: a number too long to be a reading (other long text is no number).
  if (numberText.length > MOST_NUMBER_CHARS) return /^[-+\d.,e\s]+$/i.test(numberText) ? { ok: false, tooLong: true } : { ok: false };
  const value = Number(decimalComma ? numberText.replace(/,/g, ".") : numberText);
  if (!Number.isFinite(value)) return { ok: false };
  if (given !== undefined && given !== unit) return { ok: false, value, unit: given };
  return { ok: true, value };
}

/**
 * What is wrong with a cell readCell refused, in a student's words: `what` names the column
 * ("force", "reading", "reading after unloading"). Empty cells are the caller's to name.
 */
export function cellProblem(what: string, typed: string, unit: "N" | "cm", reading: CellReading): string {
  if (reading.ok) return "";
  if (reading.tooLong) return `the ${what} “${echo(typed)}” is too long: write a number of at most ${MOST_NUMBER_CHARS} characters.`;
  if (reading.unit === undefined || reading.value === undefined) return `the ${what} “${echo(typed)}” is not a number.`;
  const column = unit === "N" ? "forces are in N (newtons) here" : "readings are in cm here";
  const inCm = reading.unit === "mm" ? reading.value / 10 : reading.unit === "m" ? reading.value * 100 : null;
  const hint =
    unit === "cm" && inCm !== null
      ? `: write it in cm (${typed} is ${Number(inCm.toPrecision(6))} cm)`
      : unit === "N" && (reading.unit === "g" || reading.unit === "kg")
        ? ": read the spring scale in newtons (a 100 g mass weighs about 0.98 N)"
        : "";
  return `the ${what} “${echo(typed)}” is in ${reading.unit}, but ${column}${hint}.`;
}

/** A problem worded as part of a sentence ("the force …"), begun as a sentence of its own ("The force …"). */
export function asSentence(problem: string): string {
  return problem.charAt(0).toUpperCase() + problem.slice(1);
}

/** The columns of one line, and whether its commas are decimal commas; null when the commas are ambiguous. */
function splitColumns(line: string): { cells: string[]; decimalComma: boolean } | null {
  if (/[\t;]/.test(line)) return { cells: line.split(/\s*[\t;]\s*/), decimalComma: true };
  if (!line.includes(",")) return { cells: line.split(/\s+/), decimalComma: false };
  const commas = (line.match(/,/g) ?? []).length;
  const betweenDigits = (line.match(/(?<=\d),(?=\d)/g) ?? []).length;
  const byCommas = { cells: line.split(/\s*,\s*|\s+/), decimalComma: false };
  if (betweenDigits === 0 || line.includes(".")) return byCommas;
  if (betweenDigits < commas) return null; // "1, 2,5"
  if (/\s/.test(line)) return { cells: line.split(/\s+/), decimalComma: true }; // "1 2,5"
  return commas === 1 ? byCommas : null; // "1,2" is two columns (one number is no line); "1,2,5" is not clear
}

/** "3 N" split by the spaces becomes "3", "N": a unit on its own belongs to the number before it. */
function joinUnits(cells: string[]): string[] {
  const joined: string[] = [];
  for (const cell of cells) {
    if (joined.length > 0 && UNITS.has(cell.toLowerCase())) joined[joined.length - 1] += ` ${cell}`;
    else joined.push(cell);
  }
  return joined;
}

export function parseReadingsText(text: string, secondColumn: "reading" | "deformation"): ReadingsTextResult {
  const points: ReadingPoint[] = [];
  const lineOfPoint: number[] = [];
  const problems: string[] = [];
  const lines = text.replace(/\r/g, "").split("\n").slice(0, 1200);
  lines.forEach((raw, index) => {
    const line = raw.trim();
    if (line === "" || line.startsWith("#")) return;
    const row = index + 1;
    const split = splitColumns(line);
    // A first line of column names is allowed.
    const header = points.length === 0 && problems.length === 0 && /[a-z]/i.test(line) && !/^[-+.,]?\d/.test(line);
    if (header) return;
    if (split === null) {
      problems.push(
        `Line ${row}: “${echo(line, 40)}” can be read more than one way, because its commas could be decimal commas or could separate the columns. Use a point for decimals (1, 2.5), or put a semicolon between the columns (1; 2,5).`,
      );
      return;
    }
    const cells = joinUnits(split.cells.filter((c) => c !== ""));
    const cell = (typed: string | undefined, what: string, unit: "N" | "cm") => {
      if (typed === undefined) return { value: undefined, problem: `Line ${row}: the ${what} is missing.` };
      const reading = readCell(typed, unit, split.decimalComma);
      return reading.ok ? { value: reading.value, problem: null } : { value: undefined, problem: `Line ${row}: ${cellProblem(what, typed, unit, reading)}` };
    };
    const force = cell(cells[0], "force", "N");
    const second = cell(cells[1], secondColumn, "cm");
    let back: number | undefined;
    let broke = false;
    const extras: string[] = [];
    for (const extra of cells.slice(2)) {
      const read = readCell(extra, "cm", split.decimalComma);
      if (BROKE_WORDS.has(extra.toLowerCase())) broke = true;
      else if (read.ok && back === undefined) back = read.value;
      else if (!read.ok && (read.unit !== undefined || read.tooLong)) extras.push(`Line ${row}: ${cellProblem("reading after unloading", extra, "cm", read)}`);
      else extras.push(`Line ${row}: “${echo(extra)}” is neither a reading nor “broke”.`);
    }
    for (const problem of [force.problem, second.problem, ...extras]) if (problem) problems.push(problem);
    if (force.value === undefined || second.value === undefined) return;
    points.push({
      forceN: force.value,
      ...(secondColumn === "reading" ? { readingCm: second.value } : { deformationCm: second.value }),
      ...(back !== undefined ? { returnReadingCm: back } : {}),
      ...(broke ? { broke: true } : {}),
    });
    lineOfPoint.push(row);
  });
  return { points, lines: lineOfPoint, problems };
}
