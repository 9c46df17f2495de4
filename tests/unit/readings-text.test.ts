/**
 * Unit tests of app/lib/readings-text.ts: readings pasted into /tools/analyse. Every format it read
 * before still reads the same; a decimal comma is understood where the columns are separated some
 * other way; a line whose commas could be read two ways is refused with how to write it.
 * All readings are invented for the test.
 */
import { describe, expect, it } from "vitest";
import { parseReadingsText, readCell } from "../../app/lib/readings-text";

const read = (text: string, second: "reading" | "deformation" = "reading") => parseReadingsText(text, second);

describe("formats that were read before", () => {
  it.each([
    ["comma and space, points for decimals", "0, 21.0\n1, 20.6\n2, 20.1"],
    ["commas without spaces", "0,21.0\n1,20.6\n2,20.1"],
    ["spaces", "0 21.0\n1   20.6\n2 20.1"],
    ["tabs", "0\t21.0\n1\t20.6\n2\t20.1"],
    ["semicolons", "0; 21.0\n1;20.6\n2 ; 20.1"],
    ["a header line, a comment and blank lines", "force (N), loaded reading (cm)\n# first load\n0, 21.0\n\n1, 20.6\n2, 20.1"],
  ])("%s", (_label, text) => {
    const r = read(text);
    expect(r.problems).toEqual([]);
    expect(r.points).toEqual([
      { forceN: 0, readingCm: 21 },
      { forceN: 1, readingCm: 20.6 },
      { forceN: 2, readingCm: 20.1 },
    ]);
  });

  it("a reading after unloading and the word broke, and the line each point came from", () => {
    const r = read("force, reading, after\n1, 20.6, 21.0\n2, 20.1, 20.9\n\n3, 15, broke");
    expect(r.problems).toEqual([]);
    expect(r.points).toEqual([
      { forceN: 1, readingCm: 20.6, returnReadingCm: 21 },
      { forceN: 2, readingCm: 20.1, returnReadingCm: 20.9 },
      { forceN: 3, readingCm: 15, broke: true },
    ]);
    expect(r.lines).toEqual([2, 3, 5]);
  });

  it("names what is not a number, by line", () => {
    const r = read("1, 20.6\n2, abc\n3, 19.8, maybe");
    expect(r.problems).toEqual(["Line 2: the reading “abc” is not a number.", "Line 3: “maybe” is neither a reading nor “broke”."]);
    expect(r.points).toHaveLength(2);
  });
});

describe("decimal commas", () => {
  it.each([
    ["tabs", "1\t2,5\n2\t5,0\n3\t7,5"],
    ["semicolons", "1; 2,5\n2; 5,0\n3; 7,5"],
    ["spaces", "1 2,5\n2 5,0\n3 7,5"],
    ["spaces, with a decimal comma in the force too", "1,0 2,5\n2,0 5,0\n3,0 7,5"],
  ])("are read as decimals when %s separate the columns", (_label, text) => {
    const r = read(text, "deformation");
    expect(r.problems).toEqual([]);
    expect(r.points.map((p) => [p.forceN, p.deformationCm])).toEqual([
      [1, 2.5],
      [2, 5],
      [3, 7.5],
    ]);
  });

  it("the reported case “1, 2,5” is refused line by line, never read as a reading after unloading", () => {
    const r = read("1, 2,5\n2, 5,0\n3, 7,5", "deformation");
    expect(r.points).toEqual([]);
    expect(r.problems).toHaveLength(3);
    expect(r.problems[0]).toBe(
      "Line 1: “1, 2,5” can be read more than one way, because its commas could be decimal commas or could separate the columns. Use a point for decimals (1, 2.5), or put a semicolon between the columns (1; 2,5).",
    );
  });

  it("“1,2,5” is refused; “1, 2.5”, “1,2.5” and “1,2” are read one way only", () => {
    expect(read("1,2,5").problems[0]).toMatch(/^Line 1: “1,2,5” can be read more than one way/);
    expect(read("1, 2.5\n2,5.0\n3,7").points.map((p) => [p.forceN, p.readingCm])).toEqual([
      [1, 2.5],
      [2, 5],
      [3, 7],
    ]);
  });
});

describe("units", () => {
  it("the column's own unit is allowed after a number", () => {
    const r = read("1 N, 20.6 cm\n2N, 20.1cm, 21.0 cm\n3 N; 19,6 cm");
    expect(r.problems).toEqual([]);
    expect(r.points).toEqual([
      { forceN: 1, readingCm: 20.6 },
      { forceN: 2, readingCm: 20.1, returnReadingCm: 21 },
      { forceN: 3, readingCm: 19.6 },
    ]);
  });

  it("another unit is named with the column's unit", () => {
    const r = read("3 kg, 20.6\n2, 201 mm\n1, 20.6, 0.21 m");
    expect(r.problems).toEqual([
      "Line 1: the force “3 kg” is in kg, but forces are in N (newtons) here: read the spring scale in newtons (a 100 g mass weighs about 0.98 N).",
      "Line 2: the reading “201 mm” is in mm, but readings are in cm here: write it in cm (201 mm is 20.1 cm).",
      "Line 3: the reading after unloading “0.21 m” is in m, but readings are in cm here: write it in cm (0.21 m is 21 cm).",
    ]);
  });

  it("readCell: empty, plain, with a unit, with a decimal comma", () => {
    expect(readCell("", "cm", true)).toEqual({ ok: false });
    expect(readCell("19.5", "cm", false)).toEqual({ ok: true, value: 19.5 });
    expect(readCell("19,5 cm", "cm", true)).toEqual({ ok: true, value: 19.5 });
    expect(readCell("3 n", "N", false)).toEqual({ ok: true, value: 3 });
    expect(readCell("19.5 mm", "cm", false)).toEqual({ ok: false, value: 19.5, unit: "mm" });
    expect(readCell("cm", "cm", false)).toEqual({ ok: false });
    expect(readCell("1e5", "cm", false)).toEqual({ ok: true, value: 100000 });
  });
});

describe("long text is cut, not echoed whole", () => {
  const digits = "7".repeat(5000);

  it("a 5000-digit number is too long, quoted by its first 20 characters and “…”", () => {
    const r = read(`1, 20.6\n2, ${digits}\n3, 19.6`);
    expect(r.problems).toEqual([`Line 2: the reading “${"7".repeat(20)}…” is too long: write a number of at most 20 characters.`]);
    expect(r.points.map((p) => p.forceN)).toEqual([1, 3]);
  });

  it("readCell: more than 20 characters is too long; 20 are read", () => {
    expect(readCell(digits, "cm", false)).toEqual({ ok: false, tooLong: true });
    expect(readCell("0.000000000000000001", "cm", false)).toEqual({ ok: true, value: 1e-18 });
  });

  it("a long line that cannot be split, and a long extra column, are quoted cut too", () => {
    const r = read(`1, 2,5 ${"x".repeat(300)}\n2, 20.1, 20.6, ${"y".repeat(300)}`);
    expect(r.problems[0]).toMatch(/^Line 1: “1, 2,5 x{33}…” can be read more than one way/);
    expect(r.problems[1]).toBe(`Line 2: “${"y".repeat(20)}…” is neither a reading nor “broke”.`);
    expect(r.problems.join(" ").length).toBeLessThan(600);
  });
});
