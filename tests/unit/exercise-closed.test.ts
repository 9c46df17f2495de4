// An exercise of a lesson closed at its due date, rendered as the server does: locked, no button,
// and its status says why (not "3 of 3 tries left").
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { createRoutesStub } from "react-router";
import { describe, expect, it } from "vitest";
import { Exercise } from "~/components/lesson/exercise";
import { LessonContext, type LessonContextValue } from "~/components/lesson/lesson-context";
import type { LessonState } from "~/lib/course.server";

const exercise = {
  id: "ex",
  kind: "number",
  title: "Stiffness of one reading",
  required: true,
  prompt: { prompt: "3 N bends a strip 1.2 cm. What is its stiffness?" },
  attemptsUsed: 0,
  attemptsAllowed: 3,
  status: "open",
  lastAnswer: null,
  lastFeedback: null,
  solution: null,
};

function render(canAnswer: boolean, asAdult: boolean): string {
  const state = { exercises: { ex: exercise } } as unknown as LessonState;
  const value: LessonContextValue = { slug: "02-force-and-deformation", canAnswer, asAdult, reader: "teacher", state };
  const Stub = createRoutesStub([{ path: "/", Component: () => createElement(LessonContext.Provider, { value }, createElement(Exercise, { id: "ex" })) }]);
  return renderToStaticMarkup(createElement(Stub, { initialEntries: ["/"] }));
}

describe("an exercise in a closed lesson", () => {
  it("is locked, has no button, and says it closed", () => {
    const html = render(false, false);
    expect(html).toContain("Closed at the due date");
    expect(html).toMatch(/<input[^>]*disabled/);
    expect(html).not.toContain("Check my answer");
    expect(html).not.toContain("as an adult");
  });
  it("still counts the tries while the lesson is open, and tells an adult nothing is saved", () => {
    expect(render(true, false)).toContain("3 of 3 tries left");
    expect(render(false, true)).toContain("You are looking at this lesson as an adult");
  });
});
