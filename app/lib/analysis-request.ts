/**
 * The request body of `POST /api/analysis`: a zod schema, and a parser that turns any body into
 * either the validated input for `analyseReadings` or a list of plain-words problems with the HTTP
 * status to answer (400, or 413 for too many points). Never throws.
 *
 * Units as in app/lib/science.ts: force in N, readings and deformations in cm.
 */
import { z } from "zod";
import type { AnalysisInput } from "./science";

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
  })
  .refine((p) => p.readingCm !== undefined || p.deformationCm !== undefined, {
    error: "each point needs readingCm or deformationCm",
  });

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
  })
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
