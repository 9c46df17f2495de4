// A later passage held back until its prediction is committed, and the chart's axes, rendered as the
// server does.
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { chartAxis, ForceChart } from "~/components/lesson/force-chart";
import { LessonContext, type LessonContextValue } from "~/components/lesson/lesson-context";
import { AfterPrediction } from "~/components/lesson/prediction";
import type { LessonState } from "~/lib/course.server";

function render(predictions: Record<string, string>, who: { canAnswer: boolean; asAdult: boolean }): string {
  const state = { predictions } as unknown as LessonState;
  const value: LessonContextValue = { slug: "03-proportional-or-not", reader: "teacher", state, ...who };
  return renderToStaticMarkup(
    createElement(LessonContext.Provider, { value }, createElement(AfterPrediction, { id: "which-proportional", children: createElement("p", null, "Their data are linear but not proportional.") })),
  );
}

describe("a passage after a prediction", () => {
  const student = { canAnswer: true, asAdult: false };
  it("is held back from a student who has not committed the prediction, with a word on why", () => {
    const html = render({}, student);
    expect(html).not.toContain("linear but not proportional");
    expect(html).toContain("once you have committed your prediction above");
  });
  it("shows once the prediction is committed, and always to an adult or in a closed lesson", () => {
    expect(render({ "which-proportional": "balsa" }, student)).toContain("linear but not proportional");
    expect(render({}, { canAnswer: false, asAdult: true })).toContain("linear but not proportional");
    expect(render({}, { canAnswer: false, asAdult: false })).toContain("linear but not proportional");
  });
  it("is held back only by its own prediction", () => {
    expect(render({ "another-guess": "x" }, student)).not.toContain("linear but not proportional");
  });
});

// Round gridlines (steps of 1, 2, 2.5 or 5 times a power of ten, about five of them) ending at the first
// step past the data: common practice for charts, no source.
describe("a chart's axis", () => {
  it("ends at the first round step past the data, not at the next power of ten", () => {
    expect(chartAxis(5.25)).toEqual({ max: 6, ticks: [0, 2, 4, 6] });
    expect(chartAxis(8.4)).toEqual({ max: 10, ticks: [0, 2, 4, 6, 8, 10] });
    expect(chartAxis(1.26)).toEqual({ max: 1.5, ticks: [0, 0.5, 1, 1.5] });
  });
  it("ends exactly at a value on a step, and has a range when there is no data", () => {
    expect(chartAxis(4)).toEqual({ max: 4, ticks: [0, 1, 2, 3, 4] });
    expect(chartAxis(0).max).toBe(1);
  });
});

describe("a lesson chart whose lines use only the elastic range", () => {
  // Invented readings: straight (2 N/cm) up to 4 N, then softer, breaking at 6 N.
  const csv = "forceN,readingCm,broke\n1,19.5,false\n2,19.0,false\n3,18.5,false\n4,18.0,false\n5,17.0,false\n6,15.0,true";
  const slopeOf = (html: string) => Number(/through the origin: slope ([\d.]+) N\/cm/.exec(html)?.[1]);
  it("fits the lines to the loads up to that force, draws the later points hollow and says so", () => {
    const all = renderToStaticMarkup(createElement(ForceChart, { csv, mode: "bend", unloadedCm: 20, title: "Strip" }));
    const elastic = renderToStaticMarkup(createElement(ForceChart, { csv, mode: "bend", unloadedCm: 20, title: "Strip", linesUpToN: 4 }));
    expect(slopeOf(elastic)).toBeCloseTo(2, 6); // 1 N per 0.5 cm, exactly
    expect(slopeOf(all)).toBeLessThan(2);
    expect(elastic).toContain("Both lines use the loads up to 4 N; hollow points: the loads past it.");
    expect(elastic.match(/fill="#fff" stroke/g)).toHaveLength(1); // 5 N; 6 N broke and is the cross
  });
});
