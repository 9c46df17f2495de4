/**
 * The science of Bendwise: how strips, sticks and bundles deform under load.
 *
 * Pure TypeScript: no React, no database, no I/O. Lessons, the answer checker, the teacher's tools
 * and `POST /api/analysis` all call these functions, so each one is tested against a published
 * reference where one exists (see tests/unit/science.test.ts).
 *
 * Unit conventions, the same everywhere in this file:
 * - classroom readings: force in N, ruler readings and deformations in cm, stiffness in N/cm;
 * - beam formulas (the "Beams" section): SI only — N, m, Pa (N/m²), m⁴.
 *
 * Map of the file:
 *   1. constants and small helpers
 *   2. readings → deformation, stiffness of one reading, permanent set
 *   3. least-squares fits (through the origin, with a free intercept) — NIST StRD conventions
 *   4. proportionality verdict (the written rule)
 *   5. elastic limit, breaking load
 *   6. specimens together: ratio, side by side, glued stack, in series
 *   7. beams: second moment of area, midspan deflection, Young's modulus, scaling
 *   8. weight from mass, reading uncertainty carried into stiffness
 *   9. design check
 *  10. analyseReadings — the `POST /api/analysis` contract
 *  11. cautions: a reading that looks mistyped, a force that goes back down
 */

// ───────────────────────────── 1. constants and small helpers ─────────────────────────────

/**
 * Gravitational field strength used throughout Bendwise: 9.81 N/kg (the value every lesson and
 * exercise uses; standard gravity is 9.806 65 m/s², rounded to three significant figures).
 */
export const G_N_PER_KG = 9.81;

/** Whether a reading goes down (a beam bends) or up (a band stretches) as load is added. */
export type Mode = "bend" | "stretch";

/** One force–deformation pair: force in N, deformation in cm. */
export interface ForceDeformation {
  forceN: number;
  deformationCm: number;
}

/**
 * A finite number, or null: every value leaving this module is one or the other (never NaN).
 * −0 becomes 0, so an answer reads the same before and after a JSON round trip.
 */
function finiteOrNull(x: number): number | null {
  if (!Number.isFinite(x)) return null;
  return x === 0 ? 0 : x;
}

/**
 * Comparisons against the ruler's resolution allow for binary rounding noise: 20.0 − 19.9 is
 * 0.10000000000000142 in floating point, which must still count as "within 0.1 cm".
 */
function withinResolution(distanceCm: number, resolutionCm: number): boolean {
  return Math.abs(distanceCm) <= resolutionCm * (1 + 1e-9) + 1e-12;
}

/**
 * The difference of two readings, cleaned of binary noise: rounded to 12 significant digits of
 * the larger reading (a ruler never gives more), so 20.3 − 19.9 is 0.4, not 0.400000000000002.
 */
function readingDifference(a: number, b: number): number {
  const diff = a - b;
  const scale = Math.max(Math.abs(a), Math.abs(b));
  if (!Number.isFinite(diff) || scale === 0) return diff;
  const decimals = Math.min(100, Math.max(0, 12 - Math.floor(Math.log10(scale))));
  return Number(diff.toFixed(decimals));
}

/**
 * A number written for a student: `sig` significant figures, "× 10^n" instead of "e+n", and a
 * space before the unit (NIST SP 811 §7.2: a space separates the numerical value and the unit).
 */
export function formatForStudent(value: number, unit = "", sig = 3): string {
  if (!Number.isFinite(value)) return "—";
  // toPrecision keeps trailing zeros (2.00 has three significant figures) and switches to
  // "1.23e+5" for large and small numbers, which we write the way a student would.
  const [mantissa, exponent] = value.toPrecision(sig).split("e");
  const number = exponent === undefined ? mantissa : `${mantissa} × 10^${Number(exponent)}`;
  return unit ? `${number} ${unit}` : number;
}

/**
 * Floating-point residue set to 0: a computed value within a billionth of the data's own scale
 * (the largest force, say) of 0 is rounding left over from an exact answer (an intercept of
 * 2.2 × 10^-16 N for readings on a perfect line), not something any reading can show.
 */
function snapToZero(x: number, scale: number): number {
  return Math.abs(x) <= 1e-9 * scale ? 0 : x;
}

/** How many decimal places a step such as a ruler's resolution has: 0.1 → 1, 0.25 → 2, 1 → 0 (at most 10). */
export function decimalsOf(step: number): number {
  for (let places = 0; places < 10; places++) {
    if (Math.abs(Number(step.toFixed(places)) - step) <= Math.abs(step) * 1e-9) return places;
  }
  return 10;
}

/**
 * A reading or deformation written to the ruler's resolution, so the zero a student read stays:
 * 38 read to 0.1 cm is "38.0" (lesson 1: "18.0 cm, not 18 cm"). A value with more decimals than
 * the resolution keeps them (19.55 stays "19.55"); no unit.
 */
export function formatToResolution(value: number, resolutionCm: number): string {
  if (!Number.isFinite(value)) return "—";
  const places = Math.max(decimalsOf(resolutionCm), decimalsOf(Number(value.toPrecision(12))));
  const text = value.toFixed(Math.min(places, 10));
  return Number(text) === 0 ? (0).toFixed(Math.min(places, 10)) : text;
}

/**
 * A fitted value with its standard error, for a student: "0.034 N (± 0.047)". The error is given
 * to 2 significant figures and the value to the same decimal place (JCGM 100:2008, the GUM, §7.2.6:
 * an uncertainty needs at most two significant digits). An error of 0 (readings exactly on the
 * line) gives the value to 3 significant figures and "± 0" to the same places: "2.50 N/cm (± 0.00)".
 * Null values are "—".
 */
export function formatWithUncertainty(value: number | null, se: number | null, unit: string): string {
  if (value === null || !Number.isFinite(value)) return "—";
  const withUnit = (number: string) => (unit ? `${number} ${unit}` : number);
  if (se === null || !Number.isFinite(se)) return `${formatForStudent(value, unit)} (± —)`;
  if (se === 0) {
    const shown = formatForStudent(value);
    const places = shown.includes("×") ? 0 : (shown.split(".")[1] ?? "").length;
    return `${withUnit(shown)} (± ${(0).toFixed(places)})`;
  }
  const places = 1 - Math.floor(Math.log10(Math.abs(se)));
  // Beyond 10 decimal places (or a negative error) fixed decimals stop being readable.
  if (places > 10 || se < 0) return `${formatForStudent(value, unit)} (± ${formatForStudent(se, "", 2)})`;
  const fixed = (n: number) => {
    const text = n.toFixed(Math.max(0, places));
    return Number(text) === 0 ? (0).toFixed(Math.max(0, places)) : text;
  };
  return `${withUnit(fixed(value))} (± ${fixed(se)})`;
}

