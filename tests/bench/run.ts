// `npm run bench`: how fast Bendwise answers, as shares of a floor measured in the same run.
//
//   build → a throw-away PostgreSQL on loopback → migrations, the demo seed and a large INVENTED school
//   (tests/bench/invented-school.ts) → SQL statements per request and lesson compile vs cache, in
//   process (tests/bench/in-process.measure.ts, with vitest) → the production server on 127.0.0.1 →
//   client JavaScript of every lesson page against the landing page → autocannon: a lesson page, an
//   answer check, the gradebook JSON (and its refresh) and POST /api/analysis, each taking turns with
//   the floor (GET /api/ping, a constant JSON) → a table on screen and the same figures in
//   tests/.artifacts/bench.json.
//
// Only servers this script starts, on 127.0.0.1, are loaded, each for a bounded time. No figure is a
// wall-clock limit: the targets are ratios to the floor, so a busy or slow machine moves both sides
// (and the two take turns in short slices, so that a drift of the machine's speed moves both alike).
import { execFileSync, spawn, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { cpus, loadavg, tmpdir } from "node:os";
import path from "node:path";
import { gzipSync } from "node:zlib";
import autocannon, { type Result as AutocannonResult } from "autocannon";
import { eq } from "drizzle-orm";
import { drizzle } from "drizzle-orm/postgres-js";
import postgres from "postgres";
import * as schema from "~/db/schema.server";
import { exerciseAttempts } from "~/db/schema.server";
import type { ExerciseDefinition } from "~/lib/exercises";
import { exerciseSeed, seededRandom } from "~/lib/seeded-random";
import { freePort, startAppServer, waitForHttp } from "../../drizzle/scripts/local-stack";
import { runMigrations } from "../../drizzle/scripts/migrate";
import { ensureDatabase, startThrowAwayPostgres } from "../../drizzle/scripts/postgres";
import { seedDemo } from "../../drizzle/scripts/seed";
import { COURSE, CURRENT_LESSON, seedInventedSchool, slipRaw } from "./invented-school";
import { mintSessionCookie } from "./session-cookie";
import type { BenchInfo } from "./in-process.measure";

const projectDir = process.cwd();
const artifacts = path.join(projectDir, "tests", ".artifacts");
mkdirSync(artifacts, { recursive: true });
const SECONDS = Number(process.env.BENCH_SECONDS ?? 10);
const WARM_UP_SECONDS = Number(process.env.BENCH_WARM_UP_SECONDS ?? 3);
/** Turns the load and the floor take in each figure (see pairedLoad). */
const ROUNDS = Number(process.env.BENCH_ROUNDS ?? 5);
const CONNECTIONS = Number(process.env.BENCH_CONNECTIONS ?? 10);
/** The lesson page measured under load: a lesson with displayed equations and the students' term work. */
const PAGE_LESSON = "02-force-and-deformation";

const TARGETS = {
  answerRatio: 0.4,
  lessonPageRatio: 0.25,
  gradebookRatio: 0.25,
  maxStatements: 5,
  maxJsRatio: 1.5,
};

const cleanups: Array<() => void | Promise<void>> = [];
let app: ChildProcess | undefined;
// Once, however many times it is asked for: Ctrl-C in a terminal signals npm, tsx and this process alike.
let cleaning: Promise<void> | undefined;
function cleanUp(): Promise<void> {
  cleaning ??= (async () => {
    if (app && app.exitCode === null) {
      app.kill("SIGTERM");
      // The server closes at once; its idle database connections could keep it up for their 20 s.
      const hard = setTimeout(() => app?.kill("SIGKILL"), 5_000);
      await new Promise((r) => app!.once("exit", r));
      clearTimeout(hard);
    }
    for (const cleanup of [...cleanups].reverse()) {
      try {
        await cleanup();
      } catch (error) {
        console.error("clean-up:", (error as Error).message);
      }
    }
  })();
  return cleaning;
}
process.on("SIGINT", () => void cleanUp().then(() => process.exit(130)));

const step = (text: string) => console.log(`\n▸ ${text}`);

function instanceFor(studentId: string, slug: string, definition: ExerciseDefinition) {
  return definition.generate(seededRandom(exerciseSeed(studentId, slug, definition.id, 0)), { ownData: null });
}

/** The urlencoded body of a wrong (but readable) answer, as the lesson page's fetcher sends it. */
function answerBody(studentId: string, slug: string, definition: ExerciseDefinition, which: number): string {
  const raw = slipRaw(definition, instanceFor(studentId, slug, definition), which);
  const form = new URLSearchParams({ intent: "answer", exerciseId: definition.id });
  if (definition.kind === "choice") {
    const { choice, reason } = JSON.parse(raw) as { choice: string; reason: string };
    form.set("choice", choice);
    form.set("reason", reason);
  } else if (definition.kind === "table") {
    for (const cell of JSON.parse(raw) as string[]) form.append("cell", cell);
  } else {
    form.set("answer", raw);
  }
  return form.toString();
}

interface LoadResult {
  name: string;
  requestsPerSecond: number;
  /** the floor's requests per second in the slices between this load's (see pairedLoad) */
  floorRequestsPerSecond: number;
  ratioToFloor: number;
  latencyP50Ms: number;
  latencyP99Ms: number;
  requests: number;
  non2xx: number;
  errors: number;
  /** CPU time per request during this load's slices (and the floor's): see cpuReading */
  cpuMsPerRequest: CpuPerRequest;
  floorCpuMsPerRequest: CpuPerRequest;
}

type Req = { method: string; path: string; headers: Record<string, string>; body?: string };

/**
 * CPU time used so far, in ms, by the app server (all its threads: rendering, the compression pool,
 * garbage collection), by PostgreSQL (the postmaster, its live backends and those that have ended)
 * and by this process (autocannon, the load). Read from /proc, so a figure per request can be taken
 * for each load beside its requests per second: unlike the rate, it does not move with the speed the
 * shared machine happens to have, and it says which process a load is spending.
 */
type CpuPerRequest = { server: number; postgres: number; load: number };
let cpuOf: { serverPid: number; postgresDataDir: string } | undefined;
const CLOCK_TICKS_PER_MS = 100 / 1000; // USER_HZ is 100 on Linux

function procTicks(pid: number, withEndedChildren = false): number {
  try {
    const fields = readFileSync(`/proc/${pid}/stat`, "utf8").split(") ")[1].split(" ");
    // utime, stime, then cutime, cstime (fields 14–17 of proc(5); the split drops the first two)
    const own = Number(fields[11]) + Number(fields[12]);
    return withEndedChildren ? own + Number(fields[13]) + Number(fields[14]) : own;
  } catch {
    return 0; // the process ended between listing and reading
  }
}

function cpuReading(): CpuPerRequest {
  if (!cpuOf) return { server: NaN, postgres: NaN, load: NaN };
  const postmaster = Number(readFileSync(path.join(cpuOf.postgresDataDir, "postmaster.pid"), "utf8").split("\n")[0]);
  let postgresTicks = procTicks(postmaster, true);
  for (const entry of readdirSync("/proc")) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      if (Number(readFileSync(`/proc/${entry}/stat`, "utf8").split(") ")[1].split(" ")[1]) === postmaster) postgresTicks += procTicks(Number(entry));
    } catch {
      // gone meanwhile
    }
  }
  const own = process.cpuUsage();
  return { server: procTicks(cpuOf.serverPid) / CLOCK_TICKS_PER_MS, postgres: postgresTicks / CLOCK_TICKS_PER_MS, load: (own.user + own.system) / 1000 };
}

