/**
 * Property tests of app/lib/science.ts on random data (fast-check), with simple-statistics as an
 * independent reference for least squares. Seeds are fixed so a failure can be replayed.
 */
import fc from "fast-check";
import { linearRegression, linearRegressionLine, rSquared, sum } from "simple-statistics";
import { describe, expect, it } from "vitest";
import { parseAnalysisRequest } from "../../app/lib/analysis-request";
import { analyseReadings, fitThroughOrigin, fitWithIntercept, type ForceDeformation } from "../../app/lib/science";

const RUNS = { numRuns: 300, seed: 20240611 };

/** Deformations (cm, to 0.01) and forces (N, to 0.01) in classroom ranges, with at least two different deformations. */
const readings = fc
  .array(
    fc.record({
      deformationCm: fc.integer({ min: -500, max: 5000 }).map((i) => i / 100),
      forceN: fc.integer({ min: 0, max: 2000 }).map((i) => i / 100),
    }),
    { minLength: 3, maxLength: 60 },
  )
  .filter((pts) => new Set(pts.map((p) => p.deformationCm)).size >= 2);

/** |a − b| ≤ 1e-9 × (|b| + scale): relative agreement, with a floor for values near zero. */
function close(a: number | null, b: number, scale: number): boolean {
  return a !== null && Math.abs(a - b) <= 1e-9 * (Math.abs(b) + scale);
}

describe("least squares agrees with simple-statistics (independent reference) on random data", () => {
  it("with a free intercept: slope, intercept and centred R² match linearRegression / rSquared", () => {
    fc.assert(
      fc.property(readings, (pts) => {
        const data = pts.map((p) => [p.deformationCm, p.forceN]);
        const ref = linearRegression(data);
        const fit = fitWithIntercept(pts);
        const scale = Math.max(1, ...pts.map((p) => Math.abs(p.forceN)));
        expect(close(fit.slope, ref.m, scale)).toBe(true);
        expect(close(fit.intercept, ref.b, scale)).toBe(true);
        if (new Set(pts.map((p) => p.forceN)).size >= 2) {
          expect(close(fit.r2, rSquared(data, linearRegressionLine(ref)), 1)).toBe(true);
        }
        // residual SD on n − 2 degrees of freedom, residuals taken from the reference line
        const line = linearRegressionLine(ref);
        const rss = sum(pts.map((p) => (p.forceN - line(p.deformationCm)) ** 2));
        expect(close(fit.residualSD, Math.sqrt(rss / (pts.length - 2)), scale)).toBe(true);
      }),
      RUNS,
    );
  });

  it("through the origin: equals the free-intercept fit of the data mirrored through the origin", () => {
    // Adding (−x, −y) for every (x, y) puts both means at 0, so the ordinary least-squares line of
    // the mirrored set passes through the origin with slope Σxy/Σx², and its centred R² equals
    // the uncentred R² of the original data: a reference computed by simple-statistics alone.
    fc.assert(
      fc.property(readings, (pts) => {
        const mirrored = pts.flatMap((p) => [
          [p.deformationCm, p.forceN],
          [-p.deformationCm, -p.forceN],
        ]);
        const ref = linearRegression(mirrored);
        const fit = fitThroughOrigin(pts);
        const scale = Math.max(1, ...pts.map((p) => Math.abs(p.forceN)));
        expect(Math.abs(ref.b)).toBeLessThanOrEqual(1e-9 * scale);
        expect(close(fit.slope, ref.m, scale)).toBe(true);
        if (pts.some((p) => p.forceN !== 0)) {
          expect(close(fit.r2, rSquared(mirrored, linearRegressionLine(ref)), 1)).toBe(true);
        }
      }),
      RUNS,
    );
  });

  it("scaling forces by c scales both slopes and their standard errors by c and leaves R² alone", () => {
    fc.assert(
      fc.property(readings, fc.integer({ min: 2, max: 50 }), (pts, c) => {
        const scaled: ForceDeformation[] = pts.map((p) => ({ ...p, forceN: p.forceN * c }));
        const a = fitWithIntercept(pts);
        const b = fitWithIntercept(scaled);
        const scale = c * Math.max(1, ...pts.map((p) => Math.abs(p.forceN)));
        expect(close(b.slope, (a.slope as number) * c, scale)).toBe(true);
        if (a.slopeSE !== null) expect(close(b.slopeSE, a.slopeSE * c, scale)).toBe(true);
        if (a.r2 !== null) expect(close(b.r2, a.r2, 1)).toBe(true);
      }),
      RUNS,
    );
  });
});

