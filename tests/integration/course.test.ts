// The course model against a real database: per-student numbers, checking and recording answers,
// attempts and worked solutions, own readings, written answers, progress, and the compile cache.
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { exerciseAttempts, readingSets, users, writtenAnswers } from "~/db/schema.server";
import {
  continueTarget,
  courseProgress,
  exerciseInstance,
  findExercise,
  loadLessonState,
  recordAttempt,
  saveReadings,
  saveWrittenAnswer,
} from "~/lib/course.server";
import { analyseReadings } from "~/lib/science";
import * as lessonRoute from "~/routes/learn.lesson";
import { appUrl, runRoute, sessionCookieFor } from "./auth-helpers";
import { checkLessonFrontmatter, compileCount, compiledLesson, lessonExercises, lessonFolders } from "~/lib/lessons.server";

process.env.BENDWISE_LESSON_CACHE_DIR = mkdtempSync(path.join(tmpdir(), "bendwise-lesson-cache-"));

const LESSON = "02-force-and-deformation";
let amira: string;
let ben: string;

async function studentId(username: string) {
  const [row] = await db.select({ id: users.id }).from(users).where(eq(users.username, username));
  return row.id;
}

beforeAll(async () => {
  amira = await studentId("amira.k");
  ben = await studentId("ben.t");
});

describe("per-student exercise numbers", () => {
  it("gives a student the same numbers on every visit and the student beside them other numbers", () => {
    const definition = findExercise(LESSON, "deformation-from-readings")!;
    const first = exerciseInstance(amira, LESSON, definition, []);
    const again = exerciseInstance(amira, LESSON, definition, []);
    const other = exerciseInstance(ben, LESSON, definition, []);
    expect(again.prompt).toBe(first.prompt);
    expect(other.prompt).not.toBe(first.prompt);
  });
});

