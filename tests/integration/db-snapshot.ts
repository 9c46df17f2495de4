// Row counts and an md5 checksum of every table, to prove that a request changed nothing (or that a
// restored database holds exactly what was backed up). Order-independent: each row is hashed as text,
// the hashes sorted and hashed again.
import { sql } from "drizzle-orm";
import postgres from "postgres";
import { db } from "~/db/client.server";

export type Snapshot = Map<string, { rows: number; md5: string }>;

function tableQuery(schema: string, table: string): string {
  const name = `"${schema}"."${table}"`;
  return `select '${schema}.${table}' as t, count(*)::int as n, coalesce(md5(string_agg(md5(x::text), '' order by md5(x::text))), '') as h from ${name} x`;
}

async function listTables(run: (text: string) => Promise<Record<string, unknown>[]>, schemas: string[]): Promise<{ schema: string; table: string }[]> {
  const rows = await run(
    `select table_schema as s, table_name as t from information_schema.tables where table_type = 'BASE TABLE' and table_schema in (${schemas.map((s) => `'${s}'`).join(", ")}) order by 1, 2`,
  );
  return rows.map((r) => ({ schema: String(r.s), table: String(r.t) }));
}

/** A snapshot function for the app's own database (schema public), leaving out `skip` tables. */
export async function snapshotter(skip: Iterable<string> = []): Promise<() => Promise<Snapshot>> {
  const leaveOut = new Set(skip);
  const run = async (text: string) => (await db.execute(sql.raw(text))) as unknown as Record<string, unknown>[];
  const tables = (await listTables(run, ["public"])).filter((t) => !leaveOut.has(t.table));
  const query = tables.map((t) => tableQuery(t.schema, t.table)).join(" union all ");
  return async () => new Map(((await run(query)) as { t: string; n: number; h: string }[]).map((r) => [r.t.replace(/^public\./, ""), { rows: r.n, md5: r.h }]));
}

/** Every table of every schema Bendwise keeps (the app's, Drizzle's migrations, the mail queue's) in any database. */
export async function snapshotDatabase(url: string): Promise<Snapshot> {
  const client = postgres(url, { max: 1, onnotice: () => {} });
  try {
    const run = (text: string) => client.unsafe(text) as unknown as Promise<Record<string, unknown>[]>;
    const tables = await listTables(run, ["public", "drizzle", "pgboss"]);
    const rows = (await run(tables.map((t) => tableQuery(t.schema, t.table)).join(" union all "))) as { t: string; n: number; h: string }[];
    return new Map(rows.map((r) => [r.t, { rows: r.n, md5: r.h }]));
  } finally {
    await client.end();
  }
}

export function changedTables(before: Snapshot, after: Snapshot): string[] {
  const names = new Set([...before.keys(), ...after.keys()]);
  return [...names].filter((t) => before.get(t)?.md5 !== after.get(t)?.md5 || before.get(t)?.rows !== after.get(t)?.rows);
}
