// The in-process half of `npm run bench` (run by tests/bench/run.ts with vitest, never by `npm test`):
//
// 1. SQL statements per request, counted at the driver (sqlStatements.count in app/db/client.server.ts):
//    each measured request is a real Request with a real session cookie, handed to the same loaders and
//    actions React Router would call for it (the root loader and the route's loader for a page, the
//    action alone for a fetcher's POST). Counted one request at a time, after one warm-up request.
// 2. Compiling a lesson against serving it from the cache: compiledLesson() with an empty cache folder
//    (mdx-bundler runs), then again (memory), then in a fresh module instance (the disk cache).
//
// It reads what to request from BENCH_INFO (a JSON file written by run.ts) and writes its figures to
// BENCH_IN_PROCESS_OUT.
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { describe, expect, it, vi } from "vitest";
import { sql } from "drizzle-orm";
import { db, sqlStatements } from "~/db/client.server";
import { loadGradebooks } from "~/lib/teaching/gradebook.server";
import * as root from "~/root";
import * as lessonRoute from "~/routes/learn.lesson";
import * as gradebookRoute from "~/routes/api.teach.classes.$classId.gradebook";
import * as analysisRoute from "~/routes/api.analysis";
import * as pingRoute from "~/routes/api.ping";

export interface BenchInfo {
  appUrl: string;
  lessonSlug: string;
  studentCookie: string;
  answer: { cookie: string; slug: string; exerciseId: string; fields: Record<string, string> };
  gradebook: { cookie: string; classId: string };
  analysisBody: string;
  lessons: string[];
}

const info = JSON.parse(readFileSync(process.env.BENCH_INFO!, "utf8")) as BenchInfo;
const out: Record<string, unknown> = {};

type Fn = (args: never) => unknown;
async function call(fn: Fn, request: Request, params: Record<string, string> = {}) {
  try {
    const result = await fn({ request, params, context: {} } as never);
    return result instanceof Response ? result.status : 200;
  } catch (thrown) {
    if (thrown instanceof Response) return thrown.status;
    throw thrown;
  }
}

/** Statements sent while `run` handles one request. */
async function countStatements(run: () => Promise<number>): Promise<{ statements: number; status: number }> {
  await run(); // warm-up: module state, compiled lesson, prepared statements
  const before = sqlStatements.count;
  const status = await run();
  return { statements: sqlStatements.count - before, status };
}

const sameOrigin = (cookie: string) => ({ cookie, origin: info.appUrl, "sec-fetch-site": "same-origin" });

describe("SQL statements per request", () => {
  it("counts them", async () => {
    const lessonPage = await countStatements(async () => {
      const request = new Request(`${info.appUrl}/learn/${info.lessonSlug}`, { headers: { cookie: info.studentCookie } });
      await call(root.loader as Fn, request);
      return call(lessonRoute.loader as Fn, request, { slug: info.lessonSlug });
    });
    let wrongAnswers = 0;
    const answer = await countStatements(async () => {
      wrongAnswers++;
      const request = new Request(`${info.appUrl}/learn/${info.answer.slug}.data`, {
        method: "POST",
        headers: { ...sameOrigin(info.answer.cookie), "content-type": "application/x-www-form-urlencoded" },
        body: new URLSearchParams(info.answer.fields),
      });
      return call(lessonRoute.action as Fn, request, { slug: info.answer.slug });
    });
    const gradebook = await countStatements(() =>
      call(gradebookRoute.loader as Fn, new Request(`${info.appUrl}/api/teach/classes/${info.gradebook.classId}/gradebook`, { headers: { cookie: info.gradebook.cookie } }), {
        classId: info.gradebook.classId,
      }),
    );
    // The same after a change in the class (a student renamed to the same name raises its version
    // through the trigger), so the gradebook is computed afresh: one statement more.
    const changeInTheClass = () =>
      db.execute(sql`update users set display_name = display_name where id = (select student_id from enrollments where class_id = ${info.gradebook.classId} limit 1)`);
    await changeInTheClass();
    const statementsBefore = sqlStatements.count;
    const gradebookAfterChange = {
      status: await call(gradebookRoute.loader as Fn, new Request(`${info.appUrl}/api/teach/classes/${info.gradebook.classId}/gradebook`, { headers: { cookie: info.gradebook.cookie } }), {
        classId: info.gradebook.classId,
      }),
      statements: 0,
    };
    gradebookAfterChange.statements = sqlStatements.count - statementsBefore;
    // And how long computing it afresh takes, in this process (the mean of 20, after 3 to warm up).
    for (let i = 0; i < 3; i++) await loadGradebooks({ db }, [info.gradebook.classId]);
    const computeStarted = performance.now();
    for (let i = 0; i < 20; i++) await loadGradebooks({ db }, [info.gradebook.classId]);
    out.gradebookComputeMs = (performance.now() - computeStarted) / 20;
    let address = 0;
    const analysis = await countStatements(() =>
      call(
        analysisRoute.action as Fn,
        new Request(`${info.appUrl}/api/analysis`, {
          method: "POST",
          headers: { "content-type": "application/json", "x-forwarded-for": `198.51.100.${++address}` },
          body: info.analysisBody,
        }),
      ),
    );
    const ping = await countStatements(() => call(pingRoute.loader as Fn, new Request(`${info.appUrl}/api/ping`)));
    for (const [name, counted] of Object.entries({ lessonPage, answer, gradebook, gradebookAfterChange, analysis, ping })) {
      expect(counted.status, `${name} answered ${counted.status}`).toBeLessThan(300);
    }
    expect(wrongAnswers).toBe(2);
    out.sqlStatements = {
      floor: ping.statements,
      lessonPage: lessonPage.statements,
      answer: answer.statements,
      gradebook: gradebook.statements,
      gradebookAfterChange: gradebookAfterChange.statements,
      analysis: analysis.statements,
    };
  });
});

