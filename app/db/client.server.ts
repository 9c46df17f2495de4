// One database client per process. postgres.js connects lazily, so importing this is cheap.
import { drizzle } from "drizzle-orm/postgres-js";
import postgres from "postgres";
import { serverEnv } from "~/env.server";
import * as schema from "./schema.server";

const sqlClient = postgres(serverEnv().DATABASE_URL, {
  max: 10,
  onnotice: () => {},
  // Keep connections short-lived so a restarted PostgreSQL is picked up again.
  idle_timeout: 20,
  connect_timeout: 10,
});

export const db = drizzle(sqlClient, { schema });
export type Database = typeof db;
export { sqlClient };
