// The roster: a CSV file is checked first with every problem named by row and column, a bad file saves
// nothing, a good one is saved whole in one transaction through the seat rules (a shortage of seats
// saves nothing and says why); one by one; a student who already has an account; move, take out,
// new password. Children's data: display name, username, grade band, optional student number.
import { and, count, eq, inArray } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { classes, enrollments, seatAssignments, users } from "~/db/schema.server";
import { verifyPassword } from "~/lib/passwords.server";
import { parseRosterCsv, previewRoster } from "~/lib/teaching/roster.server";
import { findTeacherClass } from "~/lib/teaching/classes.server";
import { problemPlace } from "~/lib/teaching/shared";
import * as roster from "~/routes/teach.classes.$classId.roster";
import * as studentPage from "~/routes/teach.classes.$classId.students.$studentId";
import { createClass, createSchool } from "../factories/schools";
import { get, post, runRoute, sessionCookieFor } from "./auth-helpers";
import { createTeacher, demoIds, postMultipart, signInAdult } from "./teaching-helpers";

let ids: Awaited<ReturnType<typeof demoIds>>;
const cookies: Record<string, string> = {};

beforeAll(async () => {
  ids = await demoIds();
  for (const who of ["teacher", "secondTeacher", "otherSchoolTeacher"] as const) cookies[who] = await sessionCookieFor(who);
}, 60_000);

const usersCount = async () => (await db.select({ n: count() }).from(users))[0].n;

function upload(classId: string, csv: string, cookie: string, name = "roster.csv", band = "6-8") {
  const form = new FormData();
  form.set("gradeBand", band);
  form.set("file", new File([csv], name, { type: "text/csv" }));
  return runRoute(roster.action as never, postMultipart(`/teach/classes/${classId}/roster`, form, cookie), { classId });
}

describe("reading a roster file", () => {
  it("names every problem by row and column, and accepts header names in any case and spacing", () => {
    const csv = [
      "Display Name,USERNAME,Student Number,Email",
      "Amara O.,amara.o,70431,amara@example.com",
      ",bruno.l,70432,",
      "Chen W.,Chen W,70433,",
      "Dara K.,amara.o,7 0434,",
      "",
      "Eli N.,eli.n,,",
    ].join("\n");
    const { rows, problems, ignoredColumns, columns } = parseRosterCsv(csv);
    expect(rows.map((r) => r.row)).toEqual([2, 3, 4, 5, 7]);
    expect(columns).toEqual({ displayName: "Display Name", username: "USERNAME", studentNumber: "Student Number" });
    expect(ignoredColumns).toEqual(["Email"]);
    expect(problems.map(problemPlace)).toEqual([
      "Row 3, column “Display Name”",
      "Row 4, column “USERNAME”",
      "Row 5, column “USERNAME”",
      "Row 5, column “Student Number”",
    ]);
    expect(problems[1].message).toMatch(/may use only letters/);
    expect(problems[2].message).toMatch(/also on row 2/);
    expect(rows[0]).toMatchObject({ displayName: "Amara O.", username: "amara.o", studentNumber: "70431" });
  });

  it("says what is wrong with a file that has no usable header, no rows, or a stray comma", () => {
    expect(parseRosterCsv("").problems[0].message).toMatch(/empty/);
    expect(parseRosterCsv("name,age\nA,12").problems[0]).toMatchObject({ row: 1, message: expect.stringMatching(/“username” is missing/) });
    expect(parseRosterCsv("display name,username\n").problems[0].message).toMatch(/no students/);
    const stray = parseRosterCsv("display name,username\nOdu, K.,odu.k");
    expect(stray.problems.map(problemPlace)).toContain("Row 2");
    expect(stray.problems.find((p) => p.row === 2 && p.column === null)?.message).toMatch(/double quotes/);
    // Semicolons, as some spreadsheet programs write them, are read too.
    expect(parseRosterCsv("display name;username;student number\nAmara O.;amara.o;1\n").rows[0]).toMatchObject({ username: "amara.o", studentNumber: "1" });
    // A byte-order mark and Windows line ends are fine.
    expect(parseRosterCsv("\uFEFFdisplay name,username\r\nAmara O.,amara.o\r\n").problems).toEqual([]);
  });
});

