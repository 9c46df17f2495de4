// PostgreSQL restarted while the app serves answers. The test builds the app, starts a PostgreSQL of
// its own (Debian's, on a free loopback port, with the demo data) and the production server on it, then
// has students send answers through the lesson page's fetcher address (POST /learn/<lesson>.data with
// the same-origin headers) while `pg_ctl restart -m fast` runs. The app process is never restarted.
// It must answer again once PostgreSQL is back, and every answer it acknowledged (2xx) must be in the
// database, once. Answers sent while PostgreSQL is down are refused with a 503 (the lesson page shows
// "try again in a few seconds" beside the exercise); what must never happen is an acknowledged answer
// that was not kept. A second test stops PostgreSQL outright and checks the 503s of pages and routes.
import { type ChildProcess, execFile, spawn } from "node:child_process";
import { randomBytes } from "node:crypto";
import { mkdirSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import { drizzle } from "drizzle-orm/postgres-js";
import postgres from "postgres";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as schema from "~/db/schema.server";
import { freePort, waitForHttp } from "../../drizzle/scripts/local-stack";
import { runMigrations } from "../../drizzle/scripts/migrate";
import { ensureDatabase, findPostgresBin, startThrowAwayPostgres, type RunningPostgres } from "../../drizzle/scripts/postgres";
import { seedDemo } from "../../drizzle/scripts/seed";
import { mintSessionCookie } from "../bench/session-cookie";

const run = promisify(execFile);
/** Exercises that take a number, in lessons 2 and 3: each student may send three counted answers to each. */
const EXERCISES = [
  ...["deformation-from-readings", "stiffness-one-reading", "force-for-deformation", "stiffness-in-n-per-m"].map((id) => ({ slug: "02-force-and-deformation", id })),
  ...["slope-through-origin", "predict-deformation", "zero-force-crossing"].map((id) => ({ slug: "03-proportional-or-not", id })),
];

let pg: RunningPostgres;
let sql: postgres.Sql;
let app: ChildProcess;
let appUrl: string;
let buildDir: string;
let appLog = "";
let appSecret = "";
const plan: { cookie: string; studentId: string; slug: string; exerciseId: string; answer: string }[] = [];

beforeAll(async () => {
  mkdirSync(path.resolve(".cache"), { recursive: true });
  buildDir = mkdtempSync(path.resolve(".cache", "restart-build-"));
  // The build runs while PostgreSQL starts; without vitest's variables, so the React Router plugin is in.
  const buildEnv = Object.fromEntries(Object.entries(process.env).filter(([k]) => !k.startsWith("VITEST") && k !== "TEST" && k !== "NODE_ENV"));
  const building = run(process.execPath, [path.resolve("node_modules/@react-router/dev/bin.js"), "build"], {
    env: { ...buildEnv, BENDWISE_BUILD_DIR: buildDir },
    maxBuffer: 64 * 1024 * 1024,
  }).then(
    () => null,
    (error: Error) => error,
  );

  pg = startThrowAwayPostgres(await freePort());
  await ensureDatabase(pg.adminUrl, "bendwise");
  const url = pg.urlFor("bendwise");
  await runMigrations(url);
  sql = postgres(url, { max: 2, onnotice: () => {} });
  await seedDemo(drizzle(sql, { schema }));
  const buildError = await building;
  if (buildError) throw buildError;

  const secret = randomBytes(32).toString("base64url");
  appSecret = secret;
  const port = await freePort();
  appUrl = `http://127.0.0.1:${port}`;
  app = spawn(process.execPath, [path.resolve("node_modules/@react-router/serve/bin.js"), path.join(buildDir, "server", "index.js")], {
    env: {
      ...process.env,
      NODE_ENV: "production",
      PORT: String(port),
      HOST: "127.0.0.1",
      AUTH_TRUST_HOST: "true",
      DATABASE_URL: url,
      AUTH_SECRET: secret,
      APP_URL: appUrl,
      SMTP_URL: "smtp://127.0.0.1:9",
      UPLOADS_DIR: mkdtempSync(path.join(tmpdir(), "bendwise-restart-uploads-")),
      BENDWISE_MAIL_WORKER: "separate",
    },
    stdio: ["ignore", "ignore", "pipe"],
  });
  app.stderr!.on("data", (chunk) => (appLog += chunk));
  await waitForHttp(`${appUrl}/healthz`, 60_000, app);

  // The demo school's students without invented work, each answering each exercise up to three times.
  const students = await sql<{ id: string }[]>`
    select u.id from users u join organisations o on o.id = u.home_organisation_id
    where o.slug = 'maplebrook' and u.username not in ('hugo.m', 'ines.r', 'jonah.b') order by u.username`;
  const cookies = new Map<string, string>();
  for (const s of students) cookies.set(s.id, await mintSessionCookie(secret, s.id));
  let n = 0;
  for (let round = 0; round < 3; round++) {
    for (const exercise of EXERCISES) {
      for (const s of students) {
        n++;
        // A wrong but readable answer, unique so it can be found again: each one counts and is kept.
        plan.push({ cookie: cookies.get(s.id)!, studentId: s.id, slug: exercise.slug, exerciseId: exercise.id, answer: `${9000 + n}.5` });
      }
    }
  }
}, 300_000);

afterAll(async () => {
  if (app && app.exitCode === null) {
    app.kill("SIGTERM");
    await new Promise((r) => setTimeout(r, 500));
    if (app.exitCode === null) app.kill("SIGKILL");
  }
  await sql?.end({ timeout: 1 }).catch(() => {});
  pg?.stop();
  if (buildDir) rmSync(buildDir, { recursive: true, force: true });
});

/** pg_ctl in a process of its own (as the postgres user when root), so answers keep going out while it runs. */
function pgCtl(command: "restart" | "stop" | "start"): Promise<{ startedAt: number; endedAt: number }> {
  const pgCtlBin = path.join(findPostgresBin(), "pg_ctl");
  // A start after a stop needs the loopback address, port and socket folder again (restart reuses them).
  const port = new URL(pg.adminUrl).port;
  const startOptions = command === "start" ? ["-o", `-h 127.0.0.1 -p ${port} -k ${pg.dataDir}`, "-l", path.join(pg.dataDir, "server.log")] : [];
  const args = ["-D", pg.dataDir, ...startOptions, "-m", "fast", "-w", "-t", "60", command];
  const isRoot = process.getuid?.() === 0;
  const startedAt = Date.now();
  return new Promise((resolve, reject) => {
    const child = spawn(isRoot ? "runuser" : pgCtlBin, isRoot ? ["-u", "postgres", "--", pgCtlBin, ...args] : args, { cwd: "/", stdio: "ignore" });
    child.on("exit", (code) => (code === 0 ? resolve({ startedAt, endedAt: Date.now() }) : reject(new Error(`pg_ctl ${command} exited with ${code}`))));
  });
}
const restartPostgres = () => pgCtl("restart");

describe("PostgreSQL stopped", () => {
  it("makes pages, fetchers and JSON routes answer 503 with Retry-After and a sentence saying so, until it is back", async () => {
    const [teacher] = await sql<{ id: string }[]>`select id from users where email = 'r.oduya@maplebrook.example'`;
    const [klass] = await sql<{ id: string }[]>`select id from classes where teacher_id = ${teacher.id} limit 1`;
    const teacherCookie = await mintSessionCookie(appSecret, teacher.id, { hours: 12 });
    const student = plan[0];
    const lessonPage = () => fetch(`${appUrl}/learn/${student.slug}`, { headers: { cookie: student.cookie } });
    const answer = () =>
      fetch(`${appUrl}/learn/${student.slug}.data`, {
        method: "POST",
        headers: { cookie: student.cookie, "content-type": "application/x-www-form-urlencoded", origin: appUrl, "sec-fetch-site": "same-origin" },
        body: new URLSearchParams({ intent: "answer", exerciseId: student.exerciseId, answer: "12.5" }),
      });
    const gradebook = () => fetch(`${appUrl}/api/teach/classes/${klass.id}/gradebook`, { headers: { cookie: teacherCookie } });
    expect((await lessonPage()).status).toBe(200);

    await pgCtl("stop");
    try {
      const page = await lessonPage();
      expect(page.status).toBe(503);
      expect(page.headers.get("retry-after")).toBe("5");
      const html = await page.text();
      expect(html).toContain("cannot reach its database just now");
      expect(html, "no sign-in offered to a student who is signed in").not.toContain('href="/sign-in"');
      const sent = await answer();
      expect(sent.status).toBe(503);
      // The lesson page's fetcher gets the sentence for the exercise that was sent, so it shows beside it.
      const body = await sent.text();
      expect(body).toContain("cannot reach its database just now");
      expect(body).toContain(student.exerciseId);
      expect((await gradebook()).status).toBe(503);
      expect((await fetch(`${appUrl}/healthz`)).status).toBe(503);
      const analysis = await fetch(`${appUrl}/api/analysis`, {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ mode: "bend", unloadedCm: 30, resolutionCm: 0.1, points: [{ forceN: 1, readingCm: 29.6 }, { forceN: 2, readingCm: 29.2 }] }),
      });
      expect(analysis.status).toBe(503);
      // Nothing of the database is needed for these.
      expect((await fetch(`${appUrl}/api/ping`)).status).toBe(200);
      expect((await fetch(`${appUrl}/`)).status).toBe(200);
    } finally {
      await pgCtl("start");
    }
    expect((await lessonPage()).status).toBe(200);
    expect((await gradebook()).status).toBe(200);
    expect(app.exitCode, "the app process kept running").toBeNull();
  }, 120_000);
});

