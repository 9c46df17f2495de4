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

// Drizzle asks postgres.js for unnamed statements. For a statement with parameters postgres.js then
// first asks the server for the parameter types (a round trip of its own) and the server parses and
// plans the text again every time. Named (prepared) statements, postgres.js's own default, are parsed
// once per connection and run in one round trip after that: about half the waiting per query.
// Connections are recycled after 20 idle seconds, so the statements a connection keeps stay few.
const unsafe = sqlClient.unsafe.bind(sqlClient);
sqlClient.unsafe = ((query: string, parameters?: unknown[], options?: { prepare?: boolean }) =>
  unsafe(query, parameters as never, { ...options, prepare: true })) as typeof sqlClient.unsafe;

export const db = drizzle(sqlClient, { schema });
export type Database = typeof db;
export { sqlClient };
