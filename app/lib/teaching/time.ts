// Dates for due dates, in the class's own time zone. A class keeps an IANA time zone (set from the
// teacher's browser when the class is made), so the server renders "due Friday 5 pm" exactly as the
// teacher typed it, and server and browser render the same text (no hydration mismatch).
// Pure functions: no database, safe in the browser.

// Making an Intl.DateTimeFormat costs far more than using one (a gradebook writes dozens of dates per
// request), so each (locale, options) is made once and kept.
const formatters = new Map<string, Intl.DateTimeFormat>();
function formatter(locale: string, options: Intl.DateTimeFormatOptions): Intl.DateTimeFormat {
  const key = `${locale}|${JSON.stringify(options)}`;
  let known = formatters.get(key);
  if (!known) {
    known = new Intl.DateTimeFormat(locale, options);
    formatters.set(key, known);
  }
  return known;
}

/** True for a time zone this runtime knows, such as "America/Chicago" or "UTC". */
export function isTimeZone(value: string): boolean {
  if (!value || value.length > 64) return false;
  try {
    new Intl.DateTimeFormat("en-US", { timeZone: value });
    return true;
  } catch {
    return false;
  }
}

/** Milliseconds the zone's wall clock is ahead of UTC at `date`. */
function offsetMs(date: Date, timeZone: string): number {
  const parts = formatter("en-US", {
    timeZone,
    hourCycle: "h23",
    year: "numeric",
    month: "2-digit",
    day: "2-digit",
    hour: "2-digit",
    minute: "2-digit",
    second: "2-digit",
  }).formatToParts(date);
  const get = (type: string) => Number(parts.find((p) => p.type === type)?.value ?? 0);
  const wall = Date.UTC(get("year"), get("month") - 1, get("day"), get("hour"), get("minute"), get("second"));
  return wall - Math.floor(date.getTime() / 1000) * 1000;
}

const LOCAL_INPUT = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})$/;

/**
 * "2026-12-11T17:00" read as a wall-clock time in `timeZone` → the instant. Null when unreadable.
 * In the hour skipped by a clock change the later reading is taken.
 */
export function zonedInputToDate(local: string, timeZone: string): Date | null {
  const m = LOCAL_INPUT.exec(local.trim());
  if (!m) return null;
  const [, y, mo, d, h, mi] = m.map(Number);
  const asUtc = Date.UTC(y, mo - 1, d, h, mi);
  const check = new Date(asUtc);
  if (check.getUTCMonth() !== mo - 1 || check.getUTCDate() !== d || h > 23 || mi > 59) return null;
  let guess = asUtc - offsetMs(new Date(asUtc), timeZone);
  const second = offsetMs(new Date(guess), timeZone);
  guess = asUtc - second;
  return new Date(guess);
}

/** The instant's wall-clock time in the zone, written as ISO without a zone: "2026-12-11T16:05:09". */
function zonedWallClock(date: Date | string, timeZone: string): string {
  const instant = new Date(date);
  return new Date(instant.getTime() + offsetMs(instant, timeZone)).toISOString().slice(0, 19);
}

/** The instant as a value for <input type="datetime-local"> in the zone. */
export function dateToZonedInput(date: Date | string, timeZone: string): string {
  return zonedWallClock(date, timeZone).slice(0, 16);
}

/**
 * "2026-12-11 16:05:09": the instant's wall-clock time in the zone, as a CSV cell that spreadsheet
 * programs read as a date and time (so a column of them sorts by time), and a person reads too.
 */
export function spreadsheetMoment(date: Date | string, timeZone: string): string {
  return zonedWallClock(date, timeZone).replace("T", " ");
}

/** "Fri 11 Dec, 5:00 pm" in the zone (with the year when it is not the current one). */
export function formatDue(date: Date | string, timeZone: string, now: Date = new Date()): string {
  const instant = new Date(date);
  const sameYear =
    formatter("en-GB", { timeZone, year: "numeric" }).format(instant) ===
    formatter("en-GB", { timeZone, year: "numeric" }).format(now);
  return formatter("en-GB", {
    timeZone,
    weekday: "short",
    day: "numeric",
    month: "short",
    ...(sameYear ? {} : { year: "numeric" }),
    hour: "numeric",
    minute: "2-digit",
    hourCycle: "h12",
  }).format(instant);
}