// ─────────────── analyseReadings: never throws, never NaN ───────────────

const anyFinite = fc.double({ noNaN: true, noDefaultInfinity: true });
const classroom = fc.double({ min: -100, max: 100, noNaN: true });

/** Random bodies that pass analysisRequestSchema: classroom-sized numbers, and any finite double. */
function bodies(num: fc.Arbitrary<number>) {
  const point = fc
    .record(
      {
        forceN: num.map(Math.abs),
        readingCm: num,
        deformationCm: num,
        returnReadingCm: num,
        broke: fc.boolean(),
      },
      { requiredKeys: ["forceN"] },
    )
    .filter((p) => p.readingCm !== undefined || p.deformationCm !== undefined);
  return fc.record({
    mode: fc.constantFrom("bend" as const, "stretch" as const),
    unloadedCm: num,
    resolutionCm: fc.double({ min: 1e-6, max: 10, noNaN: true }),
    points: fc.array(point, { minLength: 2, maxLength: 40 }),
  }).filter((body) => {
    // The schema refuses one force throughout (every unbroken point at the same force).
    const unbroken = body.points.filter((p) => !p.broke);
    return unbroken.length < 2 || new Set(unbroken.map((p) => p.forceN)).size >= 2;
  });
}

function allFinite(v: unknown): boolean {
  if (typeof v === "number") return Number.isFinite(v);
  if (Array.isArray(v)) return v.every(allFinite);
  if (v && typeof v === "object") return Object.values(v).every(allFinite);
  return true;
}

describe("analyseReadings on random valid input", () => {
  for (const [label, num] of [
    ["classroom-sized numbers", classroom],
    ["any finite doubles (overflow, tiny values, −0)", anyFinite],
  ] as const) {
    it(`never throws and never yields NaN or Infinity: ${label}`, () => {
      fc.assert(
        fc.property(bodies(num), (body) => {
          const parsed = parseAnalysisRequest(body);
          expect(parsed.ok).toBe(true);
          if (!parsed.ok) return;
          const result = analyseReadings(parsed.data);
          expect(allFinite(result)).toBe(true);
          expect(result.points).toHaveLength(body.points.length);
          expect(typeof result.proportional).toBe("boolean");
          expect(result.notes.every((n) => typeof n === "string" && n.length > 0 && !n.includes("NaN"))).toBe(true);
          // The answer survives JSON unchanged (JSON would turn NaN/Infinity into null).
          expect(JSON.parse(JSON.stringify(result))).toEqual(result);
        }),
        { numRuns: 400, seed: 77 },
      );
    });
  }

  it("breaking load is the first broke force, and broke points never change the fits", () => {
    fc.assert(
      fc.property(bodies(classroom), (body) => {
        const parsed = parseAnalysisRequest(body);
        if (!parsed.ok) return;
        const result = analyseReadings(parsed.data);
        const firstBroke = parsed.data.points.find((p) => p.broke);
        expect(result.breakingLoadN).toBe(firstBroke ? firstBroke.forceN : null);
        const withoutBroke = analyseReadings({ ...parsed.data, points: parsed.data.points.filter((p) => !p.broke) });
        if (parsed.data.points.filter((p) => !p.broke).length >= 2) {
          expect(withoutBroke.fit).toEqual(result.fit);
        }
      }),
      { numRuns: 300, seed: 5 },
    );
  });
});
