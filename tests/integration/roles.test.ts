// Roles are per organisation: a teacher at one school is nobody at the other; a student is refused
// the teaching and school pages with a reason; a child's password is set only by their own teacher
// or parent. Homes show the signed-in person's own things and nobody else's.
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { classes, organisations } from "~/db/schema.server";
import { getUser, homePathFor, homesFor, requireMembership, requireRole, resetChildPassword, type SessionUser } from "~/lib/auth.server";
import * as learn from "~/routes/learn";
import * as teach from "~/routes/teach";
import * as school from "~/routes/school";
import * as family from "~/routes/family";
import * as classAddress from "~/routes/teach.classes.$classId";
import * as classRoster from "~/routes/teach.classes.$classId.roster";
import * as signIn from "~/routes/sign-in";
import { demoSignIns } from "../../drizzle/scripts/seed";
import { get, post, runRoute, sessionCookieFor, userIdOf } from "./auth-helpers";

const cookies: Record<string, string> = {};
let harborside: { id: string };
let harborClass: { id: string };
let mapleClass: { id: string };

beforeAll(async () => {
  for (const who of ["teacher", "secondTeacher", "student", "parent", "schoolAdmin", "otherSchoolTeacher", "otherSchoolAdmin"] as const) {
    cookies[who] = await sessionCookieFor(who);
  }
  [harborside] = await db.select({ id: organisations.id }).from(organisations).where(eq(organisations.slug, "harborside"));
  [harborClass] = await db.select({ id: classes.id }).from(classes).where(eq(classes.signInCode, "HARBOR8"));
  [mapleClass] = await db.select({ id: classes.id }).from(classes).where(and(eq(classes.signInCode, "MAPLE7A")));
}, 60_000);

const userOf = async (who: string) => (await getUser(get("/", { cookie: cookies[who] }))) as SessionUser;