describe("answering an exercise", () => {
  it("accepts the right value in another unit (mm for cm) and records the attempt", async () => {
    const definition = findExercise(LESSON, "deformation-from-readings")!;
    const instance = exerciseInstance(amira, LESSON, definition, []);
    const mm = Number((instance.expected!.value * 10).toFixed(1));
    const result = await recordAttempt({ db }, { studentId: amira, slug: LESSON, definition, submission: { kind: "text", answer: `${mm} mm` } });
    expect("feedback" in result && result.feedback.right).toBe(true);
    const rows = await db.select().from(exerciseAttempts).where(and(eq(exerciseAttempts.studentId, amira), eq(exerciseAttempts.exerciseId, definition.id)));
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ rawAnswer: `${mm} mm`, outcome: "correct", parsedUnit: "mm", correct: 1 });
  });

  it("answers a wrong value with the hint, names the slip, and shows the worked solution after the last try", async () => {
    const definition = findExercise(LESSON, "deformation-from-readings")!;
    const instance = exerciseInstance(ben, LESSON, definition, []);
    const loaded = instance.expected!.context!.loadedReadingCm!;
    const first = await recordAttempt({ db }, { studentId: ben, slug: LESSON, definition, submission: { kind: "text", answer: `${loaded} cm` } });
    expect("feedback" in first && first.feedback).toMatchObject({ right: false, slipCode: "loaded-reading-as-deformation" });
    expect("feedback" in first && first.feedback.hint).toBe(instance.hint);

    let state = await loadLessonState({ db }, ben, LESSON);
    expect(state.exercises[definition.id]).toMatchObject({ status: "open", attemptsUsed: 1, solution: null });

    // An unreadable answer does not use up a try.
    const unreadable = await recordAttempt({ db }, { studentId: ben, slug: LESSON, definition, submission: { kind: "text", answer: "about a bit" } });
    expect("feedback" in unreadable && unreadable.counted).toBe(false);

    for (let i = 0; i < 2; i++) {
      await recordAttempt({ db }, { studentId: ben, slug: LESSON, definition, submission: { kind: "text", answer: "99 cm" } });
    }
    state = await loadLessonState({ db }, ben, LESSON);
    expect(state.exercises[definition.id]).toMatchObject({ status: "used-up", attemptsUsed: 3 });
    expect(state.exercises[definition.id].solution).toBe(instance.solution);
    const refused = await recordAttempt({ db }, { studentId: ben, slug: LESSON, definition, submission: { kind: "text", answer: "1 cm" } });
    expect(refused).toEqual({ refused: "You have used every attempt at this exercise." });
  });

  it("never puts an expected answer or an unearned solution into the page's state", async () => {
    const state = await loadLessonState({ db }, await studentId("carmen.l"), LESSON);
    const json = JSON.stringify(state);
    for (const key of ["expected", "cells", "correctChoice", "knownWrongAnswers"]) expect(json).not.toContain(`"${key}"`);
    for (const exercise of Object.values(state.exercises)) expect(exercise.solution).toBeNull();
    const kinds = new Set(Object.values(state.exercises).map((e) => e.kind));
    expect(kinds).toEqual(new Set(["number", "table", "choice"]));
  });

  it("checks a table cell by cell and a choice by its option", async () => {
    const student = await studentId("dev.p");
    const table = findExercise(LESSON, "complete-the-table")!;
    const tableInstance = exerciseInstance(student, LESSON, table, []);
    const cells = tableInstance.cells!.map((c) => `${c.value} cm`);
    // A cell that cannot be read names its row and uses no try; every other wrong row is named too.
    const unreadable = await recordAttempt({ db }, { studentId: student, slug: LESSON, definition: table, submission: { kind: "cells", cells: ["-1 cm", "two", ""] } });
    expect("feedback" in unreadable && unreadable.feedback).toMatchObject({ outcome: "unreadable", message: expect.stringMatching(/^Row 2 could not be read.*\nRow 3 could not be read/) });
    expect((await loadLessonState({ db }, student, LESSON)).exercises[table.id].attemptsUsed).toBe(0);
    const wrongCells = ["0 cm", cells[1], "0 cm"];
    const wrong = await recordAttempt({ db }, { studentId: student, slug: LESSON, definition: table, submission: { kind: "cells", cells: wrongCells } });
    expect("feedback" in wrong && wrong.feedback.message).toMatch(/^Row 1: .*\nRow 3: /);
    expect((await loadLessonState({ db }, student, LESSON)).exercises[table.id].attemptsUsed).toBe(1);
    const right = await recordAttempt({ db }, { studentId: student, slug: LESSON, definition: table, submission: { kind: "cells", cells } });
    expect("feedback" in right && right.feedback.right).toBe(true);

    const choice = findExercise(LESSON, "same-stiffness-choice")!;
    const choiceInstance = exerciseInstance(student, LESSON, choice, []);
    const result = await recordAttempt({
      db },
      { studentId: student, slug: LESSON, definition: choice, submission: { kind: "choice", choice: choiceInstance.correctChoice!, reason: "I divided each force by its deformation." } },
    );
    expect("feedback" in result && result.feedback.right).toBe(true);
  });
});

describe("own readings", () => {
  it("saves a readings table and analyses it exactly as the analysis function does", async () => {
    const student = await studentId("elif.s");
    // Invented readings for the test.
    const set = {
      readingsId: "home-lab-a",
      mode: "bend" as const,
      material: "plastic ruler",
      unloadedCm: 20,
      resolutionCm: 0.1,
      points: [1, 2, 3, 4, 5, 6].map((f) => ({ forceN: f, readingCm: Number((20 - f * 0.42).toFixed(1)) })),
    };
    await saveReadings({ db }, student, LESSON, set);
    const state = await loadLessonState({ db }, student, LESSON);
    expect(state.readings["home-lab-a"]).toEqual(set);
    expect(state.lastPlace).toBe("readings-home-lab-a");
    const direct = analyseReadings({ mode: "bend", unloadedCm: 20, resolutionCm: 0.1, points: set.points });
    const saved = state.readings["home-lab-a"];
    expect(analyseReadings({ mode: saved.mode, unloadedCm: saved.unloadedCm!, resolutionCm: saved.resolutionCm, points: saved.points })).toEqual(direct);
  });
});

