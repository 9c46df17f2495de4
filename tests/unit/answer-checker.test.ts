/**
 * Unit tests of app/lib/answer-checker.ts. Outside sources are named beside the tests that use
 * them; numbers marked "invented" are made up for the test.
 */
import { describe, expect, it } from "vitest";
import {
  DEFAULT_TOLERANCE,
  MAX_TYPED_LENGTH,
  SLIP_HINTS,
  checkAnswer,
  checkTableAnswers,
  tableCellNames,
  convertUnits,
  countSignificantFigures,
  describeKind,
  parseAnswer,
  roundToSignificantFigures,
  validateExpectedAnswer,
  type ExpectedAnswer,
} from "../../app/lib/answer-checker";
import { stiffnessNPerCm, weightN } from "../../app/lib/science";

/** The parsed value and unit, or the failure reason. */
function read(typed: string) {
  const r = parseAnswer(typed);
  return r.ok ? { value: r.answer.value, unit: r.answer.unit } : { reason: r.reason };
}

describe("must show (issue 4)", () => {
  it("typing `25 mm` where 2.5 cm is expected is correct", () => {
    const r = checkAnswer("25 mm", { value: 2.5, unit: "cm" });
    expect(r.outcome).toBe("correct");
    expect(r.parsed).toEqual({ value: 25, unit: "mm" });
  });

  it("`2.5` alone says the unit is missing", () => {
    const r = checkAnswer("2.5", { value: 2.5, unit: "cm" });
    expect(r.outcome).toBe("unit-missing");
    expect(r.message).toMatch(/unit/);
  });

  it("`21.5 cm` where the deformation is 0.5 cm and the loaded reading 21.5 cm names the loaded-reading slip", () => {
    const r = checkAnswer("21.5 cm", { value: 0.5, unit: "cm", context: { loadedReadingCm: 21.5 } });
    expect(r.outcome).toBe("incorrect");
    expect(r.slip?.code).toBe("loaded-reading-as-deformation");
    expect(r.slip?.hint).toBe(SLIP_HINTS["loaded-reading-as-deformation"]);
    expect(r.message).toContain(SLIP_HINTS["loaded-reading-as-deformation"]);
  });
});

describe("reading numbers in every usual form", () => {
  it.each([
    ["2.5", 2.5],
    [".5", 0.5],
    ["-3", -3],
    ["\u22123", -3], // the typographic minus sign
    ["+4", 4],
    ["5.", 5],
    ["6.53e4", 65300],
    ["6.53E4", 65300],
    ["6.53e-4", 6.53e-4],
    ["6.53 × 10^4", 65300],
    ["6.53x10^4", 65300],
    ["6.53X10^4", 65300],
    ["6.53*10^4", 65300],
    ["6.53*10**4", 65300],
    ["6.53·10⁴", 65300],
    ["6.53 × 10⁻⁴", 6.53e-4],
    ["6.53 × 10^(-4)", 6.53e-4],
    ["6.53 x 10 ^ 4", 65300],
    ["2,5", 2.5],
    [",5", 0.5],
    ["0,125", 0.125], // a leading 0 cannot be a digit group, so this is a decimal comma
    ["1234,5", 1234.5],
    ["65 300", 65300], // digits grouped with a space (NIST SP 811 §10.5.3)
    ["65\u2009300", 65300], // thin space
    ["65\u202F300", 65300], // narrow no-break space
    ["1 234 567,5", 1234567.5],
    ["1,234,567", 1234567],
    ["1,234.5", 1234.5],
    ["  2.5  ", 2.5],
  ])("%s → %d", (typed, value) => {
    const r = read(typed);
    expect(r).toHaveProperty("value");
    expect((r as { value: number }).value).toBeCloseTo(value, 12);
  });

  it("asks rather than guesses when a comma could group digits or mark decimals", () => {
    const r = parseAnswer("65,300 N/m");
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/65\.300 or 65300/);
    expect(parseAnswer("2,500").ok).toBe(false);
  });

  it.each(["", "   ", "abc", "cm 2.5", "2..5", "--5", "2 5", "1e99999", "6.53 × 10^(4", "5x10", "six"])(
    "%j is unreadable",
    (typed) => {
      expect(parseAnswer(typed).ok).toBe(false);
      expect(checkAnswer(typed, { value: 2.5, unit: "cm" }).outcome).toBe("unreadable");
    },
  );

  it(`refuses text over ${MAX_TYPED_LENGTH} characters, and anything that is not text`, () => {
    expect(checkAnswer(`2.5${" ".repeat(MAX_TYPED_LENGTH)}cm`, { value: 2.5, unit: "cm" }).outcome).toBe("unreadable");
    expect(checkAnswer(undefined as unknown as string, { value: 2.5, unit: "cm" }).outcome).toBe("unreadable");
    expect(checkAnswer(2.5 as unknown as string, { value: 2.5, unit: "cm" }).outcome).toBe("unreadable");
  });
});

