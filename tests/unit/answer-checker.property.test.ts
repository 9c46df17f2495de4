/**
 * Property tests of app/lib/answer-checker.ts (fast-check): it never throws whatever is typed,
 * reads back what it is given, and rounds like the JavaScript engine except at decimal ties.
 * Seeds are fixed so a failure can be replayed.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  checkAnswer,
  countSignificantFigures,
  parseAnswer,
  roundToSignificantFigures,
  type ExpectedAnswer,
  type Outcome,
} from "../../app/lib/answer-checker";

const OUTCOMES: readonly Outcome[] = ["correct", "unit-missing", "unit-wrong-kind", "sig-figs-off", "incorrect", "unreadable", "not-checkable"];

/** A few realistic expected answers, with every option in play. */
const EXPECTED: readonly ExpectedAnswer[] = [
  { value: 2.5, unit: "cm" },
  { value: 0.5, unit: "cm", context: { loadedReadingCm: 21.5, forceN: 2, deformationCm: 0.5, totalLengthCm: 30 } },
  { value: 65333.33, unit: "N/m", sigFigs: { count: 3, exactRounding: true } },
  { value: 4, unit: "N/cm", tolerance: { relative: 0.02, absolute: 0.1, combine: "both" }, context: { forceN: 2, deformationCm: 0.5 } },
  { value: 3, unit: "" },
  { value: 4.905, unit: "N", knownWrongAnswers: [{ code: "g-ten", value: 5, unit: "N", hint: "g is 9.81 N/kg" }] },
  { value: -0.4, unit: "mm", tolerance: { absolute: 0 } },
];

/** Strings built from the pieces answers are made of, to reach deep into the parser. */
const answerLike = fc
  .array(
    fc.constantFrom(
      "0", "1", "2", "5", "9", "12", "300", ".", ",", " ", "\u2009", "-", "+", "\u2212", "e", "E", "x", "×", "*", "·", "^",
      "**", "10", "(", ")", "⁴", "⁻", "²", "N", "kN", "cm", "mm", "m", "kg", "g", "/", "per", "newtons", "Pa", "GPa",
      "times", "µ", "%", "NaN", "Infinity", "1e308", "9".repeat(400),
    ),
    { maxLength: 24 },
  )
  .map((parts) => parts.join(""));

function checkShape(typed: string, expected: ExpectedAnswer): void {
  const r = checkAnswer(typed, expected);
  expect(OUTCOMES).toContain(r.outcome);
  expect(typeof r.message).toBe("string");
  expect(r.message.length).toBeGreaterThan(0);
  if (r.parsed !== null) expect(Number.isFinite(r.parsed.value)).toBe(true);
  if (r.outcome === "unreadable") expect(r.parsed).toBeNull();
}

describe("checkAnswer never throws, whatever is typed", () => {
  const strings: [string, fc.Arbitrary<string>][] = [
    ["printable ASCII", fc.string({ maxLength: 300 })],
    ["any code unit, lone surrogates included", fc.string({ unit: "binary", maxLength: 300 })],
    ["any full Unicode grapheme", fc.string({ unit: "grapheme", maxLength: 120 })],
    ["answer-like fragments", answerLike],
  ];
  for (const [label, typed] of strings) {
    it(label, () => {
      fc.assert(
        fc.property(typed, fc.constantFrom(...EXPECTED), (t, expected) => checkShape(t, expected)),
        { numRuns: 1500, seed: 4242 },
      );
    });
  }

  it("with anything at all as the typed value or the expected answer", () => {
    fc.assert(
      fc.property(fc.anything(), fc.anything(), (typed, expected) => {
        const r = checkAnswer(typed as string, expected as ExpectedAnswer);
        expect(OUTCOMES).toContain(r.outcome);
      }),
      { numRuns: 500, seed: 99 },
    );
  });
});

