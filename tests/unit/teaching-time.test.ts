// The times of day the teacher's pages write (due dates, each try, the gradebook's "Updated"): a
// 12-hour clock that reads noon as 12 pm and midnight as 12 am, in the class's own time zone.
import { describe, expect, it } from "vitest";
import { formatClockTime, formatDue, formatMoment, spreadsheetMoment } from "../../app/lib/teaching/time";

const now = new Date("2026-11-15T12:00:00Z");

describe("the 12-hour clock of the teacher's pages", () => {
  it("reads a due date at noon as 12:00 pm and one at midnight as 12:00 am, never 0:00", () => {
    expect(formatDue(new Date("2026-11-20T12:00:00Z"), "UTC", now)).toBe("Fri 20 Nov, 12:00 pm");
    expect(formatDue(new Date("2026-11-20T00:00:00Z"), "UTC", now)).toBe("Fri 20 Nov, 12:00 am");
    expect(formatDue(new Date("2026-11-20T23:00:00Z"), "UTC", now)).toBe("Fri 20 Nov, 11:00 pm");
    // Noon in the class's own zone: 9:00 UTC is 12:00 in Nairobi (UTC+3).
    expect(formatDue(new Date("2026-11-20T09:00:00Z"), "Africa/Nairobi", now)).toBe("Fri 20 Nov, 12:00 pm");
    expect(formatDue(new Date("2027-01-08T17:00:00Z"), "UTC", now)).toBe("Fri, 8 Jan 2027, 5:00 pm");
  });

  it("writes the tries and the gradebook's last update on the same clock", () => {
    expect(formatMoment(new Date("2026-11-30T12:05:09Z"), "UTC")).toBe("30 Nov 2026, 12:05:09 pm");
    expect(formatMoment(new Date("2026-11-30T00:00:30Z"), "UTC")).toBe("30 Nov 2026, 12:00:30 am");
    expect(formatClockTime(new Date("2026-11-30T12:15:40Z"), "UTC")).toBe("12:15:40 pm");
    expect(formatClockTime(new Date("2026-11-30T14:05:09Z"), "UTC")).toBe("2:05:09 pm");
  });
});

describe("a moment in a CSV export", () => {
  it("is the class's wall-clock time in the form spreadsheets read as a date and time", () => {
    expect(spreadsheetMoment(new Date("2026-11-30T12:27:29.856Z"), "UTC")).toBe("2026-11-30 12:27:29");
    expect(spreadsheetMoment(new Date("2026-11-30T12:27:29Z"), "America/Chicago")).toBe("2026-11-30 06:27:29");
    // Across midnight and a clock change (Chicago's summer time ended on 1 Nov 2026).
    expect(spreadsheetMoment(new Date("2026-11-01T04:30:00Z"), "America/Chicago")).toBe("2026-10-31 23:30:00");
    expect(spreadsheetMoment(new Date("2026-11-01T07:30:00Z"), "America/Chicago")).toBe("2026-11-01 01:30:00");
  });
});
