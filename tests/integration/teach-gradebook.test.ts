// The gradebook: cells with completion, score, lateness and "stuck"; the filters; a bounded number of
// SQL statements whatever the class size; its JSON route (same door as the page); CSV exports; item
// analysis; review of written answers; and the school administrator's overview, scoped to their school.
import { brotliDecompressSync, gunzipSync } from "node:zlib";
import { and, eq } from "drizzle-orm";
import Papa from "papaparse";
import { beforeAll, describe, expect, it } from "vitest";
import { db, sqlStatements } from "~/db/client.server";
import { accommodations, assignments, classes, enrollments, exerciseAttempts, lessonVisits, readingSets, users, writtenAnswers } from "~/db/schema.server";
import { loadLessonState, saveWrittenAnswer } from "~/lib/course.server";
import { lessonExercises, listLessons } from "~/lib/lessons.server";
import { analyseItems, classAttempts } from "~/lib/teaching/analysis.server";
import { gradebookVersion, loadGradebook } from "~/lib/teaching/gradebook.server";
import { filterRows } from "~/lib/teaching/shared";
import { formatDue } from "~/lib/teaching/time";
import * as gradebookPage from "~/routes/teach.classes.$classId.gradebook";
import * as gradebookJson from "~/routes/api.teach.classes.$classId.gradebook";
import * as gradebookCsvRoute from "~/routes/teach.classes.$classId.gradebook.csv";
import * as attemptsCsvRoute from "~/routes/teach.classes.$classId.lessons.$slug.exercises.$exerciseId.csv";
import * as lessonPage from "~/routes/teach.classes.$classId.lessons.$slug";
import * as exercisePage from "~/routes/teach.classes.$classId.lessons.$slug.exercises.$exerciseId";
import * as studentPage from "~/routes/teach.classes.$classId.students.$studentId";
import * as schoolClasses from "~/routes/school.classes";
import { get, post, runRoute, sessionCookieFor } from "./auth-helpers";
import { demoIds, enrollInventedStudents, recordTry } from "./teaching-helpers";

const LESSON = "02-force-and-deformation";
const DAY = 24 * 60 * 60 * 1000;
let ids: Awaited<ReturnType<typeof demoIds>>;
const cookies: Record<string, string> = {};
const required = lessonExercises(LESSON).exercises.filter((e) => e.required ?? true).map((e) => e.id);

beforeAll(async () => {
  ids = await demoIds();
  for (const who of ["teacher", "secondTeacher", "otherSchoolTeacher", "schoolAdmin", "otherSchoolAdmin", "student"] as const) cookies[who] = await sessionCookieFor(who);
}, 60_000);

async function studentByUsername(username: string) {
  return (await db.select().from(users).where(eq(users.username, username)))[0];
}

