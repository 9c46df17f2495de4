/**
 * Unit tests of the teaching words pages show beside the rules they describe (app/lib/teaching/shared.ts
 * and words.ts): the username rule and its pattern, the late-work rule in plain words, counts, and the
 * time-zone menu's place names (time.ts).
 */
import { describe, expect, it } from "vitest";
import { lateRuleInWords, USERNAME_PATTERN, USERNAME_RULE } from "../../app/lib/teaching/shared";
import { addStudentsLabel } from "../../app/lib/teaching/words";
import { timeZoneMenu } from "../../app/lib/teaching/time";

describe("the username rule", () => {
  it("says in words what the pattern accepts: 3 to 40 characters, letters, digits, dots, hyphens and underscores, a letter or digit at each end", () => {
    expect(USERNAME_RULE).toBe("3 to 40 letters a–z, digits, dots, hyphens and underscores, starting and ending with a letter or digit");
    for (const ok of ["abc", "amira.k", "tove-a", "ugo_b", "x9.y-z_1", "a".repeat(40)]) expect(USERNAME_PATTERN.test(ok), ok).toBe(true);
    for (const bad of ["ab", "a".repeat(41), ".abc", "abc-", "_abc", "ab c", "Abc", "åsa", "ab@c"]) expect(USERNAME_PATTERN.test(bad), bad).toBe(false);
  });
});

describe("the late-work rule in plain words", () => {
  it("names each rule, with the share of credit lost a day", () => {
    expect(lateRuleInWords("penalty", 5)).toBe("late answers lose 5% of their credit a day");
    expect(lateRuleInWords("penalty", 1)).toBe("late answers lose 1% of their credit a day");
    expect(lateRuleInWords("closed", 0)).toBe("closes at the due date");
    expect(lateRuleInWords("accept", 0)).toBe("late answers count in full");
    // A penalty of 0 takes nothing off: late answers count in full.
    expect(lateRuleInWords("penalty", 0)).toBe("late answers count in full");
  });
});

describe("the roster check's button", () => {
  it("counts one student in the singular and more in the plural", () => {
    expect(addStudentsLabel(1)).toBe("Add this student to the class");
    expect(addStudentsLabel(3)).toBe("Add these 3 students to the class");
  });
});

describe("the time-zone menu", () => {
  it("names places as they are called today, keeping the runtime's zone as the value", () => {
    const menu = timeZoneMenu();
    const calcutta = menu.find((z) => z.value === "Asia/Calcutta" || z.value === "Asia/Kolkata");
    expect(calcutta?.label).toBe("Kolkata");
    expect(menu.some((z) => ["Calcutta", "Asmera", "Godthab", "Katmandu"].includes(z.label))).toBe(false);
  });
});

describe("the time-zone menu's order", () => {
  it("keeps the regions in their order and sorts each region by the name shown", () => {
    const menu = timeZoneMenu();
    const asia = menu.filter((z) => z.group === "Asia").map((z) => z.label);
    expect(asia).toEqual([...asia].sort((a, b) => a.localeCompare(b)));
    const regions = menu.map((z) => z.group ?? "");
    expect(regions.filter((g, i) => g !== regions[i - 1])).toEqual([...new Set(regions)]);
  });
});