/** A fitted value alone, to the decimal place its standard error allows: the number formatWithUncertainty shows, so a note and a table agree. */
export function formatFitted(value: number | null, se: number | null, unit: string): string {
  return formatWithUncertainty(value, se, unit).replace(/ \(± [^)]*\)$/, "");
}

/** A value the student gave (a force, a reading, a difference of readings) written as given, up to 6 figures: "5 N", "0.3 cm". */
function formatGiven(value: number, unit: string): string {
  if (!Number.isFinite(value)) return "—";
  const short = Number(value.toPrecision(6));
  const plain = short === 0 || (Math.abs(short) >= 1e-4 && Math.abs(short) < 1e9);
  return plain ? `${short} ${unit}` : formatForStudent(short, unit, 6);
}

// ───────────────── 2. readings → deformation, stiffness of one reading, permanent set ─────────────────

/**
 * Deformation in cm from two ruler readings in cm: bend = unloaded − loaded (the beam sags, the
 * height drops), stretch = loaded − unloaded (the band gets longer).
 */
export function deformationCm(mode: Mode, unloadedCm: number, loadedCm: number): number {
  return mode === "bend" ? readingDifference(unloadedCm, loadedCm) : readingDifference(loadedCm, unloadedCm);
}

/** Largest force a reading may give: classroom spring scales read up to 10–50 N (common practice, no source). */
export const MOST_FORCE_N = 100;
/** Largest ruler reading, in cm: a metre stick with room to spare (common practice, no source). */
export const MOST_READING_CM = 300;

/**
 * Readings no lab of this course can give, in a student's words: a negative force, a force beyond any
 * classroom spring scale, a reading beyond any ruler, and a load that moved the piece the wrong way
 * (a bending piece's height rising, a stretched piece getting shorter) by more than one ruler mark.
 * Each problem names the point it is about (its index), or null for the unloaded reading, and the
 * field it is about (a load the wrong way is the loaded reading's).
 */
export function implausibleReadings(input: {
  mode: Mode;
  unloadedCm?: number;
  resolutionCm: number;
  points: { forceN: number; readingCm?: number }[];
}): { point: number | null; field: "forceN" | "readingCm" | "unloadedCm"; problem: string }[] {
  const problems: { point: number | null; field: "forceN" | "readingCm" | "unloadedCm"; problem: string }[] = [];
  // Readings as the student wrote them, to the ruler's resolution: "30.0 cm", not "30 cm".
  const cm = (value: number) =>
    `${Math.abs(value) <= MOST_READING_CM ? formatToResolution(value, input.resolutionCm) : Number(value.toPrecision(6))} cm`;
  const { unloadedCm, mode } = input;
  if (unloadedCm !== undefined && Math.abs(unloadedCm) > MOST_READING_CM) {
    problems.push({ point: null, field: "unloadedCm", problem: `the unloaded reading ${cm(unloadedCm)} is more than any ruler in this lab reads. Check the decimal point.` });
  }
  input.points.forEach((p, index) => {
    if (p.forceN < 0) problems.push({ point: index, field: "forceN", problem: "the force cannot be below 0 N." });
    else if (p.forceN > MOST_FORCE_N) {
      problems.push({ point: index, field: "forceN", problem: `${Number(p.forceN.toPrecision(6))} N is more than a classroom spring scale reads (most go up to 10–50 N). Check the reading.` });
    }
    if (p.readingCm === undefined) return;
    if (Math.abs(p.readingCm) > MOST_READING_CM) {
      problems.push({ point: index, field: "readingCm", problem: `a reading of ${cm(p.readingCm)} is more than any ruler in this lab reads. Check the decimal point.` });
      return;
    }
    if (unloadedCm === undefined || Math.abs(unloadedCm) > MOST_READING_CM) return;
    // One mark the wrong way is reading error; more means a swapped column or a misread ruler.
    if (deformationCm(mode, unloadedCm, p.readingCm) < -input.resolutionCm - 1e-9) {
      problems.push({
        point: index,
        field: "readingCm",
        problem:
          mode === "bend"
            ? `the loaded reading ${cm(p.readingCm)} is above the unloaded reading ${cm(unloadedCm)}, but a bending piece moves down under a load. Check both readings.`
            : `the loaded length ${cm(p.readingCm)} is shorter than the unloaded length ${cm(unloadedCm)}, but a stretched piece gets longer. Check both readings.`,
      });
    }
  });
  return problems;
}

/** Stiffness of one reading in N/cm = force (N) ÷ deformation (cm); null when the deformation is 0. */
export function stiffnessNPerCm(forceN: number, deformationCmValue: number): number | null {
  if (deformationCmValue === 0) return null;
  return finiteOrNull(forceN / deformationCmValue);
}

/**
 * Permanent set in cm: how far the piece stays deformed after the load is removed — the return
 * reading's offset from the unloaded reading, with the same sign rule as the deformation.
 */
export function permanentSetCm(mode: Mode, unloadedCm: number, returnReadingCm: number): number {
  return deformationCm(mode, unloadedCm, returnReadingCm);
}

// ───────────────────── 3. least-squares fits (force on deformation) ─────────────────────

/**
 * A straight line through the origin, force = slope × deformation (slope in N/cm).
 * `null` marks a value that cannot be computed from the data given (see the fit functions).
 */
export interface FitThroughOrigin {
  /** number of points used */
  n: number;
  /** stiffness in N/cm: Σxy / Σx² */
  slope: number | null;
  /** standard error of the slope in N/cm; null with fewer than 2 points */
  slopeSE: number | null;
  /** residual standard deviation in N, on n − 1 degrees of freedom; null with fewer than 2 points */
  residualSD: number | null;
  /** uncentred R² = 1 − RSS / Σy²; null when every force is 0 */
  r2: number | null;
}

/** A straight line with a free intercept, force = intercept + slope × deformation. */
export interface FitWithIntercept {
  n: number;
  /** N/cm */
  slope: number | null;
  /** N: the force the line gives at zero deformation */
  intercept: number | null;
  /** N/cm; null with fewer than 3 points */
  slopeSE: number | null;
  /** N; null with fewer than 3 points */
  interceptSE: number | null;
  /** N, on n − 2 degrees of freedom; null with fewer than 3 points */
  residualSD: number | null;
  /** centred R² = 1 − RSS / Σ(y − ȳ)²; null when every force is the same */
  r2: number | null;
}

/**
 * Least-squares line through the origin of force (N) on deformation (cm), with the conventions
 * of the NIST StRD certified values for NoInt1: slope = Σxy/Σx², residual SD on n − 1
 * degrees of freedom, uncentred R². Null fields where the data cannot give a value.
 */