describe("reading units", () => {
  it.each([
    ["2.5cm", 2.5, "cm"],
    ["2.5 cm", 2.5, "cm"],
    ["2.5\u00A0cm", 2.5, "cm"],
    ["2.5 cm.", 2.5, "cm"],
    ["25mm", 25, "mm"],
    ["0.025 m", 0.025, "m"],
    ["3 N", 3, "N"],
    ["3 newtons", 3, "N"],
    ["3 Newton", 3, "N"],
    ["0.3 kN", 0.3, "kN"],
    ["5 N/cm", 5, "N/cm"],
    ["5 N / cm", 5, "N/cm"],
    ["5 N per cm", 5, "N/cm"],
    ["5 newtons per centimetre", 5, "N/cm"],
    ["5 newtons per centimeter", 5, "N/cm"],
    ["500 N/m", 500, "N/m"],
    ["0.5 N/mm", 0.5, "N/mm"],
    ["6.53 × 10^4 N/m", 65300, "N/m"],
    ["6.53e4N/m", 65300, "N/m"],
    ["0.5 kg", 0.5, "kg"],
    ["500 g", 500, "g"],
    ["500 grams", 500, "g"],
    ["2 N·cm", 2, "N*cm"],
    ["2 N cm", 2, "N*cm"],
    ["0.2 cm/N", 0.2, "cm/N"],
    ["12.5 GPa", 12.5, "GPa"],
    ["4.9 × 10^-10 m⁴", 4.9e-10, "m^4"],
    ["3 KG", 3, "kg"], // wrong case, but no other unit in the course could be meant
    ["3 x", 3, null], // "3 times" as stiff
    ["3 times", 3, null],
    // A phone keyboard has no ² or · key: a digit straight after a length is its power, and a force
    // and a length typed together ("Nm") are their product.
    ["6.25 cm2", 6.25, "cm^2"],
    ["0.04 m2", 0.04, "m^2"],
    ["12 mm2", 12, "mm^2"],
    ["8 cm3", 8, "cm^3"],
    ["2 m4", 2, "m^4"],
    ["3 N/m2", 3, "N/m^2"],
    ["6.5 Ncm", 6.5, "N*cm"],
    ["6.5Ncm", 6.5, "N*cm"],
    ["0.065 Nm", 0.065, "N*m"],
    ["65 Nmm", 65, "N*mm"],
    ["2 kNm", 2, "kN*m"],
    ["2 mN", 2, "mN"], // a millinewton stays a millinewton
  ])("%j → %d %s", (typed, value, unit) => {
    const r = read(typed);
    expect((r as { value: number }).value).toBeCloseTo(value, 12);
    expect((r as { unit: string | null }).unit).toBe(unit);
  });

  it("reads the typed power and product as the right amount", () => {
    expect(checkAnswer("6.25 cm2", { value: 6.25, unit: "cm^2" }).outcome).toBe("correct");
    expect(checkAnswer("625 mm2", { value: 6.25, unit: "cm^2" }).outcome).toBe("correct");
    expect(checkAnswer("0.065 Nm", { value: 6.5, unit: "N*cm" }).outcome).toBe("correct");
    expect(checkAnswer("6.5 Ncm", { value: 6.5, unit: "N*cm" }).outcome).toBe("correct");
  });

  // Case decides: "nm" (a nanometre, not in the course) must not become "Nm", nor a force
  // squared come from "N2", nor "cm5" a power we do not use.
  it.each(["2 nm", "2 NM", "2 N2", "2 cm5", "2 cm22", "2 Ncmm"])("%j stays unreadable", (typed) => {
    expect(parseAnswer(typed).ok).toBe(false);
  });

  it.each(["2.5 zz", "2.5 Mm", "2.5 mPa", "2.5 furlongs", "5 N/cm/cm", "5 /cm", "5 N/", "2.5 µm"])(
    "%j is not in the course vocabulary: unreadable",
    (typed) => {
      expect(parseAnswer(typed).ok).toBe(false);
    },
  );

  it("js-quantities converts and knows kinds (wrapped)", () => {
    expect(convertUnits(25, "mm", "cm")).toBeCloseTo(2.5, 12);
    expect(convertUnits(5, "N/cm", "N/m")).toBeCloseTo(500, 9);
    expect(convertUnits(1, "kN", "N")).toBe(1000);
    expect(convertUnits(1, "kg", "N")).toBeNull();
    expect(describeKind("mm")).toBe("a length");
    expect(describeKind("N/mm")).toBe("a stiffness (force per length)");
    expect(describeKind("N*cm")).toBe("a force times a length");
    expect(describeKind("")).toBe("a plain number");
  });
});

