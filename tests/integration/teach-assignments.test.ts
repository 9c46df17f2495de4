// Assignments and accommodations, from the teacher's form to the student's page: dates typed in the
// class's time zone, late policies, more tries and more days applied quietly (attemptsAllowed takes the
// student's lesson policy and the exercise), answers refused after a closed due date, the student's
// assigned lessons for /learn, and a lesson page whose query count stays fixed.
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db, sqlStatements } from "~/db/client.server";
import { accommodations, assignments, classes, users } from "~/db/schema.server";
import { attemptsAllowed, courseProgress, findExercise, loadLessonState, recordAttempt } from "~/lib/course.server";
import { assignedLessonsFor } from "~/lib/teaching/assignments.server";
import { lateCredit } from "~/lib/teaching/gradebook.server";
import { lessonPolicies } from "~/lib/teaching/policy.server";
import { dateToZonedInput, daysLate, formatClockTime, formatDue, formatMoment, timeZoneMenu, zonedInputToDate } from "~/lib/teaching/time";
import * as assignPage from "~/routes/teach.classes.$classId.assignments";
import * as studentPage from "~/routes/teach.classes.$classId.students.$studentId";
import * as lessonRoute from "~/routes/learn.lesson";
import { get, post, runRoute, sessionCookieFor } from "./auth-helpers";
import { demoIds } from "./teaching-helpers";

const LESSON = "02-force-and-deformation";
const DAY = 24 * 60 * 60 * 1000;
let ids: Awaited<ReturnType<typeof demoIds>>;
const cookies: Record<string, string> = {};

beforeAll(async () => {
  ids = await demoIds();
  for (const who of ["teacher", "secondTeacher", "student"] as const) cookies[who] = await sessionCookieFor(who);
  await db.update(classes).set({ timeZone: "America/Chicago" }).where(eq(classes.id, ids.mapleA.id));
  // Start from a class with nothing assigned (the demo seed assigns lesson 2).
  await db.delete(assignments).where(eq(assignments.classId, ids.mapleA.id));
}, 60_000);

const assign = (fields: Record<string, string>, cookie = cookies.teacher) =>
  runRoute(assignPage.action as never, post(`/teach/classes/${ids.mapleA.id}/assignments`, { intent: "assign", slug: LESSON, latePolicy: "accept", latePenaltyPercent: "0", ...fields }, { cookie }), { classId: ids.mapleA.id });
const accommodate = (studentId: string, fields: Record<string, string>) =>
  runRoute(studentPage.action as never, post(`/teach/classes/${ids.mapleA.id}/students/${studentId}`, { intent: "accommodation", ...fields }, { cookie: cookies.teacher }), { classId: ids.mapleA.id, studentId });
const local = (date: Date) => dateToZonedInput(date, "America/Chicago");