const cpuSince = (before: CpuPerRequest, after: CpuPerRequest) => ({
  server: after.server - before.server,
  postgres: after.postgres - before.postgres,
  load: after.load - before.load,
});
const addCpu = (a: CpuPerRequest, b: CpuPerRequest) => ({ server: a.server + b.server, postgres: a.postgres + b.postgres, load: a.load + b.load });
const perRequest = (total: CpuPerRequest, requests: number) => ({ server: total.server / requests, postgres: total.postgres / requests, load: total.load / requests });
const NO_CPU: CpuPerRequest = { server: 0, postgres: 0, load: 0 };

/** Runs of autocannon whose requests are made by `next(i)`, with i counting on from one run to the next. */
function loadRunner(appUrl: string, next: (i: number) => Req) {
  let i = 0;
  return (seconds: number) =>
    autocannon({
      url: appUrl,
      connections: CONNECTIONS,
      duration: seconds,
      // Every request says what a browser says about compression, so pages and JSON go out gzipped as they would.
      requests: [{ setupRequest: (req: Record<string, unknown>) => { const r = next(i++); return { ...req, ...r, headers: { "accept-encoding": process.env.BENCH_ACCEPT_ENCODING ?? "gzip, deflate, br", ...r.headers } }; } }],
    });
}

