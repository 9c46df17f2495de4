// One database client per process. postgres.js connects lazily, so importing this is cheap.
import { drizzle } from "drizzle-orm/postgres-js";
import postgres from "postgres";
import { serverEnv } from "~/env.server";
import * as schema from "./schema.server";

/**
 * Statements sent by this process, counted at the driver. Tests and the benchmark read it to check
 * that a page runs a bounded number of queries (no query per student or per lesson).
 */
export const sqlStatements = { count: 0 };

const sqlClient = postgres(serverEnv().DATABASE_URL, {
  max: 10,
  debug: () => {
    sqlStatements.count++;
  },
  onnotice: () => {},
  // Keep connections short-lived so a restarted PostgreSQL is picked up again.
  idle_timeout: 20,
  connect_timeout: 10,
});

export const db = drizzle(sqlClient, { schema });
export type Database = typeof db;
export { sqlClient };