describe("a student", () => {
  it.each([
    ["/teach", teach.loader, /This page is for teachers\. You are signed in as Amira K\. \(student, Maplebrook Middle School/],
    ["/school", school.loader, /This page is for school administrators\./],
    ["/family", family.loader, /This page is for parents\./],
  ])("gets 403 on %s, with a sentence saying why", async (path, loader, message) => {
    const result = await runRoute(loader as never, get(path, { cookie: cookies.student }));
    expect(result.status).toBe(403);
    expect(result.body).toMatch(message);
  });

  it("sees their own classes on /learn, and no other student", async () => {
    const result = await runRoute(learn.loader as never, get("/learn", { cookie: cookies.student }));
    expect(result.status).toBe(200);
    const body = result.body as { displayName: string; classes: { name: string; teacherName: string }[] };
    expect(body.displayName).toBe("Amira K.");
    expect(body.classes.map((c) => `${c.name} / ${c.teacherName}`)).toEqual(["Grade 7 Physical Science A / Ruth Oduya"]);
    expect(JSON.stringify(body)).not.toMatch(/Ben T\.|ben\.t/);
  });
});

describe("a teacher of the first school", () => {
  it("sees the roster of their own class; the class's own address opens its gradebook", async () => {
    const result = await runRoute(classRoster.loader as never, get(`/teach/classes/${mapleClass.id}/roster`, { cookie: cookies.teacher }), { classId: mapleClass.id });
    expect(result.status).toBe(200);
    expect((result.body as { students: unknown[] }).students).toHaveLength(10);
    const address = await runRoute(classAddress.loader as never, get(`/teach/classes/${mapleClass.id}`, { cookie: cookies.teacher }), { classId: mapleClass.id });
    expect(address.status).toBe(302);
    expect(address.location).toBe(`/teach/classes/${mapleClass.id}/gradebook`);
  });

  it("gets 404 for a class of the second school, and for a colleague's class", async () => {
    for (const [who, id] of [["teacher", harborClass.id], ["secondTeacher", mapleClass.id]] as const) {
      const result = await runRoute(classAddress.loader as never, get(`/teach/classes/${id}`, { cookie: cookies[who] }), { classId: id });
      expect(result.status).toBe(404);
      expect(result.body).toMatch(/no class of yours/);
    }
  });

  it("gets 403 from requireMembership for any record of the second school", async () => {
    const oduya = await userOf("teacher");
    let thrown: unknown;
    try {
      requireMembership(oduya, harborside.id, ["teacher", "school_admin"]);
    } catch (error) {
      thrown = error;
    }
    expect(thrown).toBeInstanceOf(Response);
    expect((thrown as Response).status).toBe(403);
    expect(await (thrown as Response).text()).toMatch(/not one of its teachers and school administrators/);
  });

  it("cannot set the password of a student at the second school", async () => {
    const result = await resetChildPassword({ db }, await userIdOf("teacher"), await userIdOf("otherSchoolStudent"), "a perfectly good passphrase");
    expect(result).toMatchObject({ ok: false, status: 403 });
  });

  it("sees only their own classes on /teach", async () => {
    const result = await runRoute(teach.loader as never, get("/teach", { cookie: cookies.teacher }));
    const rows = (result.body as { classes: { code: string; students: number }[] }).classes;
    expect(rows.map((c) => c.code)).toEqual(["MAPLE7A", "MAPLE7B"]);
    expect(rows.map((c) => c.students)).toEqual([10, 10]);
  });
});

describe("the second school's people", () => {
  it("see nothing of the first school", async () => {
    const nakamura = await runRoute(teach.loader as never, get("/teach", { cookie: cookies.otherSchoolTeacher }));
    expect((nakamura.body as { classes: { code: string }[] }).classes.map((c) => c.code)).toEqual(["HARBOR8"]);
    const calder = await runRoute(school.loader as never, get("/school", { cookie: cookies.otherSchoolAdmin }));
    const schools = (calder.body as { schools: { name: string }[] }).schools;
    expect(schools.map((s) => s.name)).toEqual(["Harborside Academy (invented demo)"]);
  });
});

describe("homes", () => {
  it("each role lands on its own home; several roles land on the first of admin, teacher, parent, student", async () => {
    expect(homePathFor(await userOf("schoolAdmin"))).toBe("/school");
    expect(homePathFor(await userOf("teacher"))).toBe("/teach");
    expect(homePathFor(await userOf("parent"))).toBe("/family");
    expect(homePathFor(await userOf("student"))).toBe("/learn");
    const both: SessionUser = {
      id: "x",
      displayName: "Both",
      email: null,
      memberships: [
        { organisationId: "h", organisationKind: "household", organisationName: "Home", role: "parent" },
        { organisationId: "s", organisationKind: "school", organisationName: "School", role: "teacher" },
      ],
    };
    expect(homePathFor(both)).toBe("/teach");
    expect(homesFor(both).map((h) => h.path)).toEqual(["/teach", "/family"]);
  });

  it("requireRole hands back the membership that matched", async () => {
    const { user, membership } = await requireRole(get("/school", { cookie: cookies.schoolAdmin }), ["school_admin"]);
    expect(user.displayName).toBe("Dana Whitcombe");
    expect(membership).toMatchObject({ role: "school_admin", organisationKind: "school", organisationName: "Maplebrook Middle School (invented demo)" });
  });

  it("the school home counts seats and students from the database", async () => {
    const result = await runRoute(school.loader as never, get("/school", { cookie: cookies.schoolAdmin }));
    const [maple] = (result.body as { schools: { seats: { schoolYear: string; bought: number; inUse: number; free: number }[]; students: number; teachers: unknown[] }[] }).schools;
    // 40 bought for the demo year; each of the 30 students holds one.
    expect(maple.seats).toEqual([{ schoolYear: "2026-27", bought: 40, inUse: 30, free: 10 }]);
    expect(maple.students).toBe(30);
    expect(maple.teachers).toHaveLength(2);
  });

  it("the family home lists the household's children with the minimum about each", async () => {
    const result = await runRoute(family.loader as never, get("/family", { cookie: cookies.parent }));
    const [home] = (result.body as { households: { signInCode: string; children: Record<string, unknown>[] }[] }).households;
    expect(home.signInCode).toBe("LINDQ-HOME");
    expect(home.children.map((c) => Object.keys(c).sort())).toEqual([
      ["displayName", "gradeBand", "id", "username"],
      ["displayName", "gradeBand", "id", "username"],
    ]);
  });
});

describe("resetting a child's password", () => {
  it("works for the teacher of one of the child's classes; the child's old sessions end", async () => {
    const amira = await userIdOf("student");
    const before = await sessionCookieFor("student");
    const result = await resetChildPassword({ db }, await userIdOf("teacher"), amira, "springs and rulers");
    expect(result).toEqual({ ok: true });
    expect(await getUser(get("/learn", { cookie: before }))).toBeNull();
    const { code, username } = demoSignIns.student;
    const signedIn = await runRoute(signIn.action as never, post("/sign-in", { door: "student", code, username, password: "springs and rulers" }));
    expect(signedIn.location).toBe("/learn");
  });

  it("works for the parent of the household", async () => {
    const result = await resetChildPassword({ db }, await userIdOf("parent"), await userIdOf("child"), "juno likes bridges");
    expect(result).toEqual({ ok: true });
  });

  it("is refused for a colleague who does not teach the child, a parent of another family, and a teacher for a home-schooled child", async () => {
    const amira = await userIdOf("student");
    const juno = await userIdOf("child");
    expect(await resetChildPassword({ db }, await userIdOf("secondTeacher"), amira, "a fine passphrase")).toMatchObject({ ok: false, status: 403 });
    expect(await resetChildPassword({ db }, await userIdOf("parent"), amira, "a fine passphrase")).toMatchObject({ ok: false, status: 403 });
    expect(await resetChildPassword({ db }, await userIdOf("teacher"), juno, "a fine passphrase")).toMatchObject({ ok: false, status: 403 });
    expect(await resetChildPassword({ db }, await userIdOf("schoolAdmin"), amira, "a fine passphrase")).toMatchObject({ ok: false, status: 403 });
  });

  it("applies the same password rules, and says so", async () => {
    const result = await resetChildPassword({ db }, await userIdOf("teacher"), await userIdOf("student"), "short");
    expect(result).toMatchObject({ ok: false, status: 400, field: "password", message: expect.stringMatching(/at least 8/) });
  });

  it("answers 404 for someone who is not a child", async () => {
    expect(await resetChildPassword({ db }, await userIdOf("teacher"), await userIdOf("parent"), "a fine passphrase")).toMatchObject({ ok: false, status: 404 });
  });
});
