// The student's written answer, rendered as the server does: the review (rubric levels and comment)
// and the count of characters left near each part's limit.
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { createRoutesStub } from "react-router";
import { describe, expect, it } from "vitest";
import { WrittenAnswer } from "~/components/lesson/written-answer";
import { LessonContext, type LessonContextValue } from "~/components/lesson/lesson-context";
import type { LessonState } from "~/lib/course.server";

type Saved = LessonState["writtenAnswers"][string];

function render(saved: Partial<Saved>, reader: "teacher" | "parent" = "teacher"): string {
  const state = { writtenAnswers: { cer: { claim: "", evidence: "", reasoning: "", handedIn: true, reviewComment: null, reviewScores: null, ...saved } } } as unknown as LessonState;
  const value: LessonContextValue = { slug: "02-force-and-deformation", canAnswer: true, asAdult: false, reader, state };
  const Stub = createRoutesStub([{ path: "/", Component: () => createElement(LessonContext.Provider, { value }, createElement(WrittenAnswer, { id: "cer", prompt: "Is it the same?" })) }]);
  return renderToStaticMarkup(createElement(Stub, { initialEntries: ["/"] }))
    .replace(/<[^>]+>/g, " ")
    .replace(/&#x27;/g, "'")
    .replace(/\s+/g, " ");
}

describe("a written answer's review", () => {
  it("shows the rubric's level of each part and the total, with the comment", () => {
    const text = render({ reviewScores: { claim: 2, evidence: 1, reasoning: 0 }, reviewComment: "Give the numbers with units." });
    expect(text).toContain("Your teacher's review");
    expect(text).toContain("Claim: A clear, precise answer to the question (2 of 2)");
    expect(text).toContain("Evidence: Some data, not all of it fits (1 of 2)");
    expect(text).toContain("Reasoning: No link to the science (0 of 2)");
    expect(text).toContain("In all: 3 of 6");
    expect(text).toContain("Give the numbers with units.");
  });

  it("shows scores without a comment, and nothing before a review", () => {
    const scoresOnly = render({ reviewScores: { claim: 1, evidence: 1, reasoning: 1 } }, "parent");
    expect(scoresOnly).toContain("Your parent's review");
    expect(scoresOnly).toContain("In all: 3 of 6");
    expect(render({})).not.toContain("review");
  });
});

describe("a written answer's length", () => {
  it("says how many characters are left near the limit, and when a part is full", () => {
    expect(render({ reasoning: "x".repeat(3000) })).not.toContain("characters left");
    expect(render({ reasoning: "x".repeat(3900) })).toContain("100 of 4,000 characters left.");
    expect(render({ reasoning: "x".repeat(4000) })).toContain("This part is full: 4,000 characters at most.");
  });
});
