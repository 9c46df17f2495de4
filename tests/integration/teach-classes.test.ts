// Classes under /teach: made, renamed, archived and restored, a readable sign-in code that the teacher
// can renew (the old one stops signing anyone in), each class in a school year; another teacher's class
// and the other school's are simply not found.
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { classes } from "~/db/schema.server";
import { CLASS_CODE_ALPHABET, newClassCode, spacedCode } from "~/lib/teaching/classes.server";
import { schoolYearOf } from "~/lib/school-year";
import * as classList from "~/routes/teach.classes";
import * as settings from "~/routes/teach.classes.$classId.settings";
import * as authRoute from "~/routes/auth.$";
import { cookieHeaderFrom, get, post, runRoute, sessionCookieFor } from "./auth-helpers";
import { demoIds } from "./teaching-helpers";

let ids: Awaited<ReturnType<typeof demoIds>>;
const cookies: Record<string, string> = {};

beforeAll(async () => {
  ids = await demoIds();
  for (const who of ["teacher", "secondTeacher", "otherSchoolTeacher"] as const) cookies[who] = await sessionCookieFor(who);
}, 60_000);

/** Can a demo student sign in with this class code? (Auth's own student door.) */
async function studentSignsInWith(code: string): Promise<boolean> {
  const csrf = await runRoute(authRoute.loader as never, get("/auth/csrf"));
  const jar = cookieHeaderFrom(csrf.setCookies);
  const { csrfToken } = csrf.body as { csrfToken: string };
  const result = await runRoute(
    authRoute.action as never,
    post("/auth/callback/student-password", { csrfToken, code, username: "amira.k", password: "strips-and-sticks" }, { cookie: jar }),
  );
  return cookieHeaderFrom(result.setCookies, jar).includes("authjs.session-token");
}

describe("class codes", () => {
  it("are eight characters without look-alikes, read aloud in two groups, and do not repeat", () => {
    const codes = new Set(Array.from({ length: 2000 }, () => newClassCode()));
    expect(codes.size).toBe(2000);
    for (const code of codes) {
      expect(code).toMatch(/^[A-Z0-9]{8}$/);
      for (const ch of code) expect(CLASS_CODE_ALPHABET).toContain(ch);
      expect(code).not.toMatch(/[0O1IL2Z5S8B]/);
    }
    expect(spacedCode("KTXQ9MWE")).toBe("KTXQ 9MWE");
    expect(spacedCode("MAPLE7A")).toBe("MAPLE7A");
  });
});

