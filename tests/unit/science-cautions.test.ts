/**
 * Cautions on readings (app/lib/science.ts, section 11): a reading that looks like a slipped decimal
 * point or digit, and a force that goes back down in a list of loading steps. The rule is our own
 * (common practice, no source); these tests pin what it must and must not flag. The readings here are
 * invented, except those read from the lessons' own (invented) data sets.
 */
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { analyseReadings, cautionWords, type AnalysisInput, type Mode } from "../../app/lib/science";

/** A ruler bending under water, 100 mL (0.98 N) at a time: heights 37.7 … 36.6 cm from 38.0 cm. */
const heights = [37.7, 37.5, 37.2, 36.9, 36.6];
const series = (readings: number[], unloadedCm = 38.0, mode: Mode = "bend"): AnalysisInput => ({
  mode,
  unloadedCm,
  resolutionCm: 0.1,
  points: readings.map((readingCm, i) => ({ forceN: Number((0.98 * (i + 1)).toFixed(2)), readingCm })),
});
const cautionsOf = (input: AnalysisInput) => analyseReadings(input).cautions;

describe("a reading far from the others", () => {
  it("3.69 typed for 36.9 is named, with the value as typed; the analysis still uses it", () => {
    const input = series([37.7, 37.5, 37.2, 3.69, 36.6]);
    const result = analyseReadings(input);
    expect(result.cautions).toHaveLength(1);
    const [caution] = result.cautions;
    expect(caution).toMatchObject({ kind: "far-from-others", point: 3, valueCm: 3.69 });
    expect(cautionWords(caution, "Row 4", 0.1)).toBe("Row 4 (3.69 cm) is far from the other readings: was it typed right?");
    expect(caution.message).toBe("points[3] (3.69 cm) is far from the other readings: was it typed right?");
    // A caution, not a refusal: the slip is still in the fit (which is why the R² is poor).
    expect(result.points[3].deformationCm).toBeCloseTo(34.31, 9);
    expect(result.fit.throughOrigin.r2!).toBeLessThan(0.5);
  });

  it("a slipped tens digit (26.9 for 36.9) and a decimal slip the other way (in a stretch) are named too", () => {
    expect(cautionsOf(series([37.7, 37.5, 37.2, 26.9, 36.6])).map((c) => c.point)).toEqual([3]);
    // A rubber band 9.0 cm long, stretching about 1 cm per step; 110 typed for 11.0.
    expect(cautionsOf(series([10.1, 110, 12.0, 13.1], 9.0, "stretch")).map((c) => c.point)).toEqual([1]);
  });

  it("a slipped unloaded reading is named as the unloaded reading (point null)", () => {
    const [caution] = cautionsOf(series([9.5, 10.1, 10.6, 11.2], 0.9, "stretch"));
    expect(caution).toMatchObject({ kind: "far-from-others", point: null, valueCm: 0.9 });
    expect(cautionWords(caution, "The unloaded length", 0.1)).toBe("The unloaded length (0.9 cm) is far from the other readings: was it typed right?");
  });

  it("ordinary scatter of a ruler step or two raises no caution", () => {
    expect(cautionsOf(series(heights))).toEqual([]);
    expect(cautionsOf(series([37.8, 37.4, 37.3, 36.8, 36.7]))).toEqual([]);
    // Readings on a line with every reading off by up to two ruler steps, many times over.
    fc.assert(
      fc.property(
        fc.double({ min: 0.05, max: 3, noNaN: true }),
        fc.array(fc.integer({ min: -2, max: 2 }), { minLength: 3, maxLength: 12 }),
        (perStep, offsets) => {
          const readings = offsets.map((o, i) => Number((30 - perStep * (i + 1) + 0.1 * o).toFixed(1)));
          expect(cautionsOf(series(readings, 30.0))).toEqual([]);
        },
      ),
      { numRuns: 300, seed: 7 },
    );
  });

  it("a series that curves past its elastic limit is not called mistyped; a broken point is left out", () => {
    // Lesson 5's balsa strip: 0.5 cm a newton, then faster, then broke at 8 N with a wild reading.
    const balsa: AnalysisInput = {
      mode: "bend",
      unloadedCm: 20.0,
      resolutionCm: 0.1,
      points: [19.5, 19.0, 18.5, 18.0, 17.4, 16.7, 15.8, 2.0].map((readingCm, i) => ({ forceN: i + 1, readingCm, ...(i === 7 ? { broke: true } : {}) })),
    };
    expect(cautionsOf(balsa)).toEqual([]);
  });

  it("no lesson's data set raises a caution (each read as its lesson's chart reads it)", () => {
    const root = join(__dirname, "../../lessons");
    let checked = 0;
    for (const lesson of readdirSync(root)) {
      const mdx = readFileSync(join(root, lesson, "index.mdx"), "utf8");
      const files = new Map([...mdx.matchAll(/import (\w+) from "\.\/([\w-]+\.csv)"/g)].map((m) => [m[1], m[2]]));
      for (const chart of mdx.matchAll(/<ForceChart csv=\{(\w+)\} mode="(bend|stretch)" unloadedCm=\{([\d.]+)\}/g)) {
        const file = files.get(chart[1])!;
        const [header, ...lines] = readFileSync(join(root, lesson, file), "utf8").trim().split(/\r?\n/);
        const columns = header.split(",");
        const rows = lines.map((l) => Object.fromEntries(l.split(",").map((v, i) => [columns[i], v])));
        const points = rows.map((r) => ({ forceN: Number(r.forceN), readingCm: Number(r.readingCm), ...(r.broke === "true" ? { broke: true } : {}) }));
        const input: AnalysisInput = { mode: chart[2] as Mode, unloadedCm: Number(chart[3]), resolutionCm: 0.1, points };
        expect({ file, cautions: analyseReadings(input).cautions }).toEqual({ file, cautions: [] });
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(10);
  });

  it("too few readings to judge (fewer than three others) gives no caution", () => {
    expect(cautionsOf(series([37.7, 3.75]))).toEqual([]);
  });
});

describe("a force that goes back down", () => {
  it("is named once, at the first step whose force is lower, in both modes", () => {
    for (const mode of ["bend", "stretch"] as const) {
      const unloadedCm = mode === "bend" ? 20.0 : 9.0;
      const sign = mode === "bend" ? -1 : 1;
      const forces = [1, 2, 3, 2, 1];
      const input: AnalysisInput = {
        mode,
        unloadedCm,
        resolutionCm: 0.1,
        points: forces.map((forceN) => ({ forceN, readingCm: Number((unloadedCm + sign * 0.4 * forceN).toFixed(1)) })),
      };
      const cautions = cautionsOf(input);
      expect(cautions).toHaveLength(1);
      expect(cautions[0]).toMatchObject({ kind: "force-went-down", point: 3, fromN: 3, toN: 2 });
      expect(cautionWords(cautions[0], "Line 5", 0.1)).toMatch(/^Line 5: the force goes down, from 3 N to 2 N\. .*as the reading after unloading\.$/);
    }
  });

  it("a force that stays the same or goes up raises nothing", () => {
    const input: AnalysisInput = { mode: "bend", unloadedCm: 20, resolutionCm: 0.1, points: [1, 1, 2, 3].map((forceN) => ({ forceN, readingCm: 20 - 0.4 * forceN })) };
    expect(cautionsOf(input)).toEqual([]);
  });
});
