/**
 * What the analysis displays show a student: the analyser's report (/tools/analyse) and the lesson's
 * readings analysis, rendered to HTML. Readings are invented for the test.
 */
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { AnalysisReport } from "../../app/components/analysis-report";
import { ReadingsAnalysis, readingText, rowsFrom } from "../../app/components/lesson/readings-entry";
import { analyseReadings, type AnalysisInput } from "../../app/lib/science";

/** The page's text, tags dropped, by data-testid. */
function byTestId(html: string, id: string): string {
  const match = new RegExp(`data-testid="${id}"[^>]*>(.*?)</(dd|p|div)>`, "s").exec(html);
  return (match?.[1] ?? "").replace(/<[^>]+>/g, "").replace(/<!-- -->/g, "");
}
const text = (html: string) => html.replace(/<[^>]+>/g, " ").replace(/\s+/g, " ");

// Exactly on F = 2.5 N/cm × deformation (0.4 cm per newton).
const perfect: AnalysisInput = {
  mode: "bend",
  unloadedCm: 25.0,
  resolutionCm: 0.1,
  points: [
    { forceN: 0, readingCm: 25.0 },
    { forceN: 1, readingCm: 24.6 },
    { forceN: 2, readingCm: 24.2 },
    { forceN: 3, readingCm: 23.8 },
  ],
};
// 100 g masses (0.98 N each), 0.2 cm each, and the strip came back after every load.
const lessonTable: AnalysisInput = {
  mode: "bend",
  unloadedCm: 20.0,
  resolutionCm: 0.1,
  points: [0.98, 1.96, 2.94, 3.92].map((f, i) => ({ forceN: f, readingCm: [19.8, 19.6, 19.4, 19.2][i], returnReadingCm: 20.0 })),
};

describe("the analyser's report", () => {
  const report = (input: AnalysisInput) => renderToStaticMarkup(createElement(AnalysisReport, { analysis: analyseReadings(input), resolutionCm: input.resolutionCm }));

  it("perfect readings show no rounding residue: ± 0.00 and an intercept of 0.00 N", () => {
    const html = report(perfect);
    expect(byTestId(html, "slope-through-origin")).toBe("2.50 N/cm (± 0.00)");
    expect(text(html)).toContain("intercept 0.00 N (± 0.00)");
    expect(text(html)).not.toMatch(/10\^-1\d|0\.0000000/);
  });

  it("deformations keep the ruler's decimals: 2.0, not 2", () => {
    const html = report({ mode: "bend", unloadedCm: 20.0, resolutionCm: 0.1, points: [{ forceN: 1, readingCm: 19.0 }, { forceN: 2, readingCm: 18.0 }] });
    expect(html).toMatch(/>1\.0<\/td>/);
    expect(html).toMatch(/>2\.0<\/td>/);
  });

  it("each R² says which it is, so the two are not read as rivals", () => {
    const html = report({ mode: "bend", resolutionCm: 0.1, points: [1, 2, 3, 4].map((f, i) => ({ forceN: f, deformationCm: [0.45, 0.8, 1.25, 1.6][i] })) });
    expect(text(html)).toContain("R² of the line through the origin");
    expect(byTestId(html, "r2-through-origin")).toMatch(/^0\.99\d+ \(1 − RSS ÷ ΣF², the R² the lessons use\)$/);
    expect(byTestId(html, "r2-with-intercept")).toMatch(/^0\.99\d+ \(measured around the average force, not around 0 N: it cannot be compared with the R² above\)$/);
    expect(text(html)).not.toContain("R² (through the origin)");
  });

  it("an elastic limit not reached reads as a lower bound", () => {
    expect(byTestId(report(lessonTable), "elastic-limit")).toBe("at least 3.92 N (it sprang back after every load)");
    const setAfter2 = { ...lessonTable, points: lessonTable.points.map((p, i) => ({ ...p, returnReadingCm: i < 2 ? 20.0 : 19.6 })) };
    expect(byTestId(report(setAfter2), "elastic-limit")).toBe("1.96 N");
  });
});