describe("uploading a roster to a class", () => {
  it("shows a preview of a file with a bad row, naming it, and saves nothing; the fixed file is saved whole", async () => {
    const classId = ids.mapleB.id;
    const before = await usersCount();
    const bad = "display name,username,student number\nNia P.,nia.p,80001\nOmar T.,omar t,80002\nPia S.,pia.s,\n";
    const preview = await upload(classId, bad, cookies.teacher);
    expect(preview.status).toBe(400);
    const body = preview.body as { preview: { rows: unknown[]; problems: { row: number; column: string; message: string }[] }; csv: string };
    expect(body.preview.rows).toHaveLength(3);
    expect(body.preview.problems).toEqual([{ row: 3, column: "username", message: expect.stringMatching(/“omar t” may use only/) }]);
    expect(await usersCount()).toBe(before);

    // Confirming a bad file (sent back by hand) saves nothing either.
    const forced = await runRoute(roster.action as never, post(`/teach/classes/${classId}/roster`, { intent: "import-csv", csv: bad, gradeBand: "6-8" }, { cookie: cookies.teacher }), { classId });
    expect(forced.status).toBe(400);
    expect(await usersCount()).toBe(before);

    const good = bad.replace("omar t", "omar.t");
    const checked = await upload(classId, good, cookies.teacher);
    expect(checked.status).toBe(200);
    expect((checked.body as { preview: { problems: unknown[] } }).preview.problems).toEqual([]);
    expect(await usersCount()).toBe(before);

    const saved = await runRoute(roster.action as never, post(`/teach/classes/${classId}/roster`, { intent: "import-csv", csv: good, gradeBand: "9-10" }, { cookie: cookies.teacher }), { classId });
    expect(saved.status).toBe(200);
    const added = (saved.body as { added: { username: string; password: string }[] }).added;
    expect(added.map((a) => a.username)).toEqual(["nia.p", "omar.t", "pia.s"]);
    expect(await usersCount()).toBe(before + 3);
    const rows = await db.select().from(users).where(and(eq(users.homeOrganisationId, ids.maplebrook.id), inArray(users.username, ["nia.p", "omar.t", "pia.s"])));
    expect(rows.map((r) => [r.username, r.studentNumber, r.gradeBand, r.email])).toEqual(
      expect.arrayContaining([["nia.p", "80001", "9-10", null], ["omar.t", "80002", "9-10", null], ["pia.s", null, "9-10", null]]),
    );
    // The first password shown once is the one that works; it is stored only as a hash.
    const nia = rows.find((r) => r.username === "nia.p")!;
    expect(await verifyPassword(nia.passwordHash!, added[0].password)).toBe(true);
    expect(nia.passwordHash).not.toContain(added[0].password);
    // Each took a seat of the school for the class's year.
    const seats = await db.select().from(seatAssignments).where(inArray(seatAssignments.studentId, rows.map((r) => r.id)));
    expect(seats).toHaveLength(3);

    // The same file again: every username is now taken, named by row; nothing more is saved.
    const again = await upload(classId, good, cookies.teacher);
    expect(again.status).toBe(400);
    expect((again.body as { preview: { problems: { row: number }[] } }).preview.problems.map((p) => p.row)).toEqual([2, 3, 4]);
    expect(await usersCount()).toBe(before + 3);
  });

  it("refuses a file with more students than free seats, saving none of them, with the seat rules' words", async () => {
    const { school } = await createSchool(db, { seats: 2 });
    const { user: teacher, password } = await createTeacher(school.id, "Teacher Quill");
    const klass = await createClass(db, school.id, teacher.id, "2026-27");
    const cookie = await signInAdult(teacher.email!, password);
    const csv = "display name,username\nAa B.,aa.b\nCc D.,cc.d\nEe F.,ee.f\n";
    const preview = await upload(klass.id, csv, cookie);
    expect(preview.status).toBe(400);
    expect((preview.body as { preview: { problems: { row: null; message: string }[] } }).preview.problems[0]).toMatchObject({
      row: null,
      message: expect.stringMatching(/3 students, but your school has only 2 free seats for 2026-27/),
    });
    // The seat rules' notice: this teacher is not an administrator, so it names who can buy more.
    expect((preview.body as { seatNotice: { askAdministrators: string[] } }).seatNotice.askAdministrators).toHaveLength(1);
    // Even a confirm sent past the preview saves nothing: the seat rules refuse the third inside the transaction.
    const teacherClass = (await findTeacherClass({ db }, { id: teacher.id, schoolIds: [school.id] }, klass.id))!;
    const refused = await runRoute(roster.action as never, post(`/teach/classes/${klass.id}/roster`, { intent: "import-csv", csv, gradeBand: "6-8" }, { cookie }), { classId: klass.id });
    expect(refused.status).toBe(400);
    expect((refused.body as { seatNotice?: { message: string } }).seatNotice?.message).toMatch(/only 2 free seats/);
    expect((await db.select().from(users).where(eq(users.homeOrganisationId, school.id))).filter((u) => u.username)).toHaveLength(0);
    expect(await db.select().from(enrollments).where(eq(enrollments.classId, teacherClass.id))).toHaveLength(0);

    // Inside the transaction: with the preview's seat check bypassed, the seat function's refusal undoes every row.
    const { addStudents } = await import("~/lib/teaching/roster.server");
    const direct = await addStudents({ db }, teacherClass, ["aa.b", "cc.d", "ee.f"].map((u, i) => ({ displayName: `S ${i}`, username: u, studentNumber: "", gradeBand: "6-8" as const, row: i + 2 })));
    expect(direct).toMatchObject({ ok: false, row: 4, message: expect.stringMatching(/All 2 seats for 2026-27 are in use/) });
    expect((await db.select().from(users).where(eq(users.homeOrganisationId, school.id))).filter((u) => u.username)).toHaveLength(0);

    // One by one: two fit, the third is refused with the seat rules' own message, and no account is left behind.
    const addOne = (username: string) =>
      runRoute(roster.action as never, post(`/teach/classes/${klass.id}/roster`, { intent: "add-one", displayName: username, username, gradeBand: "6-8", studentNumber: "", password: "" }, { cookie }), { classId: klass.id });
    expect((await addOne("gg.h")).status).toBe(200);
    expect((await addOne("ii.j")).status).toBe(200);
    const third = await addOne("kk.l");
    expect(third.status).toBe(409);
    expect((third.body as { seatNotice: { message: string } }).seatNotice.message).toMatch(/All 2 seats for 2026-27 are in use/);
    expect((await db.select().from(users).where(eq(users.homeOrganisationId, school.id))).filter((u) => u.username).map((u) => u.username).sort()).toEqual(["gg.h", "ii.j"]);
  });

  it("tells what is wrong with an upload that is not a CSV file", async () => {
    const workbook = await upload(ids.mapleB.id, "PK\u0003\u0004binary", cookies.teacher, "roster.xlsx");
    expect(workbook.status).toBe(400);
    expect((workbook.body as { error: string }).error).toMatch(/spreadsheet workbook/);
    const form = new FormData();
    form.set("gradeBand", "6-8");
    const none = await runRoute(roster.action as never, postMultipart(`/teach/classes/${ids.mapleB.id}/roster`, form, cookies.teacher), { classId: ids.mapleB.id });
    expect((none.body as { error: string }).error).toMatch(/Choose a CSV file/);
  });

  it("reads a Windows-1252 file from an older spreadsheet program", async () => {
    const bytes = new Uint8Array([...new TextEncoder().encode("display name,username\nJos"), 0xe9, ...new TextEncoder().encode(" R.,jose.r\n")]);
    const form = new FormData();
    form.set("gradeBand", "6-8");
    form.set("file", new File([bytes], "old.csv"));
    const result = await runRoute(roster.action as never, postMultipart(`/teach/classes/${ids.mapleB.id}/roster`, form, cookies.teacher), { classId: ids.mapleB.id });
    expect((result.body as { preview: { rows: { displayName: string }[] } }).preview.rows[0].displayName).toBe("José R.");
  });

  it("is 404 for another teacher's class, before reading the file", async () => {
    const before = await usersCount();
    const result = await upload(ids.mapleA.id, "display name,username\nX Y.,x.y\n", cookies.secondTeacher);
    expect(result.status).toBe(404);
    const confirm = await runRoute(roster.action as never, post(`/teach/classes/${ids.mapleA.id}/roster`, { intent: "import-csv", csv: "display name,username\nX Y.,x.y\n", gradeBand: "6-8" }, { cookie: cookies.otherSchoolTeacher }), { classId: ids.mapleA.id });
    expect(confirm.status).toBe(404);
    expect(await usersCount()).toBe(before);
  });
});

