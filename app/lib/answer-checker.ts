/**
 * The answer checker: reads what a student typed (a number, maybe a unit), compares it with the
 * exercise's expected value, and says what went right or wrong in plain words.
 *
 * Pure and total: `checkAnswer` never throws, whatever it is given.
 *
 * Map of the file:
 *   1. outcome and slip codes (our own names), the public types
 *   2. reading the number: decimal point or comma, digit groups, "× 10^4", "e4", superscripts
 *   3. reading the unit: a small course vocabulary, converted and compared by js-quantities
 *   4. significant figures: counting what was typed, rounding per NIST SP 811 §B.7.1
 *   5. tolerance
 *   6. slips: known wrong answers and their hints
 *   7. checkAnswer
 */
// @ts-expect-error -- js-quantities 1.8 ships no type declarations; QtyFactory below types what we use.
import QtyUntyped from "js-quantities";
import { G_N_PER_KG } from "./science";

// ───────────────────────── 1. outcome and slip codes, public types ─────────────────────────

/**
 * What the checker decided:
 * - "correct";
 * - "unit-missing": the number is right in the expected unit, but no unit was typed;
 * - "unit-wrong-kind": the unit measures something else (a force where a length is asked);
 * - "sig-figs-off": the value is right, but not written to the significant figures asked for;
 * - "incorrect": the value is wrong (a `slip` may say how);
 * - "unreadable": not a number (with or without a unit) we can read;
 * - "not-checkable": the exercise's own expected answer is malformed (an authoring bug, not the student's).
 */
export type Outcome =
  | "correct"
  | "unit-missing"
  | "unit-wrong-kind"
  | "sig-figs-off"
  | "incorrect"
  | "unreadable"
  | "not-checkable";

/** Outcomes that use no try: the answer could not be read, or the exercise could not be checked. */
export const NO_TRY_OUTCOMES: ReadonlySet<string> = new Set<Outcome>(["unreadable", "not-checkable"]);

/** Slips we recognise, each with a hint. Exercises may add their own codes through `knownWrongAnswers`. */
export type SlipCode =
  | "loaded-reading-as-deformation"
  | "total-length-as-change"
  | "multiplied-not-divided"
  | "ratio-upside-down"
  | "sign-reversed"
  | "unit-factor-10"
  | "unit-factor-100"
  | "unit-factor-1000"
  | "mass-not-weight"
  | "unit-not-converted";

/** Student-facing hints for each slip, in Bendwise's own words. */
export const SLIP_HINTS: Readonly<Record<SlipCode, string>> = {
  "loaded-reading-as-deformation":
    "That is the ruler reading with the load on. The deformation is how far the reading moved: the difference between the unloaded and the loaded reading.",
  "total-length-as-change":
    "That is a whole length of the piece. The deformation is only the change: loaded length minus unloaded length.",
  "multiplied-not-divided":
    "It looks like force was multiplied by deformation. Stiffness is force divided by deformation (N ÷ cm gives N/cm).",
  "ratio-upside-down":
    "That is the right ratio turned upside down. Check which quantity goes on top of the fraction.",
  "sign-reversed":
    "The size is right but the sign is the other way round: check the order of your subtraction. A deformation is how far the piece moved, the larger reading minus the smaller one.",
  "unit-factor-10": "The value is off by a factor of 10: check where the decimal point goes, and any unit conversion (1 cm = 10 mm).",
  "unit-factor-100": "The value is off by a factor of 100 — a unit slip? Remember 1 m = 100 cm, so 1 N/cm = 100 N/m.",
  "unit-factor-1000": "The value is off by a factor of 1000 — a unit slip? Remember 1 m = 1000 mm, 1 kN = 1000 N and 1 kg = 1000 g.",
  "mass-not-weight":
    "That is a mass. A spring scale measures force: weight in N = mass in kg × 9.81 N/kg.",
  "unit-not-converted":
    "The value is right, but this question asks for it in another unit: convert it, then write the number with the unit asked for.",
};

/** Acceptable distance from the expected value: relative (0.01 = 1 %), absolute (in the expected unit), or both. */
export interface Tolerance {
  relative?: number;
  absolute?: number;
  /** with both given: "either" passes when one is met (default), "both" needs both */
  combine?: "either" | "both";
}

/** When the exercise asks for a number of significant figures. */
export interface SigFigRule {
  /** how many significant figures the answer must show (1 to 15) */
  count: number;
  /**
   * also require the digits to be the expected value rounded per NIST SP 811 §B.7.1 (default
   * false: any value within tolerance written with `count` figures passes)
   */
  exactRounding?: boolean;
}

/**
 * What the exercise knows, so the checker can recognise slips. Lengths in cm, force in N. Give
 * only what the exercise has; each slip is looked for only when its numbers are known.
 */
export interface SlipContext {
  /** the force applied, N */
  forceN?: number;
  /** the true deformation (change in height or length), cm */
  deformationCm?: number;
  /** the ruler reading with the load on, cm */
  loadedReadingCm?: number;
  /** the whole length of the loaded piece, cm (stretch exercises) */
  totalLengthCm?: number;
  /** the whole length of the piece before loading, cm */
  unloadedLengthCm?: number;
}