describe("significant figures", () => {
  it.each([
    ["2.5", 2, 2],
    ["2.50", 3, 3],
    ["0.0050", 2, 2],
    ["65300", 3, 5], // trailing zeros of a whole number: open
    ["65300.", 5, 5],
    ["100", 1, 3],
    ["6.53", 3, 3],
    ["0", 1, 1],
    ["0.00", 2, 2],
    ["1002", 4, 4],
  ])("%s has %d to %d", (mantissa, min, max) => {
    expect(countSignificantFigures(mantissa)).toEqual({ min, max });
  });

  it("counts the figures of the mantissa in any notation", () => {
    const figures = (t: string) => {
      const r = parseAnswer(t);
      return r.ok ? r.answer.sigFigs : null;
    };
    expect(figures("6.53 × 10^4 N/m")).toEqual({ min: 3, max: 3 });
    expect(figures("6.530e4")).toEqual({ min: 4, max: 4 });
    expect(figures("2,50 cm")).toEqual({ min: 3, max: 3 });
    expect(figures("65 300 N/m")).toEqual({ min: 3, max: 5 });
  });
});

describe("rounding per NIST SP 811 (2008), Appendix B.7.1 'Rounding numbers'", () => {
  // Source: NIST SP 811, 2008 edition, §B.7.1, its worked examples (cited from memory; the rule
  // texts agree with quotations of the Guide in public sources). Rule 3 — discarded digits that
  // are exactly 5 — keeps an even last digit and raises an odd one: round half to EVEN.
  it.each([
    [6.9749515, 3, "6.97"], // rule 1: discarded digits begin with 4
    [6.9749515, 2, "7.0"], // rule 2: begin with 7
    [6.9749515, 5, "6.9750"], // rule 2: a 5 followed by non-zero digits
    [6.9749515, 7, "6.974952"], // rule 3: exactly 5, preceding 1 is odd → raised
    [6.9749505, 7, "6.974950"], // rule 3: exactly 5, preceding 0 is even → kept
  ])("SP 811 example: %d to %d figures is %s", (value, figures, text) => {
    const r = roundToSignificantFigures(value, figures);
    expect(r?.text).toBe(text);
    expect(r?.value).toBe(Number(text));
  });

  it("rule 3 is NOT round-half-up: 2.45 → 2.4 and 2.35 → 2.4; 0.125 → 0.12; −2.45 → −2.4", () => {
    expect(roundToSignificantFigures(2.45, 2)?.text).toBe("2.4");
    expect(roundToSignificantFigures(2.35, 2)?.text).toBe("2.4");
    expect(roundToSignificantFigures(0.125, 2)?.text).toBe("0.12");
    expect(roundToSignificantFigures(0.135, 2)?.text).toBe("0.14");
    expect(roundToSignificantFigures(-2.45, 2)?.text).toBe("-2.4");
    // JavaScript's own toPrecision rounds the binary value half up, and disagrees here:
    expect((2.45).toPrecision(2)).toBe("2.5");
  });

  it("carries, writes trailing zeros, and uses powers of ten when a whole number would be ambiguous", () => {
    expect(roundToSignificantFigures(9.96, 2)?.text).toBe("1.0 × 10^1");
    expect(roundToSignificantFigures(0.0999, 2)?.text).toBe("0.10");
    expect(roundToSignificantFigures(65333.33, 3)).toEqual({ value: 65300, text: "6.53 × 10^4" });
    expect(roundToSignificantFigures(65333.33, 5)?.text).toBe("65333");
    expect(roundToSignificantFigures(0, 3)?.text).toBe("0.00");
    expect(roundToSignificantFigures(Number.NaN, 3)).toBeNull();
    expect(roundToSignificantFigures(1, 0)).toBeNull();
  });
});

