// The mail queue: every e-mail is a job in PostgreSQL (pg-boss, schema "pgboss"), so a mail server
// that is down loses nothing. The app only adds jobs; the mail worker (worker.server.ts, its own
// process, any number of them on any machine) takes them and hands them to SMTP, retrying a refused
// one with exponential backoff.
//
// Decisions
// - pg-boss 10.x: the last line that runs on Node 20. Its tables live in the same database as ours,
//   in their own schema; it installs and upgrades them itself on start (under an advisory lock).
// - The retry policy is written on each job (not only on the queue row), so an old job keeps the
//   policy it was queued with. The waits are pg-boss's: delay × 2^n, plus up to the same again at
//   random (jitter), so many refused e-mails do not all come back at the same second.
// - Delivered e-mails leave the queue's tables within a few hours (archive after 1 hour, then
//   deleted): a sign-in link or a summary naming a child is not kept in the database longer than needed.
import PgBoss from "pg-boss";
import { serverEnv, type ServerEnv } from "~/env.server";

export const MAIL_QUEUE = "mail";
export const WEEKLY_SUMMARY_QUEUE = "weekly-summaries";

/** What a mail job carries: the finished e-mail. */
export interface MailJobData {
  to: string;
  subject: string;
  text: string;
  html: string;
  headers?: Record<string, string>;
}

/** How long a sending attempt may take before pg-boss counts it as failed and retries. */
export const MAIL_ATTEMPT_SECONDS = 120;

export function mailJobOptions(env: Pick<ServerEnv, "MAIL_RETRY_LIMIT" | "MAIL_RETRY_DELAY_SECONDS"> = serverEnv()): PgBoss.SendOptions {
  return {
    retryLimit: env.MAIL_RETRY_LIMIT,
    retryDelay: env.MAIL_RETRY_DELAY_SECONDS,
    retryBackoff: true,
    expireInSeconds: MAIL_ATTEMPT_SECONDS,
    // A queued e-mail waits at most this long for a mail server that stays down.
    retentionDays: 7,
  };
}

/** The earliest and latest wait before retry n (1-based), in seconds, as pg-boss computes it. */
export function retryWindowSeconds(n: number, delaySeconds: number): [number, number] {
  const base = (delaySeconds * 2 ** Math.min(16, n)) / 2;
  return [base, base * 2];
}

/** A pg-boss instance with Bendwise's settings. The app's only queues jobs; a worker's also keeps the tables tidy and runs the schedule. */
export function createBoss(connectionString: string, role: "app" | "worker", maxConnections = role === "app" ? 2 : 4): PgBoss {
  const boss = new PgBoss({
    connectionString,
    application_name: `bendwise-${role}`,
    max: maxConnections,
    // Only workers look after the tables and the weekly schedule; app processes only add jobs.
    supervise: role === "worker",
    schedule: role === "worker",
    archiveCompletedAfterSeconds: 60 * 60,
    deleteAfterHours: 1,
  });
  boss.on("error", (error) => console.error(`[mail queue] ${error.message}`));
  return boss;
}

/** The queues exist before anything is sent to them (pg-boss 10 asks for that); safe to call again. */
export async function ensureQueues(boss: PgBoss): Promise<void> {
  await boss.createQueue(MAIL_QUEUE);
  // One summary run at a time, whatever the number of workers.
  await boss.createQueue(WEEKLY_SUMMARY_QUEUE, { name: WEEKLY_SUMMARY_QUEUE, policy: "singleton", retryLimit: 3, retryDelay: 60, retryBackoff: true });
}

let appBoss: Promise<PgBoss> | undefined;

/** This process's queue connection, started on first use (and started again after a failed start). */
export function mailQueue(): Promise<PgBoss> {
  appBoss ??= (async () => {
    const boss = createBoss(serverEnv().DATABASE_URL, "app");
    await boss.start();
    await ensureQueues(boss);
    return boss;
  })().catch((error) => {
    appBoss = undefined;
    throw error;
  });
  return appBoss;
}

/** Installs pg-boss's tables and our queues in a database (npm start and npm test do it with the migrations). */
export async function installQueue(connectionString: string): Promise<void> {
  const boss = new PgBoss({ connectionString, max: 1, supervise: false, schedule: false, application_name: "bendwise-migrate" });
  await boss.start();
  await ensureQueues(boss);
  await boss.stop({ graceful: false, wait: true });
}

/** Stops this process's queue connection (tests, orderly shutdown). */
export async function closeMailQueue(): Promise<void> {
  const pending = appBoss;
  appBoss = undefined;
  if (pending) await (await pending).stop({ graceful: false, wait: true });
}