describe("reading back what was written", () => {
  const decimal = fc.tuple(fc.integer({ min: -999_999, max: 999_999 }), fc.integer({ min: 0, max: 6 })).map(([n, k]) => n / 10 ** k);
  const unit = fc.constantFrom("", "N", "kN", "cm", "mm", "m", "N/cm", "N/m", "N/mm", "kg", "g");

  it("String(v), exponent forms and the decimal comma all read back as v, with the unit", () => {
    fc.assert(
      fc.property(decimal, unit, fc.constantFrom("", " "), (v, u, gap) => {
        const [mantissa, exponent] = v.toExponential().split("e");
        const forms = [String(v), `${mantissa}e${Number(exponent)}`, `${mantissa} × 10^${Number(exponent)}`, `${mantissa}x10^${Number(exponent)}`];
        // A decimal comma followed by exactly three digits is refused as ambiguous (65,300), by design.
        const comma = String(v).replace(".", ",");
        if (!/^-?[1-9]\d{0,2},\d{3}$/.test(comma)) forms.push(comma);
        for (const form of forms) {
          const r = parseAnswer(`${form}${u ? gap + u : ""}`);
          expect(r.ok, form).toBe(true);
          if (!r.ok) continue;
          expect(Math.abs(r.answer.value - v)).toBeLessThanOrEqual(1e-12 * Math.abs(v));
          expect(r.answer.unit).toBe(u === "" ? null : u);
        }
      }),
      { numRuns: 800, seed: 7 },
    );
  });

  it("a value in cm typed in mm or m is correct; ten times too big is not", () => {
    const positive = fc.tuple(fc.integer({ min: 1, max: 99_999 }), fc.integer({ min: 0, max: 4 })).map(([n, k]) => n / 10 ** k);
    fc.assert(
      fc.property(positive, (v) => {
        const expected: ExpectedAnswer = { value: v, unit: "cm", tolerance: { relative: 1e-9 } };
        expect(checkAnswer(`${Number((v * 10).toPrecision(12))} mm`, expected).outcome).toBe("correct");
        expect(checkAnswer(`${Number((v / 100).toPrecision(12))} m`, expected).outcome).toBe("correct");
        const wrong = checkAnswer(`${Number((v * 10).toPrecision(12))} cm`, expected);
        expect(wrong.outcome).toBe("incorrect");
        expect(wrong.slip?.code).toBe("unit-factor-10");
      }),
      { numRuns: 500, seed: 11 },
    );
  });
});

describe("SP 811 rounding against an independent implementation", () => {
  const value = fc.oneof(
    fc.double({ min: -1e12, max: 1e12, noNaN: true }),
    fc.tuple(fc.integer({ min: -9_999_999, max: 9_999_999 }), fc.integer({ min: 0, max: 9 })).map(([n, k]) => n / 10 ** k),
  );

  it("agrees with Number.prototype.toPrecision wherever the discarded digits are not exactly a 5 (a decimal tie)", () => {
    fc.assert(
      fc.property(value, fc.integer({ min: 1, max: 12 }), (x, n) => {
        const digits = Math.abs(x).toExponential().split("e")[0].replace(".", "");
        const discarded = digits.slice(n);
        const isTie = discarded.length > 0 && discarded[0] === "5" && /^5?0*$/.test(discarded);
        fc.pre(!isTie);
        const ours = roundToSignificantFigures(x, n);
        expect(ours).not.toBeNull();
        expect(ours?.value).toBe(Number(x.toPrecision(n)) || 0);
      }),
      { numRuns: 3000, seed: 811 },
    );
  });

  it("at a tie the last kept digit is always even (SP 811 B.7.1 rule 3)", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 99_999 }), (kept) => {
        // the kept digits followed by exactly one 5, e.g. 1234 → 1.2345, rounded to 4 figures
        const text = `${kept}5`;
        const n = String(kept).length;
        const r = roundToSignificantFigures(Number(`${text[0]}.${text.slice(1)}`), n);
        // x lies between 1 and 10, so the last kept digit is the one worth 10^(1 − n); read the
        // result in those steps (9.5 → 10 is 10 steps of 1: the "final digit" is the 0, even).
        const steps = Math.round((r?.value ?? Number.NaN) * 10 ** (n - 1));
        expect(steps % 2).toBe(0);
      }),
      { numRuns: 1000, seed: 812 },
    );
  });

  it("the written result shows exactly the figures asked for", () => {
    fc.assert(
      fc.property(value, fc.integer({ min: 1, max: 12 }), (x, n) => {
        fc.pre(x !== 0);
        const r = roundToSignificantFigures(x, n);
        const mantissa = (r?.text ?? "").replace(/^-/, "").split(" × ")[0];
        const { min, max } = countSignificantFigures(mantissa);
        expect(min <= n && n <= max).toBe(true);
      }),
      { numRuns: 2000, seed: 813 },
    );
  });
});