describe("checkAnswer outcomes", () => {
  // Source: OpenStax College Physics §16.1, Example "How stiff are car springs?" (cited from
  // memory): 80.0 kg settles a car 1.20 cm, k = 6.53 × 10⁴ N/m, with g = 9.80 m/s².
  const carSpringNPerM = (stiffnessNPerCm(weightN(80.0, 9.8), 1.2) as number) * 100;
  const carSpring: ExpectedAnswer = { value: carSpringNPerM, unit: "N/m", sigFigs: { count: 3 } };

  it("the OpenStax answer, written every usual way, is correct", () => {
    for (const typed of ["6.53 × 10^4 N/m", "6.53x10^4 N/m", "6.53e4 N/m", "6,53·10⁴ N/m", "653 N/cm", "65.3 kN/m", "65.3 N/mm"]) {
      expect(checkAnswer(typed, carSpring).outcome, typed).toBe("correct");
    }
  });

  it("right value, wrong significant figures", () => {
    const r = checkAnswer("6.533 × 10^4 N/m", carSpring);
    expect(r.outcome).toBe("sig-figs-off");
    expect(r.message).toMatch(/3 significant figures \(you wrote 4\)/);
    expect(checkAnswer("6.5 × 10^4 N/m", carSpring).outcome).toBe("sig-figs-off");
    // 65300 may have 3 to 5 figures: given the benefit of the doubt
    expect(checkAnswer("65300 N/m", carSpring).outcome).toBe("correct");
  });

  it("exact rounding, when asked, wants the SP 811 rounding of the expected value", () => {
    const exact: ExpectedAnswer = { ...carSpring, sigFigs: { count: 3, exactRounding: true } };
    const r = checkAnswer("6.54 × 10^4 N/m", exact);
    expect(r.outcome).toBe("sig-figs-off");
    expect(r.message).toContain("6.53 × 10^4 N/m");
    expect(checkAnswer("6.53 × 10^4 N/m", exact).outcome).toBe("correct");
    // the 6.54 answer passes without exact rounding (within the default 1 %)
    expect(checkAnswer("6.54 × 10^4 N/m", carSpring).outcome).toBe("correct");
  });

  it("wrong kind of unit says which kinds, and whether the number itself was right", () => {
    const r = checkAnswer("2.5 N", { value: 2.5, unit: "cm" });
    expect(r.outcome).toBe("unit-wrong-kind");
    expect(r.message).toMatch(/a force/);
    expect(r.message).toMatch(/a length/);
    expect(r.message).toMatch(/number itself looks right/);
  });

  it("a plain number typed with a unit uses no try and says the quantity has no unit", () => {
    // Invented: a safety factor of 3.63 (a ratio of two forces).
    const factor: ExpectedAnswer = { value: 3.63, unit: "" };
    for (const typed of ["3.63 N", "3.63 cm", "5 N/cm"]) {
      const r = checkAnswer(typed, factor);
      expect(r.outcome, typed).toBe("unreadable");
      expect(r.message, typed).toMatch(/has no unit/);
      expect(r.message, typed).toMatch(/no try was used/i);
    }
    expect(checkAnswer("3.63", factor).outcome).toBe("correct");
    expect(checkAnswer("3.63 times", factor).outcome).toBe("correct");
  });

  it("a bare number for a quantity with a unit uses a try, and says plainly when the number is right", () => {
    const right = checkAnswer("2.5", { value: 2.5, unit: "cm" });
    expect(right.outcome).toBe("unit-missing");
    expect(right.message).toMatch(/^The number is right, but the unit is missing/);
    const wrong = checkAnswer("3", { value: 2.5, unit: "cm" });
    expect(wrong.outcome).toBe("incorrect");
    expect(wrong.message).not.toMatch(/number is right/);
  });

  it("tolerances: default 1 % relative, absolute, either, both", () => {
    expect(DEFAULT_TOLERANCE).toEqual({ relative: 0.01 });
    expect(checkAnswer("2.52 cm", { value: 2.5, unit: "cm" }).outcome).toBe("correct"); // 0.8 %
    expect(checkAnswer("2.53 cm", { value: 2.5, unit: "cm" }).outcome).toBe("incorrect"); // 1.2 %
    const abs: ExpectedAnswer = { value: 2.5, unit: "cm", tolerance: { absolute: 0.1 } };
    expect(checkAnswer("2.59 cm", abs).outcome).toBe("correct");
    expect(checkAnswer("2.61 cm", abs).outcome).toBe("incorrect");
    expect(checkAnswer("26 mm", abs).outcome).toBe("correct"); // absolute tolerance is in the expected unit
    const either: ExpectedAnswer = { value: 2.5, unit: "cm", tolerance: { relative: 0.01, absolute: 0.5 } };
    const both: ExpectedAnswer = { value: 2.5, unit: "cm", tolerance: { relative: 0.01, absolute: 0.5, combine: "both" } };
    expect(checkAnswer("2.6 cm", either).outcome).toBe("correct");
    expect(checkAnswer("2.6 cm", both).outcome).toBe("incorrect");
    // zero tolerance still forgives binary noise from conversion
    expect(checkAnswer("25 mm", { value: 2.5, unit: "cm", tolerance: { relative: 0 } }).outcome).toBe("correct");
  });

  it("a plain-number answer (a ratio) takes no unit; 'times' and 'x' are fine", () => {
    const ratio: ExpectedAnswer = { value: 3, unit: "" };
    for (const typed of ["3", "3.0", "3x", "3 times", "3 ×"]) expect(checkAnswer(typed, ratio).outcome, typed).toBe("correct");
  });

  it("a wrong number without a unit is incorrect, and the message mentions the unit too", () => {
    const r = checkAnswer("3.7", { value: 2.5, unit: "cm" });
    expect(r.outcome).toBe("incorrect");
    expect(r.slip).toBeUndefined();
    expect(r.message).toMatch(/needs a unit/);
  });

  it("correct answers in another unit say the conversion", () => {
    expect(checkAnswer("25 mm", { value: 2.5, unit: "cm" }).message).toBe("Correct (25 mm is 2.5 cm).");
  });
});

