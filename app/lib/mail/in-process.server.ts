// A mail worker inside this process, for integration tests (BENDWISE_MAIL_WORKER=in-process): sendMail
// starts it on first use and wakes it for every e-mail, so mail reaches the catcher at once. Its own
// module, loaded only on demand, so the app's server bundle never starts one by accident. Small (one
// slot, two connections): many test files run at once against one PostgreSQL.
import { startMailWorker, type MailWorker } from "./worker.server";

let inProcess: Promise<MailWorker> | undefined;

export function inProcessMailWorker(): Promise<MailWorker> {
  inProcess ??= startMailWorker({ schedule: false, pollingIntervalSeconds: 0.5, concurrency: 1, maxConnections: 2, log: () => {} }).catch((error) => {
    inProcess = undefined;
    throw error;
  });
  return inProcess;
}