describe("one student at a time", () => {
  const addOne = (fields: Record<string, string>) =>
    runRoute(roster.action as never, post(`/teach/classes/${ids.mapleB.id}/roster`, { intent: "add-one", gradeBand: "6-8", studentNumber: "", password: "", ...fields }, { cookie: cookies.teacher }), { classId: ids.mapleB.id });

  it("adds a student with a made-up password, and names each problem while keeping what was typed", async () => {
    const bad = await addOne({ displayName: "", username: "x", password: "password" });
    expect(bad.status).toBe(400);
    expect((bad.body as { errors: Record<string, string> }).errors).toMatchObject({
      displayName: expect.stringMatching(/missing/),
      username: expect.stringMatching(/shorter than 3/),
      password: expect.stringMatching(/first anyone would guess/),
    });
    const taken = await addOne({ displayName: "Another Amira", username: "amira.k" });
    expect(taken.status).toBe(400);
    expect((taken.body as { errors: Record<string, string>; values: Record<string, string> }).errors.username).toMatch(/already used/);
    expect((taken.body as { values: Record<string, string> }).values.displayName).toBe("Another Amira");

    const ok = await addOne({ displayName: "Quentin V.", username: "Quentin.V", studentNumber: "A-7" });
    expect(ok.status).toBe(200);
    const [added] = (ok.body as { added: { username: string; password: string }[] }).added;
    expect(added.username).toBe("quentin.v");
    expect(added.password).toMatch(/^[a-z]+-[a-z]+-\d{2}$/);
  });

  it("adds a student who already has an account at the school, and says so when they are in the class already", async () => {
    const add = (username: string) =>
      runRoute(roster.action as never, post(`/teach/classes/${ids.mapleB.id}/roster`, { intent: "add-existing", username }, { cookie: cookies.teacher }), { classId: ids.mapleB.id });
    expect(((await add("amira.k")).body as { done: string }).done).toMatch(/Amira K\. is now in this class/);
    expect(((await add("amira.k")).body as { error: string }).error).toMatch(/already in this class/);
    expect(((await add("theo.r")).body as { error: string }).error).toMatch(/No student at your school/);
  });
});

