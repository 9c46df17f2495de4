// `npm test`: starts a throw-away PostgreSQL and the fakes on loopback, runs the unit and integration
// tests with vitest, builds the app, serves the production build and runs the browser tests in
// Debian's Chromium. Everything it starts is stopped again. `npm test -- <files>` runs only those files.
import { execFileSync, spawn } from "node:child_process";
import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import type { ChildProcess } from "node:child_process";
import { drizzle } from "drizzle-orm/postgres-js";
import postgres from "postgres";
import * as schema from "~/db/schema.server";
import { freePort, startAppServer, startMailWorkerProcess, waitForHttp } from "../drizzle/scripts/local-stack";
import { runMigrations } from "../drizzle/scripts/migrate";
import { ensureDatabase, startThrowAwayPostgres } from "../drizzle/scripts/postgres";
import { seedDemo } from "../drizzle/scripts/seed";
import { startMailCatcher } from "./fakes/mail-catcher";
import { startPaymentsFake } from "./fakes/payments-server";

const projectDir = process.cwd();
const artifacts = path.join(projectDir, "tests", ".artifacts");
mkdirSync(artifacts, { recursive: true });
const requested = process.argv.slice(2);
const wantsNode = requested.length === 0 || requested.some((f) => !f.includes("tests/browser"));
const wantsBrowser = requested.length === 0 || requested.some((f) => f.includes("tests/browser"));

const cleanups: Array<() => Promise<void> | void> = [];
let app: ChildProcess | undefined;
let mailWorker: ChildProcess | undefined;

async function cleanUp() {
  if (mailWorker && mailWorker.exitCode === null) {
    mailWorker.kill("SIGTERM");
    await new Promise((r) => mailWorker!.once("exit", r));
  }
  if (app && app.exitCode === null) {
    app.kill("SIGTERM");
    await new Promise((r) => app!.once("exit", r));
  }
  for (const cleanup of cleanups.reverse()) {
    try {
      await cleanup();
    } catch (error) {
      console.error("clean-up:", (error as Error).message);
    }
  }
}
process.on("SIGINT", () => void cleanUp().then(() => process.exit(130)));

/** Debian's Chromium drives the browser tests; install it when missing (never a browser download). */
function ensureChromium() {
  if (existsSync("/usr/bin/chromium")) return;
  if (process.getuid?.() !== 0) {
    throw new Error("Browser tests need Debian's Chromium: sudo apt-get install -y chromium");
  }
  console.log("Installing Debian's chromium package for the browser tests…");
  execFileSync("apt-get", ["update", "-qq"], { stdio: "inherit" });
  execFileSync("apt-get", ["install", "-y", "-qq", "chromium"], {
    stdio: "inherit",
    env: { ...process.env, DEBIAN_FRONTEND: "noninteractive" },
  });
}

function runVitest(name: string, env: Record<string, string>, files: string[]): Promise<{ passed: number; failed: number; code: number }> {
  const report = path.join(artifacts, `vitest-${name}.json`);
  rmSync(report, { force: true });
  const vitestBin = path.join(projectDir, "node_modules", "vitest", "vitest.mjs");
  return new Promise((resolve) => {
    const child = spawn(process.execPath, [vitestBin, "run", "--reporter=default", "--reporter=json", `--outputFile=${report}`, ...files], {
      stdio: "inherit",
      env: { ...process.env, ...env },
    });
    child.on("exit", (code) => {
      let passed = 0;
      let failed = 0;
      if (existsSync(report)) {
        const json = JSON.parse(readFileSync(report, "utf8"));
        passed = json.numPassedTests ?? 0;
        failed = json.numFailedTests ?? 0;
      }
      // A file that failed to load counts as a failure even though none of its tests ran.
      if (code !== 0 && failed === 0) failed = 1;
      resolve({ passed, failed, code: code ?? 1 });
    });
  });
}