export function fitThroughOrigin(points: readonly ForceDeformation[]): FitThroughOrigin {
  const n = points.length;
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  let scale = 0;
  for (const p of points) {
    sxx += p.deformationCm * p.deformationCm;
    sxy += p.deformationCm * p.forceN;
    syy += p.forceN * p.forceN;
    scale = Math.max(scale, Math.abs(p.forceN));
  }
  const empty: FitThroughOrigin = { n, slope: null, slopeSE: null, residualSD: null, r2: null };
  if (n === 0 || !(sxx > 0) || !Number.isFinite(sxx) || !Number.isFinite(sxy)) return empty;

  const slope = sxy / sxx;
  // Residuals summed directly (two-pass) rather than Σy² − b·Σxy, which loses digits; rounding
  // residue counts as no miss, so readings on a perfect line give a standard error of exactly 0.
  let rss = 0;
  for (const p of points) {
    const r = snapToZero(p.forceN - slope * p.deformationCm, scale);
    rss += r * r;
  }
  const dof = n - 1;
  const residualSD = dof > 0 ? Math.sqrt(rss / dof) : null;
  return {
    n,
    slope: finiteOrNull(slope),
    slopeSE: residualSD === null ? null : finiteOrNull(residualSD / Math.sqrt(sxx)),
    residualSD: residualSD === null ? null : finiteOrNull(residualSD),
    r2: syy > 0 ? finiteOrNull(1 - rss / syy) : null,
  };
}

/**
 * Least-squares line with a free intercept of force (N) on deformation (cm), NIST StRD
 * conventions as certified for Norris: residual SD on n − 2 degrees of freedom, centred R².
 * Needs 2 points with different deformations for the line, 3 for standard errors.
 */
export function fitWithIntercept(points: readonly ForceDeformation[]): FitWithIntercept {
  const n = points.length;
  const empty: FitWithIntercept = {
    n,
    slope: null,
    intercept: null,
    slopeSE: null,
    interceptSE: null,
    residualSD: null,
    r2: null,
  };
  if (n < 2) return empty;

  let sumX = 0;
  let sumY = 0;
  let scale = 0;
  for (const p of points) {
    sumX += p.deformationCm;
    sumY += p.forceN;
    scale = Math.max(scale, Math.abs(p.forceN));
  }
  const meanX = sumX / n;
  const meanY = sumY / n;
  // Centred sums (two-pass) keep full precision when the data sit far from zero.
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  for (const p of points) {
    const dx = p.deformationCm - meanX;
    const dy = p.forceN - meanY;
    sxx += dx * dx;
    sxy += dx * dy;
    syy += dy * dy;
  }
  if (!(sxx > 0) || !Number.isFinite(sxx) || !Number.isFinite(sxy)) return empty;

  const slope = sxy / sxx;
  // Rounding residue is no intercept: readings on a line through the origin give exactly 0 N.
  const intercept = snapToZero(meanY - slope * meanX, scale);
  let rss = 0;
  for (const p of points) {
    const r = snapToZero(p.forceN - intercept - slope * p.deformationCm, scale);
    rss += r * r;
  }
  const dof = n - 2;
  const residualSD = dof > 0 ? Math.sqrt(rss / dof) : null;
  return {
    n,
    slope: finiteOrNull(slope),
    intercept: finiteOrNull(intercept),
    slopeSE: residualSD === null ? null : finiteOrNull(residualSD / Math.sqrt(sxx)),
    interceptSE:
      residualSD === null ? null : finiteOrNull(residualSD * Math.sqrt(1 / n + (meanX * meanX) / sxx)),
    residualSD: residualSD === null ? null : finiteOrNull(residualSD),
    r2: syy > 0 ? finiteOrNull(1 - rss / syy) : null,
  };
}

// ───────────────────────────── 4. proportionality verdict ─────────────────────────────

/**
 * The verdict on "is force proportional to deformation?":
 * - "proportional": a straight line through the origin fits;
 * - "linear-not-proportional": a straight line fits, but it misses the origin;
 * - "not-linear": no straight line fits the points;
 * - "no-increase": force does not grow with deformation (slope zero or negative, or one force throughout);
 * - "too-few-points": fewer than 2 points with a deformation other than 0.
 */
export type ProportionalityKind =
  | "proportional"
  | "linear-not-proportional"
  | "not-linear"
  | "no-increase"
  | "too-few-points";

export interface ProportionalityVerdict {
  proportional: boolean;
  kind: ProportionalityKind;
  /** the reason in plain words for a student */
  reason: string;
  /** cm: where the free line crosses zero force (−intercept ÷ slope); null when there is no line */
  originOffsetCm: number | null;
  /** cm: the largest sideways distance from a point to the line through the origin */
  largestMissThroughOriginCm: number | null;
  /** cm: the largest sideways distance from a point to the line with a free intercept */
  largestMissWithInterceptCm: number | null;
}

/**
 * Proportionality verdict for force (N) on deformation (cm), judged against the ruler's
 * resolution (cm). THE RULE (our own, written down so teachers can check it):
 *
 * Each ruler reading is rounded to the nearest mark, so it is off by at most half a mark; a
 * deformation is the difference of two readings, so it is off by at most one mark (one
 * "resolution"). Distances are measured sideways, in cm of deformation, so they compare directly
 * with the resolution. Force is proportional to deformation when BOTH:
 *   (a) the least-squares line through the origin passes within one resolution of every point; and
 *   (b) the line with a free intercept crosses zero force within one resolution of the origin
 *       (|intercept ÷ slope| ≤ resolution), or its intercept is within two standard errors of 0.
 * If the free line passes within one resolution of every point but (a) or (b) fails, the data are
 * linear but not proportional (a straight line that misses the origin). Otherwise they are not
 * linear. At least 2 points with a deformation other than 0 are needed for any verdict.
 */
