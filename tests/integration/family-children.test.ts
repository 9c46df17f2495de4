// A parent's children: made through the seat rules (one seat each; refused clearly, with nothing
// made, when none is free), with nothing but a name, username, password and grade band; signing in
// with the family code; the parent setting a new password, assigning lessons with due dates (the
// teaching model on the family's class) and following progress; another family sees none of it.
import { and, eq, sql } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { assignments, classes, enrollments, memberships, users } from "~/db/schema.server";
import { exerciseInstance, findExercise, recordAttempt } from "~/lib/course.server";
import { hashPassword } from "~/lib/passwords.server";
import { seatLedgerForYear } from "~/lib/seats.server";
import { assignedLessonsFor } from "~/lib/teaching/assignments.server";
import * as childRoute from "~/routes/family.children.$childId";
import * as newChildRoute from "~/routes/family.children.new";
import * as familyRoute from "~/routes/family";
import * as lessonsRoute from "~/routes/family.lessons";
import * as lessonRoute from "~/routes/family.lessons.$slug";
import * as learnRoute from "~/routes/learn";
import { createHousehold, givePaidSeats } from "../factories/schools";
import { get, post, runRoute, sessionCookieFor } from "./auth-helpers";
import { signInWith } from "./family-helpers";

const YEAR = "2026-27";
let household: Awaited<ReturnType<typeof createHousehold>>["household"];
let parentCookie: string;

const child = (over: Record<string, string> = {}) => ({ displayName: "Wren", username: "wren", password: "three tall pines", gradeBand: "6-8", ...over });

beforeAll(async () => {
  const made = await createHousehold(db);
  household = made.household;
  await db.update(users).set({ passwordHash: await hashPassword("a parent's own passphrase") }).where(eq(users.id, made.parent.id));
  parentCookie = (await signInWith({ email: made.parent.email!, password: "a parent's own passphrase" }))!;
  expect(parentCookie).toBeTruthy();
}, 60_000);

describe("making a child's account", () => {
  it("is refused clearly, with a way to buy a seat and nothing made, when the family has no free seat", async () => {
    const page = await runRoute(newChildRoute.loader as never, get("/family/children/new", { cookie: parentCookie }));
    expect(page.body).toMatchObject({ ledger: { bought: 0, free: 0 } });
    const refused = await runRoute(newChildRoute.action as never, post("/family/children/new", child(), { cookie: parentCookie }));
    expect(refused.status).toBe(409);
    expect(refused.body).toMatchObject({
      seatProblem: `Your family has no seats for ${YEAR} yet, so no child account can be made. Buy a seat for each child first.`,
      values: { displayName: "Wren", username: "wren", gradeBand: "6-8" },
    });
    expect(await db.select().from(users).where(eq(users.homeOrganisationId, household.id))).toEqual([]);
  });

  it("names every bad field at once", async () => {
    const result = await runRoute(newChildRoute.action as never, post("/family/children/new", { displayName: "", username: "x", password: "wren", gradeBand: "adult" }, { cookie: parentCookie }));
    expect(result.status).toBe(400);
    const errors = (result.body as { errors: Record<string, string> }).errors;
    expect(Object.keys(errors).sort()).toEqual(["displayName", "gradeBand", "password", "username"]);
    expect(errors.username).toMatch(/shorter than 3 characters/);
  });

  it("uses one seat per child, keeps only name, username, password and grade band, and refuses the child after the last seat", async () => {
    await givePaidSeats(db, household.id, YEAR, 1);
    const made = await runRoute(newChildRoute.action as never, post("/family/children/new", { ...child(), email: "wren@example.org", birthDate: "2014-05-01" }, { cookie: parentCookie }));
    expect(made.status).toBe(302);
    expect(made.location).toMatch(/^\/family\/children\/[0-9a-f-]{36}\?made=1$/);
    expect(await seatLedgerForYear({ db }, household.id, YEAR)).toMatchObject({ bought: 1, inUse: 1, free: 0 });

    const [row] = await db.select().from(users).where(and(eq(users.homeOrganisationId, household.id), eq(users.username, "wren")));
    expect(row).toMatchObject({ displayName: "Wren", gradeBand: "6-8", email: null, emailVerifiedAt: null, studentNumber: null });
    expect(row.passwordHash).toMatch(/^\$argon2/);

    const second = await runRoute(newChildRoute.action as never, post("/family/children/new", child({ displayName: "Ash", username: "ash" }), { cookie: parentCookie }));
    expect(second.status).toBe(409);
    expect((second.body as { seatProblem: string }).seatProblem).toBe(`Your family's 1 seat for ${YEAR} is in use, so no more child accounts can be made. Buy another seat first.`);

    await givePaidSeats(db, household.id, YEAR, 1);
    const taken = await runRoute(newChildRoute.action as never, post("/family/children/new", child({ displayName: "Wren again" }), { cookie: parentCookie }));
    expect(taken.status).toBe(409);
    expect((taken.body as { errors: Record<string, string> }).errors.username).toBe("The username “wren” is already used in your family. Choose another.");
    expect(await seatLedgerForYear({ db }, household.id, YEAR)).toMatchObject({ inUse: 1, free: 1 });
  });

  it("lets the child sign in with the family code, username and password", async () => {
    const cookie = await signInWith({ code: household.signInCode!.toLowerCase(), username: "WREN", password: "three tall pines" });
    expect(cookie).toContain("authjs.session-token");
    expect((await runRoute(learnRoute.loader as never, get("/learn", { cookie: cookie! }))).status).toBe(200);
    expect(await signInWith({ code: household.signInCode!, username: "wren", password: "not the password" })).toBeNull();
  });
});