describe("time zones for due dates", () => {
  it("reads a wall-clock time in the class's zone, across clock changes, and writes it back the same", () => {
    expect(zonedInputToDate("2026-12-11T17:00", "America/Chicago")!.toISOString()).toBe("2026-12-11T23:00:00.000Z");
    expect(zonedInputToDate("2026-07-01T17:00", "America/Chicago")!.toISOString()).toBe("2026-07-01T22:00:00.000Z");
    expect(zonedInputToDate("2027-03-28T09:30", "Europe/Berlin")!.toISOString()).toBe("2027-03-28T07:30:00.000Z");
    expect(dateToZonedInput(new Date("2026-12-11T23:00:00Z"), "America/Chicago")).toBe("2026-12-11T17:00");
    expect(zonedInputToDate("2026-02-30T10:00", "UTC")).toBeNull();
    expect(zonedInputToDate("next friday", "UTC")).toBeNull();
    expect(formatDue(new Date("2026-12-11T23:00:00Z"), "America/Chicago", new Date("2026-12-01T00:00:00Z"))).toMatch(/Fri 11 Dec.*5:00\s?pm/);
    // Every time of day on the 12-hour clock of the due dates (attempt lists, "Updated …").
    expect(formatMoment(new Date("2026-12-11T22:05:09Z"), "America/Chicago")).toMatch(/^11 Dec 2026, 4:05:09\s?pm$/);
    expect(formatClockTime(new Date("2026-12-11T06:05:09Z"), "UTC")).toMatch(/^6:05:09\s?am$/);
    // The class settings' menu: UTC alone first, then zones by region, named by place with spaces.
    const menu = timeZoneMenu();
    expect(menu[0]).toEqual({ value: "UTC", label: "UTC" });
    expect(menu).toContainEqual({ value: "America/Chicago", label: "Chicago", group: "America" });
    expect(menu).toContainEqual({ value: "America/Indiana/Knox", label: "Indiana/Knox", group: "America" });
    expect(menu).toContainEqual({ value: "America/Buenos_Aires", label: "Buenos Aires", group: "America" });
    expect(daysLate(new Date("2026-12-12T00:00:00Z"), new Date("2026-12-11T23:00:00Z"))).toBe(1);
    expect(daysLate(new Date("2026-12-13T23:00:00Z"), new Date("2026-12-11T23:00:00Z"))).toBe(2);
    expect(daysLate(new Date("2026-12-11T22:00:00Z"), new Date("2026-12-11T23:00:00Z"))).toBe(0);
  });

  it("gives late credit by the lesson's rule", () => {
    const due = new Date("2026-12-11T23:00:00Z");
    const twoDaysLate = new Date(due.getTime() + 1.5 * DAY);
    expect(lateCredit(new Date(due.getTime() - 1000), due, "closed", 0)).toBe(1);
    expect(lateCredit(twoDaysLate, due, "accept", 0)).toBe(1);
    expect(lateCredit(twoDaysLate, due, "penalty", 10)).toBeCloseTo(0.8);
    expect(lateCredit(twoDaysLate, due, "penalty", 60)).toBe(0);
    expect(lateCredit(twoDaysLate, due, "closed", 0)).toBe(0);
  });
});