export function proportionalityVerdict(
  points: readonly ForceDeformation[],
  resolutionCm: number,
): ProportionalityVerdict {
  const usable = points.filter((p) => Number.isFinite(p.forceN) && Number.isFinite(p.deformationCm));
  const res = formatGiven(resolutionCm, "cm");
  const none = { originOffsetCm: null, largestMissThroughOriginCm: null, largestMissWithInterceptCm: null };

  if (usable.filter((p) => p.deformationCm !== 0).length < 2) {
    return {
      proportional: false,
      kind: "too-few-points",
      reason:
        "There are fewer than two readings with a deformation other than 0, so there is no line to judge. Add more loads.",
      ...none,
    };
  }

  if (new Set(usable.map((p) => p.forceN)).size < 2) {
    return {
      proportional: false,
      kind: "no-increase",
      reason: "Every reading has the same force, so there is nothing to compare: change the load between readings.",
      ...none,
    };
  }
  const origin = fitThroughOrigin(usable);
  const free = fitWithIntercept(usable);
  if (origin.slope === null || !(origin.slope > 0)) {
    return {
      proportional: false,
      kind: "no-increase",
      reason: "The force does not go up as the deformation goes up, so they cannot be proportional.",
      ...none,
    };
  }

  const k0 = origin.slope;
  const missOrigin = Math.max(...usable.map((p) => Math.abs(p.deformationCm - p.forceN / k0)));
  let missFree: number | null = null;
  let offset: number | null = null;
  if (free.slope !== null && free.slope > 0 && free.intercept !== null) {
    const b1 = free.slope;
    const b0 = free.intercept;
    missFree = Math.max(...usable.map((p) => Math.abs(p.deformationCm - (p.forceN - b0) / b1)));
    offset = -b0 / b1;
  }
  const result = {
    originOffsetCm: offset === null ? null : finiteOrNull(offset),
    largestMissThroughOriginCm: finiteOrNull(missOrigin),
    largestMissWithInterceptCm: missFree === null ? null : finiteOrNull(missFree),
  };

  const originLineFits = withinResolution(missOrigin, resolutionCm);
  const freeLineFits = missFree !== null && withinResolution(missFree, resolutionCm);
  const twoSE =
    free.intercept !== null && free.interceptSE !== null && Math.abs(free.intercept) <= 2 * free.interceptSE;
  const originOnLine = offset === null || withinResolution(offset, resolutionCm) || twoSE;

  if (originLineFits && originOnLine) {
    return {
      proportional: true,
      kind: "proportional",
      reason: `A straight line through the origin passes within one ruler step (${res}) of every reading: double the force gives double the deformation.`,
      ...result,
    };
  }
  if (freeLineFits) {
    const why =
      offset !== null && !originOnLine
        ? `it crosses zero force at a deformation of ${formatForStudent(offset, "cm", 2)}, more than one ruler step (${res}) from 0`
        : `a line forced through the origin misses a reading by ${formatForStudent(missOrigin, "cm", 2)}, more than one ruler step (${res})`;
    // A verdict decided by less than half a ruler step says so: one reading taken again could turn it.
    const closeCall = withinResolution(missOrigin, 1.5 * resolutionCm)
      ? ` It is a close call: the line through the origin misses by less than one and a half ruler steps, so taking the farthest reading again with care may change this verdict.`
      : "";
    return {
      proportional: false,
      kind: "linear-not-proportional",
      reason: `The readings lie on a straight line, but the line misses the origin: ${why}. Force and deformation rise steadily together, yet double the force does not give double the deformation — linear, not proportional.${closeCall}`,
      ...result,
    };
  }
  return {
    proportional: false,
    kind: "not-linear",
    reason: `No straight line passes within one ruler step (${res}) of every reading: the farthest reading is ${formatForStudent(missFree ?? missOrigin, "cm", 2)} from the best line. The graph curves — often a sign the piece went past its elastic limit, or that a reading slipped.`,
    ...result,
  };
}

// ───────────────────────────── 5. elastic limit, breaking load ─────────────────────────────

/** A loading step as the elastic-limit rule sees it: force in N, permanent set in cm (null when not measured). */
export interface ReturnCheck {
  forceN: number;
  permanentSetCm: number | null;
  broke?: boolean;
}

export interface ElasticLimitResult {
  /** N: the largest force after which the piece came back within resolution, before the first permanent set */
  elasticLimitN: number | null;
  /** N: the first force after which the piece did NOT come back (the first permanent set); null if none */
  firstPermanentSetAtN: number | null;
  /** cm: that permanent set */
  firstPermanentSetCm: number | null;
  /**
   * Whether the readings went past the elastic limit (a permanent set, or a break). When false the
   * piece sprang back after every load, so elasticLimitN is only the largest load tried: the
   * limit is at least that much.
   */
  limitReached: boolean;
}

/**
 * Elastic limit in N from return readings, in the order the loads were applied: walk the steps;
 * a step whose permanent set is within one resolution (cm) counts as "came back"; stop at the
 * first step that did not come back, or at a break. Steps without a return reading are skipped.
 * When neither happens the limit was not reached in the test: limitReached is false.
 */
export function elasticLimit(steps: readonly ReturnCheck[], resolutionCm: number): ElasticLimitResult {
  let limit: number | null = null;
  for (const s of steps) {
    if (s.broke) return { elasticLimitN: limit, firstPermanentSetAtN: null, firstPermanentSetCm: null, limitReached: true };
    if (s.permanentSetCm === null || !Number.isFinite(s.permanentSetCm) || !Number.isFinite(s.forceN)) continue;
    if (withinResolution(s.permanentSetCm, resolutionCm)) {
      limit = limit === null ? s.forceN : Math.max(limit, s.forceN);
    } else {
      return { elasticLimitN: limit, firstPermanentSetAtN: s.forceN, firstPermanentSetCm: s.permanentSetCm, limitReached: true };
    }
  }
  return { elasticLimitN: limit, firstPermanentSetAtN: null, firstPermanentSetCm: null, limitReached: false };
}

/**
 * The elastic limit in words, `force` already written ("3.92"): the load itself when the readings went
 * past it, or a lower bound when the piece sprang back after every load.
 */
export function elasticLimitWords(force: string, reached: boolean): string {
  return reached ? `${force} N` : `at least ${force} N (it sprang back after every load)`;
}

/** Breaking load in N: the force of the first step (in loading order) marked broke; null if none broke. */
export function breakingLoadN(steps: readonly { forceN: number; broke?: boolean }[]): number | null {
  const first = steps.find((s) => s.broke === true);
  return first === undefined ? null : finiteOrNull(first.forceN);
}

// ───────────── 6. specimens together: ratio, side by side, glued stack, in series ─────────────

/** How many times stiffer specimen A is than specimen B (any one stiffness unit for both); null when B's is 0. */
export function stiffnessRatio(stiffnessA: number, stiffnessB: number): number | null {
  if (stiffnessB === 0) return null;
  return finiteOrNull(stiffnessA / stiffnessB);
}

/**
 * Stiffness of n identical strips side by side, loaded together (any stiffness unit): n × k.
 * Each strip carries its share of the load at the same deflection, like springs in parallel.
 */
export function sideBySideStiffness(stripStiffness: number, stripCount: number): number {
  return stripCount * stripStiffness;
}

/**
 * Stiffness of n identical strips glued into one stack (any stiffness unit): n³ × k. Bending
 * stiffness goes with thickness cubed (I = b·h³/12), and gluing makes one strip n times as
 * thick. Assumes a perfect glue line with no slip between layers (common practice, no source).
 */