/** An exercise-specific wrong answer to recognise, in its own unit ("" for a plain number). */
export interface KnownWrongAnswer {
  code: string;
  value: number;
  unit: string;
  hint: string;
  /**
   * how close a typed value must be to count as this slip (default: the exercise's tolerance); a
   * slip that lies near the right answer or near another slip needs a narrower one to be told apart
   */
  tolerance?: Tolerance;
}

/** The expected answer of an exercise; it stays on the server. */
export interface ExpectedAnswer {
  value: number;
  /** a unit of the course vocabulary ("cm", "N/m", "kg", …), or "" for a plain number (a ratio) */
  unit: string;
  /** default: DEFAULT_TOLERANCE */
  tolerance?: Tolerance;
  sigFigs?: SigFigRule;
  context?: SlipContext;
  knownWrongAnswers?: readonly KnownWrongAnswer[];
  /**
   * the question asks for the answer in exactly this unit (a conversion exercise): the right value
   * written in another unit of the same kind is "incorrect" with the unit-not-converted slip
   */
  unitRequired?: boolean;
}

/** What was read from the typed text. */
export interface ParsedAnswer {
  /** the number as typed (in the typed unit) */
  value: number;
  /** the unit in canonical form ("N/cm", "mm", …); null when none was typed */
  unit: string | null;
  /** significant figures as typed; a range when trailing zeros of a whole number leave it open (65300: 3 to 5) */
  sigFigs: { min: number; max: number };
}

export interface CheckResult {
  outcome: Outcome;
  parsed: { value: number; unit: string | null } | null;
  slip?: { code: string; hint: string };
  /** feedback for the student, in plain words */
  message: string;
  /** tables only: the empty cells (0-based, in reading order) the message names as wrong or unreadable */
  wrongCells?: number[];
}

/** The tolerance used when an exercise gives none: 1 % relative (common practice, no source). */
export const DEFAULT_TOLERANCE: Readonly<Tolerance> = { relative: 0.01 };

/** Longest typed answer we read; longer text is "unreadable" (a guard against pasted essays). */
export const MAX_TYPED_LENGTH = 200;

// ───────────── 2. reading the number ─────────────

type NumberScan =
  | { ok: true; value: number; mantissa: string; rest: string }
  | { ok: false; reason: string };

const SUPERSCRIPTS: Readonly<Record<string, string>> = {
  "⁰": "0", "¹": "1", "²": "2", "³": "3", "⁴": "4", "⁵": "5", "⁶": "6", "⁷": "7", "⁸": "8", "⁹": "9", "⁻": "-", "⁺": "+",
};
const fromSuperscript = (s: string) => [...s].map((c) => SUPERSCRIPTS[c] ?? c).join("");

/** Spaces of every width become one plain space, minus signs and dashes a hyphen-minus. */
function normaliseTyped(raw: string): string {
  return raw
    .replace(/[\u200B-\u200D\u2060\uFEFF]/g, "") // zero-width characters
    .replace(/[\s\u00A0\u1680\u2000-\u200A\u202F\u205F\u3000]+/g, " ")
    .replace(/[\u2212\u2010-\u2015\uFE63\uFF0D]/g, "-")
    .trim();
}

// The mantissa, tried in this order (first match wins):
//   1,234,567 or 1,234,567.5   comma digit groups (two or more groups)
//   1,234.5                    comma digit groups followed by a decimal point
//   65 300 or 65 300,5         space digit groups (NIST SP 811 §10.5.3 groups digits with spaces)
//   2.5  2,5  25  2.  2,       plain, with a decimal point or a decimal comma
//   .5  ,5                     no digit before the decimal marker
const MANTISSA =
  /^(\d{1,3}(?:,\d{3}){2,}(?:\.\d+)?(?!\d)|\d{1,3}(?:,\d{3})+\.\d*|\d{1,3}(?: \d{3})+(?![\d,.]| \d)|\d{1,3}(?: \d{3})+[.,]\d+|\d+(?:[.,]\d*)?|[.,]\d+)/;
const TIMES = "[x×X*·⋅∙•✕]";
const EXPONENT_E = /^ ?[eE]([+-]?\d{1,4})/;
const EXPONENT_CARET = new RegExp(`^ ?(?:${TIMES} ?)?10 ?(?:\\^|\\*\\*) ?(\\()? ?([+-]?\\d{1,4}) ?(\\))?`);
const EXPONENT_SUPERSCRIPT = new RegExp(`^ ?(?:${TIMES} ?)?10([⁺⁻]?[⁰¹²³⁴⁵⁶⁷⁸⁹]{1,4})`);

