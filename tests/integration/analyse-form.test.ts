// /tools/analyse, what the form says about bad fields and odd readings: every problem in the page's
// words and in line order, long text cut, "Ruler read to" kept to a ruler's range, and cautions (a
// slipped decimal point, a force that goes back down) named by line while the readings are still
// analysed. All readings are invented for the test.
import { describe, expect, it } from "vitest";
import { action } from "~/routes/tools.analyse";
import type { AnalysisResult } from "~/lib/science";
import { cautionWords } from "~/lib/science";
import { post, runRoute } from "./auth-helpers";

let address = 0;
function analyse(fields: Record<string, string>) {
  const request = post("/tools/analyse", { mode: "bend", resolutionCm: "0.1", secondColumn: "reading", ...fields }, { headers: { "x-forwarded-for": `10.2.0.${++address}` } });
  return runRoute(action as never, request);
}
type Answer = { problems: string[]; lines: number[]; analysis: AnalysisResult | null; values: Record<string, string> | null };

const heights = "force (N), loaded reading (cm)\n0.98, 37.7\n1.96, 37.5\n2.94, 37.2\n3.92, 36.9\n4.90, 36.6";

describe("/tools/analyse: bad fields", () => {
  it("an unloaded reading of 400 digits is named in the page's words, and what was typed comes back", async () => {
    const unloadedCm = "9".repeat(400);
    const result = await analyse({ unloadedCm, readings: heights });
    expect(result.status).toBe(400);
    const { problems, values } = result.body as Answer;
    expect(problems).toEqual(["The unloaded reading is too long: write it in at most 40 characters, such as 21.0."]);
    expect(values).toMatchObject({ unloadedCm, readings: heights });
  });

  it("an unknown mode or second column is named in the page's words, not zod's", async () => {
    const result = await analyse({ mode: "twist", secondColumn: "colour", unloadedCm: "38.0", readings: heights });
    expect((result.body as Answer).problems).toEqual([
      "Choose what happens to the piece: it bends or it stretches.",
      "Choose what the second column is: the ruler reading or the deformation.",
    ]);
  });

  it("a 5000-digit reading is called too long and quoted by its first 20 characters only", async () => {
    const result = await analyse({ unloadedCm: "38.0", readings: `${heights}\n5.88, ${"3".repeat(5000)}` });
    const { problems } = result.body as Answer;
    expect(problems).toEqual([`Line 7: the reading “${"3".repeat(20)}…” is too long: write a number of at most 20 characters.`]);
  });

  it("problems are listed in line order, whichever check found them", async () => {
    // Line 3's force is beyond any spring scale (found after reading), line 2's reading is no number (found while reading).
    const result = await analyse({ unloadedCm: "38.0", readings: "force, reading\n1, abc\n500, 37.2\n3, 36.9\n4, 3x" });
    expect((result.body as Answer).problems.map((p) => p.slice(0, 7))).toEqual(["Line 2:", "Line 3:", "Line 5:"]);
  });

  it("“Ruler read to” must be a ruler's step, 0.01 cm to 1 cm", async () => {
    for (const resolutionCm of ["100000", "0.001", "-1"]) {
      const result = await analyse({ unloadedCm: "38.0", resolutionCm, readings: heights });
      expect(result.status).toBe(400);
      const { problems } = result.body as Answer;
      expect(problems).toHaveLength(1);
      expect(problems[0]).toMatch(/^“Ruler read to” is .* cm, but it must be between 0\.01 cm and 1 cm: the smallest step you read on your ruler/);
    }
    for (const resolutionCm of ["0.01", "0.1", "0,5", "1"]) {
      expect((await analyse({ unloadedCm: "38.0", resolutionCm, readings: heights })).status).toBe(200);
    }
  });
});

describe("/tools/analyse: cautions, with the readings still analysed", () => {
  it("3.69 typed for 36.9 is named by its line, and the analysis is given", async () => {
    const result = await analyse({ unloadedCm: "38.0", readings: heights.replace("36.9", "3.69") });
    expect(result.status).toBe(200);
    const { analysis, lines } = result.body as Answer;
    expect(analysis!.points).toHaveLength(5);
    expect(analysis!.cautions).toHaveLength(1);
    const [caution] = analysis!.cautions;
    expect(cautionWords(caution, `Line ${lines[caution.point!]}`, 0.1)).toBe("Line 5 (3.69 cm) is far from the other readings: was it typed right?");
  });

  it("a force that goes back down partway is named by its line", async () => {
    const result = await analyse({ unloadedCm: "38.0", readings: "1, 37.6\n2, 37.2\n3, 36.8\n2, 37.2\n1, 37.6" });
    expect(result.status).toBe(200);
    const { analysis, lines } = result.body as Answer;
    expect(analysis!.cautions.map((c) => [c.kind, lines[c.point!]])).toEqual([["force-went-down", 4]]);
  });

  it("ordinary readings raise no caution", async () => {
    const result = await analyse({ unloadedCm: "38.0", readings: heights });
    expect((result.body as Answer).analysis!.cautions).toEqual([]);
  });
});
