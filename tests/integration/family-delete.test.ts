// Deleting a child's account and everything recorded for it. The check does not trust a list of
// tables: it lists every base table of the database from information_schema (ours and the mail
// queue's) and searches each uuid column for the child's id, and each text/json column for the id
// inside the text — before (to show the search finds the child's rows) and after (nothing left).
// The photo file leaves the photo store and the seat is free again. A school administrator deletes a
// student of the school the same way; another school's administrator finds nobody.
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { organisations, users } from "~/db/schema.server";
import { findExercise, recordAttempt, savePrediction, saveReadings, saveWrittenAnswer } from "~/lib/course.server";
import { householdClass } from "~/lib/family/household.server";
import { photoStorage, recordPhoto } from "~/lib/photo-store.server";
import { seatLedgerForYear } from "~/lib/seats.server";
import { setAccommodation } from "~/lib/teaching/assignments.server";
import * as childRoute from "~/routes/family.children.$childId";
import * as deleteChildRoute from "~/routes/family.children.$childId.delete";
import * as newChildRoute from "~/routes/family.children.new";
import * as lessonsRoute from "~/routes/family.lessons";
import * as photosRoute from "~/routes/photos";
import * as deleteStudentRoute from "~/routes/school.students.$studentId.delete";
import * as studentsRoute from "~/routes/school.students";
import { demoSignIns } from "../../drizzle/scripts/seed";
import { givePaidSeats } from "../factories/schools";
import { get, post, runRoute, sessionCookieFor, userIdOf } from "./auth-helpers";
import { confirmationMatches } from "~/lib/student-deletion.server";
import { findIdEverywhere, signInWith } from "./family-helpers";

const YEAR = "2026-27";
const PNG = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52, 0, 0, 0, 1, 0, 0, 0, 1, 8, 6, 0, 0, 0]);
let parentCookie: string;
let parentId: string;
let householdId: string;

beforeAll(async () => {
  parentCookie = await sessionCookieFor("parent");
  parentId = await userIdOf("parent");
  [{ id: householdId }] = await db.select({ id: organisations.id }).from(organisations).where(eq(organisations.slug, "lindqvist-home"));
}, 60_000);

/** A child with something in every kind of record: work, a photo file, an assignment, extra tries, a failed sign-in. */
async function childWithEverything() {
  await givePaidSeats(db, householdId, YEAR, 1);
  const made = await runRoute(newChildRoute.action as never, post("/family/children/new", { displayName: "Pip Lindqvist", username: "pip", password: "green kite string", gradeBand: "9-10" }, { cookie: parentCookie }));
  expect(made.status).toBe(302);
  const [pip] = await db.select({ id: users.id }).from(users).where(and(eq(users.homeOrganisationId, householdId), eq(users.username, "pip")));
  const slug = "01-measuring-deformation";
  await runRoute(lessonsRoute.action as never, post("/family/lessons", { intent: "assign", slug, opensAt: "2026-12-01T08:00", dueAt: "2026-12-11T17:00", latePolicy: "accept", timeZone: "UTC" }, { cookie: parentCookie }));
  await recordAttempt({ db }, { studentId: pip.id, slug, definition: findExercise(slug, "read-the-ruler")!, submission: { kind: "text", answer: "12 cm" } });
  await savePrediction({ db }, pip.id, slug, "which-drops-more", "the-longer-one");
  await saveReadings({ db }, pip.id, slug, { readingsId: "my-ruler", mode: "bend", material: "craft stick", unloadedCm: 20, resolutionCm: 0.1, points: [{ forceN: 1, readingCm: 19.6 }, { forceN: 2, readingCm: 19.2 }] });
  await saveWrittenAnswer({ db }, pip.id, slug, "cer-reference-reading", { claim: "It bends.", evidence: "0.4 cm per newton", reasoning: "Proportional." }, true);
  // The parent reviews the answer, as the household's teacher.
  const reviewed = await runRoute(childRoute.action as never, post(`/family/children/${pip.id}`, { intent: "review", studentId: pip.id, slug, answerId: "cer-reference-reading", claim: "2", evidence: "1", reasoning: "1", comment: "Give the unit." }, { cookie: parentCookie }), { childId: pip.id });
  expect(reviewed.status).toBe(200);
  const key = `${pip.id}-setup.png`;
  await photoStorage().set(key, new File([PNG], key, { type: "image/png" }));
  await recordPhoto({ db }, { studentId: pip.id, lessonSlug: slug, photoId: "setup", key, contentType: "image/png", bytes: PNG.length });
  const klass = await householdClass({ db }, { id: householdId, name: "", signInCode: "LINDQ-HOME" }, parentId);
  await setAccommodation({ db }, klass, { studentId: pip.id, assignmentId: null, extraAttempts: 2, extraDays: 1 });
  expect(await signInWith({ code: "LINDQ-HOME", username: "pip", password: "a wrong guess" })).toBeNull();
  return { id: pip.id, key };
}