describe("compiling a lesson against serving it from the cache", () => {
  it("times compiledLesson() cold, from memory and from the disk cache", async () => {
    const folder = mkdtempSync(path.join(tmpdir(), "bendwise-bench-lessons-"));
    const previous = process.env.BENDWISE_LESSON_CACHE_DIR;
    // As in the production server, where a lesson's content hash is worked out once (lessonHash).
    const previousNodeEnv = process.env.NODE_ENV;
    process.env.NODE_ENV = "production";
    const freshModule = async () => {
      vi.resetModules();
      return import("~/lib/lessons.server");
    };
    try {
      // Load the compiler's own modules once, in a folder of its own, so the first lesson is not
      // charged for importing mdx-bundler and esbuild.
      process.env.BENDWISE_LESSON_CACHE_DIR = mkdtempSync(path.join(tmpdir(), "bendwise-bench-warm-"));
      await (await freshModule()).compiledLesson(info.lessons[0]);
      rmSync(process.env.BENDWISE_LESSON_CACHE_DIR, { recursive: true, force: true });

      process.env.BENDWISE_LESSON_CACHE_DIR = folder;
      const cold = await freshModule();
      const rows: { slug: string; compileMs: number; memoryMs: number; diskMs: number }[] = [];
      for (const slug of info.lessons) {
        let started = performance.now();
        await cold.compiledLesson(slug);
        const compileMs = performance.now() - started;
        const repeats = 200;
        started = performance.now();
        for (let i = 0; i < repeats; i++) await cold.compiledLesson(slug);
        const memoryMs = (performance.now() - started) / repeats;
        rows.push({ slug, compileMs, memoryMs, diskMs: 0 });
      }
      expect(cold.compileCount()).toBe(info.lessons.length);
      for (const row of rows) {
        const fresh = await freshModule();
        const started = performance.now();
        await fresh.compiledLesson(row.slug);
        row.diskMs = performance.now() - started;
        expect(fresh.compileCount()).toBe(0);
      }
      const mean = (key: "compileMs" | "memoryMs" | "diskMs") => rows.reduce((s, r) => s + r[key], 0) / rows.length;
      out.compile = { lessons: rows, meanCompileMs: mean("compileMs"), meanMemoryMs: mean("memoryMs"), meanDiskMs: mean("diskMs") };
    } finally {
      process.env.BENDWISE_LESSON_CACHE_DIR = previous;
      process.env.NODE_ENV = previousNodeEnv;
      rmSync(folder, { recursive: true, force: true });
      writeFileSync(process.env.BENCH_IN_PROCESS_OUT!, JSON.stringify(out, null, 2));
    }
  });
});
