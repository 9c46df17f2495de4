// Reads a table of readings pasted or typed as text: one loading step per line,
// "force, reading[, reading after unloading][, broke]". Columns may be separated by tabs, semicolons,
// commas or spaces; with tabs or semicolons a decimal comma is read as a decimal point.
import type { ReadingPoint } from "./science";

export interface ReadingsTextResult {
  points: ReadingPoint[];
  /** the line (counted from 1) each point came from, for naming it in a problem */
  lines: number[];
  problems: string[];
}

const BROKE_WORDS = new Set(["broke", "broken", "b", "yes", "x", "true"]);

export function parseReadingsText(text: string, secondColumn: "reading" | "deformation"): ReadingsTextResult {
  const points: ReadingPoint[] = [];
  const lineOfPoint: number[] = [];
  const problems: string[] = [];
  const lines = text.replace(/\r/g, "").split("\n").slice(0, 1200);
  lines.forEach((raw, index) => {
    const line = raw.trim();
    if (line === "" || line.startsWith("#")) return;
    const decimalComma = /[\t;]/.test(line);
    const cells = (decimalComma ? line.split(/\s*[\t;]\s*/) : line.split(/\s*,\s*|\s+/)).filter((c) => c !== "");
    const number = (cell: string | undefined) => (cell === undefined ? NaN : Number(decimalComma ? cell.replace(",", ".") : cell));
    // A first line of column names is allowed.
    if (points.length === 0 && problems.length === 0 && Number.isNaN(number(cells[0])) && /[a-z]/i.test(line)) return;
    const row = index + 1;
    const force = number(cells[0]);
    const second = number(cells[1]);
    let back: number | undefined;
    let broke = false;
    for (const extra of cells.slice(2)) {
      if (BROKE_WORDS.has(extra.toLowerCase())) broke = true;
      else if (Number.isFinite(number(extra)) && back === undefined) back = number(extra);
      else problems.push(`Line ${row}: “${extra}” is neither a reading nor “broke”.`);
    }
    if (!Number.isFinite(force)) problems.push(`Line ${row}: the force “${cells[0] ?? ""}” is not a number.`);
    if (!Number.isFinite(second)) problems.push(`Line ${row}: the ${secondColumn} “${cells[1] ?? ""}” is not a number.`);
    if (!Number.isFinite(force) || !Number.isFinite(second)) return;
    points.push({
      forceN: force,
      ...(secondColumn === "reading" ? { readingCm: second } : { deformationCm: second }),
      ...(back !== undefined ? { returnReadingCm: back } : {}),
      ...(broke ? { broke: true } : {}),
    });
    lineOfPoint.push(row);
  });
  return { points, lines: lineOfPoint, problems };
}
