// readWholeNumber: a number typed into a form, digits only, in a range; nothing rounded or cut.
import { describe, expect, it } from "vitest";
import { classNameProblem, readWholeNumber, tidyClassName } from "~/lib/teaching/shared";

describe("readWholeNumber", () => {
  it("takes digits, with spaces, thin spaces or commas between groups of three", () => {
    expect(readWholeNumber("30", 1, 5000)).toEqual({ ok: true, value: 30 });
    expect(readWholeNumber(" 1 000 ", 1, 5000)).toEqual({ ok: true, value: 1000 });
    expect(readWholeNumber("1\u2009000", 1, 5000)).toEqual({ ok: true, value: 1000 });
    expect(readWholeNumber("5,000", 1, 5000)).toEqual({ ok: true, value: 5000 });
    expect(readWholeNumber("0", 0, 20)).toEqual({ ok: true, value: 0 });
  });

  it("refuses an empty field, anything but digits, and a number out of range, saying the range", () => {
    expect(readWholeNumber("", 0, 20)).toEqual({ ok: false, message: "Enter a whole number from 0 to 20." });
    expect(readWholeNumber("   ", 0, 20)).toEqual({ ok: false, message: "Enter a whole number from 0 to 20." });
    expect(readWholeNumber(undefined, 0, 20)).toEqual({ ok: false, message: "Enter a whole number from 0 to 20." });
    for (const typed of ["1e3", "2.5", "-5", "2,5", "12,34", "ten"]) {
      expect(readWholeNumber(typed, 1, 5000, "seats")).toEqual({ ok: false, message: "Use digits only: a whole number of seats from 1 to 5,000." });
    }
    for (const typed of ["0", "5001", "99999999999999999999"]) {
      expect(readWholeNumber(typed, 1, 5000, "seats")).toEqual({ ok: false, message: "That is outside the range: enter a whole number of seats from 1 to 5,000." });
    }
  });
});

describe("class names", () => {
  it("are kept trimmed with single spaces, and a long one is refused with its length", () => {
    expect(tidyClassName("  Grade 7 \t Science  A ")).toBe("Grade 7 Science A");
    expect(classNameProblem("   ", "Give the class a name.")).toBe("Give the class a name.");
    expect(classNameProblem("x".repeat(80), "")).toBeNull();
    expect(classNameProblem("x".repeat(81), "")).toBe("A class name can be at most 80 characters; this one has 81.");
  });
});