/** "2 December 2026" (in UTC): the day of an order, a receipt, an invitation's last day. */
export function formatLongDate(date: Date): string {
  return formatter("en-GB", { day: "numeric", month: "long", year: "numeric", timeZone: "UTC" }).format(date);
}

// Times of day read the same everywhere: the 12-hour clock of the due dates ("5:00 pm"). The cycle is
// named (h12): `hour12: true` with en-GB counts from 0, so noon read "0:00 pm" and midnight "0:00 am".

/** "11 Dec 2026, 4:05:09 pm" for lists of attempts (seconds: tries can come within a minute). */
export function formatMoment(date: Date | string, timeZone: string): string {
  return formatter("en-GB", {
    timeZone,
    day: "numeric",
    month: "short",
    year: "numeric",
    hour: "numeric",
    minute: "2-digit",
    second: "2-digit",
    hourCycle: "h12",
  }).format(new Date(date));
}

/** "2:05:09 pm" in the zone: the time of day a page was brought up to date. */
export function formatClockTime(date: Date | string, timeZone: string): string {
  return formatter("en-GB", { timeZone, hour: "numeric", minute: "2-digit", second: "2-digit", hourCycle: "h12" }).format(new Date(date));
}

export const DAY_MS = 24 * 60 * 60 * 1000;

/** Whole days (a part of a day counts as one) from `due` to `at`; 0 when on time. */
export function daysLate(at: Date | string, due: Date | string): number {
  const late = new Date(at).getTime() - new Date(due).getTime();
  return late > 0 ? Math.ceil(late / DAY_MS) : 0;
}

/**
 * The time zones as a menu: grouped by their region ("America"), each named by its place with spaces
 * ("Argentina/Buenos Aires"), so a teacher can type the first letters of a city. UTC stands alone first.
 */
export function timeZoneMenu(): { value: string; label: string; group?: string }[] {
  const menu = timeZoneChoices().map((zone) => {
    const slash = zone.indexOf("/");
    if (slash < 0) return { value: zone, label: zone };
    const place = zone.slice(slash + 1).replaceAll("_", " ");
    return { value: zone, label: PLACE_NAMES_NOW[place] ?? place, group: zone.slice(0, slash) };
  });
  // Within each region, alphabetical by the name shown (Kolkata among the K's, not where Calcutta was).
  const regionOrder = new Map(menu.map((z, i): [string, number] => [z.group ?? "", i]).reverse());
  return menu.sort((a, b) => regionOrder.get(a.group ?? "")! - regionOrder.get(b.group ?? "")! || (a.group ? a.label.localeCompare(b.label) : 0));
}

/**
 * Places whose zone the runtime still lists under an old spelling or name ("Asia/Calcutta"): the menu
 * shows today's name, and the value stays the zone the runtime knows (IANA keeps both as links).
 */
const PLACE_NAMES_NOW: Record<string, string> = {
  Calcutta: "Kolkata",
  Asmera: "Asmara",
  Godthab: "Nuuk",
  Katmandu: "Kathmandu",
  Saigon: "Ho Chi Minh",
  Rangoon: "Yangon",
  Kiev: "Kyiv",
  Faeroe: "Faroe",
  Truk: "Chuuk",
  Ponape: "Pohnpei",
  Enderbury: "Kanton",
};

/** The time zones offered when making a class (the runtime's list, or a short fallback). */
export function timeZoneChoices(): string[] {
  const intl = Intl as unknown as { supportedValuesOf?: (key: string) => string[] };
  const list = intl.supportedValuesOf?.("timeZone") ?? [];
  return list.length > 0 ? (list.includes("UTC") ? list : ["UTC", ...list]) : ["UTC"];
}