describe("the lesson's readings analysis", () => {
  const box = (input: AnalysisInput, stale = false) =>
    renderToStaticMarkup(createElement(ReadingsAnalysis, { analysis: analyseReadings(input), title: "Your readings", stale }));

  it("an intercept of 0.00 N, not 4.44 × 10^-16 N", () => {
    const html = text(box(lessonTable));
    expect(html).toContain("intercept 0.00 N");
    expect(html).not.toContain("10^-16");
  });

  it("an elastic limit not reached reads as a lower bound", () => {
    expect(byTestId(box(lessonTable), "elastic-limit")).toBe("at least 3.92 N (it sprang back after every load)");
  });

  it("after a failed save or with unsaved changes the box says it is about the last saved readings", () => {
    expect(text(box(lessonTable))).toContain("What your readings say");
    const stale = box(lessonTable, true);
    expect(text(stale)).toContain("From your last saved readings");
    expect(text(stale)).not.toContain("What your readings say");
    expect(byTestId(stale, "readings-analysis-stale")).toMatch(/worked out from the readings you last saved/);
  });

  it("names whose readings they are for a parent", () => {
    const html = text(renderToStaticMarkup(createElement(ReadingsAnalysis, { analysis: analyseReadings(lessonTable), title: "Juno's own readings", whose: "Juno's" })));
    expect(html.replace(/&#x27;/g, "'")).toContain("What Juno's readings say");
    expect(html).not.toMatch(/\byour\b/i);
  });

  it("saved readings show the ruler's decimals: 38.0 stays 38.0", () => {
    const rows = rowsFrom({
      readingsId: "r",
      mode: "bend",
      material: "",
      unloadedCm: 38,
      resolutionCm: 0.1,
      points: [{ forceN: 1, readingCm: 37.5, returnReadingCm: 38 }, { forceN: 2, readingCm: 37 }],
    });
    expect(rows.slice(0, 2)).toEqual([
      { forceN: "1", readingCm: "37.5", returnReadingCm: "38.0", broke: false },
      { forceN: "2", readingCm: "37.0", returnReadingCm: "", broke: false },
    ]);
    expect(rows).toHaveLength(6);
    // the unloaded reading's field
    expect(readingText(38, 0.1)).toBe("38.0");
  });
});

describe("cautions in both displays (a slipped decimal point: 3.69 typed for 36.9)", () => {
  const slipped: AnalysisInput = {
    mode: "bend",
    unloadedCm: 38.0,
    resolutionCm: 0.1,
    points: [37.7, 37.5, 37.2, 3.69, 36.6].map((readingCm, i) => ({ forceN: Number((0.98 * (i + 1)).toFixed(2)), readingCm })),
  };
  const ordinary: AnalysisInput = { ...slipped, points: slipped.points.map((p, i) => (i === 3 ? { ...p, readingCm: 36.9 } : p)) };

  it("the lesson's box names the row, and still shows the results", () => {
    const html = renderToStaticMarkup(createElement(ReadingsAnalysis, { analysis: analyseReadings(slipped), title: "Your readings", resolutionCm: 0.1 }));
    expect(html).toContain('data-testid="reading-cautions"');
    expect(text(html)).toContain("Row 4 (3.69 cm) is far from the other readings: was it typed right?");
    expect(byTestId(html, "stiffness-through-origin")).toMatch(/N\/cm$/);
  });

  it("the analyser's report names the line it was pasted on", () => {
    const lines = [2, 3, 4, 5, 6];
    const html = renderToStaticMarkup(
      createElement(AnalysisReport, { analysis: analyseReadings(slipped), resolutionCm: 0.1, placeOf: (p: number | null) => (p === null ? "The unloaded reading" : `Line ${lines[p]}`) }),
    );
    expect(html).toContain('data-testid="reading-cautions"');
    expect(text(html)).toContain("Line 5 (3.69 cm) is far from the other readings: was it typed right?");
  });

  it("the caution says what to do on each page: save in a lesson, analyse in the analyser, nothing for an adult reading a child's readings", () => {
    const lesson = text(renderToStaticMarkup(createElement(ReadingsAnalysis, { analysis: analyseReadings(slipped), title: "Your readings", resolutionCm: 0.1 })));
    expect(lesson).toContain("every figure after it: check it first, then save again.");
    const analyser = text(renderToStaticMarkup(createElement(AnalysisReport, { analysis: analyseReadings(slipped), resolutionCm: 0.1 })));
    expect(analyser).toContain("every figure after it: check it first, then analyse again.");
    expect(analyser).not.toMatch(/\bsave/i);
    const parent = text(renderToStaticMarkup(createElement(ReadingsAnalysis, { analysis: analyseReadings(slipped), title: "Juno's readings", whose: "Juno's" })));
    expect(parent).toContain("pulls the line and every figure after it.");
    expect(parent).not.toMatch(/save again|analyse again/);
  });

  it("ordinary readings show no caution box", () => {
    expect(renderToStaticMarkup(createElement(ReadingsAnalysis, { analysis: analyseReadings(ordinary), title: "Your readings" }))).not.toContain("reading-cautions");
    expect(renderToStaticMarkup(createElement(AnalysisReport, { analysis: analyseReadings(ordinary), resolutionCm: 0.1 }))).not.toContain("reading-cautions");
  });
});
