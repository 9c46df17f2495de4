// Helpers for integration tests that act as a signed-in person: real Requests, real session cookies
// (obtained by signing in through Auth's own /auth/* route), route modules called directly.
//
//   const cookie = await sessionCookieFor("teacher");
//   const res = await runLoader(teachLoader, get("/teach", { cookie }));
//   expect(res.status).toBe(200);
import { eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { users } from "~/db/schema.server";
import { demoSignIns } from "../../drizzle/scripts/seed";
import * as authRoute from "~/routes/auth.$";

export const appUrl = (process.env.APP_URL ?? "http://127.0.0.1:3000").replace(/\/$/, "");
export type DemoPerson = keyof typeof demoSignIns;

/** A GET as a browser sends it, optionally with cookies. */
export function get(path: string, options: { cookie?: string; headers?: Record<string, string> } = {}): Request {
  const headers = new Headers(options.headers);
  if (options.cookie) headers.set("cookie", options.cookie);
  return new Request(`${appUrl}${path}`, { headers });
}

/** A form post as a browser sends it from one of our own pages (Origin and Sec-Fetch-Site: same-origin). */
export function post(
  path: string,
  fields: Record<string, string>,
  options: { cookie?: string; origin?: string; fetchSite?: string | null; headers?: Record<string, string> } = {},
): Request {
  const headers = new Headers(options.headers);
  headers.set("content-type", "application/x-www-form-urlencoded");
  headers.set("origin", options.origin ?? appUrl);
  if (options.fetchSite !== null) headers.set("sec-fetch-site", options.fetchSite ?? "same-origin");
  if (options.cookie) headers.set("cookie", options.cookie);
  return new Request(`${appUrl}${path}`, { method: "POST", headers, body: new URLSearchParams(fields) });
}

export interface RouteResult {
  status: number;
  headers: Headers;
  /** Where a redirect points (path and query only, for same-site redirects). */
  location: string | null;
  /** Loader or action data, a Response's text, or a thrown response's text. */
  body: unknown;
  setCookies: string[];
}

async function normalise(value: unknown): Promise<RouteResult> {
  if (value instanceof Response) {
    const location = value.headers.get("location");
    const text = value.body ? await value.clone().text() : "";
    let body: unknown = text;
    if ((value.headers.get("content-type") ?? "").includes("json")) body = JSON.parse(text || "null");
    return {
      status: value.status,
      headers: value.headers,
      location: location ? location.replace(appUrl, "") : null,
      body,
      setCookies: value.headers.getSetCookie(),
    };
  }
  if (value && typeof value === "object" && (value as { type?: string }).type === "DataWithResponseInit") {
    const { data, init } = value as { data: unknown; init?: ResponseInit | null };
    const headers = new Headers(init?.headers);
    return { status: init?.status ?? 200, headers, location: headers.get("location"), body: data, setCookies: headers.getSetCookie() };
  }
  return { status: 200, headers: new Headers(), location: null, body: value, setCookies: [] };
}

type RouteFunction = (args: never) => unknown;

/** Calls a loader or action as React Router would; thrown responses become results, real errors fail the test. */
export async function runRoute(fn: RouteFunction, request: Request, params: Record<string, string> = {}): Promise<RouteResult> {
  try {
    return await normalise(await fn({ request, params, context: {} } as never));
  } catch (thrown) {
    if (thrown instanceof Response || (thrown && typeof thrown === "object" && (thrown as { type?: string }).type === "DataWithResponseInit")) {
      return normalise(thrown);
    }
    throw thrown;
  }
}
export const runLoader = runRoute;
export const runAction = runRoute;

/** "name=value; name2=value2" from Set-Cookie headers (dropping cookies being cleared). */
export function cookieHeaderFrom(setCookies: string[], existing = ""): string {
  const jar = new Map(existing.split(/;\s*/).filter(Boolean).map((c) => c.split(/=(.*)/s).slice(0, 2) as [string, string]));
  for (const line of setCookies) {
    const [pair, ...attributes] = line.split(/;\s*/);
    const [name, value] = pair.split(/=(.*)/s);
    const expired = attributes.some((a) => /^max-age=0$/i.test(a) || (/^expires=/i.test(a) && Date.parse(a.slice(8)) < Date.now()));
    if (expired || value === "") jar.delete(name);
    else jar.set(name, value);
  }
  return [...jar].map(([n, v]) => `${n}=${v}`).join("; ");
}

/**
 * Signs a demo person in through Auth's own endpoints, as a browser without our pages would:
 * GET /auth/csrf for the double-submit token, then POST /auth/callback/<provider>. Returns the Cookie header.
 */
export async function sessionCookieFor(person: DemoPerson): Promise<string> {
  const csrf = await runRoute(authRoute.loader as RouteFunction, get("/auth/csrf"));
  const csrfCookie = cookieHeaderFrom(csrf.setCookies);
  const { csrfToken } = csrf.body as { csrfToken: string };
  const who = demoSignIns[person] as { email?: string; code?: string; username?: string; password: string };
  const fields: Record<string, string> = who.email
    ? { csrfToken, email: who.email, password: who.password }
    : { csrfToken, code: who.code!, username: who.username!, password: who.password };
  const provider = who.email ? "adult-password" : "student-password";
  const signedIn = await runRoute(authRoute.action as RouteFunction, post(`/auth/callback/${provider}`, fields, { cookie: csrfCookie }));
  const cookie = cookieHeaderFrom(signedIn.setCookies, csrfCookie);
  if (!cookie.includes("authjs.session-token")) {
    throw new Error(`${person} could not sign in (status ${signedIn.status}, to ${signedIn.location})`);
  }
  return cookie;
}

/** A demo person's user id. */
export async function userIdOf(person: DemoPerson): Promise<string> {
  const who = demoSignIns[person] as { email?: string; username?: string };
  const [row] = await db
    .select({ id: users.id })
    .from(users)
    .where(who.email ? eq(users.email, who.email) : eq(users.username, who.username!));
  return row.id;
}
