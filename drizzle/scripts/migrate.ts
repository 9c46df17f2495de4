// Applies the committed SQL migrations in drizzle/ with Drizzle's migrator, then installs (or upgrades)
// the mail queue's own tables (pg-boss, schema "pgboss") and its queues.
import { drizzle } from "drizzle-orm/postgres-js";
import { migrate } from "drizzle-orm/postgres-js/migrator";
import path from "node:path";
import { fileURLToPath } from "node:url";
import postgres from "postgres";
import { installQueue } from "~/lib/mail/queue.server";

const migrationsFolder = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");

export async function runMigrations(databaseUrl: string) {
  const client = postgres(databaseUrl, { max: 1, onnotice: () => {} });
  try {
    await migrate(drizzle(client), { migrationsFolder });
  } finally {
    await client.end();
  }
  await installQueue(databaseUrl);
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error("Set DATABASE_URL to migrate a database by hand (npm start does it for you).");
  await runMigrations(url);
  console.log("Migrations applied.");
}
