/**
 * The request body of `POST /api/analysis`: a zod schema, and a parser that turns any body into
 * either the validated input for `analyseReadings` or a list of plain-words problems with the HTTP
 * status to answer (400, or 413 for too many points). Never throws.
 *
 * Units as in app/lib/science.ts: force in N, readings and deformations in cm.
 */
import { z } from "zod";
import { asSentence, cellProblem, readCell } from "./readings-text";
import { implausibleReadings, type AnalysisInput, type Mode, type ReadingPoint } from "./science";

/** Most points one request may carry; more gets 413 (Payload Too Large). */
export const MAX_POINTS = 1000;
/** Fewest points one request may carry. */
export const MIN_POINTS = 2;

// zod 4's z.number() already refuses NaN and ±Infinity, so "all numbers finite" holds throughout.
const finite = (field: string) => z.number({ error: `${field} must be a finite number` });

const pointSchema = z
  .object({
    forceN: finite("forceN").min(0, { error: "forceN must be 0 or more" }),
    readingCm: finite("readingCm").optional(),
    deformationCm: finite("deformationCm").optional(),
    returnReadingCm: finite("returnReadingCm").optional(),
    broke: z.boolean({ error: "broke must be true or false" }).optional(),
  }, { error: 'each point must be an object such as {"forceN": 1, "readingCm": 19.6}' })
  .refine((p) => p.readingCm !== undefined || p.deformationCm !== undefined, {
    error: "each point needs readingCm or deformationCm",
  });

/**
 * Why a series cannot be analysed when every point that did not break has the same force (the
 * spring scale read 3 N each time), or null: one force gives no line, only that force again.
 */
export function oneForceProblem(points: readonly { forceN: number; broke?: boolean }[]): string | null {
  const unbroken = points.filter((p) => !p.broke && Number.isFinite(p.forceN));
  if (unbroken.length < 2 || new Set(unbroken.map((p) => p.forceN)).size >= 2) return null;
  const which = unbroken.length < points.length ? "every reading that did not break" : "every reading";
  return `${which} has the same force (${Number(unbroken[0].forceN.toPrecision(6))} N): change the load between readings, so that there are at least two different forces.`;
}

/** zod schema of the `POST /api/analysis` body (mode defaults to "bend", resolutionCm to 0.1). */
export const analysisRequestSchema = z
  .object({
    mode: z.enum(["bend", "stretch"], { error: 'mode must be "bend" or "stretch"' }).default("bend"),
    unloadedCm: finite("unloadedCm").optional(),
    resolutionCm: finite("resolutionCm").positive({ error: "resolutionCm must be above 0" }).default(0.1),
    points: z
      .array(pointSchema, { error: "points must be a list" })
      .min(MIN_POINTS, { error: `give at least ${MIN_POINTS} points` })
      .max(MAX_POINTS, { error: `give at most ${MAX_POINTS} points` }),
  }, { error: 'the body must be a JSON object with a list of points, such as {"points": [{"forceN": 1, "deformationCm": 0.4}, …]}' })
  .superRefine((body, ctx) => {
    // A reading (loaded or return) means nothing without the unloaded reading to subtract.
    const needsUnloaded = body.points.some((p) => p.readingCm !== undefined || p.returnReadingCm !== undefined);
    if (needsUnloaded && body.unloadedCm === undefined) {
      ctx.addIssue({
        code: "custom",
        path: ["unloadedCm"],
        message: "unloadedCm is needed when a point gives readingCm or returnReadingCm",
      });
    }
    const oneForce = oneForceProblem(body.points);
    if (oneForce !== null) ctx.addIssue({ code: "custom", path: ["points"], message: oneForce });
  });

/** The body after validation, defaults filled in. */
export type AnalysisRequest = z.infer<typeof analysisRequestSchema>;

export type AnalysisRequestParse =
  | { ok: true; data: AnalysisRequest & AnalysisInput }
  | { ok: false; status: 400 | 413; errors: string[] };

function describePath(path: readonly PropertyKey[]): string {
  return path.map((part) => (typeof part === "number" ? `[${part}]` : `.${String(part)}`)).join("").replace(/^\./, "");
}

/**
 * Validate an already-decoded JSON body: ok with the data, or status 400/413 with problems in
 * plain words ("points[3].forceN: forceN must be 0 or more"). More than MAX_POINTS points is
 * answered 413 before anything else is checked.
 */
export function parseAnalysisRequest(body: unknown): AnalysisRequestParse {
  if (
    typeof body === "object" &&
    body !== null &&
    Array.isArray((body as { points?: unknown }).points) &&
    (body as { points: unknown[] }).points.length > MAX_POINTS
  ) {
    return { ok: false, status: 413, errors: [`points: give at most ${MAX_POINTS} points`] };
  }
  const result = analysisRequestSchema.safeParse(body);
  if (result.success) return { ok: true, data: result.data };
  const errors = result.error.issues.map((issue) => {
    const where = describePath(issue.path);
    return where ? `${where}: ${issue.message}` : issue.message;
  });
  return { ok: false, status: 400, errors };
}

/** Validate a raw request body text (JSON.parse included): like parseAnalysisRequest, with "not JSON" as a 400. */
export function parseAnalysisRequestText(text: string): AnalysisRequestParse {
  let body: unknown;
  try {
    body = JSON.parse(text);
  } catch {
    return { ok: false, status: 400, errors: ["the body is not valid JSON"] };
  }
  return parseAnalysisRequest(body);
}