export function gluedStackStiffness(stripStiffness: number, stripCount: number): number {
  return stripCount ** 3 * stripStiffness;
}

/**
 * Stiffness of pieces (or springs) in series, one after the other (any one stiffness unit):
 * 1/k = Σ 1/kᵢ. Null when the list is empty or a stiffness is not above 0.
 */
export function seriesStiffness(stiffnesses: readonly number[]): number | null {
  if (stiffnesses.length === 0 || stiffnesses.some((k) => !(k > 0))) return null;
  return finiteOrNull(1 / stiffnesses.reduce((sum, k) => sum + 1 / k, 0));
}

/** Stiffness of pieces (or springs) in parallel, sharing the load (any one stiffness unit): Σ kᵢ. */
export function parallelStiffness(stiffnesses: readonly number[]): number {
  return stiffnesses.reduce((sum, k) => sum + k, 0);
}

// ──────────────────────────── 7. beams (SI units: N, m, Pa, m⁴) ────────────────────────────

function requirePositive(name: string, value: number): void {
  if (!(value > 0) || !Number.isFinite(value)) {
    throw new RangeError(`${name} must be a finite number above 0 (got ${value})`);
  }
}

/** Second moment of area in m⁴ of a rectangle b (width, m) × h (thickness in the bending direction, m): b·h³/12. Throws RangeError unless both > 0. */
export function secondMomentRectangleM4(widthM: number, thicknessM: number): number {
  requirePositive("width", widthM);
  requirePositive("thickness", thicknessM);
  return (widthM * thicknessM ** 3) / 12;
}

/** Second moment of area in m⁴ of a round rod of diameter d (m): π·d⁴/64. Throws RangeError unless d > 0. */
export function secondMomentRoundM4(diameterM: number): number {
  requirePositive("diameter", diameterM);
  return (Math.PI * diameterM ** 4) / 64;
}

/**
 * Midspan deflection in m of a simply supported beam with a central load:
 * δ = F·L³ / (48·E·I), with F in N, span L in m, E in Pa, I in m⁴. Throws RangeError on bad input.
 */
export function midspanDeflectionM(loadN: number, spanM: number, youngsModulusPa: number, secondMomentM4: number): number {
  if (!Number.isFinite(loadN)) throw new RangeError(`load must be finite (got ${loadN})`);
  requirePositive("span", spanM);
  requirePositive("Young's modulus", youngsModulusPa);
  requirePositive("second moment of area", secondMomentM4);
  return (loadN * spanM ** 3) / (48 * youngsModulusPa * secondMomentM4);
}

/** Beam stiffness in N/m at midspan (force per deflection) of a simply supported beam: 48·E·I / L³. */
export function beamStiffnessNPerM(spanM: number, youngsModulusPa: number, secondMomentM4: number): number {
  requirePositive("span", spanM);
  requirePositive("Young's modulus", youngsModulusPa);
  requirePositive("second moment of area", secondMomentM4);
  return (48 * youngsModulusPa * secondMomentM4) / spanM ** 3;
}

/**
 * Young's modulus in Pa from a bending test (the deflection formula turned round):
 * E = F·L³ / (48·I·δ), with F in N, L in m, I in m⁴, midspan deflection δ in m.
 */
export function youngsModulusFromTestPa(loadN: number, spanM: number, secondMomentM4: number, deflectionM: number): number {
  requirePositive("load", loadN);
  requirePositive("span", spanM);
  requirePositive("second moment of area", secondMomentM4);
  requirePositive("deflection", deflectionM);
  return (loadN * spanM ** 3) / (48 * secondMomentM4 * deflectionM);
}

/**
 * By how much a beam's stiffness changes when width, thickness and span are scaled by the given
 * factors (new ÷ old, each default 1): width¹ × thickness³ ÷ span³ (from 48·E·b·h³/(12·L³)).
 */
export function beamStiffnessScale(change: { width?: number; thickness?: number; span?: number }): number {
  const w = change.width ?? 1;
  const t = change.thickness ?? 1;
  const s = change.span ?? 1;
  requirePositive("width factor", w);
  requirePositive("thickness factor", t);
  requirePositive("span factor", s);
  return (w * t ** 3) / s ** 3;
}

// ─────────────── 8. weight from mass, reading uncertainty carried into stiffness ───────────────

/** Weight in N of a mass in kg: m × g, with g = G_N_PER_KG (9.81 N/kg) unless another g is given. */
export function weightN(massKg: number, gNPerKg: number = G_N_PER_KG): number {
  return massKg * gNPerKg;
}

/**
 * Standard uncertainty in cm of one ruler reading rounded to the nearest mark of the given
 * resolution (cm): resolution ÷ (2√3) — a rectangular distribution of half-width resolution/2
 * (JCGM 100:2008, the GUM, §F.2.2.1). Classroom practice often quotes "± half a mark" instead
 * (common practice, no source); pass that to deformationUncertaintyCm if a lesson prefers it.
 */
export function readingUncertaintyCm(resolutionCm: number): number {
  return resolutionCm / (2 * Math.sqrt(3));
}

/**
 * Uncertainty in cm of a deformation found from two ruler readings, each with uncertainty
 * u (cm): √2·u — the two independent reading uncertainties add in quadrature (GUM §5.1.2 with
 * sensitivity coefficients ±1).
 */
export function deformationUncertaintyCm(readingUncertaintyCmValue: number): number {
  return Math.SQRT2 * readingUncertaintyCmValue;
}

export interface StiffnessWithUncertainty {
  /** N/cm */
  stiffnessNPerCm: number;
  /** N/cm, same kind of uncertainty as the inputs (standard or half-range) */
  uncertaintyNPerCm: number;
  /** the relative uncertainty, a plain number (0.05 = 5 %) */
  relativeUncertainty: number;
}

/**
 * Stiffness in N/cm with its uncertainty, from force F ± u_F (N) and deformation d ± u_d (cm):
 * for a quotient the relative uncertainties add in quadrature, u_k/k = √((u_F/F)² + (u_d/d)²)
 * (GUM §5.1.6, uncorrelated inputs). Null when F or d is 0 (no relative uncertainty exists).
 */
export function stiffnessWithUncertainty(
  forceN: number,
  forceUncertaintyN: number,
  deformationCmValue: number,
  deformationUncertaintyCmValue: number,
): StiffnessWithUncertainty | null {
  if (forceN === 0 || deformationCmValue === 0) return null;
  const k = forceN / deformationCmValue;
  const rel = Math.hypot(forceUncertaintyN / forceN, deformationUncertaintyCmValue / deformationCmValue);
  if (!Number.isFinite(k) || !Number.isFinite(rel)) return null;
  return { stiffnessNPerCm: k, uncertaintyNPerCm: Math.abs(k) * rel, relativeUncertainty: rel };
}