describe("assigning a lesson", () => {
  it("stores the dates as typed in the class's time zone, and names each problem", async () => {
    const bad = await assign({ opensAt: "2026-12-10T08:00", dueAt: "2026-12-09T17:00" });
    expect(bad.status).toBe(400);
    expect((bad.body as { errors: Record<string, string> }).errors.dueAt).toMatch(/after the opening/);
    const unreadable = await assign({ opensAt: "soon", dueAt: "2026-12-09T17:00", latePolicy: "penalty", latePenaltyPercent: "150" });
    expect((unreadable.body as { errors: Record<string, string> }).errors).toMatchObject({
      opensAt: expect.stringMatching(/date and a time/),
      latePenaltyPercent: expect.stringMatching(/1 to 100/),
    });
    // The browser's own bubbles are off (noValidate): each of these gets the page's message beside its field.
    for (const [typed, message] of [
      ["-5", "Use digits only: a whole number from 1 to 100."],
      ["2.5", "Use digits only: a whole number from 1 to 100."],
      ["1e9", "Use digits only: a whole number from 1 to 100."],
      ["", "Enter a whole number from 1 to 100."],
    ]) {
      const penalty = await assign({ opensAt: "2026-12-01T08:00", dueAt: "2026-12-11T17:00", latePolicy: "penalty", latePenaltyPercent: typed });
      expect(penalty.body).toMatchObject({ slug: LESSON, errors: { latePenaltyPercent: message } });
    }
    const noDates = await assign({ opensAt: "", dueAt: "" });
    expect(noDates.body).toMatchObject({ slug: LESSON, errors: { opensAt: expect.stringMatching(/date and a time/), dueAt: expect.stringMatching(/date and a time/) } });
    const absurd = await assign({ opensAt: "1900-01-01T08:00", dueAt: "9999-12-31T17:00" });
    expect((absurd.body as { errors: Record<string, string> }).errors).toMatchObject({ opensAt: expect.stringMatching(/within 500 days of today/) });
    const farDue = await assign({ opensAt: local(new Date()), dueAt: local(new Date(Date.now() + 600 * DAY)) });
    expect((farDue.body as { errors: Record<string, string> }).errors.dueAt).toMatch(/due date within 500 days of today/);
    const unknown = await assign({ slug: "99-nothing", opensAt: "2026-12-01T08:00", dueAt: "2026-12-11T17:00" });
    expect((unknown.body as { errors: Record<string, string> }).errors.slug).toMatch(/not part of the course/);
    expect(await db.select().from(assignments).where(eq(assignments.classId, ids.mapleA.id))).toHaveLength(0);

    const ok = await assign({ opensAt: "2026-12-01T08:00", dueAt: "2026-12-11T17:00", latePolicy: "penalty", latePenaltyPercent: "10" });
    expect(ok.status).toBe(200);
    const [row] = await db.select().from(assignments).where(eq(assignments.classId, ids.mapleA.id));
    expect(row).toMatchObject({ lessonSlug: LESSON, latePolicy: "penalty", latePenaltyPercent: 10 });
    expect(row.dueAt.toISOString()).toBe("2026-12-11T23:00:00.000Z");
    expect(row.opensAt.toISOString()).toBe("2026-12-01T14:00:00.000Z");

    // Assigning again changes it (one row per lesson and class).
    await assign({ opensAt: "2026-12-01T08:00", dueAt: "2026-12-12T17:00", latePolicy: "accept" });
    const rows = await db.select().from(assignments).where(eq(assignments.classId, ids.mapleA.id));
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ latePolicy: "accept", latePenaltyPercent: 0 });

    const summary = async () => {
      const page = await runRoute(assignPage.loader as never, get(`/teach/classes/${ids.mapleA.id}/assignments`, { cookie: cookies.teacher }), { classId: ids.mapleA.id });
      return (page.body as { lessons: { slug: string; assignment: { dueAt: string; lateRule: string } | null }[] }).lessons.find((l) => l.slug === LESSON)!.assignment!;
    };
    expect((await summary()).dueAt).toBe("2026-12-12T17:00");
    // The assigned lesson's summary says its late-work rule in plain words.
    expect((await summary()).lateRule).toBe("late answers count in full");
    await assign({ opensAt: "2026-12-01T08:00", dueAt: "2026-12-12T17:00", latePolicy: "penalty", latePenaltyPercent: "5" });
    expect((await summary()).lateRule).toBe("late answers lose 5% of their credit a day");
    await assign({ opensAt: "2026-12-01T08:00", dueAt: "2026-12-12T17:00", latePolicy: "closed" });
    expect((await summary()).lateRule).toBe("closes at the due date");
    await assign({ opensAt: "2026-12-01T08:00", dueAt: "2026-12-12T17:00", latePolicy: "accept" });
  });

  it("is refused to another teacher (404), who changes nothing", async () => {
    const result = await assign({ opensAt: "2026-12-01T08:00", dueAt: "2026-12-30T17:00" }, cookies.secondTeacher);
    expect(result.status).toBe(404);
    const [row] = await db.select().from(assignments).where(eq(assignments.classId, ids.mapleA.id));
    expect(row.dueAt.toISOString()).toBe("2026-12-12T23:00:00.000Z");
  });

  it("saves a due date that has already passed, and says what it means for the students", async () => {
    const now = Date.now();
    const past = { opensAt: local(new Date(now - 10 * DAY)), dueAt: local(new Date(now - 2 * DAY)) };
    const closed = await assign({ ...past, latePolicy: "closed" });
    expect(closed.status).toBe(200);
    expect((closed.body as { caution?: string }).caution).toMatch(/already passed, so the lesson is closed: it can be read, but no answers are taken/);
    const [row] = await db.select().from(assignments).where(eq(assignments.classId, ids.mapleA.id));
    expect(row).toMatchObject({ latePolicy: "closed" });
    expect(row.dueAt.getTime()).toBeLessThan(now);

    const penalty = await assign({ ...past, latePolicy: "penalty", latePenaltyPercent: "10" });
    expect((penalty.body as { caution?: string }).caution).toMatch(/work done after it is late and loses 10% of its credit for each day late/);
    const accept = await assign({ ...past, latePolicy: "accept" });
    expect((accept.body as { caution?: string }).caution).toMatch(/work done after it is late \(late work counts in full\)/);

    const ahead = await assign({ opensAt: local(new Date(now - DAY)), dueAt: local(new Date(now + 5 * DAY)) });
    expect(ahead.body).toMatchObject({ done: expect.stringMatching(/^Assigned, due /) });
    expect((ahead.body as { caution?: string }).caution).toBeUndefined();
  });
});