/** The lesson's readings table as sent: the texts as typed, one entry per row in each column. */
export interface ReadingsForm {
  mode: Mode;
  resolutionCm: number;
  unloaded: string;
  forces: string[];
  readings: string[];
  returns: string[];
  broke: boolean[];
}

/** A cell of the lesson's readings table a problem is about: its row (counted from 1) and column, or the unloaded reading. */
export type ReadingsCell = { row: number; column: "force" | "reading" | "return" } | { row: null; column: "unloaded" };

export type ReadingsFormCheck =
  | { ok: true; data: AnalysisRequest & AnalysisInput & { points: ReadingPoint[]; unloadedCm: number } }
  | { ok: false; errors: string[]; cells: ReadingsCell[] };

const COLUMN_OF_FIELD = { forceN: "force", readingCm: "reading", returnReadingCm: "return" } as const;

/**
 * The lesson's readings table, checked in one round: every problem of every row at once — a cell
 * that is missing, not a number or in another unit, a reading no lab can give (checked on the rows
 * that could be read), one force throughout — sorted by row, then the same validation as
 * POST /api/analysis. Rows left entirely empty are skipped; a comma is a decimal comma. A refusal
 * also lists the cells its problems are about, so the table can mark them.
 */
export function checkReadingsForm(form: ReadingsForm): ReadingsFormCheck {
  const found: { row: number; problem: string }[] = [];
  const cells: ReadingsCell[] = [];
  const rows = form.forces
    .map((f, i) => ({ f: f.trim(), r: (form.readings[i] ?? "").trim(), back: (form.returns[i] ?? "").trim(), broke: form.broke[i] === true, row: i + 1 }))
    .filter((p) => p.f !== "" || p.r !== "" || p.back !== "");
  const read = (row: number, column: "force" | "reading" | "return", typed: string, what: string, unit: "N" | "cm", missing: string | null) => {
    if (typed === "") {
      if (missing !== null) {
        found.push({ row, problem: `Row ${row}: ${missing}` });
        cells.push({ row, column });
      }
      return undefined;
    }
    const cell = readCell(typed, unit, true);
    if (cell.ok) return cell.value;
    found.push({ row, problem: `Row ${row}: ${cellProblem(what, typed, unit, cell)}` });
    cells.push({ row, column });
    return undefined;
  };
  const parsed: { row: number; point: ReadingPoint }[] = [];
  for (const p of rows) {
    const force = read(p.row, "force", p.f, "force", "N", "the force is missing.");
    const reading = read(p.row, "reading", p.r, "reading", "cm", "the loaded reading is missing.");
    const back = read(p.row, "return", p.back, "reading after unloading", "cm", null);
    if (force === undefined || reading === undefined || (p.back !== "" && back === undefined)) continue;
    parsed.push({ row: p.row, point: { forceN: force, readingCm: reading, ...(back !== undefined ? { returnReadingCm: back } : {}), ...(p.broke ? { broke: true } : {}) } });
  }
  const unloaded = form.unloaded.trim() === "" ? undefined : readCell(form.unloaded, "cm", true);
  const unloadedCm = unloaded?.ok ? unloaded.value : undefined;
  const general: string[] = [];
  if (unloaded === undefined || !unloaded.ok) {
    general.push(unloaded?.unit !== undefined || unloaded?.tooLong ? asSentence(cellProblem("unloaded reading", form.unloaded.trim(), "cm", unloaded)) : "The unloaded reading must be a number in cm.");
    cells.push({ row: null, column: "unloaded" });
  }
  if (rows.length < 2) general.push("Enter at least two rows of readings.");
  // The rows that could be read are checked now too, so nothing waits for a second round.
  const body = { mode: form.mode, unloadedCm, resolutionCm: form.resolutionCm, points: parsed.map((p) => p.point) };
  for (const i of implausibleReadings(body)) {
    if (i.point === null) {
      general.push(asSentence(i.problem));
      cells.push({ row: null, column: "unloaded" });
    } else {
      found.push({ row: parsed[i.point].row, problem: `Row ${parsed[i.point].row}: ${i.problem}` });
      cells.push({ row: parsed[i.point].row, column: i.field === "forceN" ? "force" : "reading" });
    }
  }
  // Only when every row could be read: a row left out might be the one with another force.
  const oneForce = parsed.length === rows.length ? oneForceProblem(body.points) : null;
  if (oneForce !== null) general.push(asSentence(oneForce));
  // Array.prototype.sort is stable: problems of one row keep their column order.
  const errors = [...found.sort((a, b) => a.row - b.row).map((f) => f.problem), ...general];
  if (errors.length > 0) return { ok: false, errors: [...new Set(errors)], cells };
  const checked = parseAnalysisRequest(body);
  if (!checked.ok) {
    // "points[2].forceN: …" → "Row 3, forceN: …", the row as the student counts it.
    const rowOf = (i: string) => parsed[Number(i)]?.row ?? Number(i) + 1;
    for (const e of checked.errors) {
      const at = /^points\[(\d+)\]\.(forceN|readingCm|returnReadingCm)/.exec(e);
      if (at) cells.push({ row: rowOf(at[1]), column: COLUMN_OF_FIELD[at[2] as keyof typeof COLUMN_OF_FIELD] });
    }
    return { ok: false, errors: checked.errors.map((e) => e.replace(/points\[(\d+)\]\.?/, (_m, i) => `Row ${rowOf(i)}, `)), cells };
  }
  return { ok: true, data: { ...checked.data, points: body.points, unloadedCm: unloadedCm as number } };
}
