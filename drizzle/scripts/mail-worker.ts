// The mail worker as a process of its own: `npm start` runs one beside the app; on other machines run
// `npm run mail:worker` (the same build, with DATABASE_URL, SMTP_URL, APP_URL, AUTH_SECRET and
// MAIL_FROM set) as many times as wanted — they share the queue in PostgreSQL.
// `npm run mail:weekly` queues this week's summaries now (again, if they went out already) and ends;
// a running worker sends them.
//
// It loads the production build's server bundle (BENDWISE_BUILD_DIR, default build/) rather than the
// sources, so it runs the very code the app runs, lessons included. Run `npm run build` first.
import { existsSync } from "node:fs";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { persistentAuthSecret } from "./local-stack";
import { DB_USER, DEMO_PORT } from "./postgres";

type MailEntry = Pick<typeof import("~/entry.server"), "startMailWorker" | "weeklySummariesNow" | "closeMailConnections">;

// Run by hand next to `npm start` (e.g. `npm run mail:weekly`), the local demo's settings apply.
process.env.DATABASE_URL ??= `postgres://${DB_USER}@127.0.0.1:${process.env.BENDWISE_PG_PORT ?? DEMO_PORT}/bendwise`;
process.env.AUTH_SECRET ??= persistentAuthSecret(process.cwd());
process.env.APP_URL ??= `http://localhost:${process.env.PORT ?? 3000}`;

const serverFile = path.resolve(process.env.BENDWISE_BUILD_DIR ?? "build", "server", "index.js");
if (!existsSync(serverFile)) {
  console.error(`The mail worker needs the app's build (${serverFile} is missing). Run \`npm run build\` first.`);
  process.exit(1);
}
const build = (await import(pathToFileURL(serverFile).href)) as { entry: { module: MailEntry } };
const mail = build.entry.module;

if (process.argv.includes("--weekly-now")) {
  const { queued, skipped } = await mail.weeklySummariesNow({ force: true });
  console.log(`Weekly summaries queued: ${queued}${skipped ? ` (${skipped} skipped)` : ""}. The mail worker sends them.`);
  await mail.closeMailConnections();
  process.exit(0);
}

const worker = await mail.startMailWorker({});
console.log("[mail worker] taking e-mail from the queue in PostgreSQL; weekly summaries on their schedule.");
let stopping = false;
async function stop() {
  if (stopping) return;
  stopping = true;
  await worker.stop();
  await mail.closeMailConnections();
  console.log(`[mail worker] stopped (${worker.stats.delivered} e-mails delivered since start).`);
  process.exit(0);
}
process.on("SIGINT", () => void stop());
process.on("SIGTERM", () => void stop());
