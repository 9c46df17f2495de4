// `npm start`: brings up the whole local Bendwise on loopback and serves the production build.
//   PostgreSQL (Debian's, data in .data/postgres) → migrations → invented demo data →
//   mail catcher with web inbox → payments fake → the app on http://localhost:3000 (PORT changes it)
//   → the mail worker (its own process, sending the mail queue kept in PostgreSQL).
// Ctrl-C stops everything this script started. Setting DATABASE_URL, SMTP_URL or PAYMENTS_API_URL
// uses those services instead of the local ones.
import type { ChildProcess } from "node:child_process";
import path from "node:path";
import { drizzle } from "drizzle-orm/postgres-js";
import postgres from "postgres";
import * as schema from "~/db/schema.server";
import { startMailCatcher, type MailCatcher } from "../../tests/fakes/mail-catcher";
import { startPaymentsFake, type PaymentsFake } from "../../tests/fakes/payments-server";
import { persistentAuthSecret, startAppServer, startMailWorkerProcess, waitForHttp } from "./local-stack";
import { runMigrations } from "./migrate";
import { DEMO_PORT, dataFolderFor, ensureDatabase, startPostgres, type RunningPostgres } from "./postgres";
import { demoSignIns, seedDemo } from "./seed";

const projectDir = process.cwd();
const appPort = Number(process.env.PORT ?? 3000);
const stoppers: Array<() => Promise<void> | void> = [];
let app: ChildProcess | undefined;
let mailWorker: ChildProcess | undefined;
let stopping = false;

/**
 * Stops a child process. After Ctrl-C the child got the same SIGINT from the terminal and is already
 * closing, so it is not signalled again (a second signal makes the framework server close twice);
 * otherwise it gets SIGTERM. One that hangs on open connections is ended after a few seconds.
 */
async function stopChild(child: ChildProcess | undefined, alreadySignalled: boolean) {
  if (!child || child.exitCode !== null || child.signalCode !== null) return;
  const exited = new Promise((r) => child.once("exit", r));
  const within = (ms: number) => Promise.race([exited.then(() => true), new Promise((r) => setTimeout(() => r(false), ms))]);
  if (!alreadySignalled) child.kill("SIGTERM");
  if (await within(8000)) return;
  child.kill("SIGKILL");
  await exited;
}

async function stopEverything(exitCode: number, fromTerminal = false) {
  if (stopping) return;
  stopping = true;
  console.log("\nStopping Bendwise…");
  await Promise.all([stopChild(mailWorker, fromTerminal), stopChild(app, fromTerminal)]);
  for (const stop of stoppers.reverse()) {
    try {
      await stop();
    } catch (error) {
      console.error((error as Error).message);
    }
  }
  console.log("Everything Bendwise started is stopped.");
  process.exit(exitCode);
}
process.on("SIGINT", () => void stopEverything(0, true));
process.on("SIGTERM", () => void stopEverything(0));

try {
  // 1. The database.
  let databaseUrl = process.env.DATABASE_URL;
  if (!databaseUrl) {
    const pg: RunningPostgres = startPostgres(dataFolderFor(projectDir), Number(process.env.BENDWISE_PG_PORT ?? DEMO_PORT));
    if (pg.startedHere) stoppers.push(() => pg.stop());
    await ensureDatabase(pg.adminUrl, "bendwise");
    databaseUrl = pg.urlFor("bendwise");
    console.log(`PostgreSQL on 127.0.0.1:${pg.port} (data in ${path.relative(projectDir, pg.dataDir) || pg.dataDir})`);
  }
  await runMigrations(databaseUrl);
  const client = postgres(databaseUrl, { max: 1, onnotice: () => {} });
  await seedDemo(drizzle(client, { schema }));
  await client.end();

  // 2. E-mail: the local catcher unless a real SMTP server is configured.
  let mail: MailCatcher | undefined;
  if (!process.env.SMTP_URL) {
    mail = await startMailCatcher(1025, 1080, path.join(projectDir, ".data", "mail"));
    stoppers.push(() => mail!.stop());
  }

  // 3. Payments: the local fake unless a real provider is configured.
  const webhookSecret = process.env.PAYMENTS_WEBHOOK_SECRET ?? "whsec_bendwise_local";
  let fake: PaymentsFake | undefined;
  if (!process.env.PAYMENTS_API_URL) {
    fake = await startPaymentsFake({
      port: 12111,
      webhookUrl: `http://127.0.0.1:${appPort}/api/payments/webhook`,
      webhookSecret,
      // The provider e-mails the invoices it sends; the fake does so through the same mail server.
      smtpUrl: process.env.SMTP_URL ?? "smtp://127.0.0.1:1025",
    });
    stoppers.push(() => fake!.stop());
  }

  // 4. The app itself, from the production build.
  const appUrl = process.env.APP_URL ?? `http://localhost:${appPort}`;
  const appEnv = {
    DATABASE_URL: databaseUrl,
    AUTH_SECRET: process.env.AUTH_SECRET ?? persistentAuthSecret(projectDir),
    APP_URL: appUrl,
    SMTP_URL: process.env.SMTP_URL ?? "smtp://127.0.0.1:1025",
    PAYMENTS_API_URL: process.env.PAYMENTS_API_URL ?? fake!.url,
    PAYMENTS_WEBHOOK_SECRET: webhookSecret,
  };
  app = startAppServer({ buildDir: path.join(projectDir, "build"), port: appPort, env: appEnv });
  app.once("exit", (code) => {
    if (!stopping) {
      console.error(`The app server stopped (exit code ${code}).`);
      void stopEverything(code ?? 1);
    }
  });
  await waitForHttp(`http://127.0.0.1:${appPort}/healthz`, 60_000, app);

  // 5. The mail worker: sends what the app queues, retrying while the mail server is down.
  mailWorker = startMailWorkerProcess({ buildDir: path.join(projectDir, "build"), env: appEnv });
  mailWorker.once("exit", (code) => {
    if (!stopping) {
      console.error(`The mail worker stopped (exit code ${code}); e-mail waits in the queue until it runs again.`);
      void stopEverything(code ?? 1);
    }
  });

  const s = demoSignIns;
  console.log(`
Bendwise is running at ${appUrl}
${mail ? `Mail inbox (every e-mail the app sends): ${mail.inboxUrl}` : "E-mail goes to SMTP_URL."}
Mail worker running beside the app; \`npm run mail:weekly\` queues this week's summaries now.
${fake ? `Payments fake (test cards only): ${fake.url}` : "Payments go to PAYMENTS_API_URL."}

Demo sign-ins (an invented school, household and people):
  School administrator  ${s.schoolAdmin.email}  /  ${s.schoolAdmin.password}
  Teacher               ${s.teacher.email}  /  ${s.teacher.password}
  Parent                ${s.parent.email}  /  ${s.parent.password}
  Student               code ${s.student.code}, username ${s.student.username}  /  ${s.student.password}
  Child at home         code ${s.child.code}, username ${s.child.username}  /  ${s.child.password}
  Other school's admin  ${s.otherSchoolAdmin.email}  /  ${s.otherSchoolAdmin.password}

Press Ctrl-C to stop everything.`);
} catch (error) {
  console.error(`\nBendwise could not start:\n${(error as Error).message}`);
  await stopEverything(1);
}