describe("the cells of the gradebook", () => {
  it("shows done, score with the late rule, overdue, finished late, stuck and work to review", async () => {
    // Class B (Oduya's): lesson 2 was due three days ago; late work loses 10 points a day.
    const due = new Date(Date.now() - 3 * DAY);
    const [assignment] = await db
      .insert(assignments)
      .values({ classId: ids.mapleB.id, lessonSlug: LESSON, opensAt: new Date(Date.now() - 10 * DAY), dueAt: due, latePolicy: "penalty", latePenaltyPercent: 10 })
      .returning();
    const onTime = await studentByUsername("kira.n");
    const lateOne = await studentByUsername("leo.f");
    const stuck = await studentByUsername("maya.d");
    const before = new Date(due.getTime() - DAY);
    const twoDaysLate = new Date(due.getTime() + 1.5 * DAY);
    for (const id of required) await recordTry(onTime.id, LESSON, id, { right: true, at: before });
    await db.insert(writtenAnswers).values({ studentId: onTime.id, lessonSlug: LESSON, answerId: "cer-stiffness", claim: "c", evidence: "e", reasoning: "r", handedInAt: before });
    for (const id of required) await recordTry(lateOne.id, LESSON, id, { right: true, at: twoDaysLate });
    await db.insert(writtenAnswers).values({ studentId: lateOne.id, lessonSlug: LESSON, answerId: "cer-stiffness", claim: "c", evidence: "e", reasoning: "r", handedInAt: twoDaysLate });
    await recordTry(stuck.id, LESSON, required[0], { slipCode: "loaded-reading-as-deformation" });
    await recordTry(stuck.id, LESSON, required[0], { slipCode: "unit-factor-10" });
    await recordTry(stuck.id, LESSON, required[0], { outcome: "unreadable" });
    await recordTry(stuck.id, LESSON, required[1], { right: true, at: before });

    const book = await loadGradebook({ db }, ids.mapleB.id);
    expect(book.lessons.map((l) => l.slug)).toEqual([LESSON]);
    const cell = (username: string) => book.rows.find((r) => r.student.username === username)!.cells[assignment.id];
    expect(cell("kira.n")).toMatchObject({ status: "complete", requiredDone: 7, requiredTotal: 7, score: 100, overdue: false, finishedLate: false, toReview: 1, stuckOn: [] });
    expect(cell("leo.f")).toMatchObject({ status: "complete", score: 80, overdue: false, finishedLate: true });
    expect(cell("maya.d")).toMatchObject({ status: "working", requiredDone: 1, score: 17, overdue: true, stuckOn: [required[0]] });
    expect(cell("nils.a")).toMatchObject({ status: "not-started", requiredDone: 0, score: null, overdue: true });

    const names = (rows: typeof book.rows) => rows.map((r) => r.student.username).sort();
    expect(names(filterRows(book.rows, "stuck"))).toEqual(["maya.d"]);
    expect(names(filterRows(book.rows, "late"))).not.toContain("kira.n");
    expect(names(filterRows(book.rows, "late"))).toEqual(expect.arrayContaining(["leo.f", "maya.d", "nils.a"]));
    expect(names(filterRows(book.rows, "not-started"))).not.toEqual(expect.arrayContaining(["kira.n", "leo.f", "maya.d"]));
    expect(filterRows(book.rows, "not-started")).toHaveLength(7);
    expect(book.rows.find((r) => r.student.username === "nils.a")!.averageScore).toBe(0);
    expect(book.summary).toMatchObject({ students: 10, lessons: 1, completePercent: 20, stuck: 1, toReview: 2 });

    // With two more days, Leo's late answers were on time after all.
    await db.insert(accommodations).values({ classId: ids.mapleB.id, studentId: lateOne.id, assignmentId: null, extraAttempts: 0, extraDays: 2 });
    const after = await loadGradebook({ db }, ids.mapleB.id);
    expect(after.rows.find((r) => r.student.username === "leo.f")!.cells[assignment.id]).toMatchObject({ score: 100, finishedLate: false, accommodated: true });

    // A lesson opened today and due in a week: not started, it does not pull Kira's average down;
    // started, it counts with its score so far.
    const nextSlug = listLessons().find((l) => l.slug !== LESSON)!.slug;
    const [next] = await db
      .insert(assignments)
      .values({ classId: ids.mapleB.id, lessonSlug: nextSlug, opensAt: new Date(Date.now() - DAY), dueAt: new Date(Date.now() + 7 * DAY) })
      .returning();
    const average = async (username: string) => (await loadGradebook({ db }, ids.mapleB.id)).rows.find((r) => r.student.username === username)!.averageScore;
    expect(await average("kira.n")).toBe(100);
    expect(await average("nils.a")).toBe(0);
    const [nextFirst] = lessonExercises(nextSlug).exercises.filter((e) => e.required ?? true);
    await recordTry(onTime.id, nextSlug, nextFirst.id, { slipCode: "unit-factor-10" });
    expect(await average("kira.n")).toBe(50);
    // The tests below see class B as before.
    await db.delete(exerciseAttempts).where(and(eq(exerciseAttempts.studentId, onTime.id), eq(exerciseAttempts.lessonSlug, nextSlug)));
    await db.delete(assignments).where(eq(assignments.id, next.id));
  });
});

describe("the number of SQL statements", () => {
  it("is the same for a class of 5 and of 35 students with 8 assigned lessons (no query per student or per lesson)", async () => {
    const course = listLessons().map((l) => l.slug);
    // Eight assigned lessons: the course's (up to eight), and invented ones if the course is shorter today.
    const slugs = [...course, ...Array.from({ length: 8 }, (_, i) => `9${i}-invented-lesson`)].slice(0, 8);
    const measure = async (size: number) => {
      const [klass] = await db
        .insert(classes)
        .values({ organisationId: ids.maplebrook.id, teacherId: ids.oduya.id, name: `Size ${size}`, schoolYear: "2026-27", signInCode: `SIZE${size}X` })
        .returning();
      const students = await enrollInventedStudents(ids.maplebrook.id, klass.id, size);
      await db.insert(assignments).values(slugs.map((slug, i) => ({ classId: klass.id, lessonSlug: slug, opensAt: new Date(Date.now() - DAY), dueAt: new Date(Date.now() + i * DAY) })));
      for (const s of students.slice(0, 5)) await recordTry(s.id, slugs[0], lessonExercises(slugs[0]).exercises[0]?.id ?? "x", { right: true });
      const count = async (fn: () => Promise<unknown>) => {
        const before = sqlStatements.count;
        await fn();
        return sqlStatements.count - before;
      };
      const page = await count(async () => {
        const result = await runRoute(gradebookPage.loader as never, get(`/teach/classes/${klass.id}/gradebook`, { cookie: cookies.teacher }), { classId: klass.id });
        expect(result.status).toBe(200);
        const body = result.body as { gradebook: { rows: unknown[]; lessons: unknown[] } };
        expect(body.gradebook.rows).toHaveLength(size);
        expect(body.gradebook.lessons).toHaveLength(8);
      });
      const json = await count(() => runRoute(gradebookJson.loader as never, get(`/api/teach/classes/${klass.id}/gradebook`, { cookie: cookies.teacher }), { classId: klass.id }));
      const model = await count(() => loadGradebook({ db }, klass.id));
      return { page, json, model };
    };
    const small = await measure(5);
    const large = await measure(35);
    expect(large).toEqual(small);
    // Nothing changed since the page and the JSON route read it: only the version is asked for.
    expect(small.model).toBe(1);
    expect(small.page).toBeLessThanOrEqual(10);
    console.log(`gradebook SQL statements — 5 students: ${JSON.stringify(small)}; 35 students: ${JSON.stringify(large)}`);
  });
});

