// /tools/analyse through its route action with real form posts: readings with one force throughout and
// readings whose commas could be read two ways are refused in words a student can act on; perfect
// readings come back without rounding residue. All readings are invented for the test.
import { describe, expect, it } from "vitest";
import { action } from "~/routes/tools.analyse";
import type { AnalysisResult } from "~/lib/science";
import { post, runRoute } from "./auth-helpers";

let address = 0;
/** Each request from its own client address, so the per-address limit never interferes. */
function analyse(fields: Record<string, string>) {
  const request = post("/tools/analyse", { mode: "bend", resolutionCm: "0.1", ...fields }, { headers: { "x-forwarded-for": `10.1.0.${++address}` } });
  return runRoute(action as never, request);
}
type Answer = { problems: string[]; analysis: AnalysisResult | null };

describe("/tools/analyse", () => {
  it("refuses one force on every line: the force has to change between readings", async () => {
    const result = await analyse({ secondColumn: "reading", unloadedCm: "25.0", readings: "3, 24.0\n3, 23.9\n3, 24.1" });
    expect(result.status).toBe(400);
    expect((result.body as Answer).problems).toEqual([
      "Every reading has the same force (3 N): change the load between readings, so that there are at least two different forces.",
    ]);
  });

  it("refuses “1, 2,5” lines instead of reading the 5 as a reading after unloading", async () => {
    const result = await analyse({ secondColumn: "deformation", unloadedCm: "", readings: "1, 2,5\n2, 5,0\n3, 7,5" });
    expect(result.status).toBe(400);
    const { problems, analysis } = result.body as Answer;
    expect(analysis).toBeNull();
    expect(problems.slice(0, 3).map((p) => p.slice(0, 7))).toEqual(["Line 1:", "Line 2:", "Line 3:"]);
    expect(problems[0]).toMatch(/Use a point for decimals \(1, 2\.5\), or put a semicolon between the columns \(1; 2,5\)/);
    expect(problems.join(" ")).not.toMatch(/permanent set|Every reading has the same force/);
  });

  it("reads decimal commas between semicolons and units after the numbers", async () => {
    const result = await analyse({ secondColumn: "deformation", unloadedCm: "", readings: "1 N; 2,5 cm\n2 N; 5,0 cm\n3 N; 7,5 cm" });
    expect(result.status).toBe(200);
    const { analysis } = result.body as Answer;
    expect(analysis!.points.map((p) => p.deformationCm)).toEqual([2.5, 5, 7.5]);
    expect(analysis!.points.every((p) => p.permanentSetCm === null)).toBe(true);
  });

  it("perfect readings: the fit carries no rounding residue", async () => {
    const result = await analyse({ secondColumn: "reading", unloadedCm: "25.0", readings: "0, 25.0\n1, 24.6\n2, 24.2\n3, 23.8" });
    const { analysis } = result.body as Answer;
    expect(analysis!.fit.withIntercept.intercept).toBe(0);
    expect(analysis!.fit.throughOrigin.slopeSE).toBe(0);
    expect(analysis!.notes.join(" ")).toMatch(/meets zero deformation at 0\.00 N/);
  });
});