// ───────────────────────────────────── 9. design check ─────────────────────────────────────

/** How several strips are combined: loose side by side (n × stiffness) or glued into one stack (n³ ×). */
export type BundleArrangement = "side-by-side" | "glued-stack";

/** A design to check, all SI: Pa, m, N. */
export interface DesignCheckInput {
  /** the material's Young's modulus, Pa */
  youngsModulusPa: number;
  /** one strip's width, m */
  stripWidthM: number;
  /** one strip's thickness (in the bending direction), m */
  stripThicknessM: number;
  /** distance between the supports, m */
  spanM: number;
  /** how many strips (a whole number ≥ 1) */
  stripCount: number;
  arrangement: BundleArrangement;
  /** the load at midspan, N */
  loadN: number;
  /** the largest deflection allowed, m */
  deflectionLimitM: number;
  /** ≥ 1: the load is multiplied by this before checking */
  safetyFactor: number;
}

export interface DesignCheckResult {
  passes: boolean;
  /** m⁴: second moment of area of the whole bundle */
  secondMomentM4: number | null;
  /** N/m: midspan stiffness of the bundle */
  stiffnessNPerM: number | null;
  /** N: load × safety factor */
  factoredLoadN: number | null;
  /** m: midspan deflection at the factored load */
  deflectionAtFactoredLoadM: number | null;
  /** m: deflection limit − deflection at factored load (negative when the design fails) */
  marginM: number | null;
  /** what is wrong with the input, in plain words; empty when the input was usable */
  problems: string[];
}

/**
 * Design check (SI: Pa, m, N): does this material and bundle keep the midspan deflection of a
 * simply supported beam under the limit at the load × safety factor? Side by side: I = n·b·h³/12;
 * glued stack: I = b·(n·h)³/12. Never throws: bad input gives passes = false and `problems`.
 */
export function designCheck(input: DesignCheckInput): DesignCheckResult {
  const problems: string[] = [];
  const positive: [string, number][] = [
    ["Young's modulus", input.youngsModulusPa],
    ["strip width", input.stripWidthM],
    ["strip thickness", input.stripThicknessM],
    ["span", input.spanM],
    ["deflection limit", input.deflectionLimitM],
  ];
  for (const [name, value] of positive) {
    if (!(typeof value === "number" && Number.isFinite(value) && value > 0)) problems.push(`${name} must be a number above 0`);
  }
  if (!(Number.isInteger(input.stripCount) && input.stripCount >= 1)) problems.push("number of strips must be a whole number, 1 or more");
  if (!(typeof input.loadN === "number" && Number.isFinite(input.loadN) && input.loadN >= 0)) problems.push("load must be a number, 0 or more");
  if (!(typeof input.safetyFactor === "number" && Number.isFinite(input.safetyFactor) && input.safetyFactor >= 1)) {
    problems.push("safety factor must be a number, 1 or more");
  }
  if (input.arrangement !== "side-by-side" && input.arrangement !== "glued-stack") {
    problems.push('arrangement must be "side-by-side" or "glued-stack"');
  }
  if (problems.length > 0) {
    return {
      passes: false,
      secondMomentM4: null,
      stiffnessNPerM: null,
      factoredLoadN: null,
      deflectionAtFactoredLoadM: null,
      marginM: null,
      problems,
    };
  }

  const n = input.stripCount;
  const I =
    input.arrangement === "side-by-side"
      ? n * secondMomentRectangleM4(input.stripWidthM, input.stripThicknessM)
      : secondMomentRectangleM4(input.stripWidthM, n * input.stripThicknessM);
  const factoredLoadN = input.loadN * input.safetyFactor;
  const stiffness = beamStiffnessNPerM(input.spanM, input.youngsModulusPa, I);
  const deflection = factoredLoadN / stiffness;
  const margin = input.deflectionLimitM - deflection;
  const values = [I, stiffness, factoredLoadN, deflection, margin];
  if (values.some((v) => !Number.isFinite(v))) {
    return {
      passes: false,
      secondMomentM4: finiteOrNull(I),
      stiffnessNPerM: finiteOrNull(stiffness),
      factoredLoadN: finiteOrNull(factoredLoadN),
      deflectionAtFactoredLoadM: finiteOrNull(deflection),
      marginM: finiteOrNull(margin),
      problems: ["the numbers are too large or too small to compute with"],
    };
  }
  return {
    passes: deflection <= input.deflectionLimitM,
    secondMomentM4: I,
    stiffnessNPerM: stiffness,
    factoredLoadN,
    deflectionAtFactoredLoadM: deflection,
    marginM: margin,
    problems: [],
  };
}

// ─────────────────────── 10. analyseReadings — the POST /api/analysis contract ───────────────────────

/** One loading step as a student records it (force N, readings and deformation cm). */
export interface ReadingPoint {
  forceN: number;
  /** the loaded ruler reading; or give deformationCm instead */
  readingCm?: number;
  deformationCm?: number;
  /** the reading after this load was removed */
  returnReadingCm?: number;
  broke?: boolean;
}

/** The validated body of `POST /api/analysis` (see analysisRequestSchema in analysis-request.ts). */
export interface AnalysisInput {
  mode: Mode;
  /** needed when any point gives readingCm or returnReadingCm */
  unloadedCm?: number;
  /** the smallest step the ruler is read to, cm (> 0) */
  resolutionCm: number;
  points: readonly ReadingPoint[];
}

/** One point of the answer. `deformationCm` is null only when it cannot be computed (no unloaded reading). */
export interface AnalysedPoint {
  forceN: number;
  deformationCm: number | null;
  /** null when the deformation is 0 (or unknown) */
  stiffnessNPerCm: number | null;
  /** null without returnReadingCm */
  permanentSetCm: number | null;
}

/**
 * The answer of `POST /api/analysis`. Numeric fit fields are `number | null`: null where the data
 * cannot give a value (too few points, all deformations 0, ...), and a note says why.
 */
export interface AnalysisResult {
  points: AnalysedPoint[];
  fit: {
    throughOrigin: { slope: number | null; slopeSE: number | null; residualSD: number | null; r2: number | null };
    withIntercept: {
      slope: number | null;
      intercept: number | null;
      slopeSE: number | null;
      interceptSE: number | null;
      residualSD: number | null;
      r2: number | null;
    };
  };
  proportional: boolean;
  elasticLimitN: number | null;
  /** false when the piece sprang back after every load (and never broke): elasticLimitN is then a lower bound */
  elasticLimitReached: boolean;
  breakingLoadN: number | null;
  notes: string[];
  /** readings worth a second look (see readingCautions); the analysis above still uses them */
  cautions: ReadingCaution[];
}