const FLOOR: Req = { method: "GET", path: "/api/ping", headers: {} };

/**
 * One load as a share of the floor. This machine's speed drifts (a shared 2-core VM: the floor has
 * moved by a third within one run), so after a warm-up the load and the floor take turns: ROUNDS
 * slices of each, SECONDS in all for each, and the share is the load's requests over the floor's in
 * the same stretch of time. Latencies: the median of the slices' p50, the highest p99.
 */
async function pairedLoad(name: string, appUrl: string, next: (i: number) => Req): Promise<LoadResult> {
  // BENCH_ONLY=lesson,gradebook runs only the loads whose names contain one of those words.
  const only = process.env.BENCH_ONLY?.split(",");
  if (only && !only.some((word) => name.includes(word))) {
    const none = { server: NaN, postgres: NaN, load: NaN };
    return { name, requestsPerSecond: NaN, floorRequestsPerSecond: NaN, ratioToFloor: NaN, latencyP50Ms: NaN, latencyP99Ms: NaN, requests: 0, non2xx: 0, errors: 0, cpuMsPerRequest: none, floorCpuMsPerRequest: none };
  }
  const measured = loadRunner(appUrl, next);
  const floor = loadRunner(appUrl, () => FLOOR);
  await floor(1);
  await measured(WARM_UP_SECONDS);
  const slice = SECONDS / ROUNDS;
  const slices: AutocannonResult[] = [];
  let floorRequests = 0;
  let floorProblems = 0;
  let floorCpu = NO_CPU;
  let loadCpu = NO_CPU;
  for (let round = 0; round < ROUNDS; round++) {
    let before = cpuReading();
    const f = await floor(slice);
    floorCpu = addCpu(floorCpu, cpuSince(before, cpuReading()));
    floorRequests += f.requests.total;
    floorProblems += f.non2xx + f.errors + f.timeouts;
    before = cpuReading();
    slices.push(await measured(slice));
    loadCpu = addCpu(loadCpu, cpuSince(before, cpuReading()));
  }
  const requests = slices.reduce((n, r) => n + r.requests.total, 0);
  const p50s = slices.map((r) => r.latency.p50).sort((a, b) => a - b);
  const outcome: LoadResult = {
    name,
    requestsPerSecond: requests / SECONDS,
    floorRequestsPerSecond: floorRequests / SECONDS,
    ratioToFloor: requests / floorRequests,
    latencyP50Ms: p50s[Math.floor(p50s.length / 2)],
    latencyP99Ms: Math.max(...slices.map((r) => r.latency.p99)),
    requests,
    non2xx: slices.reduce((n, r) => n + r.non2xx, 0),
    errors: slices.reduce((n, r) => n + r.errors + r.timeouts, 0) + floorProblems,
    cpuMsPerRequest: perRequest(loadCpu, requests),
    floorCpuMsPerRequest: perRequest(floorCpu, floorRequests),
  };
  const cpu = outcome.cpuMsPerRequest;
  console.log(
    `  ${name.padEnd(22)} ${outcome.requestsPerSecond.toFixed(0).padStart(6)} req/s  floor beside it ${outcome.floorRequestsPerSecond.toFixed(0).padStart(5)} req/s  share ${(100 * outcome.ratioToFloor).toFixed(0).padStart(3)}%  p50 ${outcome.latencyP50Ms} ms  p99 ${outcome.latencyP99Ms} ms  (${outcome.requests} requests, ${outcome.non2xx} not 2xx)` +
      `\n  ${"".padEnd(22)} CPU per request: server ${cpu.server.toFixed(2)} ms (floor ${outcome.floorCpuMsPerRequest.server.toFixed(2)} ms), PostgreSQL ${cpu.postgres.toFixed(2)} ms, load ${cpu.load.toFixed(2)} ms`,
  );
  return outcome;
}