describe("making a class", () => {
  it("makes a class in a school year with a fresh code and the browser's time zone", async () => {
    const result = await runRoute(
      classList.action as never,
      post("/teach/classes", { intent: "create", name: "Grade 7 Science, period 4", schoolYear: schoolYearOf(), organisationId: ids.maplebrook.id, timeZone: "America/Chicago" }, { cookie: cookies.teacher }),
    );
    expect(result.status).toBe(200);
    const id = (result.body as { created: string }).created;
    const [made] = await db.select().from(classes).where(eq(classes.id, id));
    expect(made).toMatchObject({ name: "Grade 7 Science, period 4", schoolYear: schoolYearOf(), teacherId: ids.oduya.id, organisationId: ids.maplebrook.id, timeZone: "America/Chicago", archivedAt: null });
    expect(made.signInCode).toMatch(/^[A-Z0-9]{8}$/);

    const list = await runRoute(classList.loader as never, get("/teach/classes", { cookie: cookies.teacher }));
    const names = (list.body as { active: { name: string }[] }).active.map((c) => c.name);
    expect(names).toContain("Grade 7 Science, period 4");
    // Only the teacher's own classes: not the second teacher's, not the other school's.
    expect(names).not.toContain("Grade 8 Engineering Design");
    expect(names).not.toContain("Grade 8 Science");
  });

  it("names each problem and keeps what was typed: an empty name, a taken name, a year out of range, another school", async () => {
    const count = async () => (await db.select({ id: classes.id }).from(classes)).length;
    const before = await count();
    const attempt = (fields: Record<string, string>) =>
      runRoute(classList.action as never, post("/teach/classes", { intent: "create", schoolYear: schoolYearOf(), organisationId: ids.maplebrook.id, timeZone: "UTC", ...fields }, { cookie: cookies.teacher }));

    const empty = await attempt({ name: "   " });
    expect(empty.status).toBe(400);
    expect((empty.body as { errors: Record<string, string> }).errors.name).toMatch(/Give the class a name/);

    const taken = await attempt({ name: "Grade 7 Physical Science A", schoolYear: "2026-27" });
    expect(taken.status).toBe(400);
    expect((taken.body as { errors: Record<string, string>; values: { name: string } }).errors.name).toMatch(/already has a class called/);
    expect((taken.body as { values: { name: string } }).values.name).toBe("Grade 7 Physical Science A");

    // The same name but for capitals and spaces is the same name; the message names the class that has it.
    for (const name of ["  grade 7 physical science a  ", "GRADE 7   PHYSICAL\tSCIENCE A"]) {
      const alike = await attempt({ name, schoolYear: "2026-27" });
      expect(alike.status).toBe(400);
      expect((alike.body as { errors: Record<string, string> }).errors.name).toMatch(/already has a class called “Grade 7 Physical Science A” in 2026-27/);
      expect((alike.body as { values: { name: string } }).values.name).toBe(name);
    }

    // A name an archived class has is taken too, and the message says the class is archived (no list of current classes shows it).
    await db.update(classes).set({ archivedAt: new Date() }).where(eq(classes.name, "Grade 7 Science, period 4"));
    const archivedAlike = await attempt({ name: "GRADE 7 SCIENCE, PERIOD 4" });
    expect(archivedAlike.status).toBe(400);
    expect((archivedAlike.body as { errors: Record<string, string> }).errors.name).toMatch(/^An archived class of your school in \d{4}-\d{2} is called “Grade 7 Science, period 4”/);
    await db.update(classes).set({ archivedAt: null }).where(eq(classes.name, "Grade 7 Science, period 4"));

    // A pasted essay is refused whole, with its length, never cut to fit.
    const long = "Grade 7 ".repeat(625);
    const tooLong = await attempt({ name: long });
    expect(tooLong.status).toBe(400);
    expect((tooLong.body as { errors: Record<string, string> }).errors.name).toBe("A class name can be at most 80 characters; this one has 4,999.");
    expect((tooLong.body as { values: { name: string } }).values.name).toBe(long);

    const year = await attempt({ name: "Far future", schoolYear: "2040-41" });
    expect(year.status).toBe(400);
    expect((year.body as { errors: Record<string, string> }).errors.schoolYear).toMatch(/Choose/);

    const elsewhere = await attempt({ name: "Sneaky", organisationId: ids.harborside.id });
    expect(elsewhere.status).toBe(403);
    expect(await count()).toBe(before);
  });
});