/**
 * Analyse a series of readings (force N, readings cm, resolution cm; slopes in N/cm) exactly as
 * `POST /api/analysis` answers. Input is assumed validated by analysisRequestSchema, but the
 * function still never throws and never returns NaN: impossible values are null, with a note.
 * Points marked broke are left out of the fits. When a point gives both readingCm and
 * deformationCm, the reading (the raw record) wins and a note flags any disagreement.
 */
export function analyseReadings(input: AnalysisInput): AnalysisResult {
  const notes: string[] = [];
  const mode: Mode = input.mode === "stretch" ? "stretch" : "bend";
  const resolution = Number.isFinite(input.resolutionCm) && input.resolutionCm > 0 ? input.resolutionCm : 0.1;
  const unloaded = typeof input.unloadedCm === "number" && Number.isFinite(input.unloadedCm) ? input.unloadedCm : null;
  const raw = Array.isArray(input.points) ? input.points : [];

  // Per point: deformation, stiffness of that reading, permanent set.
  const points: AnalysedPoint[] = [];
  let missingUnloaded = false;
  for (const p of raw) {
    let deformation: number | null = null;
    if (typeof p.readingCm === "number" && Number.isFinite(p.readingCm)) {
      if (unloaded === null) missingUnloaded = true;
      else {
        deformation = finiteOrNull(deformationCm(mode, unloaded, p.readingCm));
        if (
          deformation !== null &&
          typeof p.deformationCm === "number" &&
          Number.isFinite(p.deformationCm) &&
          !withinResolution(p.deformationCm - deformation, resolution)
        ) {
          notes.push(
            `At ${formatGiven(p.forceN, "N")} the deformation you gave (${formatGiven(p.deformationCm, "cm")}) does not match the readings (${formatGiven(deformation, "cm")}); the readings were used.`,
          );
        }
      }
    }
    if (deformation === null && typeof p.deformationCm === "number") deformation = finiteOrNull(p.deformationCm);
    let set: number | null = null;
    if (typeof p.returnReadingCm === "number" && Number.isFinite(p.returnReadingCm)) {
      if (unloaded === null) missingUnloaded = true;
      else set = finiteOrNull(permanentSetCm(mode, unloaded, p.returnReadingCm));
    }
    // Validation guarantees a finite force ≥ 0; anything else is read as 0 rather than passed on.
    const force = finiteOrNull(p.forceN) ?? 0;
    points.push({
      forceN: force,
      deformationCm: deformation,
      stiffnessNPerCm: deformation === null ? null : stiffnessNPerCm(force, deformation),
      permanentSetCm: set,
    });
  }
  if (missingUnloaded) {
    notes.push("Some points give ruler readings but there is no unloaded reading, so their deformation or permanent set cannot be found.");
  }

  // Breaking load; broke points stay out of the fits.
  const steps = raw.map((p, i) => ({ forceN: points[i].forceN, broke: p.broke === true, permanentSetCm: points[i].permanentSetCm }));
  const breaking = breakingLoadN(steps);
  const brokeCount = steps.filter((s) => s.broke).length;
  if (breaking !== null) {
    notes.push(
      `The piece broke at ${formatGiven(breaking, "N")}: the breaking load. ${brokeCount === 1 ? "That point is" : `The ${brokeCount} points marked broke are`} left out of the fits.`,
    );
    const firstBreak = steps.findIndex((s) => s.broke);
    if (steps.slice(firstBreak + 1).some((s) => !s.broke)) {
      notes.push("Some points come after the break but are not marked broke; check the order of the readings.");
    }
  }

  const fitPoints: ForceDeformation[] = [];
  points.forEach((p, i) => {
    if (!steps[i].broke && p.deformationCm !== null) fitPoints.push({ forceN: p.forceN, deformationCm: p.deformationCm });
  });
  const zeroDeformation = points.filter((p, i) => !steps[i].broke && p.deformationCm === 0 && p.forceN !== 0);
  if (zeroDeformation.length > 0) {
    notes.push(
      `At ${zeroDeformation.map((p) => formatGiven(p.forceN, "N")).join(", ")} the deformation is 0, so that reading alone gives no stiffness.`,
    );
  }

  // One point is not a series: with fewer than two, both fits stay empty (all null). Nor is one
  // force read several times: a "stiffness" from it would only restate that force.
  const oneForce = fitPoints.length >= 2 && new Set(fitPoints.map((p) => p.forceN)).size < 2;
  const series = fitPoints.length >= 2 && !oneForce ? fitPoints : [];
  const origin = fitThroughOrigin(series);
  const free = fitWithIntercept(series);
  if (fitPoints.length < 2) {
    notes.push("Fewer than two unbroken points have a deformation, so no line can be fitted. Add more loads.");
  } else if (oneForce) {
    // The verdict's reason below says so ("Every reading has the same force…").
  } else if (origin.slope === null) {
    notes.push("Every deformation is 0, so no stiffness can be found: the piece did not move at the ruler's resolution.");
  } else {
    notes.push(`Stiffness from the line through the origin: ${formatFitted(origin.slope, origin.slopeSE, "N/cm")}.`);
    if (free.slope === null) {
      notes.push("All the deformations are the same, so a line with a free intercept cannot be fitted.");
    } else if (free.slopeSE === null) {
      notes.push("With only two points the standard errors and residual standard deviation of the line with a free intercept cannot be found; at least three are needed.");
    }
    if (free.slope !== null && free.intercept !== null) {
      notes.push(
        `The line with a free intercept has slope ${formatFitted(free.slope, free.slopeSE, "N/cm")} and meets zero deformation at ${formatFitted(free.intercept, free.interceptSE, "N")}.`,
      );
    }
  }

  const verdict = proportionalityVerdict(fitPoints, resolution);
  notes.push(verdict.reason);

  const limit = elasticLimit(steps, resolution);
  const anyReturn = points.some((p) => p.permanentSetCm !== null);
  if (anyReturn) {
    if (limit.firstPermanentSetAtN !== null && limit.firstPermanentSetCm !== null) {
      notes.push(
        `After ${formatGiven(limit.firstPermanentSetAtN, "N")} the piece did not come back: a permanent set of ${formatGiven(limit.firstPermanentSetCm, "cm")}, more than one ruler step.`,
      );
    }
    notes.push(
      limit.elasticLimitN === null
        ? "The piece never came back within one ruler step, so the elastic limit is below the smallest load tested."
        : limit.limitReached
          ? `Elastic limit: the piece came back within one ruler step after every load up to ${formatGiven(limit.elasticLimitN, "N")}.`
          : `The piece came back within one ruler step after every load, so the elastic limit was not reached: it is at least ${formatGiven(limit.elasticLimitN, "N")}.`,
    );
  }

  return {
    points,
    fit: {
      throughOrigin: { slope: origin.slope, slopeSE: origin.slopeSE, residualSD: origin.residualSD, r2: origin.r2 },
      withIntercept: {
        slope: free.slope,
        intercept: free.intercept,
        slopeSE: free.slopeSE,
        interceptSE: free.interceptSE,
        residualSD: free.residualSD,
        r2: free.r2,
      },
    },
    proportional: verdict.proportional,
    elasticLimitN: limit.elasticLimitN,
    elasticLimitReached: limit.limitReached,
    breakingLoadN: breaking,
    notes,
    cautions: readingCautions({ mode, unloadedCm: unloaded ?? undefined, resolutionCm: resolution, points: raw }, points),
  };
}