/** Every module script a page loads (its modulepreload links and the inline module's imports) and its classic scripts. */
async function pageScripts(appUrl: string, pathname: string, cookie?: string): Promise<{ url: string; bytes: number; gzip: number }[]> {
  const html = await (await fetch(`${appUrl}${pathname}`, { headers: cookie ? { cookie } : {} })).text();
  const urls = new Set<string>();
  for (const m of html.matchAll(/<link[^>]+rel="modulepreload"[^>]+href="([^"]+)"/g)) urls.add(m[1]);
  for (const m of html.matchAll(/<link[^>]+href="([^"]+)"[^>]+rel="modulepreload"/g)) urls.add(m[1]);
  for (const script of html.matchAll(/<script[^>]*type="module"[^>]*>([\s\S]*?)<\/script>/g)) {
    for (const m of script[1].matchAll(/(?:import|from)\s*\(?\s*"([^"]+\.js)"/g)) urls.add(m[1]);
  }
  for (const m of html.matchAll(/<script[^>]+src="([^"]+)"/g)) urls.add(m[1]);
  const files = [];
  for (const url of urls) {
    const response = await fetch(new URL(url, appUrl));
    if (!response.ok) throw new Error(`${url} answered ${response.status}`);
    const body = Buffer.from(await response.arrayBuffer());
    files.push({ url, bytes: body.length, gzip: gzipSync(body).length });
  }
  return files;
}

const sum = (files: { gzip: number }[]) => files.reduce((s, f) => s + f.gzip, 0);
const kb = (bytes: number) => `${(bytes / 1024).toFixed(1)} KB`;

let exitCode = 1;
try {
  console.log(`Bendwise benchmark on ${cpus().length} cores (${cpus()[0]?.model ?? "?"}), Node ${process.version}, load average ${loadavg().map((l) => l.toFixed(2)).join(" ")}`);

  step("Building the app");
  mkdirSync(path.join(projectDir, ".cache"), { recursive: true });
  const buildDir = mkdtempSync(path.join(projectDir, ".cache", "bench-build-"));
  cleanups.push(() => rmSync(buildDir, { recursive: true, force: true }));
  execFileSync(process.execPath, [path.join(projectDir, "node_modules", "@react-router", "dev", "bin.js"), "build"], {
    stdio: ["ignore", "ignore", "inherit"],
    env: { ...process.env, BENDWISE_BUILD_DIR: buildDir },
  });

  step("A throw-away PostgreSQL with the demo and a large invented school");
  const pg = startThrowAwayPostgres(await freePort());
  cleanups.push(() => pg.stop());
  await ensureDatabase(pg.adminUrl, "bendwise_bench");
  const databaseUrl = pg.urlFor("bendwise_bench");
  await runMigrations(databaseUrl);
  const client = postgres(databaseUrl, { max: 4, onnotice: () => {} });
  cleanups.push(() => client.end());
  const db = drizzle(client, { schema });
  await seedDemo(db);
  let started = performance.now();
  const school = await seedInventedSchool(db);
  await client`analyze`;
  console.log(`  ${Object.entries(school.counts).map(([k, v]) => `${v} ${k}`).join(", ")} in ${((performance.now() - started) / 1000).toFixed(1)} s`);

  const authSecret = randomBytes(32).toString("base64url");
  const appPort = await freePort();
  const appUrl = `http://127.0.0.1:${appPort}`;

  step("Session cookies for every invented student and the gradebook's teacher");
  const cookieOf = new Map<string, string>();
  for (const s of school.students) cookieOf.set(s.id, await mintSessionCookie(authSecret, s.id));
  const teacherCookie = await mintSessionCookie(authSecret, school.gradebookClass.teacherId, { hours: 12 });

  // Answers: (student, exercise) pairs of the current lesson with no attempt yet; each takes up to three wrong answers.
  const current = COURSE.find((c) => c.slug === CURRENT_LESSON)!;
  const tried = new Set(
    (await db.select({ s: exerciseAttempts.studentId, e: exerciseAttempts.exerciseId }).from(exerciseAttempts).where(eq(exerciseAttempts.lessonSlug, CURRENT_LESSON))).map(
      (r) => `${r.s}|${r.e}`,
    ),
  );
  const pairs = school.students.flatMap((s) =>
    current.lesson.exercises.filter((e) => e.kind !== "own-data" && !tried.has(`${s.id}|${e.id}`)).map((definition) => ({ studentId: s.id, definition })),
  );
  const [reserved, ...loadPairs] = pairs;
  console.log(`  ${pairs.length} open (student, exercise) pairs in ${CURRENT_LESSON}: room for ${pairs.length * 3} counted answers`);

  const analysisBody = JSON.stringify({
    mode: "bend",
    unloadedCm: 30,
    resolutionCm: 0.1,
    points: Array.from({ length: 10 }, (_, i) => ({ forceN: i + 1, readingCm: Number((30 - 0.42 * (i + 1) - (i % 3 === 1 ? 0.1 : 0)).toFixed(1)) })),
  });

  step("SQL statements per request and lesson compile vs cache (in process, vitest)");
  const infoFile = path.join(tmpdir(), `bendwise-bench-info-${process.pid}.json`);
  const inProcessOut = path.join(tmpdir(), `bendwise-bench-in-process-${process.pid}.json`);
  cleanups.push(() => rmSync(infoFile, { force: true }));
  cleanups.push(() => rmSync(inProcessOut, { force: true }));
  const info: BenchInfo = {
    appUrl,
    lessonSlug: PAGE_LESSON,
    studentCookie: cookieOf.get(school.students[1].id)!,
    answer: {
      cookie: cookieOf.get(reserved.studentId)!,
      slug: CURRENT_LESSON,
      exerciseId: reserved.definition.id,
      fields: Object.fromEntries(new URLSearchParams(answerBody(reserved.studentId, CURRENT_LESSON, reserved.definition, 0))),
    },
    gradebook: { cookie: teacherCookie, classId: school.gradebookClass.id },
    analysisBody,
    lessons: COURSE.map((c) => c.slug),
  };
  writeFileSync(infoFile, JSON.stringify(info));
  const appEnv = {
    DATABASE_URL: databaseUrl,
    AUTH_SECRET: authSecret,
    APP_URL: appUrl,
    SMTP_URL: "smtp://127.0.0.1:9",
    UPLOADS_DIR: mkdtempSync(path.join(tmpdir(), "bendwise-bench-uploads-")),
  };
  cleanups.push(() => rmSync(appEnv.UPLOADS_DIR, { recursive: true, force: true }));
  await new Promise<void>((resolve, reject) => {
    const child = spawn(
      process.execPath,
      [path.join(projectDir, "node_modules", "vitest", "vitest.mjs"), "run", "--config", "tests/bench/vitest.bench.config.ts", "--reporter=dot"],
      { stdio: ["ignore", "inherit", "inherit"], env: { ...process.env, ...appEnv, BENCH_INFO: infoFile, BENCH_IN_PROCESS_OUT: inProcessOut } },
    );
    child.on("exit", (code) => (code === 0 ? resolve() : reject(new Error(`the in-process measurements failed (exit ${code})`))));
  });
  const inProcess = JSON.parse(readFileSync(inProcessOut, "utf8")) as {
    sqlStatements: Record<"floor" | "lessonPage" | "answer" | "gradebook" | "gradebookAfterChange" | "analysis", number>;
    gradebookComputeMs: number;
    compile: { lessons: { slug: string; compileMs: number; memoryMs: number; diskMs: number }[]; meanCompileMs: number; meanMemoryMs: number; meanDiskMs: number };
  };

  step("The production server on loopback");
  // BENCH_PROFILE_DIR=<folder> writes a CPU profile of the server (for finding where the time goes).
  app = process.env.BENCH_PROFILE_DIR
    ? spawn(process.execPath, [`--cpu-prof`, `--cpu-prof-dir=${path.resolve(process.env.BENCH_PROFILE_DIR)}`, path.join(projectDir, "node_modules", "@react-router", "serve", "bin.js"), path.join(buildDir, "server", "index.js")], {
        env: { ...process.env, ...appEnv, NODE_ENV: "production", PORT: String(appPort), HOST: "127.0.0.1", AUTH_TRUST_HOST: "true" },
        stdio: ["ignore", "ignore", "inherit"],
      })
    : startAppServer({ buildDir, port: appPort, quiet: true, env: appEnv });
  await waitForHttp(`${appUrl}/healthz`, 60_000, app);
  cpuOf = { serverPid: app.pid!, postgresDataDir: pg.dataDir };

  step("Client JavaScript (gzip) of every lesson page against the landing page");
  const landing = await pageScripts(appUrl, "/");
  const lessonJs = [];
  for (const { slug } of COURSE) {
    const files = await pageScripts(appUrl, `/learn/${slug}`, cookieOf.get(school.students[0].id));
    const lessonCode = files.filter((f) => f.url.startsWith("/lesson-code/"));
    if (lessonCode.length !== 1) throw new Error(`the page of ${slug} did not load its lesson code`);
    lessonJs.push({ slug, gzip: sum(files), lessonCodeGzip: sum(lessonCode), files: files.length });
  }
  const worst = lessonJs.reduce((a, b) => (b.gzip > a.gzip ? b : a));
  console.log(`  landing page ${kb(sum(landing))} in ${landing.length} files; lesson pages ${kb(Math.min(...lessonJs.map((l) => l.gzip)))}–${kb(worst.gzip)} (largest: ${worst.slug})`);

  const sizeOf = async (pathname: string, cookie: string) => {
    const body = Buffer.from(await (await fetch(`${appUrl}${pathname}`, { headers: { cookie } })).arrayBuffer());
    return { bytes: body.length, gzip: gzipSync(body).length };
  };
  const responseSizes = {
    lessonPage: await sizeOf(`/learn/${PAGE_LESSON}`, cookieOf.get(school.students[0].id)!),
    gradebook: await sizeOf(`/api/teach/classes/${school.gradebookClass.id}/gradebook`, teacherCookie),
  };
  console.log(`  response sizes: lesson page ${kb(responseSizes.lessonPage.bytes)} (${kb(responseSizes.lessonPage.gzip)} gzip), gradebook JSON ${kb(responseSizes.gradebook.bytes)} (${kb(responseSizes.gradebook.gzip)} gzip)`);

  /** The i-th answer of the load: each open (student, exercise) pair in turn, up to three rounds. */
  const answerRequest = (i: number): Req => {
    const pair = loadPairs[i % loadPairs.length];
    const round = Math.floor(i / loadPairs.length);
    return {
      method: "POST",
      path: `/learn/${CURRENT_LESSON}.data`,
      headers: {
        cookie: cookieOf.get(pair.studentId)!,
        "content-type": "application/x-www-form-urlencoded",
        origin: appUrl,
        "sec-fetch-site": "same-origin",
      },
      body: answerBody(pair.studentId, CURRENT_LESSON, pair.definition, round),
    };
  };

  // Every invented student has signed in and landed on their course page before, as a student opening
  // a lesson has: so the session cookie has been read once (Auth.js's decryption, kept per cookie
  // until the session ends) and the loads measure the lesson page and the answer, not a first sign-in.
  step("Each invented student opens /learn once (their first page after signing in)");
  started = performance.now();
  const everyone = [...school.students];
  await Promise.all(
    Array.from({ length: CONNECTIONS }, async () => {
      for (let s = everyone.pop(); s; s = everyone.pop()) {
        const response = await fetch(`${appUrl}/learn`, { headers: { cookie: cookieOf.get(s.id)! } });
        if (!response.ok) throw new Error(`/learn answered ${response.status} for an invented student`);
        await response.arrayBuffer();
      }
    }),
  );
  console.log(`  ${school.students.length} students in ${((performance.now() - started) / 1000).toFixed(1)} s`);

  const gradebookPath = `/api/teach/classes/${school.gradebookClass.id}/gradebook`;

  // BENCH_HOLD=<file>: write what a person needs to load this server by hand (its address, the
  // database, the secret, every student's session), keep everything running and wait for Ctrl-C.
  if (process.env.BENCH_HOLD) {
    writeFileSync(
      process.env.BENCH_HOLD,
      JSON.stringify(
        {
          appUrl,
          ...appEnv,
          buildDir,
          lessonPath: `/learn/${PAGE_LESSON}`,
          gradebookPath,
          teacherCookie,
          studentCookies: school.students.map((s) => cookieOf.get(s.id)),
          answerRequests: Array.from({ length: 6_000 }, (_, i) => answerRequest(i)),
        },
        null,
        2,
      ),
    );
    console.log(`  holding: details in ${process.env.BENCH_HOLD}; Ctrl-C ends the server and the database`);
    await new Promise(() => {});
  }
  const shownRevision = ((await (await fetch(`${appUrl}${gradebookPath}`, { headers: { cookie: teacherCookie } })).json()) as { gradebook: { revision: string } }).gradebook.revision;

  step(`Load: ${CONNECTIONS} connections, autocannon in this process; for each figure a ${WARM_UP_SECONDS} s warm-up, then ${ROUNDS} turns of the floor and the load, ${SECONDS} s of each in all`);
  const students = school.students;
  const lessonPage = await pairedLoad("lesson page", appUrl, (i) => ({
    method: "GET",
    path: `/learn/${PAGE_LESSON}`,
    headers: { cookie: cookieOf.get(students[i % students.length].id)!, accept: "text/html" },
  }));
  const answer = await pairedLoad("answer check", appUrl, answerRequest);
  const gradebook = await pairedLoad("gradebook JSON", appUrl, () => ({ method: "GET", path: gradebookPath, headers: { cookie: teacherCookie } }));
  // What the open gradebook page asks every 30 s: React Router's .data request of its fetcher, with the
  // revision it shows; nothing changed in the class during the load, so each answer is "unchanged".
  const gradebookRefresh = await pairedLoad("gradebook refresh", appUrl, () => ({
    method: "GET",
    path: `${gradebookPath}.data?since=${encodeURIComponent(shownRevision)}`,
    headers: { cookie: teacherCookie },
  }));
  // A distinct client address per request (the app reads the last X-Forwarded-For entry), so the
  // per-address limit of 120 a minute is never reached: every request is analysed and counted.
  const analysis = await pairedLoad("POST /api/analysis", appUrl, (i) => ({
    method: "POST",
    path: "/api/analysis",
    headers: { "content-type": "application/json", "x-forwarded-for": `10.${(i >> 16) & 255}.${(i >> 8) & 255}.${i & 255}` },
    body: analysisBody,
  }));

  // The framework's own floor for a page: the sign-in page for someone not signed in (no session, no
  // database, a form and the site's header and footer), rendered by the same entry as a lesson page.
  // What any document costs before a lesson adds its student's data, exercises and math.
  const smallestPage = await pairedLoad("smallest page: sign-in, not signed in", appUrl, () => ({
    method: "GET",
    path: "/sign-in",
    headers: { accept: "text/html" },
  }));

  const loads = [lessonPage, answer, gradebook, gradebookRefresh, analysis, smallestPage].filter((r) => r.requests > 0);
  const floorFigures = loads.map((r) => r.floorRequestsPerSecond);
  const floor = floorFigures.reduce((a, b) => a + b, 0) / floorFigures.length;
  const ratio = (r: LoadResult) => r.ratioToFloor;
  const sql = inProcess.sqlStatements;
  const jsRatio = worst.gzip / sum(landing);
  const checks = [
    { measure: "answer check (lesson action, with its write)", ratio: ratio(answer), target: TARGETS.answerRatio },
    { measure: "lesson page (student, server render with math)", ratio: ratio(lessonPage), target: TARGETS.lessonPageRatio },
    { measure: "gradebook JSON (35 students, 8 lessons)", ratio: ratio(gradebook), target: TARGETS.gradebookRatio },
  ];
  const statementChecks = [
    { measure: "lesson page", statements: sql.lessonPage },
    { measure: "answer check", statements: sql.answer },
    { measure: "gradebook JSON", statements: sql.gradebook },
    { measure: "gradebook JSON after a change in the class", statements: sql.gradebookAfterChange },
  ];

  const report = {
    when: new Date().toISOString(),
    machine: { cores: cpus().length, cpu: cpus()[0]?.model ?? "?", node: process.version, loadAverageAtEnd: loadavg() },
    settings: { connections: CONNECTIONS, seconds: SECONDS, rounds: ROUNDS, warmUpSeconds: WARM_UP_SECONDS, tool: "autocannon 9.0.0" },
    inventedSchool: school.counts,
    floor: { requestsPerSecond: floor, lowest: Math.min(...floorFigures), highest: Math.max(...floorFigures) },
    load: Object.fromEntries([lessonPage, answer, gradebook, gradebookRefresh, analysis, smallestPage].map((r) => [r.name, r])),
    sqlStatementsPerRequest: sql,
    responseSizes,
    clientJavaScript: { landingGzip: sum(landing), landingFiles: landing, lessons: lessonJs, largestLesson: worst.slug, ratio: jsRatio },
    compile: inProcess.compile,
    targets: {
      ratios: checks.map((c) => ({ ...c, met: c.ratio >= c.target })),
      statements: statementChecks.map((c) => ({ ...c, max: TARGETS.maxStatements, met: c.statements <= TARGETS.maxStatements })),
      javaScript: { ratio: jsRatio, max: TARGETS.maxJsRatio, met: jsRatio <= TARGETS.maxJsRatio },
    },
  };
  writeFileSync(path.join(artifacts, "bench.json"), JSON.stringify(report, null, 2));

  const pct = (x: number) => `${(100 * x).toFixed(0)}%`;
  const line = (cells: string[]) => `| ${cells.join(" | ")} |`;
  const rows = [
    line(["measure", "figure", "share of floor / ratio", "target", "met"]),
    line(["---", "---:", "---:", "---:", ":---:"]),
    line([`floor: GET /api/ping (constant JSON; mean of its turns, ${Math.min(...floorFigures).toFixed(0)}–${Math.max(...floorFigures).toFixed(0)})`, `${floor.toFixed(0)} req/s`, "100%", "", ""]),
    ...[
      [lessonPage, TARGETS.lessonPageRatio],
      [answer, TARGETS.answerRatio],
      [gradebook, TARGETS.gradebookRatio],
      [gradebookRefresh, null],
      [analysis, null],
      [smallestPage, null],
    ].map(([r, target]) => {
      const result = r as LoadResult;
      const t = target as number | null;
      return line([
        `${result.name} (p50 ${result.latencyP50Ms} ms; floor beside it ${result.floorRequestsPerSecond.toFixed(0)} req/s)`,
        `${result.requestsPerSecond.toFixed(0)} req/s`,
        pct(ratio(result)),
        t === null ? "" : `≥ ${pct(t)}`,
        t === null ? "" : ratio(result) >= t ? "yes" : "NO",
      ]);
    }),
    // CPU per request: the server's beside the floor's in the same turns, and PostgreSQL's.
    ...[lessonPage, answer, gradebook, gradebookRefresh, analysis, smallestPage]
      .filter((r) => r.requests > 0)
      .map((r) =>
        line([
          `CPU per request: ${r.name} (server; PostgreSQL ${r.cpuMsPerRequest.postgres.toFixed(2)} ms)`,
          `${r.cpuMsPerRequest.server.toFixed(2)} ms`,
          `${(r.cpuMsPerRequest.server / r.floorCpuMsPerRequest.server).toFixed(1)}× the floor's ${r.floorCpuMsPerRequest.server.toFixed(2)} ms`,
          "",
          "",
        ]),
      ),
    ...(["lessonPage", "answer", "gradebook", "gradebookAfterChange", "analysis"] as const).map((k) => {
      const name = { lessonPage: "lesson page", answer: "answer check", gradebook: "gradebook JSON", gradebookAfterChange: "gradebook JSON after a change in the class", analysis: "POST /api/analysis" }[k];
      const targeted = k !== "analysis";
      return line([`SQL statements: ${name}`, String(sql[k]), "", targeted ? `≤ ${TARGETS.maxStatements}` : "", targeted ? (sql[k] <= TARGETS.maxStatements ? "yes" : "NO") : ""]);
    }),
    line(["gradebook computed afresh (35 students × 8 lessons, in process, mean of 20)", `${inProcess.gradebookComputeMs.toFixed(1)} ms`, "", "", ""]),
    line(["client JS (gzip): landing page", kb(sum(landing)), "1.00", "", ""]),
    line([`client JS (gzip): largest lesson page (${worst.slug}, incl. lesson code ${kb(worst.lessonCodeGzip)})`, kb(worst.gzip), jsRatio.toFixed(2), `≤ ${TARGETS.maxJsRatio}`, jsRatio <= TARGETS.maxJsRatio ? "yes" : "NO"]),
    line(["lesson compile (mdx-bundler, mean of 8)", `${inProcess.compile.meanCompileMs.toFixed(0)} ms`, "", "", ""]),
    line(["lesson from the cache: memory / disk (mean of 8)", `${(inProcess.compile.meanMemoryMs * 1000).toFixed(0)} µs / ${inProcess.compile.meanDiskMs.toFixed(2)} ms`, `compile is ${(inProcess.compile.meanCompileMs / inProcess.compile.meanDiskMs).toFixed(0)}× the disk cache`, "", ""]),
  ];
  console.log(`\n${rows.join("\n")}\n\nThe same figures: ${path.relative(projectDir, path.join(artifacts, "bench.json"))}`);
  const missed = [...report.targets.ratios, ...report.targets.statements, report.targets.javaScript].filter((t) => !t.met).length;
  const failures = [lessonPage, answer, gradebook, gradebookRefresh, analysis, smallestPage].filter((r) => r.non2xx > 0 || r.errors > 0);
  for (const f of failures) console.log(`warning: ${f.name} had ${f.non2xx} answers that were not 2xx and ${f.errors} errors`);
  console.log(missed === 0 ? "Every target is met." : `${missed} target(s) missed.`);
  exitCode = 0;
} catch (error) {
  console.error(`\nThe benchmark could not go on:\n${(error as Error).stack ?? error}`);
} finally {
  await cleanUp();
}
process.exit(exitCode);
