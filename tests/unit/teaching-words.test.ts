/**
 * Unit tests of app/lib/teaching/words.ts: how teachers and parents read a student's tries.
 * Answers are invented.
 */
import { describe, expect, it } from "vitest";
import { triesAsRead } from "../../app/lib/teaching/words";

const attempt = (id: string, rawAnswer: string, outcome: string, extra: { correct?: number; slipCode?: string | null } = {}) => ({
  id,
  rawAnswer,
  outcome,
  correct: extra.correct ?? 0,
  slipCode: extra.slipCode ?? null,
  at: `at ${id}`,
});

describe("a student's tries as teachers and parents read them", () => {
  it("numbers only the tries that counted; an answer that could not be read says it used no try", () => {
    const read = triesAsRead([
      attempt("a", "5 cm", "incorrect", { slipCode: "unit-factor-10" }),
      attempt("b", "five newtons", "unreadable"),
      attempt("c", "0.5 cm", "correct", { correct: 1 }),
    ]);
    expect(read.map((t) => t.label)).toEqual(["Try 1", "Not counted", "Try 2"]);
    expect(read.map((t) => t.what)).toEqual(["Off by a factor of 10 (the decimal point or a unit)", "Could not be read (no try used)", "right"]);
    expect(read[2]).toMatchObject({ right: true, answer: "0.5 cm", at: "at c" });
  });

  it("shows a choice as the option the student saw", () => {
    const [read] = triesAsRead([attempt("a", JSON.stringify({ choice: "same", reason: "ratios match" }), "correct", { correct: 1 })], new Map([["same", "About the same for all three"]]));
    expect(read.answer).toBe("About the same for all three — “ratios match”");
  });
});