/** Reads the number at the start of normalised text; the rest is left for the unit. */
function scanNumber(text: string): NumberScan {
  let s = text;
  let sign = 1;
  if (s.startsWith("-") || s.startsWith("+")) {
    sign = s.startsWith("-") ? -1 : 1;
    s = s.slice(1).trimStart();
  }
  const m = MANTISSA.exec(s);
  if (!m) return { ok: false, reason: "there is no number at the start" };
  let mantissa = m[1];
  s = s.slice(mantissa.length);

  if (/^\d{1,3}(,\d{3}){2,}(\.\d+)?$/.test(mantissa)) {
    mantissa = mantissa.replace(/,/g, ""); // 1,234,567 — comma digit groups
  } else if (/^\d{1,3}(,\d{3})+\.\d*$/.test(mantissa)) {
    mantissa = mantissa.replace(/,/g, ""); // 1,234.5
  } else if (mantissa.includes(" ")) {
    mantissa = mantissa.replace(/ /g, "").replace(",", "."); // 65 300 or 65 300,5
  } else if (mantissa.includes(",")) {
    // One comma on its own is a decimal comma (2,5) — except 2,500 or 65,300, which could be
    // either 2.5 or 2500: we ask rather than guess (SP 811 §10.5.3: commas do not group digits).
    if (/^[1-9]\d{0,2},\d{3}$/.test(mantissa)) {
      return {
        ok: false,
        reason: `"${mantissa}" could mean ${mantissa.replace(",", ".")} or ${mantissa.replace(",", "")}: write it without the comma, or with a decimal point`,
      };
    }
    mantissa = mantissa.replace(",", ".");
  }

  let exponent = 0;
  const e = EXPONENT_E.exec(s);
  const caret = e ? null : EXPONENT_CARET.exec(s);
  const sup = e || caret ? null : EXPONENT_SUPERSCRIPT.exec(s);
  if (e) {
    exponent = Number(e[1]);
    s = s.slice(e[0].length);
  } else if (caret) {
    if (Boolean(caret[1]) !== Boolean(caret[3])) return { ok: false, reason: "a bracket in the power of ten is not closed" };
    exponent = Number(caret[2]);
    s = s.slice(caret[0].length);
  } else if (sup) {
    exponent = Number(fromSuperscript(sup[1]));
    s = s.slice(sup[0].length);
  }
  const value = sign * Number(`${mantissa}e${exponent}`);
  if (!Number.isFinite(value)) return { ok: false, reason: "the number is too large" };
  return { ok: true, value, mantissa, rest: s.trim() };
}

// ───────────── 3. reading the unit ─────────────

interface QtyInstance {
  scalar: number;
  to(unit: string): QtyInstance;
  isCompatible(other: string | QtyInstance): boolean;
  inverse(): QtyInstance;
  units(): string;
}
type QtyFactory = (value: number, unit: string) => QtyInstance;
const Qty = QtyUntyped as QtyFactory;

/**
 * The course's unit vocabulary: the symbols a student may type. js-quantities does the
 * conversions and knows the kinds, but its parser reads almost any letters as some unit
 * ("zz" is a zepto-redshift), so only these symbols reach it.
 */
const UNIT_SYMBOLS = new Set(["N", "kN", "mN", "m", "cm", "mm", "km", "g", "kg", "mg", "Pa", "kPa", "MPa", "GPa"]);

/** Written-out names, compared in lower case. */
const UNIT_NAMES: Readonly<Record<string, string>> = {
  newton: "N", newtons: "N", kilonewton: "kN", kilonewtons: "kN", millinewton: "mN", millinewtons: "mN",
  meter: "m", meters: "m", metre: "m", metres: "m",
  centimeter: "cm", centimeters: "cm", centimetre: "cm", centimetres: "cm",
  millimeter: "mm", millimeters: "mm", millimetre: "mm", millimetres: "mm",
  kilometer: "km", kilometers: "km", kilometre: "km", kilometres: "km",
  gram: "g", grams: "g", gramme: "g", grammes: "g",
  kilogram: "kg", kilograms: "kg", kilogramme: "kg", kilogrammes: "kg", kilo: "kg", kilos: "kg",
  milligram: "mg", milligrams: "mg",
  pascal: "Pa", pascals: "Pa", kilopascal: "kPa", kilopascals: "kPa",
  megapascal: "MPa", megapascals: "MPa", gigapascal: "GPa", gigapascals: "GPa",
};

/**
 * Symbols typed in the wrong case that cannot mean anything else in the course vocabulary
 * (SP 811 §6.1 says symbols are case-sensitive; we forgive these few, common practice, no source).
 * "Mm" (megametre) and "mPa" (millipascal) are NOT forgiven into mm and MPa.
 */
const FORGIVEN_CASE: Readonly<Record<string, string>> = {
  n: "N", KN: "kN", Kn: "kN", kn: "kN", Kg: "kg", KG: "kg", CM: "cm", Cm: "cm", MM: "mm",
  pa: "Pa", PA: "Pa", kpa: "kPa", KPa: "kPa", KPA: "kPa", Mpa: "MPa", MPA: "MPa", mpa: "MPa", gpa: "GPa", Gpa: "GPa", GPA: "GPa",
};

/**
 * Lengths whose power may be typed as a plain digit after the symbol: "cm2" is cm², "m3" is m³
 * (a phone keyboard has no ² key). Only these symbols, as typed, and only the powers 2 to 4: "N2"
 * or "cm5" stay unreadable rather than becoming a quantity nobody meant (common practice, no source).
 */
const LENGTH_SYMBOLS = new Set(["m", "cm", "mm", "km"]);

/**
 * A force and a length typed together with no sign between them: "Nm", "Ncm", "Nmm", "kNm" are
 * N·m, N·cm, N·mm and kN·m (a phone keyboard has no "·"). Case decides, as symbols are
 * case-sensitive (NIST SP 811 §6.1): "nm" would be a nanometre, which is not in the course
 * vocabulary, so it stays unreadable and is never read as N·m; "NM" is nothing; "mN" (the prefix
 * before its symbol) stays a millinewton. No symbol of the vocabulary is spelt like one of these,
 * so no other typed unit changes meaning. A stiffness typed "Nm" for "N/m" is read as what it
 * says, N·m, and the student is told that measures a force times a length.
 */