describe("own readings sent from the lesson page", () => {
  it("names every reading no lab can give, row by row, and saves nothing", async () => {
    const cookie = await sessionCookieFor("student");
    const fields = new URLSearchParams([
      ["intent", "save-readings"],
      ["readingsId", "ruler-readings"],
      ["mode", "bend"],
      ["resolutionCm", "0.1"],
      ["material", "plastic ruler"],
      ["unloadedCm", "24.0"],
      // Invented readings: a good row, a reading above the unloaded one, one beyond any ruler, a negative force.
      ...[["1", "23.7"], ["2", "30"], ["3", "1e5"], ["-2", "23.2"]].flatMap(([f, r]) => [["forceN", f], ["readingCm", r], ["returnReadingCm", ""], ["broke", "0"]]),
    ]);
    const request = new Request(`${appUrl}/learn/07-home-lab`, {
      method: "POST",
      headers: { "content-type": "application/x-www-form-urlencoded", origin: appUrl, "sec-fetch-site": "same-origin", cookie },
      body: fields,
    });
    const answer = await runRoute(lessonRoute.action as never, request, { slug: "07-home-lab" });
    expect(answer.status).toBe(400);
    expect((answer.body as { errors: string[] }).errors).toEqual([
      "Row 2: the loaded reading 30.0 cm is above the unloaded reading 24.0 cm, but a bending piece moves down under a load. Check both readings.",
      "Row 3: a reading of 100000 cm is more than any ruler in this lab reads. Check the decimal point.",
      "Row 4: the force cannot be below 0 N.",
    ]);
    const saved = await db.select().from(readingSets).where(and(eq(readingSets.studentId, amira), eq(readingSets.lessonSlug, "07-home-lab")));
    expect(saved.filter((r) => r.readingsId === "ruler-readings")).toEqual([]);
  });

  const send = async (unloaded: string, rows: string[][]) => {
    const cookie = await sessionCookieFor("student");
    const fields = new URLSearchParams([
      ["intent", "save-readings"],
      ["readingsId", "ruler-readings"],
      ["mode", "bend"],
      ["resolutionCm", "0.1"],
      ["material", "plastic ruler"],
      ["unloadedCm", unloaded],
      ...rows.flatMap(([f, r]) => [["forceN", f], ["readingCm", r], ["returnReadingCm", ""], ["broke", "0"]]),
    ]);
    const request = new Request(`${appUrl}/learn/07-home-lab`, {
      method: "POST",
      headers: { "content-type": "application/x-www-form-urlencoded", origin: appUrl, "sec-fetch-site": "same-origin", cookie },
      body: fields,
    });
    return runRoute(lessonRoute.action as never, request, { slug: "07-home-lab" });
  };

  it("names the unreadable cells and the readings no lab can give in one answer", async () => {
    // Invented: a unit of another column, a word, a negative force and a reading above the unloaded one.
    const answer = await send("24.0", [["1", "23.7 mm"], ["2", "abc"], ["-2", "23.2"], ["4", "30"]]);
    expect(answer.status).toBe(400);
    expect((answer.body as { errors: string[] }).errors).toEqual([
      "Row 1: the reading “23.7 mm” is in mm, but readings are in cm here: write it in cm (23.7 mm is 2.37 cm).",
      "Row 2: the reading “abc” is not a number.",
      "Row 3: the force cannot be below 0 N.",
      "Row 4: the loaded reading 30.0 cm is above the unloaded reading 24.0 cm, but a bending piece moves down under a load. Check both readings.",
    ]);
  });

  it("saves readings typed with their units, the units taken off", async () => {
    const answer = await send("24,0 cm", [["1 N", "23.7 cm"], ["2 N", "23,3 cm"]]);
    expect(answer.body).toEqual({ readingsId: "ruler-readings", saved: true });
    const [saved] = await db
      .select()
      .from(readingSets)
      .where(and(eq(readingSets.studentId, amira), eq(readingSets.lessonSlug, "07-home-lab"), eq(readingSets.readingsId, "ruler-readings")));
    expect(saved).toMatchObject({ unloadedCm: 24, points: [{ forceN: 1, readingCm: 23.7 }, { forceN: 2, readingCm: 23.3 }] });
  });
});