describe("a student's page: new password, another class, out of the class", () => {
  it("sets a new password (made up when left empty), moves between the teacher's classes, and takes a student out", async () => {
    const [student] = await db.select().from(users).where(eq(users.username, "carmen.l"));
    const url = `/teach/classes/${ids.mapleA.id}/students/${student.id}`;
    const act = (fields: Record<string, string>, cookie = cookies.teacher, classId = ids.mapleA.id) =>
      runRoute(studentPage.action as never, post(url, fields, { cookie }), { classId, studentId: student.id });

    const made = await act({ intent: "password", password: "" });
    expect(made.status).toBe(200);
    const password = (made.body as { password: string }).password;
    const [after] = await db.select().from(users).where(eq(users.id, student.id));
    expect(await verifyPassword(after.passwordHash!, password)).toBe(true);
    expect(after.sessionVersion).toBe(student.sessionVersion + 1);
    const weak = await act({ intent: "password", password: "12345678" });
    expect(weak.status).toBe(400);
    const long = await act({ intent: "password", password: "x".repeat(600) });
    expect(long.status).toBe(400);
    expect((long.body as { error: string }).error).toBe("A password can be at most 256 characters long. Shorten it, or leave the field empty for one made up for you.");

    // Not the second teacher's class to move into, and not the other school's.
    expect((await act({ intent: "move", toClassId: ids.mapleE.id })).status).toBe(400);
    const moved = await act({ intent: "move", toClassId: ids.mapleB.id });
    expect(moved.status).toBe(200);
    // The page does not load the old class's address again (the student is not there any more: 404).
    const revalidate = (actionResult: unknown) => studentPage.shouldRevalidate({ actionResult, defaultShouldRevalidate: true } as never);
    expect(revalidate(moved.body)).toBe(false);
    expect(revalidate({ intent: "password", done: "x" })).toBe(true);
    const inClasses = await db.select({ classId: enrollments.classId }).from(enrollments).where(eq(enrollments.studentId, student.id));
    expect(inClasses.map((e) => e.classId)).toEqual([ids.mapleB.id]);
    // Same school year: the seat is kept, not taken twice.
    expect(await db.select().from(seatAssignments).where(eq(seatAssignments.studentId, student.id))).toHaveLength(1);

    const out = await runRoute(studentPage.action as never, post(`/teach/classes/${ids.mapleB.id}/students/${student.id}`, { intent: "remove" }, { cookie: cookies.teacher }), { classId: ids.mapleB.id, studentId: student.id });
    expect((out.body as { done: string }).done).toMatch(/seat is free/);
    expect(revalidate(out.body)).toBe(false);
    expect(await db.select().from(enrollments).where(eq(enrollments.studentId, student.id))).toHaveLength(0);
    expect(await db.select().from(users).where(eq(users.id, student.id))).toHaveLength(1);
  });

  it("is 404 for a student who is not in the class, and for another teacher", async () => {
    const page = await runRoute(studentPage.loader as never, get(`/teach/classes/${ids.mapleA.id}/students/${ids.ben.id}`, { cookie: cookies.secondTeacher }), { classId: ids.mapleA.id, studentId: ids.ben.id });
    expect(page.status).toBe(404);
    const [harborStudent] = await db.select().from(users).where(eq(users.username, "theo.r"));
    const other = await runRoute(studentPage.action as never, post(`/teach/classes/${ids.mapleA.id}/students/${harborStudent.id}`, { intent: "password", password: "" }, { cookie: cookies.teacher }), { classId: ids.mapleA.id, studentId: harborStudent.id });
    expect(other.status).toBe(404);
    const klass = (await db.select().from(classes).where(eq(classes.id, ids.mapleA.id)))[0];
    expect(klass).toBeTruthy();
  });
});

describe("the roster preview model", () => {
  it("checks usernames against the whole school, not only the class", async () => {
    const klass = (await findTeacherClass({ db }, { id: ids.oduya.id, schoolIds: [ids.maplebrook.id] }, ids.mapleA.id))!;
    const preview = await previewRoster({ db }, klass, "display name,username\nKira again,kira.n\n");
    expect(preview.problems[0]).toMatchObject({ row: 2, column: "username", message: expect.stringMatching(/already used/) });
  });
});