describe("accommodations, applied quietly on the student's side", () => {
  it("gives more tries to one student only; a setting for one lesson replaces the class-wide one", async () => {
    const now = new Date();
    await assign({ opensAt: local(new Date(now.getTime() - DAY)), dueAt: local(new Date(now.getTime() + 5 * DAY)) });
    const before = await loadLessonState({ db }, ids.amira.id, LESSON);
    expect(before.exercises["deformation-from-readings"].attemptsAllowed).toBe(3);

    expect((await accommodate(ids.amira.id, { scope: "class", extraAttempts: "2", extraDays: "0" })).status).toBe(200);
    expect((await loadLessonState({ db }, ids.amira.id, LESSON)).exercises["deformation-from-readings"].attemptsAllowed).toBe(5);
    expect((await loadLessonState({ db }, ids.ben.id, LESSON)).exercises["deformation-from-readings"].attemptsAllowed).toBe(3);

    const [assignment] = await db.select().from(assignments).where(eq(assignments.classId, ids.mapleA.id));
    expect((await accommodate(ids.amira.id, { scope: assignment.id, extraAttempts: "1", extraDays: "3" })).status).toBe(200);
    const policy = (await lessonPolicies({ db }, ids.amira.id, [LESSON])).get(LESSON)!;
    expect(policy.extraAttempts).toBe(1);
    expect(policy.dueAt.getTime() - policy.classDueAt.getTime()).toBe(3 * DAY);
    expect(attemptsAllowed(policy, { id: "x" })).toBe(4);
    expect(attemptsAllowed(policy, { id: "x", attempts: 1 })).toBe(2);
    expect(attemptsAllowed(null)).toBe(3);

    // Setting it again changes the row (one per scope); 0 and 0 removes it.
    await accommodate(ids.amira.id, { scope: assignment.id, extraAttempts: "2", extraDays: "3" });
    const rows = await db.select().from(accommodations).where(eq(accommodations.studentId, ids.amira.id));
    expect(rows).toHaveLength(2);
    await accommodate(ids.amira.id, { scope: assignment.id, extraAttempts: "0", extraDays: "0" });
    expect(await db.select().from(accommodations).where(eq(accommodations.studentId, ids.amira.id))).toHaveLength(1);

    const bad = await accommodate(ids.amira.id, { scope: "class", extraAttempts: "-1", extraDays: "500" });
    expect(bad.status).toBe(400);
    expect(bad.body).toMatchObject({
      fieldErrors: { extraAttempts: "Use digits only: a whole number from 0 to 20.", extraDays: "That is outside the range: enter a whole number from 0 to 60." },
      values: { extraAttempts: "-1", extraDays: "500" },
    });

    // Empty fields (or only spaces) are refused, never taken for 0 and 0: the class-wide setting stays.
    for (const blank of ["", "   "]) {
      const empty = await accommodate(ids.amira.id, { scope: "class", extraAttempts: blank, extraDays: blank });
      expect(empty.status).toBe(400);
      expect(empty.body).toMatchObject({ fieldErrors: { extraAttempts: "Enter a whole number from 0 to 20.", extraDays: "Enter a whole number from 0 to 60." } });
    }
    for (const odd of ["1e1", "2.5"]) expect((await accommodate(ids.amira.id, { scope: "class", extraAttempts: odd, extraDays: "0" })).status).toBe(400);
    expect(await db.select().from(accommodations).where(eq(accommodations.studentId, ids.amira.id))).toHaveLength(1);
    const notHers = await accommodate(ids.amira.id, { scope: "00000000-0000-4000-8000-000000000000", extraAttempts: "1", extraDays: "0" });
    expect(notHers.status).toBe(400);

    // Nothing on the student's page says that an accommodation exists.
    const page = await runRoute(lessonRoute.loader as never, get(`/learn/${LESSON}`, { cookie: cookies.student }), { slug: LESSON });
    expect(JSON.stringify(page.body)).not.toMatch(/accommodat|extraAttempts|extraDays/i);
  });

  it("lets the student use the extra tries, and counts the lesson done only when they are used", async () => {
    const definition = findExercise(LESSON, "stiffness-one-reading")!;
    for (let i = 0; i < 3; i++) {
      const r = await recordAttempt({ db }, { studentId: ids.amira.id, slug: LESSON, definition, submission: { kind: "text", answer: "999 N/cm" } });
      expect("feedback" in r).toBe(true);
    }
    const state = await loadLessonState({ db }, ids.amira.id, LESSON);
    expect(state.exercises[definition.id]).toMatchObject({ status: "open", attemptsUsed: 3, attemptsAllowed: 5 });
    const progress = await courseProgress({ db }, ids.amira.id);
    const lesson2 = progress.find((p) => p.slug === LESSON)!;
    expect(lesson2.requiredDone).toBe(0);
    for (let i = 0; i < 2; i++) await recordAttempt({ db }, { studentId: ids.amira.id, slug: LESSON, definition, submission: { kind: "text", answer: "999 N/cm" } });
    const sixth = await recordAttempt({ db }, { studentId: ids.amira.id, slug: LESSON, definition, submission: { kind: "text", answer: "999 N/cm" } });
    expect(sixth).toEqual({ refused: "You have used every attempt at this exercise." });
    expect((await courseProgress({ db }, ids.amira.id)).find((p) => p.slug === LESSON)!.requiredDone).toBe(1);
  });

  it("keeps the lesson page's query count fixed, with or without assignments and accommodations", async () => {
    const count = async (studentId: string) => {
      const before = sqlStatements.count;
      await loadLessonState({ db }, studentId, LESSON);
      return sqlStatements.count - before;
    };
    const [harborStudent] = await db.select().from(users).where(eq(users.username, "theo.r"));
    const plain = await count(harborStudent.id);
    const withAll = await count(ids.amira.id);
    expect(withAll).toBe(plain);
    expect(plain).toBe(1); // the student's rows and the policy in one statement
  });

  it("checks an answer in two statements, with the student's extra tries applied", async () => {
    const definition = findExercise(LESSON, "deformation-from-readings")!;
    const before = sqlStatements.count;
    const outcome = await recordAttempt({ db }, { studentId: ids.amira.id, slug: LESSON, definition, submission: { kind: "text", answer: "999 cm" } });
    expect(sqlStatements.count - before).toBe(2); // readings, earlier tries and the policy; then the attempt with the visit
    expect("feedback" in outcome).toBe(true);
    // Amira has two extra tries in this class (the test above): her fifth counted try is still taken.
    expect((await loadLessonState({ db }, ids.amira.id, LESSON)).exercises[definition.id].attemptsAllowed).toBe(5);
  });
});