describe("slips: each recognised and named (invented exercise numbers)", () => {
  // A stretched band: unloaded 10.0 cm, loaded 12.5 cm under 2.0 N; deformation 2.5 cm; k = 0.8 N/cm.
  const band = { forceN: 2, deformationCm: 2.5, loadedReadingCm: 12.5, totalLengthCm: 12.5, unloadedLengthCm: 10 };
  const deformation: ExpectedAnswer = { value: 2.5, unit: "cm", context: { unloadedLengthCm: 10, totalLengthCm: 12.5 } };
  const stiffness: ExpectedAnswer = { value: 0.8, unit: "N/cm", context: band };

  const slipOf = (typed: string, expected: ExpectedAnswer) => {
    const r = checkAnswer(typed, expected);
    expect(r.outcome, typed).toBe("incorrect");
    return r.slip?.code;
  };

  it("the total length instead of the change in length", () => {
    expect(slipOf("12.5 cm", deformation)).toBe("total-length-as-change");
    expect(slipOf("10 cm", deformation)).toBe("total-length-as-change");
    expect(slipOf("0.16 N/cm", stiffness)).toBe("loaded-reading-as-deformation"); // 2 N ÷ 12.5 cm: listed first
    expect(slipOf("0.2 N/cm", { ...stiffness, context: { forceN: 2, deformationCm: 2.5, unloadedLengthCm: 10 } })).toBe(
      "total-length-as-change",
    );
  });

  it("the loaded reading instead of the deformation, in a stiffness too", () => {
    const bend: ExpectedAnswer = { value: 4, unit: "N/cm", context: { forceN: 2, deformationCm: 0.5, loadedReadingCm: 21.5 } };
    expect(slipOf("0.093 N/cm", bend)).toBe("loaded-reading-as-deformation");
  });

  it("force times deformation instead of force divided by it — with or without its unit", () => {
    expect(slipOf("5 N·cm", stiffness)).toBe("multiplied-not-divided");
    expect(slipOf("5 N*cm", stiffness)).toBe("multiplied-not-divided");
    expect(slipOf("5", stiffness)).toBe("multiplied-not-divided");
  });

  it("a ratio turned upside down", () => {
    expect(slipOf("1.25 cm/N", stiffness)).toBe("ratio-upside-down");
    expect(slipOf("12.5 mm/N", stiffness)).toBe("ratio-upside-down");
    expect(slipOf("1.25 N/cm", stiffness)).toBe("ratio-upside-down");
    expect(slipOf("0.333", { value: 3, unit: "" })).toBe("ratio-upside-down");
  });

  it("the right size with the sign reversed: a subtraction the other way round", () => {
    expect(slipOf("-2.5 cm", deformation)).toBe("sign-reversed");
    expect(slipOf("-25 mm", deformation)).toBe("sign-reversed");
    expect(slipOf("-1.8 cm", { value: 1.8, unit: "cm" })).toBe("sign-reversed");
    expect(checkAnswer("-1.8 cm", { value: 1.8, unit: "cm" }).message).toMatch(/order of your subtraction/);
    expect(slipOf("0.4 mm", { value: -0.4, unit: "mm", tolerance: { absolute: 0 } })).toBe("sign-reversed");
    // Nothing to reverse in a zero.
    expect(checkAnswer("-0 cm", { value: 0, unit: "cm", tolerance: { absolute: 0.05 } }).outcome).toBe("correct");
  });

  it("a unit slip by a factor of 10, 100 or 1000, either way", () => {
    expect(slipOf("25 cm", { value: 2.5, unit: "cm" })).toBe("unit-factor-10");
    expect(slipOf("25", { value: 2.5, unit: "cm" })).toBe("unit-factor-10");
    expect(slipOf("0.25 cm", { value: 2.5, unit: "cm" })).toBe("unit-factor-10");
    expect(slipOf("5 N/m", { value: 5, unit: "N/cm" })).toBe("unit-factor-100");
    expect(slipOf("2500 cm", { value: 2.5, unit: "cm" })).toBe("unit-factor-1000");
    expect(slipOf("4 N", { value: 4, unit: "kN" })).toBe("unit-factor-1000");
    // …while the right value in another unit is simply correct
    expect(checkAnswer("500 N/m", { value: 5, unit: "N/cm" }).outcome).toBe("correct");
  });

  it("a mass where a weight is asked", () => {
    expect(slipOf("0.5 kg", { value: weightN(0.5), unit: "N" })).toBe("mass-not-weight");
    expect(slipOf("500 g", { value: weightN(0.5), unit: "N" })).toBe("mass-not-weight");
  });

  it("exercise-specific wrong answers come first", () => {
    const withG10: ExpectedAnswer = {
      value: weightN(0.5),
      unit: "N",
      knownWrongAnswers: [{ code: "g-rounded-to-10", value: 5, unit: "N", hint: "Use g = 9.81 N/kg, not 10." }],
    };
    const r = checkAnswer("5 N", withG10);
    expect(r.slip).toEqual({ code: "g-rounded-to-10", hint: "Use g = 9.81 N/kg, not 10." });
  });

  it("no slip is claimed for an unrelated wrong answer", () => {
    expect(checkAnswer("3.7 cm", deformation).slip).toBeUndefined();
    expect(checkAnswer("0.55 N/cm", stiffness).slip).toBeUndefined();
  });

  it("every built-in slip has a hint", () => {
    for (const hint of Object.values(SLIP_HINTS)) expect(hint.length).toBeGreaterThan(20);
  });
});