// ─────────────── 11. cautions: a reading that looks mistyped, a force that goes back down ───────────────

/**
 * A reading worth a second look. The analysis still uses it: a caution asks, it does not refuse.
 * - "far-from-others": the reading (or deformation, as given) lies far from the line through all the
 *   other readings, as a slipped decimal point or digit does (3.69 typed for 36.9); `point` is null for
 *   the unloaded reading.
 * - "force-went-down": the force is lower than on the step before; the steps are loading steps, in the
 *   order the loads were added (the elastic limit and the break are read in that order), and a reading
 *   taken with the load off belongs beside its load as the reading after unloading. Only the first
 *   such step is named.
 * `message` names the point as the API does ("points[3]"); pages word it with cautionWords.
 */
export type ReadingCaution =
  | { kind: "far-from-others"; point: number | null; valueCm: number; message: string }
  | { kind: "force-went-down"; point: number; fromN: number; toN: number; message: string };

/** Ruler steps a reading must miss by before it is called far from the others (see readingCautions). */
export const FAR_READING_RULER_STEPS = 10;

/**
 * The caution in words, `place` naming the point in the page's words ("Row 4", "Line 5", "The
 * unloaded reading"): "Row 4 (3.69 cm) is far from the other readings: was it typed right?"
 */
export function cautionWords(caution: ReadingCaution, place: string, resolutionCm: number): string {
  if (caution.kind === "far-from-others") {
    const value = Math.abs(caution.valueCm) <= MOST_READING_CM ? formatToResolution(caution.valueCm, resolutionCm) : formatGiven(caution.valueCm, "").trim();
    return `${place} (${value} cm) is far from the other readings: was it typed right?`;
  }
  return `${place}: the force goes down, from ${formatGiven(caution.fromN, "N")} to ${formatGiven(caution.toN, "N")}. The readings are read as loading steps in the order the loads were added (the elastic limit and the break too), so list them from the smallest load up; a reading taken with the load off goes beside its load, as the reading after unloading.`;
}

/**
 * Readings worth a second look (see ReadingCaution), in the order of the points. `analysed` are the
 * points as analyseReadings worked them out (deformations in cm).
 *
 * THE RULE for a reading far from the others (our own, common practice, no source; written down so a
 * teacher can check it): the unloaded reading counts as a reading of 0 cm deformation at 0 N. Leave
 * one reading out and draw the least-squares straight line of deformation against force through all
 * the others (unbroken ones only; at least three others, with at least two different forces). The
 * reading is far from the others when that line misses it by more than BOTH
 *   (a) 10 ruler steps (1 cm for a ruler read to 0.1 cm), so ordinary scatter of a mark or two never
 *       counts; and
 *   (b) twice the whole distance the other readings cover (their largest deformation less their
 *       smallest), so a series that curves past its elastic limit, whose last readings run ahead of
 *       the line, is not called mistyped.
 * A slipped decimal point (3.69 for 36.9) or a slipped tens digit (26.9 for 36.9) moves a reading by
 * many times what a whole run of loading steps moves it, so it passes both. A slip smaller than that
 * cannot be told from a real reading, and is not flagged.
 */
export function readingCautions(input: AnalysisInput, analysed: readonly AnalysedPoint[]): ReadingCaution[] {
  const cautions: ReadingCaution[] = [];
  const resolution = Number.isFinite(input.resolutionCm) && input.resolutionCm > 0 ? input.resolutionCm : 0.1;
  const raw = Array.isArray(input.points) ? input.points : [];
  const unloadedTyped = typeof input.unloadedCm === "number" && Number.isFinite(input.unloadedCm) && raw.some((p) => p.readingCm !== undefined);

  type Step = { point: number | null; forceN: number; deformationCm: number; valueCm: number };
  const steps: Step[] = [{ point: null, forceN: 0, deformationCm: 0, valueCm: input.unloadedCm ?? 0 }];
  analysed.forEach((p, i) => {
    if (raw[i]?.broke === true || p.deformationCm === null || !Number.isFinite(p.forceN)) return;
    steps.push({ point: i, forceN: p.forceN, deformationCm: p.deformationCm, valueCm: raw[i].readingCm ?? p.deformationCm });
  });
  if (steps.length >= 4) {
    steps.forEach((candidate, c) => {
      if (candidate.point === null && !unloadedTyped) return;
      const others = steps.filter((_, j) => j !== c);
      if (others.length < 3) return;
      // Deformation against force: the force goes in as x, the deformation as y (roles swapped on purpose).
      const line = fitWithIntercept(others.map((o) => ({ forceN: o.deformationCm, deformationCm: o.forceN })));
      if (line.slope === null || line.intercept === null) return;
      const miss = Math.abs(candidate.deformationCm - (line.intercept + line.slope * candidate.forceN));
      const ds = others.map((o) => o.deformationCm);
      const span = Math.max(...ds) - Math.min(...ds);
      if (Number.isFinite(miss) && miss > Math.max(FAR_READING_RULER_STEPS * resolution, 2 * span)) {
        const caution = { kind: "far-from-others" as const, point: candidate.point, valueCm: candidate.valueCm, message: "" };
        caution.message = cautionWords(caution, candidate.point === null ? "unloadedCm" : `points[${candidate.point}]`, resolution);
        cautions.push(caution);
      }
    });
  }

  const down = raw.findIndex((p, i) => i > 0 && Number.isFinite(p.forceN) && Number.isFinite(raw[i - 1].forceN) && p.forceN < raw[i - 1].forceN);
  if (down > 0) {
    const caution = { kind: "force-went-down" as const, point: down, fromN: raw[down - 1].forceN, toN: raw[down].forceN, message: "" };
    caution.message = cautionWords(caution, `points[${down}]`, resolution);
    cautions.push(caution);
  }
  // The unloaded reading first, then by point.
  return cautions.sort((a, b) => (a.point ?? -1) - (b.point ?? -1));
}
