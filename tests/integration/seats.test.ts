// The seat rules against a real PostgreSQL: the ledger per school year, enrolling takes one free seat,
// removing frees it, no free seat means a clear refusal (with a link for administrators and names for
// teachers), a child account takes a family seat, and 50 enrollments at once into 10 free seats
// give exactly 10 enrollments, on separate connections.
import { and, count, eq } from "drizzle-orm";
import { drizzle } from "drizzle-orm/postgres-js";
import postgres from "postgres";
import { afterAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import * as schema from "~/db/schema.server";
import { enrollments, organisations, seatAssignments, users } from "~/db/schema.server";
import {
  assignHouseholdSeat,
  createChildUsingSeat,
  enrollStudentUsingSeat,
  noFreeSeatNotice,
  releaseSeat,
  seatLedger,
  seatLedgerForYear,
  type SeatRefusal,
} from "~/lib/seats.server";
import { isSchoolYear, purchasableSchoolYears, schoolYearOf } from "~/lib/school-year";
import { createAdult, createClass, createHousehold, createSchool, createStudents, givePaidSeats } from "../factories/schools";

describe("school years", () => {
  it("start on 1 July and are written 2026-27", () => {
    expect(schoolYearOf(new Date("2026-12-01T12:00:00Z"))).toBe("2026-27");
    expect(schoolYearOf(new Date("2027-06-30T12:00:00Z"))).toBe("2026-27");
    expect(schoolYearOf(new Date("2027-07-01T12:00:00Z"))).toBe("2027-28");
    expect(schoolYearOf(new Date("2099-08-01T00:00:00Z"))).toBe("2099-00");
    expect(purchasableSchoolYears(new Date("2026-12-01T12:00:00Z"))).toEqual(["2026-27", "2027-28"]);
    expect(isSchoolYear("2026-27")).toBe(true);
    expect(isSchoolYear("2026-28")).toBe(false);
    expect(isSchoolYear("2026/27")).toBe(false);
  });
});

describe("the seat ledger", () => {
  it("shows the demo school's seats: 40 bought, 30 in use, 10 free in 2026-27", async () => {
    const [maplebrook] = await db.select().from(organisations).where(eq(organisations.slug, "maplebrook"));
    expect(await seatLedger({ db }, maplebrook.id)).toEqual([{ schoolYear: "2026-27", bought: 40, inUse: 30, free: 10 }]);
  });

  it("counts only paid purchases, per school year, and never shows free below zero", async () => {
    const { school } = await createSchool(db, { seats: 5 });
    await givePaidSeats(db, school.id, "2027-28", 7);
    await db.insert(schema.seatPurchases).values({ organisationId: school.id, schoolYear: "2026-27", seats: 100, amountCents: 90000, method: "invoice", status: "pending" });
    await db.insert(schema.seatPurchases).values({ organisationId: school.id, schoolYear: "2026-27", seats: 100, amountCents: 90000, method: "card", status: "void" });
    expect(await seatLedger({ db }, school.id)).toEqual([
      { schoolYear: "2027-28", bought: 7, inUse: 0, free: 7 },
      { schoolYear: "2026-27", bought: 5, inUse: 0, free: 5 },
    ]);
    expect(await seatLedgerForYear({ db }, school.id, "2030-31")).toEqual({ schoolYear: "2030-31", bought: 0, inUse: 0, free: 0 });
  });
});

describe("enrolling and removing students", () => {
  it("takes one seat per student per year, not one per class, and frees it after the last class", async () => {
    const { school, admin } = await createSchool(db, { seats: 2 });
    const teacher = await createAdult(db, school.id, "teacher", "Teacher Ames");
    const [a, b] = await createStudents(db, school.id, 2);
    const classA = await createClass(db, school.id, teacher.id);
    const classB = await createClass(db, school.id, teacher.id);

    const first = await enrollStudentUsingSeat({ db }, { classId: classA.id, studentId: a.id });
    expect(first).toMatchObject({ ok: true, seatTaken: true, ledger: { bought: 2, inUse: 1, free: 1 } });
    const second = await enrollStudentUsingSeat({ db }, { classId: classB.id, studentId: a.id });
    expect(second).toMatchObject({ ok: true, seatTaken: false, ledger: { inUse: 1, free: 1 } });
    const again = await enrollStudentUsingSeat({ db }, { classId: classA.id, studentId: a.id });
    expect(again).toMatchObject({ ok: true, alreadyEnrolled: true, seatTaken: false });

    expect(await releaseSeat({ db }, { classId: classA.id, studentId: a.id })).toMatchObject({ removed: true, seatFreed: false, ledger: { inUse: 1 } });
    expect(await releaseSeat({ db }, { classId: classB.id, studentId: a.id })).toMatchObject({ removed: true, seatFreed: true, ledger: { inUse: 0, free: 2 } });
    expect(await releaseSeat({ db }, { classId: classB.id, studentId: a.id })).toMatchObject({ removed: false, seatFreed: false });

    await enrollStudentUsingSeat({ db }, { classId: classA.id, studentId: a.id });
    expect(await enrollStudentUsingSeat({ db }, { classId: classA.id, studentId: b.id })).toMatchObject({ ok: true, ledger: { inUse: 2, free: 0 } });
    void admin;
  });

  it("refuses with a clear message when no seat is free; the administrator gets a link to buy more, a teacher the administrators' names", async () => {
    const { school, admin } = await createSchool(db, { seats: 1 });
    const secondAdmin = await createAdult(db, school.id, "school_admin", "Bo Admin-Second");
    const teacher = await createAdult(db, school.id, "teacher", "Teacher Ames");
    const [a, b] = await createStudents(db, school.id, 2);
    const klass = await createClass(db, school.id, teacher.id);
    await enrollStudentUsingSeat({ db }, { classId: klass.id, studentId: a.id });

    const refused = await enrollStudentUsingSeat({ db }, { classId: klass.id, studentId: b.id });
    expect(refused).toEqual({
      ok: false,
      reason: "no-free-seat",
      message: "The 1 seat for 2026-27 is in use, so this student cannot be added. More seats need to be bought first.",
      ledger: { schoolYear: "2026-27", bought: 1, inUse: 1, free: 0 },
    });
    const [enrolled] = await db.select({ n: count() }).from(enrollments).where(eq(enrollments.studentId, b.id));
    expect(enrolled.n).toBe(0);

    const forAdmin = await noFreeSeatNotice({ db }, refused as SeatRefusal, { organisationId: school.id, isAdministrator: true });
    expect(forAdmin).toEqual({ message: (refused as SeatRefusal).message, buyUrl: "/school/seats/buy?year=2026-27&seats=10" });
    const forTeacher = await noFreeSeatNotice({ db }, refused as SeatRefusal, { organisationId: school.id, isAdministrator: false });
    expect(forTeacher.buyUrl).toBeUndefined();
    expect(forTeacher.askAdministrators).toEqual([admin.displayName, secondAdmin.displayName].sort());

    const none = await createSchool(db);
    const noneTeacher = await createAdult(db, none.school.id, "teacher", "T");
    const [c] = await createStudents(db, none.school.id, 1);
    const noneClass = await createClass(db, none.school.id, noneTeacher.id);
    expect(await enrollStudentUsingSeat({ db }, { classId: noneClass.id, studentId: c.id })).toMatchObject({
      ok: false,
      message: "There are no seats for 2026-27 yet, so no student can be added. Seats need to be bought first.",
    });
  });

  it("uses the seats of the class's own school year", async () => {
    const { school } = await createSchool(db, { seats: 3, schoolYear: "2026-27" });
    const teacher = await createAdult(db, school.id, "teacher", "T");
    const [a] = await createStudents(db, school.id, 1);
    const nextYear = await createClass(db, school.id, teacher.id, "2027-28");
    expect(await enrollStudentUsingSeat({ db }, { classId: nextYear.id, studentId: a.id })).toMatchObject({ ok: false, reason: "no-free-seat", ledger: { schoolYear: "2027-28" } });
  });

  it("refuses a student of another school and a class that does not exist", async () => {
    const mine = await createSchool(db, { seats: 3 });
    const other = await createSchool(db, { seats: 3 });
    const teacher = await createAdult(db, mine.school.id, "teacher", "T");
    const [stranger] = await createStudents(db, other.school.id, 1);
    const klass = await createClass(db, mine.school.id, teacher.id);
    expect(await enrollStudentUsingSeat({ db }, { classId: klass.id, studentId: stranger.id })).toMatchObject({ ok: false, reason: "not-a-student-here" });
    expect(await enrollStudentUsingSeat({ db }, { classId: "00000000-0000-0000-0000-000000000000", studentId: stranger.id })).toMatchObject({ ok: false, reason: "class-not-found" });
    expect(await seatLedgerForYear({ db }, mine.school.id, "2026-27")).toMatchObject({ inUse: 0 });
  });
});

describe("50 enrollments at the same moment into 10 free seats", () => {
  const pool = postgres(process.env.DATABASE_URL!, { max: 20, onnotice: () => {} });
  const concurrentDb = drizzle(pool, { schema });
  afterAll(async () => {
    await pool.end();
  });

  it("enrol exactly 10 students; the other 40 get the clear refusal, and the ledger adds up", async () => {
    const { school } = await createSchool(db, { seats: 10 });
    const teacher = await createAdult(db, school.id, "teacher", "T");
    const klass = await createClass(db, school.id, teacher.id);
    const students = await createStudents(db, school.id, 50);

    const started = Date.now();
    const results = await Promise.all(students.map((s) => enrollStudentUsingSeat({ db: concurrentDb }, { classId: klass.id, studentId: s.id })));
    const ms = Date.now() - started;

    const successes = results.filter((r) => r.ok);
    const refusals = results.filter((r) => !r.ok);
    console.log(`concurrency: ${successes.length} enrolled, ${refusals.length} refused, ${ms} ms for 50 enrollments over 20 connections`);
    expect(successes).toHaveLength(10);
    expect(refusals).toHaveLength(40);
    for (const r of refusals) {
      expect(r).toMatchObject({ ok: false, reason: "no-free-seat", message: "All 10 seats for 2026-27 are in use, so this student cannot be added. More seats need to be bought first." });
    }
    const [seatsHeld] = await db.select({ n: count() }).from(seatAssignments).where(eq(seatAssignments.organisationId, school.id));
    const [inClass] = await db.select({ n: count() }).from(enrollments).where(eq(enrollments.classId, klass.id));
    expect(seatsHeld.n).toBe(10);
    expect(inClass.n).toBe(10);
    expect(await seatLedgerForYear({ db }, school.id, "2026-27")).toEqual({ schoolYear: "2026-27", bought: 10, inUse: 10, free: 0 });
  });

  it("with removals and enrollments racing, seats in use never exceed seats bought", async () => {
    const { school } = await createSchool(db, { seats: 5 });
    const teacher = await createAdult(db, school.id, "teacher", "T");
    const klass = await createClass(db, school.id, teacher.id);
    const students = await createStudents(db, school.id, 30);
    for (const s of students.slice(0, 5)) await enrollStudentUsingSeat({ db }, { classId: klass.id, studentId: s.id });
    const results = await Promise.all([
      ...students.slice(0, 5).map((s) => releaseSeat({ db: concurrentDb }, { classId: klass.id, studentId: s.id })),
      ...students.slice(5).map((s) => enrollStudentUsingSeat({ db: concurrentDb }, { classId: klass.id, studentId: s.id })),
    ]);
    const enrolled = results.filter((r) => "ok" in r && r.ok).length;
    const ledger = await seatLedgerForYear({ db }, school.id, "2026-27");
    expect(ledger.inUse).toBeLessThanOrEqual(5);
    expect(ledger.inUse).toBe(enrolled);
    const [inClass] = await db.select({ n: count() }).from(enrollments).where(eq(enrollments.classId, klass.id));
    expect(inClass.n).toBe(ledger.inUse);
  });
});

describe("families: a child account takes a seat", () => {
  it("creates the child with a seat while one is free, and refuses (no account made) when none is", async () => {
    const { household } = await createHousehold(db, { seats: 1 });
    const made = await createChildUsingSeat({ db }, { householdId: household.id, schoolYear: "2026-27", displayName: "Ada", username: "Ada", gradeBand: "6-8", passwordHash: "x" });
    expect(made).toMatchObject({ ok: true, child: { username: "ada", displayName: "Ada" }, ledger: { bought: 1, inUse: 1, free: 0 } });

    const refused = await createChildUsingSeat({ db }, { householdId: household.id, schoolYear: "2026-27", displayName: "Bo", username: "bo", gradeBand: "9-10", passwordHash: "x" });
    expect(refused).toMatchObject({ ok: false, reason: "no-free-seat", message: "The 1 seat for 2026-27 is in use, so this student cannot be added. More seats need to be bought first." });
    const [bo] = await db.select().from(users).where(and(eq(users.homeOrganisationId, household.id), eq(users.username, "bo")));
    expect(bo).toBeUndefined();

    await givePaidSeats(db, household.id, "2026-27", 1);
    expect(await createChildUsingSeat({ db }, { householdId: household.id, schoolYear: "2026-27", displayName: "Ada 2", username: "ada", gradeBand: "6-8", passwordHash: "x" })).toMatchObject({ ok: false, reason: "username-taken" });
  });

  it("gives an existing child a seat for another year, once", async () => {
    const { household } = await createHousehold(db, { seats: 1 });
    await givePaidSeats(db, household.id, "2027-28", 1);
    const made = await createChildUsingSeat({ db }, { householdId: household.id, schoolYear: "2026-27", displayName: "Cy", username: "cy", gradeBand: "6-8", passwordHash: "x" });
    if (!made.ok) throw new Error("child not made");
    expect(await assignHouseholdSeat({ db }, { householdId: household.id, schoolYear: "2027-28", childId: made.child.id })).toMatchObject({ ok: true, alreadyHeld: false, ledger: { inUse: 1, free: 0 } });
    expect(await assignHouseholdSeat({ db }, { householdId: household.id, schoolYear: "2027-28", childId: made.child.id })).toMatchObject({ ok: true, alreadyHeld: true });
  });

  it("a school cannot make household child accounts", async () => {
    const { school } = await createSchool(db, { seats: 3 });
    expect(await createChildUsingSeat({ db }, { householdId: school.id, schoolYear: "2026-27", displayName: "X", username: "x", gradeBand: "6-8", passwordHash: "x" })).toMatchObject({ ok: false, reason: "not-a-household" });
  });
});