describe("class settings", () => {
  it("renames, renews the code (the old one stops working at once), archives and restores", async () => {
    const created = await runRoute(
      classList.action as never,
      post("/teach/classes", { intent: "create", name: "Settings test class", schoolYear: "2026-27", organisationId: ids.maplebrook.id, timeZone: "UTC" }, { cookie: cookies.teacher }),
    );
    const classId = (created.body as { created: string }).created;
    const act = (fields: Record<string, string>, cookie = cookies.teacher) =>
      runRoute(settings.action as never, post(`/teach/classes/${classId}/settings`, fields, { cookie }), { classId });

    expect((await act({ intent: "rename", name: "Renamed class" })).status).toBe(200);
    const taken = await act({ intent: "rename", name: "Grade 7 Physical Science B" });
    expect(taken.status).toBe(400);
    expect((taken.body as { message: string }).message).toMatch(/already has a class called/);
    const alike = await act({ intent: "rename", name: "GRADE 7 PHYSICAL SCIENCE B" });
    expect(alike.status).toBe(400);
    expect(alike.body).toMatchObject({ intent: "rename", field: "name", message: expect.stringMatching(/already has a class called “Grade 7 Physical Science B”/) });
    const longName = await act({ intent: "rename", name: "x".repeat(5000) });
    expect(longName.body).toMatchObject({ intent: "rename", field: "name", message: "A class name can be at most 80 characters; this one has 5,000." });
    // Its own name in other capitals is fine; names are kept trimmed, with single spaces.
    expect((await act({ intent: "rename", name: "  renamed   CLASS " })).status).toBe(200);
    expect((await db.select().from(classes).where(eq(classes.id, classId)))[0].name).toBe("renamed CLASS");
    expect((await act({ intent: "rename", name: "Renamed class" })).status).toBe(200);

    const zone = await act({ intent: "time-zone", timeZone: "Not/AZone" });
    expect(zone.status).toBe(400);
    expect((await act({ intent: "time-zone", timeZone: "Europe/Lisbon" })).status).toBe(200);
    const [after] = await db.select().from(classes).where(eq(classes.id, classId));
    expect(after).toMatchObject({ name: "Renamed class", timeZone: "Europe/Lisbon" });

    // The demo student's class: renew its code; the old one signs nobody in, the new one works.
    const mapleId = ids.mapleA.id;
    expect(await studentSignsInWith("MAPLE7A")).toBe(true);
    const renewed = await runRoute(settings.action as never, post(`/teach/classes/${mapleId}/settings`, { intent: "renew-code" }, { cookie: cookies.teacher }), { classId: mapleId });
    expect(renewed.status).toBe(200);
    const [maple] = await db.select().from(classes).where(eq(classes.id, mapleId));
    expect(maple.signInCode).not.toBe("MAPLE7A");
    expect((renewed.body as { done: string }).done).toContain(spacedCode(maple.signInCode));
    expect(await studentSignsInWith("MAPLE7A")).toBe(false);
    expect(await studentSignsInWith(spacedCode(maple.signInCode).toLowerCase())).toBe(true);

    expect((await act({ intent: "archive" })).status).toBe(200);
    let list = (await runRoute(classList.loader as never, get("/teach/classes", { cookie: cookies.teacher }))).body as { active: { id: string }[]; archived: { id: string }[] };
    expect(list.active.map((c) => c.id)).not.toContain(classId);
    expect(list.archived.map((c) => c.id)).toContain(classId);
    expect((await act({ intent: "restore" })).status).toBe(200);
    list = (await runRoute(classList.loader as never, get("/teach/classes", { cookie: cookies.teacher }))).body as { active: { id: string }[]; archived: { id: string }[] };
    expect(list.active.map((c) => c.id)).toContain(classId);

    expect((await act({ intent: "melt" })).status).toBe(400);
  });

  it("is 404 for another teacher of the same school and for the other school, and changes nothing", async () => {
    const mapleId = ids.mapleA.id;
    for (const who of ["secondTeacher", "otherSchoolTeacher"] as const) {
      const page = await runRoute(settings.loader as never, get(`/teach/classes/${mapleId}/settings`, { cookie: cookies[who] }), { classId: mapleId });
      expect(page.status, who).toBe(404);
      const change = await runRoute(settings.action as never, post(`/teach/classes/${mapleId}/settings`, { intent: "rename", name: "Taken over" }, { cookie: cookies[who] }), { classId: mapleId });
      expect(change.status, who).toBe(404);
    }
    const [maple] = await db.select().from(classes).where(eq(classes.id, mapleId));
    expect(maple.name).toBe("Grade 7 Physical Science A");
    const notAnId = await runRoute(settings.loader as never, get(`/teach/classes/not-a-uuid/settings`, { cookie: cookies.teacher }), { classId: "not-a-uuid" });
    expect(notAnId.status).toBe(404);
  });
});
