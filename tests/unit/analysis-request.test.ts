/**
 * Unit tests of app/lib/analysis-request.ts: the body of POST /api/analysis is checked, bad input
 * gets 400 with a list of what is wrong, too many points gets 413, and nothing ever throws.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { MAX_POINTS, analysisRequestSchema, parseAnalysisRequest, parseAnalysisRequestText } from "../../app/lib/analysis-request";
import { analyseReadings } from "../../app/lib/science";

const twoPoints = [
  { forceN: 1, deformationCm: 0.5 },
  { forceN: 2, deformationCm: 1.0 },
];

describe("analysisRequestSchema / parseAnalysisRequest", () => {
  it("fills the defaults: mode bend, resolution 0.1 cm", () => {
    const r = parseAnalysisRequest({ points: twoPoints });
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(r.data.mode).toBe("bend");
      expect(r.data.resolutionCm).toBe(0.1);
      expect(analyseReadings(r.data).fit.throughOrigin.slope).toBeCloseTo(2, 12);
    }
  });

  it("accepts readings with an unloaded reading, and stretch mode", () => {
    const r = parseAnalysisRequest({
      mode: "stretch",
      unloadedCm: 10,
      resolutionCm: 0.25,
      points: [
        { forceN: 0, readingCm: 10 },
        { forceN: 1, readingCm: 10.5, returnReadingCm: 10 },
        { forceN: 2, readingCm: 11, broke: true },
      ],
    });
    expect(r.ok).toBe(true);
  });

  const bad: [string, unknown, RegExp][] = [
    ["not an object", "points", /expected object/],
    ["null", null, /expected object/],
    ["one point", { points: [twoPoints[0]] }, /^points: give at least 2 points/],
    ["no points", {}, /^points: points must be a list/],
    ["negative force", { points: [{ forceN: -1, deformationCm: 1 }, twoPoints[1]] }, /^points\[0\]\.forceN: forceN must be 0 or more/],
    ["NaN", { points: [{ forceN: Number.NaN, deformationCm: 1 }, twoPoints[1]] }, /^points\[0\]\.forceN: forceN must be a finite number/],
    ["Infinity", { points: [twoPoints[0], { forceN: 1, deformationCm: Number.POSITIVE_INFINITY }] }, /^points\[1\]\.deformationCm/],
    ["a number as text", { points: [{ forceN: "1", deformationCm: 1 }, twoPoints[1]] }, /^points\[0\]\.forceN/],
    ["neither reading nor deformation", { points: [{ forceN: 1 }, twoPoints[1]] }, /^points\[0\]: each point needs readingCm or deformationCm/],
    ["a reading without the unloaded reading", { points: [{ forceN: 1, readingCm: 20 }, twoPoints[1]] }, /^unloadedCm: unloadedCm is needed/],
    ["a return reading without the unloaded reading", { points: [{ forceN: 1, deformationCm: 1, returnReadingCm: 20 }, twoPoints[1]] }, /^unloadedCm/],
    ["resolution 0", { resolutionCm: 0, points: twoPoints }, /^resolutionCm: resolutionCm must be above 0/],
    ["an unknown mode", { mode: "twist", points: twoPoints }, /^mode: mode must be "bend" or "stretch"/],
    ["broke as text", { points: [{ forceN: 1, deformationCm: 1, broke: "yes" }, twoPoints[1]] }, /^points\[0\]\.broke/],
  ];
  it.each(bad)("%s → 400 with the problem named", (_label, body, message) => {
    const r = parseAnalysisRequest(body);
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.status).toBe(400);
      expect(r.errors.some((e) => message.test(e))).toBe(true);
    }
  });

  it("lists every problem, not just the first", () => {
    const r = parseAnalysisRequest({ resolutionCm: -1, points: [{ forceN: -1, deformationCm: 1 }, { forceN: 1 }] });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors.length).toBeGreaterThanOrEqual(3);
  });

  it(`more than ${MAX_POINTS} points → 413; exactly ${MAX_POINTS} is fine`, () => {
    const many = (n: number) => Array.from({ length: n }, (_, i) => ({ forceN: i, deformationCm: i / 2 }));
    const over = parseAnalysisRequest({ points: many(MAX_POINTS + 1) });
    expect(over.ok).toBe(false);
    if (!over.ok) expect(over.status).toBe(413);
    expect(parseAnalysisRequest({ points: many(MAX_POINTS) }).ok).toBe(true);
    // the schema alone also refuses it, for callers that use it directly
    expect(analysisRequestSchema.safeParse({ points: many(MAX_POINTS + 1) }).success).toBe(false);
  });

  it("text that is not JSON → 400", () => {
    const r = parseAnalysisRequestText("{ points: ");
    expect(r).toEqual({ ok: false, status: 400, errors: ["the body is not valid JSON"] });
    expect(parseAnalysisRequestText(JSON.stringify({ points: twoPoints })).ok).toBe(true);
  });

  it("never throws on fuzzed bodies; a failure is always 400 or 413 with at least one problem", () => {
    fc.assert(
      fc.property(fc.oneof(fc.anything(), fc.jsonValue(), fc.record({ points: fc.array(fc.anything(), { maxLength: 5 }) })), (body) => {
        const r = parseAnalysisRequest(body);
        if (!r.ok) {
          expect([400, 413]).toContain(r.status);
          expect(r.errors.length).toBeGreaterThan(0);
        } else {
          expect(() => analyseReadings(r.data)).not.toThrow();
        }
      }),
      { numRuns: 1000, seed: 413 },
    );
    fc.assert(
      fc.property(fc.string({ unit: "binary", maxLength: 200 }), (text) => {
        const r = parseAnalysisRequestText(text);
        expect(typeof r.ok).toBe("boolean");
      }),
      { numRuns: 500, seed: 414 },
    );
  });
});