describe("a malformed exercise is not the student's fault", () => {
  it.each([
    [{ value: Number.NaN, unit: "cm" }],
    [{ value: 1, unit: "furlongs" }],
    [{ value: 1, unit: "cm", tolerance: { relative: -1 } }],
    [{ value: 1, unit: "cm", sigFigs: { count: 0 } }],
    [{ value: 1, unit: "cm", knownWrongAnswers: "nope" }],
    [null],
  ])("%j → not-checkable, never a throw", (expected) => {
    const r = checkAnswer("2.5 cm", expected as unknown as ExpectedAnswer);
    expect(r.outcome).toBe("not-checkable");
    expect(validateExpectedAnswer(expected as unknown as ExpectedAnswer).length).toBeGreaterThan(0);
  });

  it("a well-formed exercise validates clean", () => {
    expect(validateExpectedAnswer({ value: 2.5, unit: "N/cm", tolerance: { absolute: 0.1 }, sigFigs: { count: 2 } })).toEqual([]);
  });
});

describe("conversion exercises (unitRequired)", () => {
  // 1 N/cm = 100 N/m (SI prefixes, NIST SP 811 §4.3: centi = 10⁻²).
  const expected = { value: 520, unit: "N/m", unitRequired: true } as const;
  it("accepts the value in the unit asked for", () => {
    expect(checkAnswer("520 N/m", expected).outcome).toBe("correct");
  });
  it("does not accept the unconverted value copied from the question, and says why", () => {
    const result = checkAnswer("5.2 N/cm", expected);
    expect(result.outcome).toBe("incorrect");
    expect(result.slip?.code).toBe("unit-not-converted");
    expect(result.message).toMatch(/N\/m/);
  });
  it("still says a unit is missing when there is none", () => {
    expect(checkAnswer("520", expected).outcome).toBe("unit-missing");
  });
  it("without the flag, any unit of the same kind is fine", () => {
    expect(checkAnswer("5.2 N/cm", { value: 520, unit: "N/m" }).outcome).toBe("correct");
  });
});