describe("the parent as the household's teacher", () => {
  let wrenId: string;
  beforeAll(async () => {
    [{ id: wrenId }] = await db.select({ id: users.id }).from(users).where(and(eq(users.homeOrganisationId, household.id), eq(users.username, "wren")));
  });

  it("sets a new password for the child: the old one stops working", async () => {
    const weak = await runRoute(childRoute.action as never, post(`/family/children/${wrenId}`, { intent: "password", password: "wren" }, { cookie: parentCookie }), { childId: wrenId });
    expect(weak.status).toBe(400);
    const done = await runRoute(childRoute.action as never, post(`/family/children/${wrenId}`, { intent: "password", password: "maple leaf boat" }, { cookie: parentCookie }), { childId: wrenId });
    expect(done.status).toBe(200);
    expect(await signInWith({ code: household.signInCode!, username: "wren", password: "three tall pines" })).toBeNull();
    expect(await signInWith({ code: household.signInCode!, username: "wren", password: "maple leaf boat" })).toContain("authjs.session-token");
  });

  it("assigns a lesson with a due date in the parent's time zone; the child sees it as assigned", async () => {
    const bad = await runRoute(lessonsRoute.action as never, post("/family/lessons", { intent: "assign", slug: "01-measuring-deformation", opensAt: "2026-12-01T08:00", dueAt: "someday", latePolicy: "accept", timeZone: "Europe/Oslo" }, { cookie: parentCookie }));
    expect(bad.status).toBe(400);
    expect((bad.body as { errors: Record<string, string> }).errors.dueAt).toMatch(/date and a time/);

    const assigned = await runRoute(lessonsRoute.action as never, post("/family/lessons", { intent: "assign", slug: "01-measuring-deformation", opensAt: "2026-12-01T08:00", dueAt: "2026-12-11T17:00", latePolicy: "accept", timeZone: "Europe/Oslo" }, { cookie: parentCookie }));
    expect(assigned.status).toBe(200);
    expect((assigned.body as { done: string }).done).toBe("Assigned, due Fri 11 Dec, 5:00 pm.");

    // The adapter: one class for the household, the parent its teacher, the household's code its code, every child in it.
    const familyClasses = await db.select().from(classes).where(eq(classes.organisationId, household.id));
    expect(familyClasses).toHaveLength(1);
    expect(familyClasses[0]).toMatchObject({ name: "Family lessons", signInCode: household.signInCode, timeZone: "Europe/Oslo" });
    expect(await db.select().from(enrollments).where(eq(enrollments.classId, familyClasses[0].id))).toEqual([expect.objectContaining({ studentId: wrenId })]);

    const forChild = await assignedLessonsFor({ db }, wrenId, new Date("2026-12-02T12:00:00Z"));
    expect(forChild).toEqual([expect.objectContaining({ slug: "01-measuring-deformation", dueAt: "2026-12-11T16:00:00.000Z", className: "Family lessons" })]);
    // Assigning takes no second seat.
    expect(await seatLedgerForYear({ db }, household.id, YEAR)).toMatchObject({ inUse: 1 });
  });

  it("follows the child's progress: path, tries, scores, and the item-level view of the lesson", async () => {
    const definition = findExercise("01-measuring-deformation", "read-the-ruler")!;
    await recordAttempt({ db }, { studentId: wrenId, slug: "01-measuring-deformation", definition, submission: { kind: "text", answer: "999 cm" } });

    const home = await runRoute(familyRoute.loader as never, get("/family", { cookie: parentCookie }));
    const [family] = (home.body as { households: { children: { id: string; displayName: string }[]; progress: Record<string, { started: number; lessonsComplete: number }> }[] }).households;
    expect(family.children).toEqual([{ id: wrenId, displayName: "Wren", username: "wren", gradeBand: "6-8" }]);
    expect(family.progress[wrenId]).toMatchObject({ started: 1, lessonsComplete: 0 });

    const page = await runRoute(childRoute.loader as never, get(`/family/children/${wrenId}`, { cookie: parentCookie }), { childId: wrenId });
    expect(page.status).toBe(200);
    const lessons = (page.body as { lessons: { slug: string; started: boolean; score: number | null; assignment: { dueText: string } | null; exercises: { id: string; tries: { answer: string; right: boolean }[] }[] }[] }).lessons;
    const first = lessons.find((l) => l.slug === "01-measuring-deformation")!;
    expect(first).toMatchObject({ started: true, score: 0, assignment: { dueText: "Fri 11 Dec, 5:00 pm" } });
    expect(first.exercises).toEqual([expect.objectContaining({ id: "read-the-ruler", tries: [expect.objectContaining({ answer: "999 cm", right: false })] })]);

    const items = await runRoute(lessonRoute.loader as never, get("/family/lessons/01-measuring-deformation", { cookie: parentCookie }), { slug: "01-measuring-deformation" });
    const row = (items.body as { items: { exerciseId: string; studentsTried: number; studentsInClass: number; rightFirstTry: number }[] }).items.find((i) => i.exerciseId === "read-the-ruler");
    expect(row).toMatchObject({ studentsTried: 1, studentsInClass: 1, rightFirstTry: 0 });
  });

  it("gives an assigned lesson the same score on the child's page as at a glance: late answers count as the late rule says", async () => {
    // Wren answers right, then the lesson's due date is set before that answer, with nothing taken late.
    const slug = "01-measuring-deformation";
    const definition = findExercise(slug, "read-the-ruler")!;
    const instance = exerciseInstance(wrenId, slug, definition, []);
    const taken = await recordAttempt({ db }, { studentId: wrenId, slug, definition, submission: { kind: "text", answer: `${instance.expected!.value.toFixed(1)} cm` } });
    expect(taken).toMatchObject({ feedback: { right: true } });
    const [klass] = await db.select().from(classes).where(eq(classes.organisationId, household.id));
    await db
      .update(assignments)
      .set({ opensAt: new Date(Date.now() - 10 * 86_400_000), dueAt: new Date(Date.now() - 86_400_000), latePolicy: "closed" })
      .where(and(eq(assignments.classId, klass.id), eq(assignments.lessonSlug, slug)));

    const page = await runRoute(childRoute.loader as never, get(`/family/children/${wrenId}`, { cookie: parentCookie }), { childId: wrenId });
    const onPage = (page.body as { lessons: { slug: string; score: number | null }[] }).lessons.find((l) => l.slug === slug)!;
    const glance = await runRoute(lessonsRoute.loader as never, get("/family/lessons", { cookie: parentCookie }));
    const book = glance.body as { gradebook: { lessons: { slug: string; assignmentId: string }[]; rows: { id: string; cells: Record<string, { score: number | null }> }[] } };
    const assignmentId = book.gradebook.lessons.find((l) => l.slug === slug)!.assignmentId;
    const atGlance = book.gradebook.rows.find((r) => r.id === wrenId)!.cells[assignmentId].score;
    expect(atGlance).toBe(0);
    expect(onPage.score).toBe(atGlance);
  });

  it("shows another family nothing of this child", async () => {
    const otherParent = await sessionCookieFor("parent");
    const page = await runRoute(childRoute.loader as never, get(`/family/children/${wrenId}`, { cookie: otherParent }), { childId: wrenId });
    expect(page.status).toBe(404);
    const reset = await runRoute(childRoute.action as never, post(`/family/children/${wrenId}`, { intent: "password", password: "taken over now" }, { cookie: otherParent }), { childId: wrenId });
    expect(reset.status).toBe(404);
    const [{ n }] = await db.select({ n: sql<number>`count(*)::int` }).from(memberships).where(eq(memberships.userId, wrenId));
    expect(n).toBe(1);
  });
});
