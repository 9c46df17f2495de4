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

// While PostgreSQL is down or starting (connections refused, ended, or "the database system is
// starting up"), a request cannot be answered, and saying so is a 503 with Retry-After, not a 500:
// the page or fetcher tells the person to try again in a moment, and nothing they saved is lost.
const UNREACHABLE = new Set([
  "ECONNREFUSED",
  "ECONNRESET",
  "ETIMEDOUT",
  "EHOSTUNREACH",
  "CONNECT_TIMEOUT",
  "CONNECTION_CLOSED",
  "CONNECTION_ENDED",
  "CONNECTION_DESTROYED",
  "57P01",
  "57P02",
  "57P03",
  "53300",
]);
export const DATABASE_UNAVAILABLE_MESSAGE =
  "Bendwise cannot reach its database just now. What you saved before is safe; please try again in a few seconds.";

/** PostgreSQL cannot be reached. Drizzle hands it on as the `cause` of its own DrizzleQueryError. */
class DatabaseUnavailable extends Error {
  constructor(cause: unknown) {
    super("PostgreSQL cannot be reached", { cause });
    this.name = "DatabaseUnavailable";
  }
}

function unavailableInstead(error: unknown): never {
  throw UNREACHABLE.has((error as { code?: string })?.code ?? "") ? new DatabaseUnavailable(error) : error;
}

/** The 503 every page, fetcher and JSON route answers while PostgreSQL cannot be reached. */
function databaseUnavailableResponse(): Response {
  return new Response(DATABASE_UNAVAILABLE_MESSAGE, {
    status: 503,
    statusText: "Service Unavailable",
    headers: { "Content-Type": "text/plain; charset=utf-8", "Retry-After": "5" },
  });
}

/** True for a DatabaseUnavailable (however wrapped) and for the 503 made from one. */
export function isDatabaseUnavailable(error: unknown): boolean {
  for (let e = error, depth = 0; e && depth < 5; e = (e as { cause?: unknown }).cause, depth++) {
    if (e instanceof DatabaseUnavailable) return true;
    if (e instanceof Response) return e.status === 503 && e.headers.get("Retry-After") !== null;
  }
  return false;
}

/** In a catch: the outage becomes the 503 response (React Router sends a thrown Response as it is); anything else goes on. */
export function rethrowAsUnavailable(error: unknown): never {
  throw isDatabaseUnavailable(error) ? databaseUnavailableResponse() : error;
}

async function runAgainAfterRestart<T>(run: () => PromiseLike<T>, tries = 1): Promise<T> {
  try {
    return await run();
  } catch (error) {
    if (tries < MAX_TRIES && ENDED_BY_THE_SERVER.has((error as { code?: string }).code ?? "")) return runAgainAfterRestart(run, tries + 1);
    return unavailableInstead(error);
  }
}

// A transaction that cannot even begin is the same outage.
const begin = sqlClient.begin.bind(sqlClient);
sqlClient.begin = ((...args: Parameters<typeof begin>) => (begin as (...a: unknown[]) => Promise<unknown>)(...args).catch(unavailableInstead)) as typeof sqlClient.begin;

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