describe("a gradebook kept between reads", () => {
  /** Reads the class's gradebook, saying whether it was computed afresh (more than the version's one statement). */
  async function read(classId: string, now?: Date) {
    const before = sqlStatements.count;
    const book = await loadGradebook({ db }, classId, now);
    return { book, computed: sqlStatements.count - before > 1 };
  }

  it("is computed again after every kind of change a gradebook shows, and only then", async () => {
    const [klass] = await db
      .insert(classes)
      .values({ organisationId: ids.maplebrook.id, teacherId: ids.oduya.id, name: "Kept gradebook", schoolYear: "2026-27", signInCode: "KEPTBOOK" })
      .returning();
    const [first, second] = await enrollInventedStudents(ids.maplebrook.id, klass.id, 2);
    const [assignment] = await db
      .insert(assignments)
      .values({ classId: klass.id, lessonSlug: LESSON, opensAt: new Date(Date.now() - DAY), dueAt: new Date(Date.now() + 5 * DAY) })
      .returning();
    expect((await read(klass.id)).computed).toBe(true);
    const unchanged = await read(klass.id);
    expect(unchanged.computed).toBe(false);
    expect(unchanged.book.rows).toHaveLength(2);

    const cell = (book: Awaited<ReturnType<typeof loadGradebook>>, studentId: string) => book.rows.find((r) => r.student.id === studentId)?.cells[assignment.id];
    const changes: { change: string; make: () => Promise<unknown>; shows: (book: Awaited<ReturnType<typeof loadGradebook>>) => boolean }[] = [
      { change: "an answer", make: () => recordTry(first.id, LESSON, required[0], { right: true }), shows: (b) => cell(b, first.id)?.requiredDone === 1 },
      { change: "a lesson visit", make: () => db.insert(lessonVisits).values({ studentId: second.id, lessonSlug: LESSON, lastPlace: "intro" }), shows: (b) => cell(b, second.id)?.status === "working" },
      {
        change: "a handed-in written answer",
        make: () => db.insert(writtenAnswers).values({ studentId: first.id, lessonSlug: LESSON, answerId: "cer-stiffness", claim: "c", evidence: "e", reasoning: "r", handedInAt: new Date() }),
        shows: (b) => cell(b, first.id)?.toReview === 1,
      },
      {
        change: "a review",
        make: () => db.update(writtenAnswers).set({ reviewedAt: new Date(Date.now() + 1000) }).where(eq(writtenAnswers.studentId, first.id)),
        shows: (b) => cell(b, first.id)?.toReview === 0,
      },
      { change: "a new name", make: () => db.update(users).set({ displayName: "Renamed Student" }).where(eq(users.id, second.id)), shows: (b) => b.rows.some((r) => r.student.displayName === "Renamed Student") },
      {
        change: "an accommodation",
        make: () => db.insert(accommodations).values({ classId: klass.id, studentId: second.id, assignmentId: assignment.id, extraDays: 2 }),
        shows: (b) => cell(b, second.id)?.accommodated === true,
      },
      { change: "a new due date", make: () => db.update(assignments).set({ dueAt: new Date(Date.now() + 9 * DAY) }).where(eq(assignments.id, assignment.id)), shows: (b) => b.lessons[0].dueAt === cell(b, first.id)?.dueAt && Date.parse(b.lessons[0].dueAt) > Date.now() + 8 * DAY },
      { change: "a student leaving the class", make: () => db.delete(enrollments).where(eq(enrollments.studentId, second.id)), shows: (b) => b.rows.length === 1 },
      { change: "a student joining", make: () => db.insert(enrollments).values({ classId: klass.id, studentId: second.id }), shows: (b) => b.rows.length === 2 },
      { change: "an assignment removed", make: () => db.delete(assignments).where(eq(assignments.id, assignment.id)), shows: (b) => b.lessons.length === 0 },
    ];
    for (const { change, make, shows } of changes) {
      const before = await gradebookVersion({ db }, klass.id);
      await make();
      expect(await gradebookVersion({ db }, klass.id), change).toBeGreaterThan(before);
      const after = await read(klass.id);
      expect(after.computed, change).toBe(true);
      expect(shows(after.book), change).toBe(true);
      expect((await read(klass.id)).computed, `${change}, read again`).toBe(false);
    }
  });

  it("is computed again when a lesson opens or a due date passes, even with no change in the database", async () => {
    const [klass] = await db
      .insert(classes)
      .values({ organisationId: ids.maplebrook.id, teacherId: ids.oduya.id, name: "Clock gradebook", schoolYear: "2026-27", signInCode: "CLOCKBK1" })
      .returning();
    await enrollInventedStudents(ids.maplebrook.id, klass.id, 1);
    const opensAt = new Date(Date.now() + DAY);
    const dueAt = new Date(Date.now() + 2 * DAY);
    await db.insert(assignments).values({ classId: klass.id, lessonSlug: LESSON, opensAt, dueAt });
    const now = new Date();
    expect((await read(klass.id, now)).book.lessons[0].opened).toBe(false);
    expect((await read(klass.id, new Date(now.getTime() + 60_000))).computed).toBe(false);
    const opened = await read(klass.id, new Date(opensAt.getTime() + 1));
    expect(opened.computed).toBe(true);
    expect(opened.book.lessons[0].opened).toBe(true);
    expect(opened.book.rows[0].notStarted).toBe(true);
    const overdue = await read(klass.id, new Date(dueAt.getTime() + 1));
    expect(overdue.computed).toBe(true);
    expect(Object.values(overdue.book.rows[0].cells)[0].overdue).toBe(true);
  });
});

