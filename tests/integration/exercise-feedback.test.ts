// What a student is told after an answer, against a real database: a table names and marks its
// wrong cells (also on the page after a reload), a choice allows one try fewer than its options and
// its last wrong try says so, and a ratio typed with a unit uses no try.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { users } from "~/db/schema.server";
import { courseProgress, exerciseInstance, findExercise, loadLessonState, recordAttempt } from "~/lib/course.server";

async function studentId(username: string) {
  const [row] = await db.select({ id: users.id }).from(users).where(eq(users.username, username));
  return row.id;
}

describe("feedback on an answer", () => {
  it("names a wrong cell of lesson 3's sums by row and column, and marks it now and after a reload", async () => {
    const SLUG = "03-proportional-or-not";
    const student = await studentId("quinn.h");
    const table = findExercise(SLUG, "products-table")!;
    const instance = exerciseInstance(student, SLUG, table, []);
    const right = instance.cells!.map((c) => `${Number(c.value.toPrecision(4))} ${c.unit === "cm^2" ? "cm2" : "Ncm"}`);

    const unreadable = await recordAttempt({ db }, { studentId: student, slug: SLUG, definition: table, submission: { kind: "cells", cells: [...right.slice(0, 3), "lots", ...right.slice(4)] } });
    expect("feedback" in unreadable && unreadable.feedback).toMatchObject({ outcome: "unreadable", wrongCells: [3], noTriesLeft: false, message: expect.stringMatching(/^Row 2, x² could not be read/) });

    const wrong = [...right];
    wrong[4] = "0 Ncm";
    const result = await recordAttempt({ db }, { studentId: student, slug: SLUG, definition: table, submission: { kind: "cells", cells: wrong } });
    expect("feedback" in result && result.feedback).toMatchObject({ right: false, wrongCells: [4], noTriesLeft: false, message: expect.stringMatching(/^Row 3, F × x: That does not match/) });
    expect("feedback" in result && result.feedback.message).not.toMatch(/Row [4-6]/);

    const state = (await loadLessonState({ db }, student, SLUG)).exercises[table.id];
    expect(state).toMatchObject({ attemptsUsed: 1, status: "open" });
    expect(state.lastFeedback).toMatchObject({ wrongCells: [4], noTriesLeft: false, message: expect.stringMatching(/^Row 3, F × x:/) });

    await recordAttempt({ db }, { studentId: student, slug: SLUG, definition: table, submission: { kind: "cells", cells: right } });
    expect((await loadLessonState({ db }, student, SLUG)).exercises[table.id].lastFeedback).toMatchObject({ right: true, wrongCells: [] });
  });

  it("gives a two-option choice one try: a wrong answer is the last, the solution shows and the lesson counts it done", async () => {
    const SLUG = "02-force-and-deformation";
    const student = await studentId("rosa.g");
    const choice = findExercise(SLUG, "same-stiffness-choice")!;
    const instance = exerciseInstance(student, SLUG, choice, []);
    expect(instance.choices).toHaveLength(2);
    expect((await loadLessonState({ db }, student, SLUG)).exercises[choice.id]).toMatchObject({ attemptsAllowed: 1, status: "open" });

    const wrongOption = instance.choices!.find((c) => c.value !== instance.correctChoice)!.value;
    const result = await recordAttempt({ db }, { studentId: student, slug: SLUG, definition: choice, submission: { kind: "choice", choice: wrongOption, reason: "guess" } });
    expect("feedback" in result && result.feedback).toMatchObject({ right: false, noTriesLeft: true });

    const state = (await loadLessonState({ db }, student, SLUG)).exercises[choice.id];
    expect(state).toMatchObject({ status: "used-up", attemptsUsed: 1 });
    expect(state.lastFeedback).toMatchObject({ right: false, noTriesLeft: true });
    expect(state.solution).toBe(instance.solution);
    const again = await recordAttempt({ db }, { studentId: student, slug: SLUG, definition: choice, submission: { kind: "choice", choice: instance.correctChoice!, reason: "" } });
    expect(again).toEqual({ refused: "You have used every attempt at this exercise." });

    // The course path counts it finished with the same rule (as the gradebook does: attemptsAllowed).
    const before = (await courseProgress({ db }, await studentId("sami.j"))).find((p) => p.slug === SLUG)!.requiredDone;
    expect((await courseProgress({ db }, student)).find((p) => p.slug === SLUG)!.requiredDone).toBe(before + 1);
  });

  it("uses no try for lesson 5's safety factor typed with a unit, and says the quantity has no unit", async () => {
    const SLUG = "05-elastic-permanent-broken";
    const student = await studentId("tara.c");
    const ratio = findExercise(SLUG, "safety-factor")!;
    const instance = exerciseInstance(student, SLUG, ratio, []);
    const value = Number(instance.expected!.value.toPrecision(3));
    const withUnit = await recordAttempt({ db }, { studentId: student, slug: SLUG, definition: ratio, submission: { kind: "text", answer: `${value} N` } });
    expect(withUnit).toMatchObject({ counted: false, feedback: { outcome: "unreadable", message: expect.stringMatching(/has no unit/) } });
    expect((await loadLessonState({ db }, student, SLUG)).exercises[ratio.id].attemptsUsed).toBe(0);
    const alone = await recordAttempt({ db }, { studentId: student, slug: SLUG, definition: ratio, submission: { kind: "text", answer: `${value}` } });
    expect(alone).toMatchObject({ counted: true, feedback: { right: true } });
  });
});