describe("progress", () => {
  it("completes a lesson when every required exercise is finished and the written answer handed in", async () => {
    const student = await studentId("finn.o");
    const { exercises } = lessonExercises(LESSON);
    for (const definition of exercises) {
      for (let i = 0; i < 3; i++) {
        await recordAttempt({ db }, { studentId: student, slug: LESSON, definition, submission: definition.kind === "table" ? { kind: "cells", cells: ["1 cm", "1 cm", "1 cm"] } : definition.kind === "choice" ? { kind: "choice", choice: "nonsense-not-an-option", reason: "" } : { kind: "text", answer: "12345 N" } });
      }
    }
    let progress = await courseProgress({ db }, student);
    let lesson2 = progress.find((p) => p.slug === LESSON)!;
    // A choice that is not one of the options is unreadable and uses no try, so that one stays open.
    expect(lesson2.complete).toBe(false);

    const choice = exercises.find((e) => e.kind === "choice")!;
    const instance = exerciseInstance(student, LESSON, choice, []);
    await recordAttempt({ db }, { studentId: student, slug: LESSON, definition: choice, submission: { kind: "choice", choice: instance.correctChoice!, reason: "" } });
    await saveWrittenAnswer({ db }, student, LESSON, "cer-stiffness", { claim: "c", evidence: "e", reasoning: "r" }, false);
    progress = await courseProgress({ db }, student);
    expect(progress.find((p) => p.slug === LESSON)!.complete).toBe(false);

    await saveWrittenAnswer({ db }, student, LESSON, "cer-stiffness", { claim: "c", evidence: "e", reasoning: "r" }, true);
    progress = await courseProgress({ db }, student);
    lesson2 = progress.find((p) => p.slug === LESSON)!;
    expect(lesson2).toMatchObject({ complete: true, requiredDone: lesson2.requiredTotal });
    expect((await loadLessonState({ db }, student, LESSON)).complete).toBe(true);
  });

  it("never lets a draft overwrite a handed-in answer, and stamps a second hand-in with its own time", async () => {
    const student = await studentId("jonah.b");
    const text = { claim: "Stiffer at small loads.", evidence: "2.5 then 2.2 N/cm", reasoning: "The ratio fell." };
    expect(await saveWrittenAnswer({ db }, student, LESSON, "cer-stiffness", text, true)).toBe("saved");
    const [first] = await db.select().from(writtenAnswers).where(eq(writtenAnswers.studentId, student));
    expect(await saveWrittenAnswer({ db }, student, LESSON, "cer-stiffness", { ...text, claim: "a draft" }, false)).toBe("already-handed-in");
    let [row] = await db.select().from(writtenAnswers).where(eq(writtenAnswers.studentId, student));
    expect(row.claim).toBe(text.claim);
    await new Promise((r) => setTimeout(r, 20));
    expect(await saveWrittenAnswer({ db }, student, LESSON, "cer-stiffness", { ...text, claim: "Second thoughts." }, true)).toBe("saved");
    [row] = await db.select().from(writtenAnswers).where(eq(writtenAnswers.studentId, student));
    expect(row.claim).toBe("Second thoughts.");
    expect(row.handedInAt!.getTime()).toBeGreaterThan(first.handedInAt!.getTime());
  });

  it("tells a child at home who reads a handed-in answer that a draft cannot change: their parent, not a teacher", async () => {
    const cookie = await sessionCookieFor("child");
    const send = (handIn: "0" | "1", claim: string) =>
      runRoute(
        lessonRoute.action as never,
        new Request(`${appUrl}/learn/07-home-lab`, {
          method: "POST",
          headers: { "content-type": "application/x-www-form-urlencoded", origin: appUrl, "sec-fetch-site": "same-origin", cookie },
          body: new URLSearchParams({ intent: "written-answer", answerId: "cer-home-lab", claim, evidence: "2.6 and 6.8 N/cm", reasoning: "It bent less.", handIn }),
        }),
        { slug: "07-home-lab" },
      );
    expect((await send("1", "The stirrer is stiffer.")).status).toBe(200);
    const draft = await send("0", "A draft from another tab");
    expect(draft.status).toBe(409);
    const message = (draft.body as { errors: { claim: string } }).errors.claim;
    expect(message).toContain("your parent then reads the new version");
    expect(message).not.toContain("teacher");
  });

  it("continues where the student stopped", async () => {
    const student = await studentId("grace.w");
    const definition = findExercise(LESSON, "stiffness-one-reading")!;
    await recordAttempt({ db }, { studentId: student, slug: LESSON, definition, submission: { kind: "text", answer: "1 N" } });
    expect(continueTarget(await courseProgress({ db }, student))).toEqual({ slug: LESSON, place: "exercise-stiffness-one-reading", due: null, stoppedAt: null });
  });

  it("sends the student to assigned work due within a week before the lesson last worked on", () => {
    const now = new Date("2026-10-05T12:00:00Z");
    const day = 24 * 60 * 60 * 1000;
    const lesson = (slug: string, worked: number | null, complete = false) => ({
      slug, number: Number(slug[1]), title: slug, summary: "", minutes: 40, requiredDone: worked ? 1 : 0, requiredTotal: 5,
      complete, started: worked !== null, lastPlace: worked ? `exercise-in-${slug}` : null, updatedAt: worked ? new Date(now.getTime() - worked * day) : null,
    });
    // Lesson 5 opened yesterday out of curiosity; lesson 3 half done a week ago and assigned.
    const progress = [lesson("01", 20, true), lesson("03", 7), lesson("05", 1), lesson("06", null)];
    const assigned = (slug: string, dueInDays: number, latePolicy: "accept" | "penalty" | "closed" = "accept", opened = true) => ({
      slug, dueAt: new Date(now.getTime() + dueInDays * day).toISOString(), dueText: `in ${dueInDays} days`, opened, latePolicy,
    });

    expect(continueTarget(progress, [assigned("03", 2)], now)).toEqual({
      slug: "03", place: "exercise-in-03", due: { text: "in 2 days", passed: false }, stoppedAt: { slug: "05", place: "exercise-in-05" },
    });
    // Past due but still taking late work: first, and said so.
    expect(continueTarget(progress, [assigned("06", 3), assigned("03", -1)], now)).toMatchObject({ slug: "03", due: { passed: true } });
    // Not yet due within a week, closed after its due date, not open yet, or finished: where the student stopped.
    for (const other of [assigned("03", 8), assigned("03", -1, "closed"), assigned("03", 1, "accept", false), assigned("01", 1)]) {
      expect(continueTarget(progress, [other], now)).toEqual({ slug: "05", place: "exercise-in-05", due: null, stoppedAt: null });
    }
    // The due lesson is the one last worked on: no second link.
    expect(continueTarget(progress, [assigned("05", 1)], now)).toMatchObject({ slug: "05", stoppedAt: null });
    expect(continueTarget(progress.map((p) => ({ ...p, complete: true })), [assigned("03", 1)], now)).toBeNull();
  });
});

