// Helpers for the family and e-mail tests: sign anyone in through Auth's own endpoints (not only the
// demo people), read the mail catcher, find a link in an e-mail, and look for an id in every table.
import { sql } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import * as authRoute from "~/routes/auth.$";
import { listCaughtMail, type CaughtMail } from "../fakes/mail-catcher";
import { appUrl, cookieHeaderFrom, get, post, runRoute } from "./auth-helpers";

type RouteFunction = (args: never) => unknown;

/** Signs in through Auth's own /auth/* endpoints: an adult by e-mail, or a student by code and username. Null when refused. */
export async function signInWith(who: { email: string; password: string } | { code: string; username: string; password: string }): Promise<string | null> {
  const csrf = await runRoute(authRoute.loader as RouteFunction, get("/auth/csrf"));
  const csrfCookie = cookieHeaderFrom(csrf.setCookies);
  const { csrfToken } = csrf.body as { csrfToken: string };
  const provider = "email" in who ? "adult-password" : "student-password";
  const signedIn = await runRoute(authRoute.action as RouteFunction, post(`/auth/callback/${provider}`, { csrfToken, ...who }, { cookie: csrfCookie }));
  const cookie = cookieHeaderFrom(signedIn.setCookies, csrfCookie);
  return cookie.includes("authjs.session-token") ? cookie : null;
}

/** The session cookie a route's redirect set (e.g. after confirming an address). */
export function sessionFrom(setCookies: string[]): string {
  return cookieHeaderFrom(setCookies);
}

const mailPort = () => {
  const port = Number(process.env.BENDWISE_MAIL_WEB_PORT);
  if (!port) throw new Error("BENDWISE_MAIL_WEB_PORT is not set: run through npm test");
  return port;
};

/** The e-mails to one address (with this subject, if given), waiting up to `timeoutMs` for at least `count` of them. */
export async function mailsTo(address: string, count = 1, timeoutMs = 8000, subject?: string, webPort = mailPort()): Promise<CaughtMail[]> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const mine = (await listCaughtMail(webPort)).filter(
      (m) => m.to.some((t) => t.address.toLowerCase() === address.toLowerCase()) && (subject === undefined || m.subject === subject),
    );
    if (mine.length >= count || Date.now() > deadline) return mine;
    await new Promise((r) => setTimeout(r, 100));
  }
}

/** The path and query of the first link to `path` in an e-mail's plain text. */
export function linkIn(mail: CaughtMail, path: string): string {
  const escaped = `${appUrl}${path}`.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
  const match = new RegExp(`${escaped}[A-Za-z0-9_\\-?=&.%]*`).exec(mail.text ?? "");
  if (!match) throw new Error(`no link to ${path} in: ${mail.text}`);
  return match[0].replace(appUrl, "");
}

export interface Sighting {
  table: string;
  column: string;
  type: string;
  rows: number;
}

/**
 * Every place in the database where `id` appears: each base table of every schema (ours and the mail
 * queue's), found through information_schema, searched in each uuid column for the id and in each
 * text, varchar, json and jsonb column for the id inside the text.
 */
export async function findIdEverywhere(db: Database, id: string): Promise<{ sightings: Sighting[]; tables: string[]; uuidColumns: number }> {
  if (!/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/.test(id)) throw new Error(`not a uuid: ${id}`);
  const tables = await db.execute<{ table_schema: string; table_name: string }>(sql`
    select table_schema, table_name from information_schema.tables
    where table_type = 'BASE TABLE' and table_schema not in ('pg_catalog', 'information_schema')
    order by table_schema, table_name`);
  const columns = await db.execute<{ table_schema: string; table_name: string; column_name: string; data_type: string }>(sql`
    select table_schema, table_name, column_name, data_type from information_schema.columns
    where table_schema not in ('pg_catalog', 'information_schema') and data_type in ('uuid', 'text', 'character varying', 'json', 'jsonb')`);
  const sightings: Sighting[] = [];
  const q = (name: string) => `"${name.replace(/"/g, '""')}"`;
  for (const t of tables) {
    for (const c of columns.filter((c) => c.table_schema === t.table_schema && c.table_name === t.table_name)) {
      const condition = c.data_type === "uuid" ? `${q(c.column_name)} = '${id}'::uuid` : `${q(c.column_name)}::text like '%${id}%'`;
      const [row] = await db.execute<{ n: number }>(sql.raw(`select count(*)::int as n from ${q(t.table_schema)}.${q(t.table_name)} where ${condition}`));
      if (row.n > 0) sightings.push({ table: `${t.table_schema}.${t.table_name}`, column: c.column_name, type: c.data_type, rows: row.n });
    }
  }
  return {
    sightings,
    tables: tables.map((t) => `${t.table_schema}.${t.table_name}`),
    uuidColumns: columns.filter((c) => c.data_type === "uuid").length,
  };
}
