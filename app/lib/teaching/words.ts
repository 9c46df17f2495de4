// Teacher-facing words for what the answer checker decided. Our own wording; no server code.
import { NO_TRY_OUTCOMES } from "~/lib/answer-checker";

const SLIP_WORDS: Record<string, string> = {
  "loaded-reading-as-deformation": "Gave the loaded ruler reading instead of the deformation",
  "total-length-as-change": "Gave a whole length instead of the change in length",
  "multiplied-not-divided": "Multiplied instead of dividing",
  "ratio-upside-down": "Turned the ratio upside down",
  "sign-reversed": "Subtracted the wrong way round (the sign is reversed)",
  "unit-factor-10": "Off by a factor of 10 (the decimal point or a unit)",
  "unit-factor-100": "Off by a factor of 100 (a unit slip)",
  "unit-factor-1000": "Off by a factor of 1000 (a unit slip)",
  "mass-not-weight": "Gave a mass instead of a weight in newtons",
  "unit-not-converted": "Gave the right value without converting it to the unit asked for",
  // Slips named by single exercises of the lessons (lessons/*/exercises.server.ts).
  "millimetres-as-hundredths": "Read each millimetre mark as 0.01 cm",
  "counted-down-from-number-above": "Counted the marks down from the number above",
  "marks-not-counted": "Gave the number below the edge without its small marks",
  "one-reading-only": "Gave how far off one reading can be, not a difference of two",
  "whole-mark-for-one-reading": "Gave a whole mark where half a mark was asked",
  "offset-wrong-way": "Corrected the scale's zero the wrong way",
  "offset-ignored": "Left out the scale's zero correction",
  "sums-upside-down": "Turned the fraction of sums upside down",
  "forgot-one-minus": "Gave the part the line misses, not 1 minus it",
  "divided-wrong-way": "Divided the wrong way round",
  "divided-not-multiplied": "Divided instead of multiplying",
  "divided-by-count": "Divided by the number of strips (the rule for pieces end to end)",
  "cubed-count": "Cubed the number of strips (the rule for a glued stack)",
  "one-strip-only": "Worked with one strip instead of the bundle",
  "added-like-side-by-side": "Added the stiffnesses, as for pieces side by side",
  "forgot-last-reciprocal": "Left out the last step: 1 ÷ the sum",
  averaged: "Averaged the two stiffnesses",
  "used-loaded-reading": "Used the loaded reading instead of the return reading",
  "loaded-reading-as-set": "Gave the ruler reading with the load on as the permanent set",
  "return-reading-as-set": "Gave the return reading itself, not its difference from the reference",
  "first-permanent-load": "Gave the first load that left a permanent set",
  "multiplied-by-factor": "Multiplied by the safety factor instead of dividing",
  "divided-by-factor": "Divided by the safety factor instead of multiplying",
  "forgot-safety-factor": "Left out the safety factor",
  "mass-times-factor": "Multiplied a mass, not a weight, by the safety factor",
  "width-and-thickness-swapped": "Swapped width and thickness",
  "forgot-twelve": "Left out the division by 12",
  "squared-not-cubed": "Squared the thickness instead of cubing it",
  "not-cubed": "Did not cube the thickness ratio",
  "compared-with-one-strip": "Compared the glued stack with one strip, not with the loose bundle",
  "thickness-not-cubed": "Took the glued stack to be no stiffer than the loose bundle",
  "span-not-cubed": "Did not cube the span ratio",
  "mass-number-as-newtons": "Wrote the mass in kilograms as newtons",
  "grams-not-kilograms": "Used the mass in grams, not kilograms",
};

const OUTCOME_WORDS: Record<string, string> = {
  correct: "Right",
  "unit-missing": "Right number, but no unit",
  "unit-wrong-kind": "A unit of another quantity",
  "sig-figs-off": "Right value, other significant figures than asked",
  incorrect: "Wrong (not one of the usual slips)",
  unreadable: "Could not be read (no try used)",
  "not-checkable": "Not checkable (no try used)",
};

/** The group a wrong answer falls in: its named slip, or else what the checker decided. */
export function wrongAnswerGroup(slipCode: string | null, outcome: string): { key: string; label: string } {
  if (slipCode) return { key: `slip:${slipCode}`, label: SLIP_WORDS[slipCode] ?? `Slip “${slipCode}”` };
  return { key: `outcome:${outcome}`, label: OUTCOME_WORDS[outcome] ?? outcome };
}

export function outcomeWords(outcome: string): string {
  return OUTCOME_WORDS[outcome] ?? outcome;
}

/**
 * What the student typed, readable: tables and choices are stored as JSON. A choice shows the label
 * the student saw (`choiceLabels`, from choiceLabelReader in course.server.ts), else its stored value.
 */
export function readableAnswer(raw: string, choiceLabels?: Map<string, string> | null): string {
  try {
    const value = JSON.parse(raw) as unknown;
    if (Array.isArray(value)) return value.map((c) => String(c || "—")).join(" | ");
    if (value && typeof value === "object" && "choice" in value) {
      const { choice, reason } = value as { choice: unknown; reason?: unknown };
      const shown = choiceLabels?.get(String(choice)) ?? String(choice);
      return reason ? `${shown} — “${String(reason)}”` : shown;
    }
  } catch {
    // Plain text answers are not JSON.
  }
  return raw;
}


/** A student's try as a teacher or parent reads it. */
export interface TryAsRead {
  id: string;
  /** "Try 2" counting only the tries that counted; "Not counted" for an answer that used no try */
  label: string;
  answer: string;
  right: boolean;
  /** "right", the named slip, or what the checker decided */
  what: string;
  at: string;
}

/**
 * A student's tries at one exercise, oldest first, as teachers and parents read them: the answer as
 * the student saw it (`choiceLabels`), what the checker decided, and when (`at`, already formatted).
 */
export function triesAsRead(
  attempts: { id: string; rawAnswer: string; correct: number | boolean; outcome: string; slipCode: string | null; at: string }[],
  choiceLabels?: Map<string, string> | null,
): TryAsRead[] {
  let counted = 0;
  return attempts.map((a) => {
    const right = a.correct === true || a.correct === 1;
    return {
      id: a.id,
      label: NO_TRY_OUTCOMES.has(a.outcome) ? "Not counted" : `Try ${++counted}`,
      answer: readableAnswer(a.rawAnswer, choiceLabels),
      right,
      what: right ? "right" : a.slipCode ? wrongAnswerGroup(a.slipCode, a.outcome).label : outcomeWords(a.outcome),
      at: a.at,
    };
  });
}

/** The roster check's button: "Add this student to the class", "Add these 3 students to the class". */
export function addStudentsLabel(count: number): string {
  return count === 1 ? "Add this student to the class" : `Add these ${count} students to the class`;
}