describe("deleting a child's account and data", () => {
  it("takes the name as typed on any keyboard: spaces, capitals and accents do not matter, anything else does", () => {
    expect(confirmationMatches("  theo ", "Théo")).toBe(true);
    expect(confirmationMatches("AMIRA k.", "Amira K.")).toBe(true);
    for (const typed of ["", "Théodore", "Thea", "Amira"]) expect(confirmationMatches(typed, typed === "Amira" ? "Amira K." : "Théo")).toBe(false);
  });

  it("asks for the child's name and deletes nothing on a wrong one", async () => {
    const juno = await userIdOf("child");
    const page = await runRoute(deleteChildRoute.loader as never, get(`/family/children/${juno}/delete`, { cookie: parentCookie }), { childId: juno });
    expect(page.body).toEqual({ child: { id: juno, displayName: "Juno", username: "juno" } });
    for (const typed of ["", "Mika", "Jun"]) {
      const refused = await runRoute(deleteChildRoute.action as never, post(`/family/children/${juno}/delete`, { confirmName: typed }, { cookie: parentCookie }), { childId: juno });
      expect(refused.status).toBe(400);
      expect((refused.body as { error: string }).error).toBe("Type Juno's name exactly as it is shown, to confirm. Nothing was deleted.");
    }
    expect(await db.select({ id: users.id }).from(users).where(eq(users.id, juno))).toHaveLength(1);
  });

  it("leaves no row of the child in any table, removes the photo file and frees the seat", async () => {
    const pip = await childWithEverything();
    const before = await findIdEverywhere(db, pip.id);
    const where = new Set(before.sightings.map((s) => s.table));
    for (const table of [
      "public.users", "public.memberships", "public.seat_assignments", "public.enrollments", "public.exercise_attempts", "public.predictions",
      "public.reading_sets", "public.written_answers", "public.photos", "public.lesson_visits", "public.accommodations", "public.sign_in_failures",
    ]) {
      expect(where, `the search should find the child in ${table} before deleting`).toContain(table);
    }
    expect(before.tables).toEqual(expect.arrayContaining(["public.users", "pgboss.job"]));
    expect(await photoStorage().has(pip.key)).toBe(true);
    const seatsBefore = await seatLedgerForYear({ db }, householdId, YEAR);

    const deleted = await runRoute(deleteChildRoute.action as never, post(`/family/children/${pip.id}/delete`, { confirmName: "  pip   LINDQVIST " }, { cookie: parentCookie }), { childId: pip.id });
    expect(deleted.status).toBe(200);
    expect(deleted.body).toEqual({ deleted: "Pip Lindqvist", seatsFreed: 1 });

    const after = await findIdEverywhere(db, pip.id);
    expect(after.sightings).toEqual([]);
    console.log(`searched ${after.tables.length} tables (${after.uuidColumns} uuid columns) for the deleted child's id: found in none; before deleting it was in ${where.size}`);
    expect(await photoStorage().has(pip.key)).toBe(false);
    expect(await seatLedgerForYear({ db }, householdId, YEAR)).toEqual({ ...seatsBefore, inUse: seatsBefore.inUse - 1, free: seatsBefore.free + 1 });
    expect(await signInWith({ code: "LINDQ-HOME", username: "pip", password: "green kite string" })).toBeNull();

    // The other children and the parent are untouched; the page and the photo address are simply not found.
    expect(await db.select({ username: users.username }).from(users).where(eq(users.homeOrganisationId, householdId))).toEqual(expect.arrayContaining([{ username: "juno" }, { username: "mika" }]));
    expect((await runRoute(childRoute.loader as never, get(`/family/children/${pip.id}`, { cookie: parentCookie }), { childId: pip.id })).status).toBe(404);
    expect((await runRoute(deleteChildRoute.action as never, post(`/family/children/${pip.id}/delete`, { confirmName: "Pip Lindqvist" }, { cookie: parentCookie }), { childId: pip.id })).status).toBe(404);
  });
});

describe("a school administrator deleting a student of the school", () => {
  it("leaves no row of the student in any table and frees the school's seat; another school finds nobody", async () => {
    const admin = await sessionCookieFor("schoolAdmin");
    const other = await sessionCookieFor("otherSchoolAdmin");
    const amira = await userIdOf("student");
    const [school] = await db.select({ id: organisations.id }).from(organisations).where(eq(organisations.slug, "maplebrook"));
    const list = await runRoute(studentsRoute.loader as never, get("/school/students", { cookie: admin }));
    expect((list.body as { students: { id: string; classes: string[] }[] }).students.find((s) => s.id === amira)?.classes).toEqual(["Grade 7 Physical Science A (2026-27)"]);
    expect((await findIdEverywhere(db, amira)).sightings.length).toBeGreaterThan(3);

    expect((await runRoute(deleteStudentRoute.loader as never, get(`/school/students/${amira}/delete`, { cookie: other }), { studentId: amira })).status).toBe(404);
    const ledger = await seatLedgerForYear({ db }, school.id, YEAR);
    const wrong = await runRoute(deleteStudentRoute.action as never, post(`/school/students/${amira}/delete`, { confirmName: "amira" }, { cookie: admin }), { studentId: amira });
    expect(wrong.status).toBe(400);

    const done = await runRoute(deleteStudentRoute.action as never, post(`/school/students/${amira}/delete`, { confirmName: "Amira K." }, { cookie: admin }), { studentId: amira });
    expect(done.body).toEqual({ deleted: "Amira K.", seatsFreed: 1 });
    expect((await findIdEverywhere(db, amira)).sightings).toEqual([]);
    expect(await seatLedgerForYear({ db }, school.id, YEAR)).toMatchObject({ inUse: ledger.inUse - 1, free: ledger.free + 1 });
    expect(await signInWith(demoSignIns.student)).toBeNull();
  });

  it("cannot reach a family's child or another school's student", async () => {
    const admin = await sessionCookieFor("schoolAdmin");
    const juno = await userIdOf("child");
    const theo = await userIdOf("otherSchoolStudent");
    for (const id of [juno, theo]) {
      const result = await runRoute(deleteStudentRoute.action as never, post(`/school/students/${id}/delete`, { confirmName: "anything" }, { cookie: admin }), { studentId: id });
      expect(result.status).toBe(404);
    }
    const photo = await runRoute(photosRoute.loader as never, get(`/photos/${juno}`, { cookie: admin }), { id: juno });
    expect(photo.status).toBe(404);
  });
});