describe("PostgreSQL restarted while the app serves answers", () => {
  it("recovers without a restart of its own, and keeps every answer it acknowledged", async () => {
    const appPid = app.pid;
    const sent: { i: number; at: number; status: number }[] = [];
    let next = 0;
    let stop = false;
    const worker = async () => {
      while (!stop && next < plan.length) {
        const i = next++;
        const p = plan[i];
        let status = 0;
        try {
          const response = await fetch(`${appUrl}/learn/${p.slug}.data`, {
            method: "POST",
            headers: { cookie: p.cookie, "content-type": "application/x-www-form-urlencoded", origin: appUrl, "sec-fetch-site": "same-origin" },
            body: new URLSearchParams({ intent: "answer", exerciseId: p.exerciseId, answer: p.answer }),
            signal: AbortSignal.timeout(15_000),
          });
          await response.arrayBuffer();
          status = response.status;
        } catch {
          status = 0; // no answer at all (connection refused or timed out)
        }
        sent.push({ i, at: Date.now(), status });
        await new Promise((r) => setTimeout(r, 40));
      }
    };
    const workers = Array.from({ length: 4 }, worker);
    await new Promise((r) => setTimeout(r, 1500));
    const restart = await restartPostgres();
    await new Promise((r) => setTimeout(r, 4000));
    stop = true;
    await Promise.all(workers);

    const acknowledged = sent.filter((s) => s.status >= 200 && s.status < 300);
    const before = acknowledged.filter((s) => s.at < restart.startedAt);
    const after = sent.filter((s) => s.at > restart.endedAt + 1000);
    console.log(
      `answers: ${sent.length} sent, ${acknowledged.length} acknowledged, ${sent.length - acknowledged.length} refused or failed; ` +
        `restart took ${restart.endedAt - restart.startedAt} ms; not acknowledged (ms from the restart's start: status): ${sent.filter((s) => s.status !== 200).map((s) => `${s.at - restart.startedAt}:${s.status}`).join(" ")}`,
    );
    if (after.length === 0) console.log(`the app's own log, last part:\n${appLog.slice(-3000)}\napp exit code: ${app.exitCode}`);
    expect(next, "the planned answers ran out before the end").toBeLessThan(plan.length);
    expect(before.length, "answers acknowledged before the restart").toBeGreaterThan(5);
    expect(after.length, "answers sent once PostgreSQL was back").toBeGreaterThan(5);
    expect(after.every((s) => s.status === 200), `answers after the restart: ${after.map((s) => s.status).join(",")}\n${appLog.slice(-2000)}`).toBe(true);
    expect(app.exitCode, "the app process kept running").toBeNull();
    expect(app.pid).toBe(appPid);
    expect(sent.filter((s) => s.status !== 200 && s.status !== 503), "answers refused otherwise than with a 503").toEqual([]);

    const kept = await sql<{ raw_answer: string; n: number }[]>`
      select raw_answer, count(*)::int as n from exercise_attempts where raw_answer like '9%.5' group by raw_answer`;
    const keptAnswers = new Map(kept.map((k) => [k.raw_answer, k.n]));
    const missing = acknowledged.filter((s) => keptAnswers.get(plan[s.i].answer) !== 1).map((s) => plan[s.i].answer);
    expect(missing, "acknowledged answers that are not in the database exactly once").toEqual([]);
  }, 120_000);
});
