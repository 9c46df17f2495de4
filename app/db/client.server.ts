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
//
// When PostgreSQL restarts, each connection that sat idle in the pool learns it was closed only when it
// is next used: its next statement fails with 57P01 (admin_shutdown), seconds later perhaps. The server
// ended that connection before the statement ran (a statement caught mid-way is rolled back), so the
// statement is sent again, on a fresh connection: a restart costs the requests in flight during it and
// no more. Other errors are never retried (a write whose answer was lost might have been done).
const unsafe = sqlClient.unsafe.bind(sqlClient);
const ENDED_BY_THE_SERVER = new Set(["57P01", "57P02"]);
const MAX_TRIES = 12; // more than the pool's connections

async function runAgainAfterRestart<T>(run: () => PromiseLike<T>, tries = 1): Promise<T> {
  try {
    return await run();
  } catch (error) {
    if (tries < MAX_TRIES && ENDED_BY_THE_SERVER.has((error as { code?: string }).code ?? "")) return runAgainAfterRestart(run, tries + 1);
    throw error;
  }
}

sqlClient.unsafe = ((query: string, parameters?: unknown[], options?: Record<string, unknown>) => {
  // postgres.js's own calls (begin, savepoints) and drizzle's plain query() pass no `prepare`: left as they are.
  if (!options || !("prepare" in options)) return unsafe(query, parameters as never, options);
  const statement = () => unsafe(query, parameters as never, { ...options, prepare: true });
  // Drizzle's prepared queries either await the statement (rows as objects) or call .values() on it
  // (rows as arrays), nothing else; each try is a new statement made the same way.
  const asObjects = () => runAgainAfterRestart(statement);
  return {
    then: (onFulfilled?: (rows: unknown) => unknown, onRejected?: (error: unknown) => unknown) => asObjects().then(onFulfilled, onRejected),
    catch: (onRejected?: (error: unknown) => unknown) => asObjects().catch(onRejected),
    values: () => runAgainAfterRestart(() => statement().values()),
  };
}) as unknown as typeof sqlClient.unsafe;

export const db = drizzle(sqlClient, { schema });
export type Database = typeof db;
export { sqlClient };