const JOINED_PRODUCT = /^(k?N)(m|cm|mm)$/;

type UnitRead = { ok: true; unit: string } | { ok: false; reason: string };

/**
 * A typed unit in canonical form for js-quantities: "N / cm", "N per cm", "newtons per
 * centimetre" → "N/cm"; "N·cm", "Ncm" → "N*cm"; "m⁴", "m4" → "m^4". One "/" at most.
 */
function readUnit(raw: string): UnitRead {
  let s = raw.trim();
  if (s === "") return { ok: true, unit: "" };
  s = s.replace(/([A-Za-z0-9])\.$/, "$1"); // a sentence's full stop: "2.5 cm." or "6.25 cm2."
  s = s.replace(/[⁺⁻]?[⁰¹²³⁴⁵⁶⁷⁸⁹]+/g, (sup) => `^${fromSuperscript(sup)}`);
  s = s.replace(/\s+per\s+/gi, "/").replace(/[·⋅∙•×*]/g, "*");
  s = s.replace(/\s*([/*^])\s*/g, "$1").replace(/\s+/g, "*");
  const parts = s.split("/");
  if (parts.length > 2) return { ok: false, reason: "a unit may have at most one “/”" };
  const sides: string[] = [];
  for (const side of parts) {
    const factors: string[] = [];
    for (const token of side.split("*")) {
      const m = /^([A-Za-z]+)(?:\^(-?[1-4])|([2-4]))?$/.exec(token);
      if (!m) return { ok: false, reason: `“${token || raw.trim()}” is not a unit we know` };
      const [, letters, caretPower, digitPower] = m;
      const joined = JOINED_PRODUCT.exec(letters);
      if (joined && !caretPower && !digitPower) {
        factors.push(joined[1], joined[2]);
        continue;
      }
      const symbol = UNIT_SYMBOLS.has(letters) ? letters : FORGIVEN_CASE[letters] ?? UNIT_NAMES[letters.toLowerCase()];
      if (symbol === undefined) return { ok: false, reason: `“${letters}” is not a unit we know` };
      if (digitPower && !LENGTH_SYMBOLS.has(letters)) return { ok: false, reason: `“${token}” is not a unit we know` };
      const power = caretPower ?? digitPower;
      factors.push(power ? `${symbol}^${power}` : symbol);
    }
    sides.push(factors.join("*"));
  }
  return { ok: true, unit: sides.join("/") };
}

/** A value in one unit converted to another by js-quantities; null when they do not convert. */
export function convertUnits(value: number, fromUnit: string, toUnit: string): number | null {
  if (fromUnit === toUnit) return value;
  try {
    const converted = Qty(value, fromUnit).to(toUnit).scalar;
    return Number.isFinite(converted) ? converted : null;
  } catch {
    return null;
  }
}

/** Whether two canonical units measure the same kind of quantity ("" is a plain number). */
export function sameKind(unitA: string, unitB: string): boolean {
  if (unitA === "" || unitB === "") return unitA === unitB;
  try {
    return Qty(1, unitA).isCompatible(unitB);
  } catch {
    return false;
  }
}

const KIND_NAMES: readonly [string, string][] = [
  ["m", "a length"],
  ["N", "a force"],
  ["N/m", "a stiffness (force per length)"],
  ["kg", "a mass"],
  ["Pa", "a pressure or modulus (force per area)"],
  ["N*m", "a force times a length"],
  ["m/N", "a length per force"],
  ["m^2", "an area"],
  ["m^4", "a second moment of area"],
];

/** The kind of quantity a canonical unit measures, in words ("a length", "a force", …). */
export function describeKind(unit: string): string {
  if (unit === "") return "a plain number";
  return KIND_NAMES.find(([reference]) => sameKind(unit, reference))?.[1] ?? "another kind of quantity";
}

// ───────────── 4. significant figures ─────────────

/**
 * Significant figures of a typed mantissa (decimal point already normalised, no groups):
 * leading zeros never count; with a decimal point every later digit counts (2.50 → 3); in a
 * whole number trailing zeros may or may not count (65300 → 3 to 5). Zero written "0.00"
 * counts the digits after the point (common practice, no source).
 */
export function countSignificantFigures(mantissa: string): { min: number; max: number } {
  const hasPoint = mantissa.includes(".");
  const digits = mantissa.replace(".", "");
  const first = digits.search(/[1-9]/);
  if (first === -1) {
    const after = hasPoint ? (mantissa.split(".")[1] ?? "").length : 0;
    const n = Math.max(1, after);
    return { min: n, max: n };
  }
  const significant = digits.slice(first);
  if (hasPoint) return { min: significant.length, max: significant.length };
  return { min: significant.replace(/0+$/, "").length, max: significant.length };
}

/**
 * Round a number to `figures` significant figures by the rules of NIST SP 811 (2008), Appendix
 * B.7.1 "Rounding numbers", applied to the number's shortest decimal form (so 2.45 is rounded as
 * the decimal 2.45, not as its binary neighbour):
 *   1. discarded digits begin with 0–4: the kept digits stay;
 *   2. they begin with 5 followed by any non-zero digit, or with 6–9: the last kept digit goes up by 1;
 *   3. they are exactly 5 (followed only by zeros): the last kept digit goes up by 1 if it is odd and
 *      stays if it is even — so the result always ends in an even digit.
 * Rule 3 is "round half to even", NOT "round half up". Returns the value and its text with the
 * trailing zeros that carry the figures (7.0, 6.9750); very large or small values, and whole
 * numbers whose trailing zeros would be ambiguous, are written "6.53 × 10^4". Null for a
 * non-finite value or a figure count outside 1–17.
 */
export function roundToSignificantFigures(value: number, figures: number): { value: number; text: string } | null {
  if (!Number.isFinite(value) || !Number.isInteger(figures) || figures < 1 || figures > 17) return null;
  const negative = value < 0;
  const [m, e] = Math.abs(value).toExponential().split("e");
  const allDigits = m.replace(".", "");
  let exponent = Number(e);
  if (/^0+$/.test(allDigits)) {
    return { value: 0, text: figures === 1 ? "0" : `0.${"0".repeat(figures - 1)}` };
  }
  let kept = allDigits.slice(0, figures).padEnd(figures, "0");
  const discarded = allDigits.slice(figures);
  const lastKeptOdd = Number(kept[kept.length - 1]) % 2 === 1;
  const roundUp =
    discarded.length > 0 &&
    (discarded[0] > "5" ||
      (discarded[0] === "5" && /[1-9]/.test(discarded.slice(1))) ||
      (discarded[0] === "5" && !/[1-9]/.test(discarded.slice(1)) && lastKeptOdd));
  if (roundUp) {
    const bumped = (BigInt(kept) + 1n).toString();
    if (bumped.length > figures) {
      exponent += 1; // 9.99 → 10.0
      kept = bumped.slice(0, figures);
    } else kept = bumped;
  }
  const sign = negative ? "-" : "";
  const rounded = Number(`${sign}${kept[0]}.${kept.slice(1)}e${exponent}`);
  // Plain decimals when the last kept digit is at or right of the units place and nothing
  // is ambiguous; otherwise "d.dd × 10^n".
  const lastPlace = exponent - (figures - 1);
  const plainOk = exponent >= -6 && exponent <= 15 && (lastPlace < 0 || (lastPlace === 0 && !kept.endsWith("0")));
  let text: string;
  if (plainOk) {
    if (exponent >= 0) {
      const whole = kept.slice(0, exponent + 1);
      const fraction = kept.slice(exponent + 1);
      text = fraction ? `${whole}.${fraction}` : whole;
    } else {
      text = `0.${"0".repeat(-exponent - 1)}${kept}`;
    }
  } else {
    text = `${kept[0]}${kept.length > 1 ? `.${kept.slice(1)}` : ""} × 10^${exponent}`;
  }
  return { value: rounded, text: sign + text };
}

// ───────────── parsing, all together ─────────────

export type ParseResult = { ok: true; answer: ParsedAnswer } | { ok: false; reason: string };

/** Words and signs that mean "times" after a plain number ("3 times", "3x"): read as no unit. */
const TIMES_WORDS = new Set(["x", "X", "×", "times"]);

/**
 * Read a typed answer: a number in any usual form (2.5, .5, -3, 2,5, 6.53e4, 6.53 × 10^4,
 * 6.53x10^4, 6.53*10^4, 6.53·10⁴, 65 300) with or without a unit (N, kN, cm, mm, m, N/cm,
 * N/m, N/mm, kg, g, Pa, … and their written-out names), with or without a space. Never throws.
 */
export function parseAnswer(typed: unknown): ParseResult {
  if (typeof typed !== "string") return { ok: false, reason: "the answer is not text" };
  if (typed.length > MAX_TYPED_LENGTH) return { ok: false, reason: `the answer is longer than ${MAX_TYPED_LENGTH} characters` };
  const text = normaliseTyped(typed);
  if (text === "") return { ok: false, reason: "the answer is empty" };
  const number = scanNumber(text);
  if (!number.ok) return number;
  const rest = number.rest;
  const unit = TIMES_WORDS.has(rest) ? { ok: true as const, unit: "" } : readUnit(rest);
  if (!unit.ok) return unit;
  return {
    ok: true,
    answer: {
      value: number.value,
      unit: unit.unit === "" ? null : unit.unit,
      sigFigs: countSignificantFigures(number.mantissa),
    },
  };
}

// ───────────── 5. tolerance ─────────────

/**
 * Whether `actual` is within tolerance of `expected`. A relative floor of 1e-9 always applies, so
 * binary noise from unit conversion (25 mm → 2.5000000000000004 cm) never fails a right answer.
 */
function withinTolerance(actual: number, expected: number, tolerance: Tolerance): boolean {
  const diff = Math.abs(actual - expected);
  const floor = 1e-9 * Math.max(Math.abs(expected), Math.abs(actual)) + Number.MIN_VALUE;
  const relOk = tolerance.relative !== undefined ? diff <= tolerance.relative * Math.abs(expected) + floor : undefined;
  const absOk = tolerance.absolute !== undefined ? diff <= tolerance.absolute + floor : undefined;
  if (relOk === undefined && absOk === undefined) return diff <= floor;
  if (relOk === undefined) return absOk === true;
  if (absOk === undefined) return relOk;
  return tolerance.combine === "both" ? relOk && absOk : relOk || absOk;
}

// ───────────── 6. slips ─────────────

interface Candidate {
  code: string;
  hint: string;
  value: number;
  /** canonical unit of the candidate value ("" for a plain number) */
  unit: string;
  tolerance?: Tolerance;
}

/** The wrong answers worth looking for, given the expected answer's kind and the exercise's context. */
function slipCandidates(expected: ExpectedAnswer, expectedUnit: string): Candidate[] {
  const c = expected.context ?? {};
  const out: Candidate[] = [];
  const known = (x: number | undefined): x is number => typeof x === "number" && Number.isFinite(x);
  const add = (code: SlipCode, value: number, unit: string) => {
    if (Number.isFinite(value)) out.push({ code, hint: SLIP_HINTS[code], value, unit });
  };

  for (const w of expected.knownWrongAnswers ?? []) {
    const u = readUnit(w.unit);
    if (u.ok && Number.isFinite(w.value)) out.push({ code: w.code, hint: w.hint, value: w.value, unit: u.unit, tolerance: w.tolerance });
  }

  const isLength = sameKind(expectedUnit, "m");
  const isStiffness = sameKind(expectedUnit, "N/m");
  const isForce = sameKind(expectedUnit, "N");

  if (isLength) {
    if (known(c.loadedReadingCm)) add("loaded-reading-as-deformation", c.loadedReadingCm, "cm");
    if (known(c.totalLengthCm)) add("total-length-as-change", c.totalLengthCm, "cm");
    if (known(c.unloadedLengthCm)) add("total-length-as-change", c.unloadedLengthCm, "cm");
  }
  if (isStiffness && known(c.forceN)) {
    if (known(c.loadedReadingCm) && c.loadedReadingCm !== 0) add("loaded-reading-as-deformation", c.forceN / c.loadedReadingCm, "N/cm");
    if (known(c.totalLengthCm) && c.totalLengthCm !== 0) add("total-length-as-change", c.forceN / c.totalLengthCm, "N/cm");
    if (known(c.unloadedLengthCm) && c.unloadedLengthCm !== 0) add("total-length-as-change", c.forceN / c.unloadedLengthCm, "N/cm");
    if (known(c.deformationCm)) {
      add("multiplied-not-divided", c.forceN * c.deformationCm, "N*cm");
      if (c.forceN !== 0) add("ratio-upside-down", c.deformationCm / c.forceN, "cm/N");
    }
  }
  // Any ratio (a stiffness, a plain-number ratio, …) turned upside down, in the expected unit's
  // inverse ("0.2 cm/N" for 5 N/cm) or written with the expected unit ("0.2 N/cm").
  if ((expectedUnit === "" || expectedUnit.includes("/")) && expected.value !== 0) {
    add("ratio-upside-down", 1 / expected.value, expectedUnit);
    if (expectedUnit !== "") {
      try {
        const inverse = Qty(expected.value, expectedUnit).inverse();
        add("ratio-upside-down", inverse.scalar, inverse.units());
      } catch {
        // no inverse unit: the plain-number candidate above still applies
      }
    }
  }
  // The right size with the other sign: a subtraction the other way round, such as a bent strip's
  // loaded height minus its unloaded height (common practice, no source: the slip teachers meet most).
  if (expected.value !== 0) add("sign-reversed", -expected.value, expectedUnit);
  if (isForce) {
    const asNewtons = convertUnits(expected.value, expectedUnit, "N");
    if (asNewtons !== null) add("mass-not-weight", asNewtons / G_N_PER_KG, "kg");
  }
  for (const [code, factor] of [
    ["unit-factor-10", 10],
    ["unit-factor-100", 100],
    ["unit-factor-1000", 1000],
  ] as const) {
    add(code, expected.value * factor, expectedUnit);
    add(code, expected.value / factor, expectedUnit);
  }
  return out;
}

/**
 * The first slip that explains the typed value. A candidate of the expected kind is compared in
 * the expected unit with the exercise's tolerance; a candidate of another kind (N·cm, cm/N, kg)
 * is compared in its own unit with the relative tolerance only. A typed number without a unit is
 * read in the unit it is compared in.
 */
function findSlip(
  parsed: ParsedAnswer,
  expected: ExpectedAnswer,
  expectedUnit: string,
  tolerance: Tolerance,
): { code: string; hint: string } | undefined {
  const typedIn = (unit: string): number | null =>
    parsed.unit === null ? parsed.value : sameKind(parsed.unit, unit) ? convertUnits(parsed.value, parsed.unit, unit) : null;

  for (const cand of slipCandidates(expected, expectedUnit)) {
    if (sameKind(cand.unit, expectedUnit)) {
      const target = convertUnits(cand.value, cand.unit, expectedUnit);
      // A candidate that is itself (nearly) the right answer explains nothing.
      if (target === null || withinTolerance(target, expected.value, tolerance)) continue;
      const typed = typedIn(expectedUnit);
      if (typed !== null && withinTolerance(typed, target, cand.tolerance ?? tolerance)) return { code: cand.code, hint: cand.hint };
    } else {
      const typed = typedIn(cand.unit);
      const relativeOnly: Tolerance = cand.tolerance ?? { relative: tolerance.relative ?? DEFAULT_TOLERANCE.relative };
      if (typed !== null && withinTolerance(typed, cand.value, relativeOnly)) return { code: cand.code, hint: cand.hint };
    }
  }
  return undefined;
}

// ───────────── 7. checkAnswer ─────────────

/** Problems with an exercise's expected answer (an authoring check; empty when it is usable). */
export function validateExpectedAnswer(expected: ExpectedAnswer): string[] {
  const problems: string[] = [];
  if (typeof expected !== "object" || expected === null) return ["the expected answer is missing"];
  if (typeof expected.value !== "number" || !Number.isFinite(expected.value)) problems.push("value must be a finite number");
  if (typeof expected.unit !== "string" || !readUnit(expected.unit).ok) problems.push(`unit "${String(expected.unit)}" is not in the course vocabulary`);
  const t = expected.tolerance;
  if (t !== undefined) {
    if (typeof t !== "object" || t === null) problems.push("tolerance must be an object");
    else {
      for (const key of ["relative", "absolute"] as const) {
        const v = t[key];
        if (v !== undefined && !(typeof v === "number" && Number.isFinite(v) && v >= 0)) problems.push(`tolerance.${key} must be a number, 0 or more`);
      }
    }
  }
  if (expected.context !== undefined && (typeof expected.context !== "object" || expected.context === null)) {
    problems.push("context must be an object");
  }
  const wrongs = expected.knownWrongAnswers;
  if (wrongs !== undefined && !(Array.isArray(wrongs) && wrongs.every((w) => typeof w === "object" && w !== null && typeof w.code === "string" && typeof w.hint === "string" && typeof w.value === "number" && typeof w.unit === "string"))) {
    problems.push("knownWrongAnswers must be a list of { code, value, unit, hint }");
  }
  const sf = expected.sigFigs;
  if (sf !== undefined && !(typeof sf === "object" && sf !== null && Number.isInteger(sf.count) && sf.count >= 1 && sf.count <= 15)) {
    problems.push("sigFigs.count must be a whole number from 1 to 15");
  }
  return problems;
}

const HOW_TO_WRITE = "Write a number and its unit, for example 2.5 cm, 0.45 N/cm or 6.53 × 10^4 N/m.";
const COULD_NOT_READ = "We could not read that answer";

/** Format a unit for a student: "N*cm" → "N·cm". */
const showUnit = (unit: string) => unit.replace(/\*/g, "·");
const show = (value: number, unit: string | null) => `${Number(value.toPrecision(12))}${unit ? ` ${showUnit(unit)}` : ""}`;

/**
 * Check what a student typed against an exercise's expected answer (value in `expected.unit`).
 * Never throws: anything unexpected becomes "unreadable" (the typed text) or "not-checkable"
 * (the exercise). When a wrong answer matches a known slip, the outcome is "incorrect" with the
 * slip even if the unit is of another kind (force × deformation typed in N·cm is a slip, not a unit problem).
 */
export function checkAnswer(typed: string, expected: ExpectedAnswer): CheckResult {
  try {
    return checkAnswerUnsafe(typed, expected);
  } catch {
    return { outcome: "unreadable", parsed: null, message: `${COULD_NOT_READ}. ${HOW_TO_WRITE}` };
  }
}

/** The shape of a table to complete (TableTemplate in exercises.ts): the `null` cells are typed in. */
export interface TableShape {
  columns: readonly string[];
  rows: readonly (readonly (string | null)[])[];
}

/**
 * A name for each empty cell of a table, in reading order, for feedback: the row, as "Row 2", or its
 * label when its first cell is words rather than a quantity ("Spring A", "Mean of the three
 * readings"); with the column after it when the row has more than one empty cell ("Row 2, x²").
 * When there is no table, or it does not have `count` empty cells, the cells are counted instead
 * ("Cell 4"), so a message never names a row the table does not have.
 */
export function tableCellNames(table: TableShape | undefined, count?: number): string[] {
  const names: string[] = [];
  table?.rows.forEach((row, r) => {
    const first = row[0];
    const label = typeof first === "string" && first.trim() !== "" && !parseAnswer(first).ok ? first.trim() : null;
    const rowName = label ?? `Row ${r + 1}`;
    const empty = row.filter((cell) => cell === null).length;
    row.forEach((cell, c) => {
      if (cell === null) names.push(empty > 1 ? `${rowName}, ${table.columns[c] ?? `column ${c + 1}`}` : rowName);
    });
  });
  const wanted = count ?? names.length;
  if (table && names.length === wanted) return names;
  return Array.from({ length: wanted }, (_, i) => `Cell ${i + 1}`);
}

/**
 * Check a table of answers, one typed cell per expected cell, each named from the table's template
 * (tableCellNames). A cell that cannot be read makes the whole table "unreadable" (no try used, as
 * for a single answer), naming each such cell; otherwise every wrong cell is named with its own
 * feedback, and the outcome (and slip) is the first wrong cell's. `wrongCells` lists the cells named.
 */
export function checkTableAnswers(typedCells: readonly string[], expectedCells: readonly ExpectedAnswer[], table?: TableShape): CheckResult & { wrongCells: number[] } {
  const names = tableCellNames(table, expectedCells.length);
  const cells = expectedCells.map((expected, i) => ({ index: i, name: names[i], result: checkAnswer(typedCells[i] ?? "", expected) }));
  const unreadable = cells.filter(({ result }) => NO_TRY_OUTCOMES.has(result.outcome));
  if (unreadable.length > 0) {
    const named = unreadable.map(({ name, result }) => {
      const message = result.message.replace(` ${HOW_TO_WRITE}`, "");
      return message.startsWith(COULD_NOT_READ) ? message.replace(COULD_NOT_READ, `${name} could not be read`) : `${name}: ${message}`;
    });
    const outcome = unreadable.some(({ result }) => result.outcome === "not-checkable") ? "not-checkable" : "unreadable";
    // One line per cell (the lesson page shows each on its own line).
    return { outcome, parsed: null, message: [...named, HOW_TO_WRITE].join("\n"), wrongCells: unreadable.map(({ index }) => index) };
  }
  const wrong = cells.filter(({ result }) => result.outcome !== "correct");
  if (wrong.length === 0) return { outcome: "correct", parsed: null, message: "Every cell is right.", wrongCells: [] };
  return {
    ...wrong[0].result,
    message: wrong.map(({ name, result }) => `${name}: ${result.message}`).join("\n"),
    wrongCells: wrong.map(({ index }) => index),
  };
}

function checkAnswerUnsafe(typed: string, expected: ExpectedAnswer): CheckResult {
  const problems = validateExpectedAnswer(expected);
  if (problems.length > 0) {
    return {
      outcome: "not-checkable",
      parsed: null,
      message: "This exercise cannot be checked right now. Tell your teacher; your answer was not counted against you.",
    };
  }
  const expectedUnitRead = readUnit(expected.unit);
  const expectedUnit = expectedUnitRead.ok ? expectedUnitRead.unit : "";
  const tolerance: Tolerance = expected.tolerance ?? DEFAULT_TOLERANCE;

  const read = parseAnswer(typed);
  if (!read.ok) {
    return { outcome: "unreadable", parsed: null, message: `${COULD_NOT_READ}: ${read.reason}. ${HOW_TO_WRITE}` };
  }
  const answer = read.answer;
  const parsed = { value: answer.value, unit: answer.unit };
  const wrong = (message: string): CheckResult => {
    const slip = findSlip(answer, expected, expectedUnit, tolerance);
    return slip
      ? { outcome: "incorrect", parsed, slip, message: `${message} ${slip.hint}` }
      : { outcome: "incorrect", parsed, message };
  };

  // The typed value in the expected unit, or why there is none.
  let valueInExpected: number | null;
  if (answer.unit === null) {
    valueInExpected = answer.value;
  } else if (expectedUnit === "" || !sameKind(answer.unit, expectedUnit)) {
    const slip = findSlip(answer, expected, expectedUnit, tolerance);
    if (slip) return { outcome: "incorrect", parsed, slip, message: `That does not match. ${slip.hint}` };
    if (expectedUnit === "") {
      // A ratio with a unit after it is not read at all (no try used), whether its number is right or not:
      // the student learns that the quantity has no unit, and sends the number alone.
      return {
        outcome: "unreadable",
        parsed: null,
        message: `This quantity has no unit: it is a plain number (a ratio), so “${showUnit(answer.unit)}” does not belong after it. Write the number alone. No try was used.`,
      };
    }
    const numberRight = withinTolerance(answer.value, expected.value, tolerance);
    return {
      outcome: "unit-wrong-kind",
      parsed,
      message: `${showUnit(answer.unit)} measures ${describeKind(answer.unit)}, but this answer is ${describeKind(expectedUnit)}.${numberRight ? " The number itself looks right." : ""} Check which quantity the question asks for.`,
    };
  } else {
    valueInExpected = convertUnits(answer.value, answer.unit, expectedUnit);
    if (valueInExpected === null) return wrong("That does not match.");
  }

  if (!withinTolerance(valueInExpected, expected.value, tolerance)) {
    if (answer.unit === null && expectedUnit !== "") return wrong(`That does not match, and it needs a unit (${showUnit(expectedUnit)} or similar).`);
    return wrong("That does not match.");
  }
  if (answer.unit === null && expectedUnit !== "") {
    return {
      outcome: "unit-missing",
      parsed,
      message: `The number is right, but the unit is missing: write the unit after the number (this answer is ${describeKind(expectedUnit)}).`,
    };
  }

  if (expected.unitRequired && answer.unit !== null && answer.unit !== expectedUnit) {
    const hint = `${SLIP_HINTS["unit-not-converted"]} Here: ${showUnit(expectedUnit)}.`;
    return { outcome: "incorrect", parsed, slip: { code: "unit-not-converted", hint }, message: `Not in the unit asked for. ${hint}` };
  }

  const rule = expected.sigFigs;
  if (rule) {
    const { min, max } = answer.sigFigs;
    const typedFigures = min === max ? `${min}` : `${min} to ${max}`;
    if (rule.count < min || rule.count > max) {
      return {
        outcome: "sig-figs-off",
        parsed,
        message: `The value is right, but write it to ${rule.count} significant figure${rule.count === 1 ? "" : "s"} (you wrote ${typedFigures}).`,
      };
    }
    if (rule.exactRounding) {
      const rounded = roundToSignificantFigures(expected.value, rule.count);
      if (rounded !== null && !withinTolerance(valueInExpected, rounded.value, {})) {
        return {
          outcome: "sig-figs-off",
          parsed,
          message: `Close, but rounded to ${rule.count} significant figures the value is ${rounded.text}${expectedUnit ? ` ${showUnit(expectedUnit)}` : ""}.`,
        };
      }
    }
  }

  const converted = answer.unit !== null && answer.unit !== expectedUnit ? ` (${show(answer.value, answer.unit)} is ${show(valueInExpected, expectedUnit)})` : "";
  return { outcome: "correct", parsed, message: `Correct${converted}.` };
}
