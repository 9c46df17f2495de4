// Statements built once and prepared, for the few that run on nearly every request.
import type { Database } from "./client.server";

/**
 * A statement built once per database client and prepared, for the statements that run on nearly
 * every request (a lesson page, an answer check): drizzle then skips building the SQL text each time.
 * Give `build` placeholders (sql.placeholder("name")) and run the result with `.execute({ name })`.
 */
export function preparedOnce<T>(build: (db: Database) => T): (db: Database) => T {
  const made = new WeakMap<Database, T>();
  return (database) => {
    let statement = made.get(database);
    if (!statement) {
      statement = build(database);
      made.set(database, statement);
    }
    return statement;
  };
}