describe("the JSON route", () => {
  it("answers the same gradebook as the page, and 404 to anyone but the class's teacher", async () => {
    const url = `/api/teach/classes/${ids.mapleB.id}/gradebook`;
    const mine = await runRoute(gradebookJson.loader as never, get(url, { cookie: cookies.teacher }), { classId: ids.mapleB.id });
    expect(mine.status).toBe(200);
    const page = await runRoute(gradebookPage.loader as never, get(`/teach/classes/${ids.mapleB.id}/gradebook`, { cookie: cookies.teacher }), { classId: ids.mapleB.id });
    const strip = (b: unknown) => ({ ...(b as { gradebook: object }).gradebook, generatedAt: "", updatedText: "" });
    expect(strip(mine.body)).toEqual(strip(page.body));
    expect(mine.headers.get("cache-control")).toMatch(/no-store/);
    for (const who of ["secondTeacher", "otherSchoolTeacher"] as const) {
      expect((await runRoute(gradebookJson.loader as never, get(url, { cookie: cookies[who] }), { classId: ids.mapleB.id })).status).toBe(404);
    }
    expect((await runRoute(gradebookJson.loader as never, get(url, { cookie: cookies.student }), { classId: ids.mapleB.id })).status).toBe(403);
    expect((await runRoute(gradebookJson.loader as never, get(url, { cookie: cookies.schoolAdmin }), { classId: ids.mapleB.id })).status).toBe(403);
    expect((await runRoute(gradebookJson.loader as never, get(url), { classId: ids.mapleB.id })).status).toBe(302);
  });

  it("tells the page's fetcher 'unchanged' while the revision it shows holds, and sends the new gradebook after a change", async () => {
    const url = `/api/teach/classes/${ids.mapleB.id}/gradebook`;
    const page = await runRoute(gradebookPage.loader as never, get(`/teach/classes/${ids.mapleB.id}/gradebook`, { cookie: cookies.teacher }), { classId: ids.mapleB.id });
    const shown = (page.body as { gradebook: { revision: string } }).gradebook.revision;
    expect(shown).toMatch(/^\d+-\d+$/);
    const ask = async (since: string) =>
      (await runRoute(gradebookJson.loader as never, get(`${url}?since=${encodeURIComponent(since)}`, { cookie: cookies.teacher }), { classId: ids.mapleB.id })).body as
        | { unchanged: true; revision: string }
        | { gradebook: { revision: string; rows: unknown[] } };
    expect(await ask(shown)).toEqual({ unchanged: true, revision: shown });
    // A change the other tests here do not count: a visit to a lesson this class was not given.
    const student = await studentByUsername("kira.n");
    await db.insert(lessonVisits).values({ studentId: student.id, lessonSlug: "08-design-challenge", lastPlace: "intro" }).onConflictDoNothing();
    const after = await ask(shown);
    expect("gradebook" in after && after.gradebook.revision !== shown).toBe(true);
    expect(await ask("no-such-revision")).toHaveProperty("gradebook");
  });

  it("sends a plain JSON client the body compressed as it asks (brotli, gzip or none), the same gradebook each way", async () => {
    const url = `/api/teach/classes/${ids.mapleB.id}/gradebook`;
    const read = async (acceptEncoding: string | null) => {
      const response = (await gradebookJson.loader({
        request: get(url, { cookie: cookies.teacher, headers: acceptEncoding ? { "accept-encoding": acceptEncoding } : {} }),
        params: { classId: ids.mapleB.id },
        context: {},
      } as never)) as unknown as Response;
      const bytes = Buffer.from(await response.arrayBuffer());
      const encoding = response.headers.get("content-encoding");
      const text = encoding === "br" ? brotliDecompressSync(bytes).toString() : encoding === "gzip" ? gunzipSync(bytes).toString() : bytes.toString();
      return { encoding, vary: response.headers.get("vary"), book: JSON.parse(text).gradebook as { rows: unknown[]; classId: string } };
    };
    const br = await read("gzip, deflate, br");
    const gzip = await read("gzip");
    const plain = await read(null);
    expect([br.encoding, gzip.encoding, plain.encoding]).toEqual(["br", "gzip", null]);
    expect(br.vary).toBe("Accept-Encoding");
    expect(br.book).toEqual(plain.book);
    expect(gzip.book).toEqual(plain.book);
    expect(plain.book.classId).toBe(ids.mapleB.id);
  });

  it("lets the page shorten the refresh for tests (2 to 30 s), and keeps 30 s otherwise", async () => {
    const refresh = async (q: string) =>
      ((await runRoute(gradebookPage.loader as never, get(`/teach/classes/${ids.mapleB.id}/gradebook${q}`, { cookie: cookies.teacher }), { classId: ids.mapleB.id })).body as { refreshSeconds: number }).refreshSeconds;
    expect(await refresh("")).toBe(30);
    expect(await refresh("?refresh=2")).toBe(2);
    expect(await refresh("?refresh=0.1")).toBe(30);
    expect(await refresh("?refresh=600")).toBe(30);
  });
});