let exitCode = 1;
const totals = { passed: 0, failed: 0 };
try {
  // The whole run starts with the type check (`npm run typecheck`): a type error fails it like a test.
  if (requested.length === 0) {
    console.log("Type check: react-router typegen && tsc");
    const bin = (pkg: string, file: string) => path.join(projectDir, "node_modules", pkg, file);
    execFileSync(process.execPath, [bin("@react-router/dev", "bin.js"), "typegen"], { stdio: ["ignore", "ignore", "inherit"] });
    execFileSync(process.execPath, [bin("typescript", "bin/tsc")], { stdio: "inherit" });
  }
  if (wantsBrowser) ensureChromium();

  const pg = startThrowAwayPostgres(await freePort());
  cleanups.push(() => pg.stop());
  const template = "bendwise_template";
  await ensureDatabase(pg.adminUrl, template);
  await runMigrations(pg.urlFor(template));
  const seedClient = postgres(pg.urlFor(template), { max: 1, onnotice: () => {} });
  await seedDemo(drizzle(seedClient, { schema }));
  await seedClient.end();

  const mailDir = mkdtempSync(path.join(tmpdir(), "bendwise-test-mail-"));
  cleanups.push(() => rmSync(mailDir, { recursive: true, force: true }));
  const [smtpPort, mailWebPort, paymentsPort, appPort] = [await freePort(), await freePort(), await freePort(), await freePort()];
  const mail = await startMailCatcher(smtpPort, mailWebPort, mailDir);
  cleanups.push(() => mail.stop());
  const webhookSecret = `whsec_test_${randomBytes(12).toString("hex")}`;
  const fake = await startPaymentsFake({ port: paymentsPort, webhookUrl: `http://127.0.0.1:${appPort}/api/payments/webhook`, webhookSecret, smtpUrl: `smtp://127.0.0.1:${smtpPort}` });
  cleanups.push(() => fake.stop());

  const appUrl = `http://127.0.0.1:${appPort}`;
  const sharedEnv = {
    BENDWISE_TEST_ADMIN_URL: pg.adminUrl,
    BENDWISE_TEST_TEMPLATE_DB: template,
    AUTH_SECRET: randomBytes(32).toString("base64url"),
    APP_URL: appUrl,
    SMTP_URL: `smtp://127.0.0.1:${smtpPort}`,
    BENDWISE_MAIL_WEB_PORT: String(mailWebPort),
    PAYMENTS_API_URL: fake.url,
    PAYMENTS_WEBHOOK_SECRET: webhookSecret,
    UPLOADS_DIR: mkdtempSync(path.join(tmpdir(), "bendwise-test-uploads-")),
  };
  cleanups.push(() => rmSync(sharedEnv.UPLOADS_DIR, { recursive: true, force: true }));

  let failedStage = false;
  if (wantsNode) {
    const files = requested.filter((f) => !f.includes("tests/browser"));
    // Each test file sends its own mail queue with a worker inside its process (sendMail starts it).
    const result = await runVitest("node", { ...sharedEnv, BENDWISE_MAIL_WORKER: "in-process" }, files);
    totals.passed += result.passed;
    totals.failed += result.failed;
    failedStage ||= result.code !== 0;
  }

  if (wantsBrowser) {
    // Inside the project (git-ignored) so the build's server bundle resolves the project's node_modules.
    mkdirSync(path.join(projectDir, ".cache"), { recursive: true });
    const buildDir = mkdtempSync(path.join(projectDir, ".cache", "test-build-"));
    cleanups.push(() => rmSync(buildDir, { recursive: true, force: true }));
    console.log("\nBuilding the app for the browser tests…");
    execFileSync(process.execPath, [path.join(projectDir, "node_modules", "@react-router", "dev", "bin.js"), "build"], {
      stdio: ["ignore", "ignore", "inherit"],
      env: { ...process.env, BENDWISE_BUILD_DIR: buildDir },
    });
    await ensureDatabase(pg.adminUrl, "bendwise_browser", template);
    const browserDbUrl = pg.urlFor("bendwise_browser");
    app = startAppServer({ buildDir, port: appPort, quiet: true, env: { ...sharedEnv, DATABASE_URL: browserDbUrl } });
    await waitForHttp(`${appUrl}/healthz`, 60_000, app);
    // The mail worker beside the app, as in `npm start`.
    mailWorker = startMailWorkerProcess({ buildDir, quiet: true, env: { ...sharedEnv, DATABASE_URL: browserDbUrl } });
    const files = requested.filter((f) => f.includes("tests/browser"));
    const result = await runVitest("browser", { ...sharedEnv, DATABASE_URL: browserDbUrl, BENDWISE_BROWSER: "1", BENDWISE_APP_URL: appUrl }, files);
    totals.passed += result.passed;
    totals.failed += result.failed;
    failedStage ||= result.code !== 0;
  }
  exitCode = failedStage ? 1 : 0;
} catch (error) {
  console.error(`\nThe test run could not go on:\n${(error as Error).stack ?? error}`);
  exitCode = 1;
} finally {
  await cleanUp();
}
console.log(`\nbendwise: ${totals.passed} passed, ${totals.failed} failed`);
process.exit(exitCode);
