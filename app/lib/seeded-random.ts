/**
 * Seeded pseudo-random numbers for per-student exercises: the same seed gives the same numbers
 * on every visit (and on every server), a different seed gives the student beside them other
 * numbers. Built on the `seedrandom` package (its default ARC4-based generator).
 *
 * Not for anything secret: seeds are guessable by design.
 */
import seedrandom from "seedrandom";

export interface SeededRandom {
  /** the next number in [0, 1) */
  next(): number;
  /** a number in [min, max) */
  uniform(min: number, max: number): number;
  /**
   * a number on the grid min, min + step, min + 2·step, … that does not pass max, each grid
   * value equally likely; written cleanly (0.1 + 0.2 gives 0.3, not 0.30000000000000004)
   */
  uniformStep(min: number, max: number, step: number): number;
  /** a whole number from min to max, both included */
  integer(min: number, max: number): number;
  /** one item of a non-empty list, each equally likely */
  pick<T>(items: readonly T[]): T;
  /** a shuffled copy of a list (Fisher–Yates) */
  shuffle<T>(items: readonly T[]): T[];
}

/** Decimal places needed to write a step such as 0.25 (2) or 1e-3 (3), so grid values can be cleaned. */
function decimalsOf(step: number): number {
  const [mantissa, exponent] = step.toExponential().split("e");
  const fraction = mantissa.split(".")[1]?.length ?? 0;
  return Math.min(20, Math.max(0, fraction - Number(exponent)));
}

/**
 * Seed the exercise key, e.g. exerciseSeed(studentId, "stiffness-1", 0): joins the parts with a
 * separator that cannot appear inside a part's JSON form, so ("a|b","c") and ("a","b|c") differ.
 */
export function exerciseSeed(...parts: readonly (string | number)[]): string {
  return JSON.stringify(parts);
}

/** A seeded generator with helpers for exercise numbers; throws RangeError on impossible ranges. */
export function seededRandom(seed: string): SeededRandom {
  const prng = seedrandom(seed);
  const next = () => prng();

  const integer = (min: number, max: number): number => {
    if (!Number.isInteger(min) || !Number.isInteger(max) || max < min) {
      throw new RangeError(`integer(${min}, ${max}): need whole numbers with min ≤ max`);
    }
    return min + Math.floor(next() * (max - min + 1));
  };

  return {
    next,
    uniform(min, max) {
      if (!Number.isFinite(min) || !Number.isFinite(max) || max < min) {
        throw new RangeError(`uniform(${min}, ${max}): need finite numbers with min ≤ max`);
      }
      return min + next() * (max - min);
    },
    uniformStep(min, max, step) {
      if (!Number.isFinite(min) || !Number.isFinite(max) || max < min || !(step > 0) || !Number.isFinite(step)) {
        throw new RangeError(`uniformStep(${min}, ${max}, ${step}): need min ≤ max and a step above 0`);
      }
      // Count the grid values first (with a little slack so 0.1…0.9 step 0.1 keeps 0.9).
      const count = Math.floor((max - min) / step + 1e-9) + 1;
      const k = integer(0, count - 1);
      const places = Math.max(decimalsOf(step), decimalsOf(Math.abs(min) || 1));
      return Number((min + k * step).toFixed(places));
    },
    integer,
    pick(items) {
      if (items.length === 0) throw new RangeError("pick: the list is empty");
      return items[Math.floor(next() * items.length)];
    },
    shuffle(items) {
      const copy = [...items];
      for (let i = copy.length - 1; i > 0; i--) {
        const j = Math.floor(next() * (i + 1));
        [copy[i], copy[j]] = [copy[j], copy[i]];
      }
      return copy;
    },
  };
}