describe("a table of answers (invented numbers)", () => {
  // One empty cell in each of three rows, as in lesson 2's table.
  const oneColumn = { columns: ["Force", "Loaded reading", "Deformation"], rows: [["1 N", "20.0 cm", null], ["2 N", "19.5 cm", null], ["3 N", "19.0 cm", null]] };
  const rows: ExpectedAnswer[] = [
    { value: 0.5, unit: "cm" },
    { value: 1.0, unit: "cm" },
    { value: 1.5, unit: "cm" },
  ];
  it("is right when every row is", () => {
    expect(checkTableAnswers(["0.5 cm", "10 mm", "1.5 cm"], rows, oneColumn)).toMatchObject({ outcome: "correct", message: "Every cell is right.", wrongCells: [] });
  });
  it("names every wrong row, with the first wrong row's outcome and slip, and says which cells", () => {
    const result = checkTableAnswers(["5 cm", "1.0 cm", "-1.5 cm"], rows, oneColumn);
    expect(result.outcome).toBe("incorrect");
    expect(result.slip?.code).toBe("unit-factor-10");
    expect(result.message).toMatch(/^Row 1: .*factor of 10.*\nRow 3: .*order of your subtraction/);
    expect(result.wrongCells).toEqual([0, 2]);
  });
  it("is unreadable (no try used) when a cell cannot be read, naming each such row once and how to write an answer once", () => {
    const result = checkTableAnswers(["0.5 cm", "two", ""], rows, oneColumn);
    expect(result.outcome).toBe("unreadable");
    expect(result.message).toMatch(/^Row 2 could not be read.*\nRow 3 could not be read/);
    expect(result.message.match(/Write a number and its unit/g)).toHaveLength(1);
    expect(result.wrongCells).toEqual([1, 2]);
  });

  // Two empty cells in each of three rows, as in lesson 3's sums: F × x (N·cm) and x² (cm²).
  const twoColumns = { columns: ["Force F", "Deformation x", "F × x", "x²"], rows: [["2 N", "0.8 cm", null, null], ["4 N", "1.6 cm", null, null], ["6 N", "2.4 cm", null, null]] };
  const sums: ExpectedAnswer[] = [
    { value: 1.6, unit: "N*cm" }, { value: 0.64, unit: "cm^2" },
    { value: 6.4, unit: "N*cm" }, { value: 2.56, unit: "cm^2" },
    { value: 14.4, unit: "N*cm" }, { value: 5.76, unit: "cm^2" },
  ];
  it("names a cell by its row and column when a row has two empty cells: never a row the table does not have", () => {
    const result = checkTableAnswers(["1.6 N·cm", "0.64 cm²", "6.4 N·cm", "2.56 cm2", "14.4 Ncm", "57.6 cm²"], sums, twoColumns);
    expect(result.outcome).toBe("incorrect");
    expect(result.slip?.code).toBe("unit-factor-10");
    expect(result.message).toMatch(/^Row 3, x²: That does not match\./);
    expect(result.message).not.toMatch(/Row [4-6]/);
    expect(result.wrongCells).toEqual([5]);

    const twoWrong = checkTableAnswers(["1.6 N·cm", "0.64 cm²", "6.4", "2.56 N", "14.4 Ncm", "5.76 cm²"], sums, twoColumns);
    expect(twoWrong.outcome).toBe("unit-missing");
    expect(twoWrong.message).toMatch(/^Row 2, F × x: The number is right, but the unit is missing.*\nRow 2, x²: /);
    expect(twoWrong.wrongCells).toEqual([2, 3]);

    const unread = checkTableAnswers(["1.6 N·cm", "0.64 cm²", "6.4 N·cm", "2.56 cm²", "14.4 N·cm", "lots"], sums, twoColumns);
    expect(unread.outcome).toBe("unreadable");
    expect(unread.message).toMatch(/^Row 3, x² could not be read/);
    expect(unread.wrongCells).toEqual([5]);
  });

  it("names a row by its label when its first cell is a word, not a number", () => {
    const labelled = { columns: ["Quantity", "Value"], rows: [["Mean of the three readings", null], ["Spread (largest − smallest)", null]] };
    expect(tableCellNames(labelled)).toEqual(["Mean of the three readings", "Spread (largest − smallest)"]);
    const result = checkTableAnswers(["20.1 cm", "3 cm"], [{ value: 20.1, unit: "cm" }, { value: 0.2, unit: "cm" }], labelled);
    expect(result.message).toMatch(/^Spread \(largest − smallest\): That does not match/);
  });

  it("falls back to counting cells when the template does not fit the expected cells", () => {
    expect(tableCellNames(undefined, 2)).toEqual(["Cell 1", "Cell 2"]);
    expect(tableCellNames(oneColumn, 2)).toEqual(["Cell 1", "Cell 2"]);
    expect(checkTableAnswers(["1 cm", "1 cm", "2 cm"], rows).message).toMatch(/^Cell 1: .*\nCell 3: /);
  });
});
