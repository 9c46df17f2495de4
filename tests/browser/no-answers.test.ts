// No expected answer in any response to a student: every lesson page of the course, its loader data
// (the `.data` address the browser's router fetches) and its lesson-code file, fetched from the
// running production server as a signed-in student who has not answered anything yet. For each of the
// lesson's exercises the student's own instance is worked out the way the server does
// (exerciseInstance), and neither its worked solution nor the names of the answer-key fields may appear.
// (lesson.test.ts does the same for lesson 2 inside the browser; this covers every lesson over HTTP.)
import { and, eq, notExists } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { exerciseAttempts, organisations, readingSets, users } from "~/db/schema.server";
import { exerciseInstance } from "~/lib/course.server";
import { lessonExercises, listLessons } from "~/lib/lessons.server";
import { mintSessionCookie } from "../bench/session-cookie";
import { appUrl } from "./browser";

/** Field names of the server's answer key (app/lib/exercises.ts, ExerciseKey) as they would be serialised. */
const KEY_FIELDS = ['"correctChoice"', '"expected"', '"cells"'];

async function freshStudent() {
  const [student] = await db
    .select({ id: users.id, username: users.username })
    .from(users)
    .innerJoin(organisations, eq(organisations.id, users.homeOrganisationId))
    .where(
      and(
        eq(organisations.slug, "maplebrook"),
        notExists(db.select().from(exerciseAttempts).where(eq(exerciseAttempts.studentId, users.id))),
        notExists(db.select().from(readingSets).where(eq(readingSets.studentId, users.id))),
      ),
    )
    .orderBy(users.username)
    .limit(1);
  if (!student) throw new Error("no demo student without answers is left");
  return student;
}

describe("no expected answer reaches a student", () => {
  it("in any lesson page, its loader data or its lesson code", async () => {
    const student = await freshStudent();
    const cookie = await mintSessionCookie(process.env.AUTH_SECRET!, student.id);
    const lessons = listLessons();
    expect(lessons.length).toBeGreaterThanOrEqual(8);
    let checked = 0;
    for (const lesson of lessons) {
      const fetchText = async (url: string) => {
        const response = await fetch(new URL(url, appUrl), { headers: { cookie } });
        expect(response.status, `${url}`).toBe(200);
        return response.text();
      };
      const html = await fetchText(`/learn/${lesson.slug}`);
      const loaderData = await fetchText(`/learn/${lesson.slug}.data`);
      const codeUrl = /<script src="(\/lesson-code\/[^"]+)"/.exec(html)?.[1];
      expect(codeUrl, `${lesson.slug} loads its lesson code`).toBeTruthy();
      const code = await fetchText(codeUrl!);
      const bodies = { page: html, "loader data": loaderData, "lesson code": code };
      for (const [name, body] of Object.entries(bodies)) {
        for (const key of KEY_FIELDS) expect(body, `${key} in the ${name} of ${lesson.slug}`).not.toContain(key);
      }
      for (const definition of lessonExercises(lesson.slug).exercises) {
        const instance = exerciseInstance(student.id, lesson.slug, definition, []);
        const lines = instance.solution.split("\n").map((l) => l.trim()).filter((l) => l.length >= 6);
        for (const [name, body] of Object.entries(bodies)) {
          for (const line of lines) expect(body, `${lesson.slug} / ${definition.id}: a line of the worked solution in the ${name}`).not.toContain(line);
        }
        checked++;
      }
    }
    console.log(`checked ${checked} exercises in ${lessons.length} lessons as ${student.username}: page, loader data and lesson code`);
    expect(checked).toBeGreaterThan(40);
  }, 120_000);
});
