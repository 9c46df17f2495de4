// The mail worker: takes e-mails off the queue and hands them to SMTP, one at a time per slot. A refused
// attempt throws, so pg-boss puts the job back with exponential backoff (queue.server.ts); a job
// whose worker died is given back after MAIL_ATTEMPT_SECONDS. It also runs the weekly summaries on
// their schedule. Any number of workers can share one database: each job is taken by one of them
// (SELECT … FOR UPDATE SKIP LOCKED inside pg-boss), and the summary run is a singleton queue.
//
// `npm start` runs one as its own process (drizzle/scripts/mail-worker.ts); on other machines run
// that script with the same DATABASE_URL, SMTP_URL, APP_URL and AUTH_SECRET.
import type PgBoss from "pg-boss";
import type { Transporter } from "nodemailer";
import { db } from "~/db/client.server";
import { serverEnv } from "~/env.server";
import { deliverNow, smtpTransport } from "~/lib/mailer.server";
import { MAIL_QUEUE, WEEKLY_SUMMARY_QUEUE, createBoss, ensureQueues, type MailJobData } from "./queue.server";
import { queueWeeklySummaries } from "./weekly.server";

export interface MailWorkerOptions {
  connectionString?: string;
  /** Where e-mail is handed over; SMTP_URL by default. */
  smtpUrl?: string;
  /** How many e-mails may be in flight at once in this process. */
  concurrency?: number;
  /** The queue's own connection pool (default 4). */
  maxConnections?: number;
  pollingIntervalSeconds?: number;
  /** Put the weekly summaries on their schedule (every long-running worker does; tests do not). */
  schedule?: boolean;
  log?: (line: string) => void;
}

export interface MailWorker {
  boss: PgBoss;
  /** Looks at the queue now instead of at the next poll. */
  wake(): void;
  /** Counts since start, for logs and tests. */
  stats: { delivered: number; failedAttempts: number };
  stop(): Promise<void>;
}

export async function startMailWorker(options: MailWorkerOptions = {}): Promise<MailWorker> {
  const env = serverEnv();
  const log = options.log ?? ((line: string) => console.log(`[mail worker] ${line}`));
  const boss = createBoss(options.connectionString ?? env.DATABASE_URL, "worker", options.maxConnections);
  await boss.start();
  await ensureQueues(boss);
  const transport: Transporter = smtpTransport(options.smtpUrl ?? env.SMTP_URL);
  const stats = { delivered: 0, failedAttempts: 0 };
  const workOptions = { batchSize: 1, includeMetadata: true as const, pollingIntervalSeconds: options.pollingIntervalSeconds ?? 1 };

  const ids: string[] = [];
  for (let slot = 0; slot < (options.concurrency ?? 3); slot++) {
    ids.push(
      await boss.work<MailJobData>(MAIL_QUEUE, workOptions, async ([job]) => {
        try {
          await deliverNow(job.data, transport);
          stats.delivered++;
        } catch (error) {
          stats.failedAttempts++;
          const attempt = job.retryCount + 1;
          const last = job.retryCount >= job.retryLimit;
          // The address stays out of the log; the job id finds the e-mail in the queue's tables.
          log(
            `e-mail ${job.id}: attempt ${attempt} of ${job.retryLimit + 1} failed (${(error as Error).message}); ` +
              (last ? "no tries left, it stays in the queue's archive as failed." : "it will be tried again after a growing wait."),
          );
          throw error;
        }
      }),
    );
  }

  ids.push(
    await boss.work(WEEKLY_SUMMARY_QUEUE, { pollingIntervalSeconds: 5 }, async () => {
      const result = await queueWeeklySummaries({ db });
      log(`weekly summaries queued: ${result.queued} (${result.skipped} had nothing to report or were sent already this week)`);
      return result;
    }),
  );
  if (options.schedule ?? true) {
    await boss.schedule(WEEKLY_SUMMARY_QUEUE, env.MAIL_WEEKLY_CRON, {}, { tz: env.MAIL_WEEKLY_TIME_ZONE });
  }

  return {
    boss,
    stats,
    wake: () => ids.forEach((id) => boss.notifyWorker(id)),
    async stop() {
      await boss.stop({ graceful: true, wait: true, timeout: 15_000 });
      transport.close();
    },
  };
}

/** The weekly summaries now (the demo command `npm run mail:weekly`); `force` sends this week's again. */
export function weeklySummariesNow(options: { force?: boolean } = {}) {
  return queueWeeklySummaries({ db }, options);
}

/** Closes this process's database and queue connections, so a one-off command can end. */
export async function closeMailConnections(): Promise<void> {
  const { closeMailQueue } = await import("./queue.server");
  const { sqlClient } = await import("~/db/client.server");
  await closeMailQueue();
  await sqlClient.end({ timeout: 5 });
}
