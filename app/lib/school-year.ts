// School years as Bendwise writes them: "2026-27" runs from 1 July 2026 to 30 June 2027.
// Seats are bought for one school year and used by students in that year's classes.

export const SCHOOL_YEAR_PATTERN = /^(\d{4})-(\d{2})$/;

/** The school year a date falls in (1 July starts a new one). */
export function schoolYearOf(date: Date = new Date()): string {
  const year = date.getUTCMonth() >= 6 ? date.getUTCFullYear() : date.getUTCFullYear() - 1;
  return `${year}-${String((year + 1) % 100).padStart(2, "0")}`;
}

/** True for "2026-27", false for "2026-28" or "2026/27". */
export function isSchoolYear(value: string): boolean {
  const match = value.match(SCHOOL_YEAR_PATTERN);
  return Boolean(match && (Number(match[1]) + 1) % 100 === Number(match[2]));
}

/** The years a purchase can be for: the current one and the next. */
export function purchasableSchoolYears(date: Date = new Date()): [string, string] {
  const current = schoolYearOf(date);
  const start = Number(current.slice(0, 4)) + 1;
  return [current, `${start}-${String((start + 1) % 100).padStart(2, "0")}`];
}