describe("closed at the due date", () => {
  it("refuses answers after the student's due date with a clear message, and takes them again with more days", async () => {
    const now = new Date();
    await assign({ opensAt: local(new Date(now.getTime() - 10 * DAY)), dueAt: local(new Date(now.getTime() - DAY)), latePolicy: "closed" });
    const definition = findExercise(LESSON, "deformation-from-readings")!;
    const refused = await recordAttempt({ db }, { studentId: ids.ben.id, slug: LESSON, definition, submission: { kind: "text", answer: "1 cm" } });
    expect(refused).toEqual({ refused: expect.stringMatching(/closed at its due date \(.+\), so answers are no longer taken/) });

    // Through the lesson page's action, as the browser sends it: 409 with the message, nothing recorded.
    const benCookie = await sessionCookieFor("secondStudent");
    const result = await runRoute(lessonRoute.action as never, post(`/learn/${LESSON}`, { intent: "answer", exerciseId: definition.id, answer: "1 cm" }, { cookie: benCookie }), { slug: LESSON });
    expect(result.status).toBe(409);
    expect((result.body as { error: string }).error).toMatch(/closed at its due date/);
    const state = await loadLessonState({ db }, ids.ben.id, LESSON);
    expect(state.assignment).toMatchObject({ closed: true, latePolicy: "closed" });
    expect(state.exercises[definition.id].attemptsUsed).toBe(0);

    // Nothing else is taken either: a prediction, a draft, a written answer handed in, readings.
    const parts: Record<string, string>[] = [
      { intent: "predict", predictionId: "stiffness-trend", choice: "same" },
      { intent: "written-answer", answerId: "cer-stiffness", claim: "Same.", evidence: "2.5 N/cm each.", reasoning: "F ÷ Δx.", handIn: "0" },
      { intent: "written-answer", answerId: "cer-stiffness", claim: "Same.", evidence: "2.5 N/cm each.", reasoning: "F ÷ Δx.", handIn: "1" },
      { intent: "save-readings", readingsId: "own-strip", unloadedCm: "20.0", forceN: "1", readingCm: "19.5" },
    ];
    for (const part of parts) {
      const sent = await runRoute(lessonRoute.action as never, post(`/learn/${LESSON}`, part, { cookie: benCookie }), { slug: LESSON });
      expect(sent.status, part.intent).toBe(409);
      expect((sent.body as { error: string }).error).toMatch(/closed at its due date .+ Ask your teacher/);
    }
    const after = await loadLessonState({ db }, ids.ben.id, LESSON);
    expect([after.predictions, after.writtenAnswers, after.readings]).toEqual([{}, {}, {}]);
    // The page shows his work read-only, and not as to an adult.
    const page = await runRoute(lessonRoute.loader as never, get(`/learn/${LESSON}`, { cookie: benCookie }), { slug: LESSON });
    expect(page.body).toMatchObject({ canAnswer: false, asAdult: false, reader: "teacher" });

    // Two more days for Ben: the lesson is open to him again, and only to him.
    await accommodate(ids.ben.id, { scope: "class", extraAttempts: "0", extraDays: "2" });
    const taken = await recordAttempt({ db }, { studentId: ids.ben.id, slug: LESSON, definition, submission: { kind: "text", answer: "1 cm" } });
    expect("feedback" in taken).toBe(true);
    expect((await loadLessonState({ db }, ids.ben.id, LESSON)).assignment?.closed).toBe(false);
    const [carmen] = await db.select().from(users).where(eq(users.username, "carmen.l"));
    expect("refused" in (await recordAttempt({ db }, { studentId: carmen.id, slug: LESSON, definition, submission: { kind: "text", answer: "1 cm" } }))).toBe(true);
  });
});

describe("the student's assigned lessons (for /learn)", () => {
  it("lists what the student's teachers assigned, with the student's own due date, and nothing of other classes", async () => {
    const benLessons = await assignedLessonsFor({ db }, ids.ben.id);
    const [assignment] = await db.select().from(assignments).where(and(eq(assignments.classId, ids.mapleA.id), eq(assignments.lessonSlug, LESSON)));
    expect(benLessons).toEqual([
      expect.objectContaining({ slug: LESSON, number: 2, className: "Grade 7 Physical Science A", latePolicy: "closed", timeZone: "America/Chicago", opened: true }),
    ]);
    expect(new Date(benLessons[0].dueAt).getTime() - assignment.dueAt.getTime()).toBe(2 * DAY);
    const [theo] = await db.select().from(users).where(eq(users.username, "theo.r"));
    expect(await assignedLessonsFor({ db }, theo.id)).toEqual([]);
    // An archived class's assignments no longer apply.
    await db.update(classes).set({ archivedAt: new Date() }).where(eq(classes.id, ids.mapleA.id));
    expect(await assignedLessonsFor({ db }, ids.ben.id)).toEqual([]);
    await db.update(classes).set({ archivedAt: null }).where(eq(classes.id, ids.mapleA.id));
  });
});