describe("exports", () => {
  it("sends the gradebook as a UTF-8 CSV with a byte-order mark: a row per student, a column per lesson, totals", async () => {
    await db.update(users).set({ displayName: "=HYPERLINK(\"x\") Ørjan" }).where(eq(users.username, "olu.e"));
    const request = get(`/teach/classes/${ids.mapleB.id}/gradebook/csv`, { cookie: cookies.teacher });
    const raw = (await gradebookCsvRoute.loader({ request, params: { classId: ids.mapleB.id }, context: {} } as never)) as Response;
    // The byte-order mark is in the bytes sent (Response.text() would drop it when decoding).
    expect([...new Uint8Array(await raw.clone().arrayBuffer()).slice(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
    const result = await runRoute(gradebookCsvRoute.loader as never, get(`/teach/classes/${ids.mapleB.id}/gradebook/csv`, { cookie: cookies.teacher }), { classId: ids.mapleB.id });
    expect(result.status).toBe(200);
    expect(result.headers.get("content-type")).toBe("text/csv; charset=utf-8");
    expect(result.headers.get("content-disposition")).toMatch(/^attachment; filename="gradebook-grade-7-physical-science-b-\d{4}-\d{2}-\d{2}\.csv"$/);
    const text = result.body as string;
    const rows = Papa.parse<string[]>(text, { skipEmptyLines: true }).data;
    expect(rows[0]).toEqual(["Student", "Username", "Student number", "Lesson 2: Force and deformation (score %)", "Lessons complete", "Lessons assigned", "Average score (%): lessons started or past due, not started then 0"]);
    expect(rows).toHaveLength(1 + 10 + 1);
    expect(rows.find((r) => r[1] === "kira.n")).toEqual(["Kira N.", "kira.n", "", "100", "1", "1", "100"]);
    expect(rows.find((r) => r[1] === "nils.a")?.[3]).toBe("0");
    expect(rows.at(-1)![0]).toBe("Whole class: average scores, lessons in total");
    // A name that looks like a formula stays text in a spreadsheet; other scripts survive.
    expect(rows.find((r) => r[1] === "olu.e")?.[0]).toBe("'=HYPERLINK(\"x\") Ørjan");
    await db.update(users).set({ displayName: "Olu E." }).where(eq(users.username, "olu.e"));
  });

  it("follows one average rule on the page, in the summary and in every CSV column, before and after the due date", async () => {
    // A lesson open and due in two days; one of three students has finished it, two have not started.
    const [klass] = await db
      .insert(classes)
      .values({ organisationId: ids.maplebrook.id, teacherId: ids.oduya.id, name: "Average rule", schoolYear: "2026-27", signInCode: `AVG${Date.now() % 100000}` })
      .returning();
    const [done] = await enrollInventedStudents(ids.maplebrook.id, klass.id, 3);
    const [assignment] = await db
      .insert(assignments)
      .values({ classId: klass.id, lessonSlug: LESSON, opensAt: new Date(Date.now() - DAY), dueAt: new Date(Date.now() + 2 * DAY) })
      .returning();
    for (const id of required) await recordTry(done.id, LESSON, id, { right: true });
    await db.insert(writtenAnswers).values({ studentId: done.id, lessonSlug: LESSON, answerId: "cer-stiffness", claim: "c", evidence: "e", reasoning: "r", handedInAt: new Date() });

    const check = async (expected: { averages: (number | null)[]; cells: string[]; classAverage: number | null; lessonAverage: string }) => {
      const page = await runRoute(gradebookPage.loader as never, get(`/teach/classes/${klass.id}/gradebook`, { cookie: cookies.teacher }), { classId: klass.id });
      const book = (page.body as { gradebook: Awaited<ReturnType<typeof loadGradebook>> }).gradebook;
      expect(book.rows.map((r) => r.averageScore)).toEqual(expected.averages);
      expect(book.summary.averageScore).toBe(expected.classAverage);
      expect(book.summary.averagedStudents).toBe(expected.averages.filter((a) => a !== null).length);
      const csv = await runRoute(gradebookCsvRoute.loader as never, get(`/teach/classes/${klass.id}/gradebook/csv`, { cookie: cookies.teacher }), { classId: klass.id });
      const rows = Papa.parse<string[]>(csv.body as string, { skipEmptyLines: true }).data.slice(1);
      // Student rows: the lesson's score as it counts, lessons complete, assigned, the average.
      expect(rows.slice(0, 3).map((r) => r.slice(3))).toEqual(
        expected.cells.map((cell, i) => [cell, i === 0 ? "1" : "0", "1", expected.averages[i] === null ? "" : String(expected.averages[i])]),
      );
      // The class: the lesson's average of what counts, lessons complete and assigned in total, the class average.
      expect(rows[3].slice(3)).toEqual([expected.lessonAverage, "1", "3", expected.classAverage === null ? "" : String(expected.classAverage)]);
    };
    // Before the due date, a lesson not started does not count yet.
    await check({ averages: [100, null, null], cells: ["100", "", ""], classAverage: 100, lessonAverage: "100" });
    // Past the due date, it counts as 0 for those who never started it, everywhere.
    await db.update(assignments).set({ dueAt: new Date(Date.now() - 60_000) }).where(eq(assignments.id, assignment.id));
    await check({ averages: [100, 0, 0], cells: ["100", "0", "0"], classAverage: 33, lessonAverage: "33" });
  });

  it("sends each exercise's tries as CSV", async () => {
    const classId = ids.mapleB.id;
    const result = await runRoute(attemptsCsvRoute.loader as never, get(`/teach/classes/${classId}/lessons/${LESSON}/exercises/${required[0]}/csv`, { cookie: cookies.teacher }), { classId, slug: LESSON, exerciseId: required[0] });
    expect(result.status).toBe(200);
    expect(result.headers.get("content-disposition")).toMatch(/^attachment; filename="tries-grade-7-physical-science-b-lesson-2-deformation-from-readings\.csv"$/);
    const rows = Papa.parse<string[]>(result.body as string, { skipEmptyLines: true }).data;
    expect(rows[0].slice(0, 4)).toEqual(["Student", "Username", "Student number", "Try"]);
    // Times as spreadsheets read a date and time, in the class's zone, beside the exact UTC instant.
    for (const row of rows.slice(1)) expect(row[4]).toMatch(/^\d{4}-\d{2}-\d{2} \d{2}:\d{2}:\d{2}$/);
    // The same words as the exercise's page: tries counted as it counts them, a slip named in words.
    const maya = rows.filter((r) => r[1] === "maya.d");
    expect(maya.map((r) => [r[3], r[9], r[10], r[11]])).toEqual([
      ["Try 1", "no", "Gave the loaded ruler reading instead of the deformation", "loaded-reading-as-deformation"],
      ["Try 2", "no", "Off by a factor of 10 (the decimal point or a unit)", "unit-factor-10"],
      ["Not counted", "no", "Could not be read (no try used)", ""],
    ]);
    const other = await runRoute(attemptsCsvRoute.loader as never, get(`/teach/classes/${classId}/lessons/${LESSON}/exercises/${required[0]}/csv`, { cookie: cookies.secondTeacher }), { classId, slug: LESSON, exerciseId: required[0] });
    expect(other.status).toBe(404);
    const noExercise = await runRoute(attemptsCsvRoute.loader as never, get(`/x`, { cookie: cookies.teacher }), { classId, slug: LESSON, exerciseId: "nope" });
    expect(noExercise.status).toBe(404);
  });
});

describe("item analysis", () => {
  it("gives the share right at the first try, tries on average and wrong answers grouped by slip", async () => {
    const classId = ids.mapleB.id;
    const exercise = required[2];
    const s = await Promise.all(["olu.e", "priya.v", "kira.n", "leo.f"].map(studentByUsername));
    // olu: right first; priya: two slips by a factor of 10, then no unit, then right; kira and leo already right.
    await recordTry(s[0].id, LESSON, exercise, { right: true });
    await recordTry(s[1].id, LESSON, exercise, { slipCode: "unit-factor-10", raw: "[\"35\"]" });
    await recordTry(s[1].id, LESSON, exercise, { slipCode: "unit-factor-10", raw: "[\"35\"]" });
    await recordTry(s[1].id, LESSON, exercise, { outcome: "unit-missing", raw: "[\"3.5\"]" });
    await recordTry(s[1].id, LESSON, exercise, { right: true });
    const items = analyseItems(LESSON, await classAttempts({ db }, classId, LESSON), 10);
    const item = items.find((i) => i.exerciseId === exercise)!;
    expect(item).toMatchObject({ studentsInClass: 10, studentsTried: 4, rightFirstTry: 3, rightFirstTryPercent: 75, rightInTheEnd: 4, averageAttempts: 1.8 });
    expect(item.wrongGroups).toEqual([
      { key: "slip:unit-factor-10", label: expect.stringMatching(/factor of 10/), attempts: 2, students: 1, examples: [{ answer: "35", count: 2 }] },
      { key: "outcome:unit-missing", label: expect.stringMatching(/no unit/), attempts: 1, students: 1, examples: [{ answer: "3.5", count: 1 }] },
    ]);

    const page = await runRoute(exercisePage.loader as never, get(`/x`, { cookie: cookies.teacher }), { classId, slug: LESSON, exerciseId: exercise });
    expect((page.body as { item: { rightFirstTryPercent: number } }).item.rightFirstTryPercent).toBe(75);
    const lesson = await runRoute(lessonPage.loader as never, get(`/x`, { cookie: cookies.teacher }), { classId, slug: LESSON });
    expect((lesson.body as { items: unknown[] }).items).toHaveLength(lessonExercises(LESSON).exercises.length);
    expect((await runRoute(lessonPage.loader as never, get(`/x`, { cookie: cookies.teacher }), { classId, slug: "99-none" })).status).toBe(404);
  });
});

describe("reviewing written answers", () => {
  it("lists drafts with words in them and leaves out a draft that is still empty", async () => {
    const classId = ids.mapleB.id;
    const [quinn, rosa] = await Promise.all(["quinn.h", "rosa.g"].map(studentByUsername));
    await saveWrittenAnswer({ db }, quinn.id, LESSON, "cer-stiffness", { claim: "", evidence: " ", reasoning: "" }, false);
    await saveWrittenAnswer({ db }, rosa.id, LESSON, "cer-stiffness", { claim: "Stiffer at small loads.", evidence: "", reasoning: "" }, false);
    const lesson = await runRoute(lessonPage.loader as never, get(`/x`, { cookie: cookies.teacher }), { classId, slug: LESSON });
    const listed = (lesson.body as { answers: { studentId: string }[] }).answers.map((a) => a.studentId);
    expect(listed).toContain(rosa.id);
    expect(listed).not.toContain(quinn.id);
  });

  it("saves 0–2 points for claim, evidence and reasoning with a comment the student sees on their lesson page", async () => {
    const kira = await studentByUsername("kira.n");
    const classId = ids.mapleB.id;
    const review = (fields: Record<string, string>, cookie = cookies.teacher) =>
      runRoute(lessonPage.action as never, post(`/teach/classes/${classId}/lessons/${LESSON}`, { intent: "review", studentId: kira.id, slug: LESSON, answerId: "cer-stiffness", claim: "2", evidence: "1", reasoning: "2", comment: "Clear claim; give the numbers with units.", ...fields }, { cookie }), { classId, slug: LESSON });

    const three = await review({ evidence: "3" });
    expect(three.status).toBe(400);
    expect(three.body).toEqual({ error: "Evidence: Give 0, 1 or 2 points.", field: "evidence" });
    expect((await review({ claim: "" })).body).toEqual({ error: "Claim: Give 0, 1 or 2 points.", field: "claim" });
    // A pasted comment past the limit is refused whole (nothing saved), never cut.
    const long = await review({ comment: "w".repeat(5000) });
    expect(long.status).toBe(400);
    expect(long.body).toEqual({
      error: "Comment for the student: It can be at most 2,000 characters; this one has 5,000. Nothing was saved, and your text is still in the box to shorten.",
      field: "comment",
    });
    expect((await db.select().from(writtenAnswers).where(eq(writtenAnswers.studentId, kira.id)))[0].reviewComment).toBeNull();
    expect((await review({}, cookies.secondTeacher)).status).toBe(404);
    const ok = await review({});
    expect(ok.status).toBe(200);
    const [row] = await db.select().from(writtenAnswers).where(eq(writtenAnswers.studentId, kira.id));
    expect(row).toMatchObject({ reviewScores: { claim: 2, evidence: 1, reasoning: 2 }, reviewComment: "Clear claim; give the numbers with units.", reviewedBy: ids.oduya.id });
    const state = await loadLessonState({ db }, kira.id, LESSON);
    expect(state.writtenAnswers["cer-stiffness"].reviewComment).toBe("Clear claim; give the numbers with units.");
    expect((await loadGradebook({ db }, classId)).rows.find((r) => r.student.id === kira.id)!.cells).toSatisfy((cells: Record<string, { toReview: number }>) => Object.values(cells).every((c) => c.toReview === 0));

    // A draft cannot be reviewed; a student of another class cannot be reviewed here.
    const maya = await studentByUsername("maya.d");
    await db.insert(writtenAnswers).values({ studentId: maya.id, lessonSlug: LESSON, answerId: "cer-stiffness", claim: "draft" });
    const draft = await review({ studentId: maya.id });
    expect(draft.status).toBe(409);
    expect((draft.body as { error: string }).error).toMatch(/not been handed in/);
    expect((await review({ studentId: ids.amira.id })).status).toBe(404);

    // The same review from the student's page.
    const fromStudentPage = await runRoute(studentPage.action as never, post(`/x`, { intent: "review", studentId: kira.id, slug: LESSON, answerId: "cer-stiffness", claim: "1", evidence: "1", reasoning: "1", comment: "" }, { cookie: cookies.teacher }), { classId, studentId: kira.id });
    expect(fromStudentPage.status).toBe(200);
  });
});

describe("a student's page", () => {
  it("shows every attempt, their own readings with the analysis for the chart, written answers", async () => {
    const kira = await studentByUsername("kira.n");
    await db.insert(readingSets).values({
      studentId: kira.id,
      lessonSlug: LESSON,
      readingsId: "craft-stick",
      mode: "bend",
      material: "craft stick",
      unloadedCm: 20,
      resolutionCm: 0.1,
      points: [{ forceN: 1, readingCm: 19.6 }, { forceN: 2, readingCm: 19.2 }, { forceN: 3, readingCm: 18.8 }],
    });
    const page = await runRoute(studentPage.loader as never, get(`/x`, { cookie: cookies.teacher }), { classId: ids.mapleB.id, studentId: kira.id });
    expect(page.status).toBe(200);
    const body = page.body as { lessons: { slug: string; exercises: { attempts: unknown[] }[]; readings: { analysis: { fit: { throughOrigin: { slope: number } } } }[]; answers: unknown[] }[] };
    const lesson = body.lessons.find((l) => l.slug === LESSON)!;
    expect(lesson.exercises.flatMap((e) => e.attempts).length).toBeGreaterThanOrEqual(required.length);
    expect(lesson.readings[0].analysis.fit.throughOrigin.slope).toBeCloseTo(2.5, 5);
    expect(lesson.answers).toHaveLength(1);
  });

  it("shows the student's own due date, marked as extended, when they have more days", async () => {
    const maya = await studentByUsername("maya.d");
    const [lesson] = await db.select().from(assignments).where(and(eq(assignments.classId, ids.mapleB.id), eq(assignments.lessonSlug, LESSON)));
    const tz = ids.mapleB.timeZone;
    const dueLineOf = async () => {
      const page = await runRoute(studentPage.loader as never, get(`/x`, { cookie: cookies.teacher }), { classId: ids.mapleB.id, studentId: maya.id });
      return (page.body as { lessons: { slug: string; assignment: { dueLine: string } | null }[] }).lessons.find((l) => l.slug === LESSON)!.assignment!.dueLine;
    };
    expect(await dueLineOf()).toBe(`Due ${formatDue(lesson.dueAt, tz)}`);
    await db.insert(accommodations).values({ classId: ids.mapleB.id, studentId: maya.id, assignmentId: lesson.id, extraAttempts: 1, extraDays: 3 });
    expect(await dueLineOf()).toBe(`Due ${formatDue(new Date(lesson.dueAt.getTime() + 3 * DAY), tz)} (3 days added for this student; the class's is ${formatDue(lesson.dueAt, tz)})`);
    await db.delete(accommodations).where(and(eq(accommodations.studentId, maya.id), eq(accommodations.assignmentId, lesson.id)));
  });

  it("shows a choice as the option the student saw, not its stored value", async () => {
    const leo = await studentByUsername("leo.f");
    await recordTry(leo.id, LESSON, "same-stiffness-choice", { raw: JSON.stringify({ choice: "different", reason: "the last reading bent more" }) });
    const page = await runRoute(studentPage.loader as never, get(`/x`, { cookie: cookies.teacher }), { classId: ids.mapleB.id, studentId: leo.id });
    const body = page.body as { lessons: { slug: string; exercises: { id: string; attempts: { answer: string }[] }[] }[] };
    const tries = body.lessons.find((l) => l.slug === LESSON)!.exercises.find((e) => e.id === "same-stiffness-choice")!.attempts;
    expect(tries.map((t) => t.answer)).toContain("No, one of them is clearly different — “the last reading bent more”");
  });
});

describe("the school administrator's view", () => {
  it("lists every class and teacher of their own school with summaries, and nothing of the other school", async () => {
    const mine = await runRoute(schoolClasses.loader as never, get("/school/classes", { cookie: cookies.schoolAdmin }));
    expect(mine.status).toBe(200);
    const [school] = (mine.body as { schools: { name: string; classes: { name: string; teacherName: string; summary: { students: number } }[]; teachers: { name: string }[] }[] }).schools;
    expect(school.name).toMatch(/Maplebrook/);
    expect(school.classes.map((c) => c.name)).toEqual(expect.arrayContaining(["Grade 7 Physical Science A", "Grade 7 Physical Science B", "Grade 8 Engineering Design"]));
    expect(school.classes.find((c) => c.name === "Grade 8 Engineering Design")).toMatchObject({ teacherName: "Lars Fenwick", summary: { students: 10 } });
    expect(school.teachers.map((t) => t.name)).toEqual(["Lars Fenwick", "Ruth Oduya"]);
    expect(JSON.stringify(mine.body)).not.toMatch(/Harborside|Grade 8 Science|Nakamura/);

    const theirs = await runRoute(schoolClasses.loader as never, get("/school/classes", { cookie: cookies.otherSchoolAdmin }));
    expect(JSON.stringify(theirs.body)).not.toMatch(/Maplebrook|Oduya|Fenwick|Physical Science/);
    expect((theirs.body as { schools: { classes: { name: string }[] }[] }).schools[0].classes.map((c) => c.name)).toEqual(["Grade 8 Science"]);

    for (const who of ["teacher", "otherSchoolTeacher", "student"] as const) {
      expect((await runRoute(schoolClasses.loader as never, get("/school/classes", { cookie: cookies[who] }))).status, who).toBe(403);
    }
  });

  it("runs a fixed number of statements whatever the number of classes", async () => {
    const count = async () => {
      const before = sqlStatements.count;
      await runRoute(schoolClasses.loader as never, get("/school/classes", { cookie: cookies.schoolAdmin }));
      return sqlStatements.count - before;
    };
    const first = await count();
    await db.insert(classes).values({ organisationId: ids.maplebrook.id, teacherId: ids.fenwick.id, name: "One more class", schoolYear: "2026-27", signInCode: "ONEMORE1" });
    expect(await count()).toBe(first);
  });
});