describe("every lesson folder", () => {
  it("has frontmatter the pipeline accepts", () => {
    for (const slug of lessonFolders()) {
      const checked = checkLessonFrontmatter(slug);
      expect(checked.ok ? [] : checked.problems, slug).toEqual([]);
    }
  });
});

describe("the lesson compile cache", () => {
  it("compiles a lesson once, not per request", async () => {
    const before = compileCount();
    const results = await Promise.all([compiledLesson(LESSON), compiledLesson(LESSON), compiledLesson(LESSON)]);
    await compiledLesson(LESSON);
    expect(compileCount() - before).toBe(1);
    expect(new Set(results.map((r) => r.hash)).size).toBe(1);
    // <Equation> arrives with its KaTeX markup made at compile time: no KaTeX code in the browser.
    expect(results[0].code).toContain("katex-display");
    expect(results[0].code).not.toMatch(/renderToString|ParseError/);
  });

  it("keeps generators and expected answers out of the compiled bundle", async () => {
    const { code } = await compiledLesson(LESSON);
    expect(code).not.toContain("generate(");
    expect(code).not.toContain("expected");
    expect(code).not.toContain("solution");
  });

  it("renders math with MathML for screen readers", async () => {
    const { code } = await compiledLesson(LESSON);
    expect(code).toContain("math");
    expect(code).toMatch(/annotation/);
  });
});
