/**
 * Unit tests of app/lib/analysis-request.ts: the body of POST /api/analysis is checked, bad input
 * gets 400 with a list of what is wrong, too many points gets 413, and nothing ever throws.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  MAX_POINTS,
  analysisRequestSchema,
  checkReadingsForm,
  parseAnalysisRequest,
  parseAnalysisRequestText,
  type ReadingsForm,
} from "../../app/lib/analysis-request";
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
    ["not an object", "points", /^the body must be a JSON object with a list of points/],
    ["null", null, /^the body must be a JSON object with a list of points/],
    ["a point that is not an object", { points: [3, twoPoints[1]] }, /^points\[0\]: each point must be an object such as/],
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

  it("every problem is in our own words, never zod's defaults (fuzzed bodies)", () => {
    fc.assert(
      fc.property(fc.oneof(fc.anything(), fc.record({ mode: fc.anything(), unloadedCm: fc.anything(), resolutionCm: fc.anything(), points: fc.array(fc.anything(), { maxLength: 4 }) }, { requiredKeys: [] })), (body) => {
        const r = parseAnalysisRequest(body);
        if (!r.ok) for (const e of r.errors) expect(e).not.toMatch(/Invalid input|Too (big|small)|expected \w+, received|Unrecognized/);
      }),
      { numRuns: 1000, seed: 415 },
    );
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

describe("one force throughout is refused (invented readings: 3 N on every line)", () => {
  const threeN = { unloadedCm: 25.0, points: [24.0, 23.9, 24.1].map((r) => ({ forceN: 3, readingCm: r })) };

  it("400, naming the force and asking for at least two different forces", () => {
    const r = parseAnalysisRequest(threeN);
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.status).toBe(400);
      expect(r.errors).toContain(
        "points: every reading has the same force (3 N): change the load between readings, so that there are at least two different forces.",
      );
    }
  });

  it("counts only the points that did not break; a single unbroken point is left to the analysis", () => {
    const broke = parseAnalysisRequest({ points: [{ forceN: 3, deformationCm: 1 }, { forceN: 3, deformationCm: 1.1 }, { forceN: 5, deformationCm: 4, broke: true }] });
    expect(broke.ok).toBe(false);
    if (!broke.ok) expect(broke.errors.join(" ")).toMatch(/every reading that did not break has the same force \(3 N\)/);
    expect(parseAnalysisRequest({ points: [{ forceN: 1, deformationCm: 0.5 }, { forceN: 2, deformationCm: 3, broke: true }] }).ok).toBe(true);
    expect(parseAnalysisRequest({ points: [{ forceN: 0, deformationCm: 0 }, { forceN: 3, deformationCm: 1 }, { forceN: 3, deformationCm: 1.1 }] }).ok).toBe(true);
  });
});

describe("checkReadingsForm (the lesson's readings table)", () => {
  const form = (rows: [string, string, string?][], unloaded = "20.0"): ReadingsForm => ({
    mode: "bend",
    resolutionCm: 0.1,
    unloaded,
    forces: rows.map((r) => r[0]),
    readings: rows.map((r) => r[1]),
    returns: rows.map((r) => r[2] ?? ""),
    broke: rows.map(() => false),
  });

  it("accepts the column's own unit and a decimal comma", () => {
    const r = checkReadingsForm(form([["1 N", "19.5 cm"], ["2N", "19,0cm", "20,0 cm"], ["", ""]], "20.0 cm"));
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(r.data.unloadedCm).toBe(20);
      expect(r.data.points).toEqual([{ forceN: 1, readingCm: 19.5 }, { forceN: 2, readingCm: 19, returnReadingCm: 20 }]);
    }
  });

  it("names a wrong unit and the column's unit", () => {
    const r = checkReadingsForm(form([["3 kg", "19.5"], ["2", "19.5 mm"], ["3", "19", "0.2 m"]], "200 mm"));
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.errors).toEqual([
        "Row 1: the force “3 kg” is in kg, but forces are in N (newtons) here: read the spring scale in newtons (a 100 g mass weighs about 0.98 N).",
        "Row 2: the reading “19.5 mm” is in mm, but readings are in cm here: write it in cm (19.5 mm is 1.95 cm).",
        "Row 3: the reading after unloading “0.2 m” is in m, but readings are in cm here: write it in cm (0.2 m is 20 cm).",
        "The unloaded reading “200 mm” is in mm, but readings are in cm here: write it in cm (200 mm is 20 cm).",
      ]);
    }
  });

  it("reports every problem of every row in one round: unreadable cells and readings no lab can give together, by row", () => {
    const r = checkReadingsForm(form([["1", "19.6"], ["-2", "19.2"], ["abc", "19.0"], ["4", ""], ["500", "18.4"], ["6", "25"]], "20.0"));
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.errors).toEqual([
        "Row 2: the force cannot be below 0 N.",
        "Row 3: the force “abc” is not a number.",
        "Row 4: the loaded reading is missing.",
        "Row 5: 500 N is more than a classroom spring scale reads (most go up to 10–50 N). Check the reading.",
        "Row 6: the loaded reading 25.0 cm is above the unloaded reading 20.0 cm, but a bending piece moves down under a load. Check both readings.",
      ]);
    }
  });

  it("one force throughout is refused in the same words as POST /api/analysis", () => {
    const r = checkReadingsForm(form([["3", "24.0"], ["3", "23.9"], ["3", "24.1"]], "25.0"));
    expect(r).toEqual({
      ok: false,
      errors: ["Every reading has the same force (3 N): change the load between readings, so that there are at least two different forces."],
      cells: [],
    });
    // A row that could not be read may be the one with another force: not claimed then.
    expect(checkReadingsForm(form([["3", "24.0"], ["4 kg", "23.9"], ["3", "24.1"]], "25.0"))).toEqual({
      ok: false,
      errors: ["Row 2: the force “4 kg” is in kg, but forces are in N (newtons) here: read the spring scale in newtons (a 100 g mass weighs about 0.98 N)."],
      cells: [{ row: 2, column: "force" }],
    });
  });

  it("an empty table and a missing unloaded reading", () => {
    const r = checkReadingsForm(form([["", ""]], ""));
    expect(r).toEqual({
      ok: false,
      errors: ["The unloaded reading must be a number in cm.", "Enter at least two rows of readings."],
      cells: [{ row: null, column: "unloaded" }],
    });
  });

  it("names the cells its problems are about, so the table can mark them", () => {
    const r = checkReadingsForm(form([["1", "19.6"], ["2", "2O.5"], ["abc", "19.0", "x"], ["4", ""], ["500", "18.4"], ["6", "25"]], "20.0"));
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.errors[0]).toBe("Row 2: the reading “2O.5” is not a number.");
      expect(r.cells).toEqual([
        { row: 2, column: "reading" },
        { row: 3, column: "force" },
        { row: 3, column: "return" },
        { row: 4, column: "reading" },
        { row: 5, column: "force" },
        { row: 6, column: "reading" },
      ]);
    }
  });

  it("a number too long for a cell is called too long and quoted cut, in a row and in the unloaded reading", () => {
    const long = "1".repeat(400);
    const r = checkReadingsForm(form([["1", "19.6"], ["2", long]], long));
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.errors).toEqual([
        `Row 2: the reading “${"1".repeat(20)}…” is too long: write a number of at most 20 characters.`,
        `The unloaded reading “${"1".repeat(20)}…” is too long: write a number of at most 20 characters.`,
      ]);
    }
  });
});
