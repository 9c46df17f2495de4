// Random and malformed input (fast-check) to every form action and every JSON route in app/routes.ts,
// called as React Router would call them (real Requests, real session cookies, the same-origin headers
// our pages send). Two properties, for every request:
//   1. never a 500: the route answers (or throws) a Response below 500; a thrown Error would be a 500;
//   2. a refused request changes nothing: when the answer is 4xx, or a redirect to sign in, the row
//      count and an md5 checksum of every table are the same after as before.
// "Changed" leaves out two tables whose job is to record refusals: sign_in_failures (the sign-in
// throttle counts wrong passwords) and rate_limits (the public API counts requests per address). The
// mail queue (schema pgboss) is left out too: its worker updates it in the background.
//
// Each route has a line in FUZZ_TARGETS: the address, and who posts (the persona that may use it, and
// a signed-out visitor). A route with an action and no line fails the first test. The intents and field
// names are read from the route's own source (name="…", value="…", z.literal("…"), case "…",
// .get("…")), so fuzzing follows the forms as they change.
import { readFileSync } from "node:fs";
import path from "node:path";
import fc from "fast-check";
import { beforeAll, describe, expect, it } from "vitest";
import type { RouteConfigEntry } from "@react-router/dev/routes";
import routes from "~/routes";
import { db } from "~/db/client.server";
import { classes } from "~/db/schema.server";
import { eq } from "drizzle-orm";
import { changedTables, snapshotter, type Snapshot } from "./db-snapshot";
import { appUrl, runRoute, sessionCookieFor, userIdOf, type DemoPerson } from "./auth-helpers";

const RUNS = Number(process.env.FUZZ_RUNS ?? 20);
const NO_SUCH_ID = "00000000-0000-4000-8000-000000000000";
type Ids = { mapleClass: string; amira: string; juno: string };
type Who = DemoPerson | "anon";
type Target = { url: (ids: Ids) => string; who: Who[]; json?: boolean };

const t = (url: string | ((ids: Ids) => string), who: Who[], json = false): Target => ({ url: typeof url === "string" ? () => url : url, who, json });

/** Every route with an action (and the JSON routes), with who posts to it. */
const FUZZ_TARGETS: Record<string, Target> = {
  "/api/analysis": t("/api/analysis", ["anon"], true),
  "/api/payments/webhook": t("/api/payments/webhook", ["anon"], true),
  "/auth/*": t("/auth/callback/student-password", ["anon"]),
  "/family/children/:childId/delete": t((i) => `/family/children/${i.juno}/delete`, ["parent", "anon"]),
  "/family/children/:childId": t((i) => `/family/children/${i.juno}`, ["parent", "anon"]),
  "/family/children/new": t("/family/children/new", ["parent", "anon"]),
  "/family/lessons/:slug": t("/family/lessons/02-force-and-deformation", ["parent", "anon"]),
  "/family/lessons": t("/family/lessons", ["parent", "anon"]),
  "/family/seats": t("/family/seats", ["parent", "anon"]),
  "/family": t("/family", ["parent", "anon"]),
  "/join/family/confirm": t("/join/family/confirm?token=not-a-real-token-0123456789", ["anon"]),
  "/join/family": t("/join/family", ["anon"]),
  "/join/teacher": t("/join/teacher?token=not-a-real-token-0123456789", ["anon"]),
  "/learn/:slug": t("/learn/02-force-and-deformation", ["student", "anon"]),
  "/mail/weekly-summary": t("/mail/weekly-summary?token=not-a-real-token", ["anon"]),
  "/payments/stopped": t(`/payments/stopped?purchase=${NO_SUCH_ID}`, ["schoolAdmin", "anon"]),
  "/reset-password/:token": t("/reset-password/not-a-real-token-0123456789", ["anon"]),
  "/reset-password": t("/reset-password", ["anon"]),
  "/school/seats/buy": t("/school/seats/buy", ["schoolAdmin", "anon"]),
  "/school/students/:studentId/delete": t((i) => `/school/students/${i.amira}/delete`, ["schoolAdmin", "anon"]),
  "/school/teachers": t("/school/teachers", ["schoolAdmin", "anon"]),
  "/sign-in/link": t("/sign-in/link", ["anon"]),
  "/sign-in": t("/sign-in", ["anon"]),
  "/sign-out": t("/sign-out", ["secondStudent", "anon"]),
  "/teach/classes/:classId/assignments": t((i) => `/teach/classes/${i.mapleClass}/assignments`, ["teacher", "anon"]),
  "/teach/classes/:classId/lessons/:slug": t((i) => `/teach/classes/${i.mapleClass}/lessons/02-force-and-deformation`, ["teacher", "anon"]),
  "/teach/classes/:classId/roster": t((i) => `/teach/classes/${i.mapleClass}/roster`, ["teacher", "anon"]),
  "/teach/classes/:classId/settings": t((i) => `/teach/classes/${i.mapleClass}/settings`, ["teacher", "anon"]),
  "/teach/classes/:classId/students/:studentId": t((i) => `/teach/classes/${i.mapleClass}/students/${i.amira}`, ["teacher", "anon"]),
  "/teach/classes": t("/teach/classes", ["teacher", "anon"]),
  "/tools/analyse": t("/tools/analyse", ["anon"]),
};

/** JSON routes read with GET: random query strings and path parameters. */
const JSON_GETS: Record<string, { url: (ids: Ids, junk: string) => string; who: Who[] }> = {
  "/api/payments/status": { url: (_i, junk) => `/api/payments/status?purchase=${encodeURIComponent(junk)}`, who: ["schoolAdmin", "parent", "anon"] },
  "/api/teach/classes/:classId/gradebook": { url: (_i, junk) => `/api/teach/classes/${encodeURIComponent(junk)}/gradebook`, who: ["teacher", "anon"] },
  "/api/ping": { url: (_i, junk) => `/api/ping?${encodeURIComponent(junk)}`, who: ["anon"] },
  "/healthz": { url: (_i, junk) => `/healthz?${encodeURIComponent(junk)}`, who: ["anon"] },
  "/lesson-code/:file": { url: (_i, junk) => `/lesson-code/${encodeURIComponent(junk)}`, who: ["student", "anon"] },
  "/photos/:id": { url: (_i, junk) => `/photos/${encodeURIComponent(junk)}`, who: ["student", "anon"] },
};

/** Tables whose purpose is to record refused requests (see the top of the file). */
const RECORDS_REFUSALS = new Set(["sign_in_failures", "rate_limits"]);
/**
 * Refusals that keep something on purpose, each with why: route pattern → tables it may touch.
 * A hand-in with an empty claim, evidence or reasoning is refused (400) but the text is kept as a
 * draft, so a student never loses what they wrote (app/routes/learn.lesson.tsx).
 */
const KEEPS_ON_REFUSAL: Record<string, { when: (fields: [string, string][]) => boolean; tables: string[] }> = {
  "/learn/:slug": { when: (f) => f.some(([k, v]) => k === "intent" && v === "written-answer"), tables: ["written_answers", "lesson_visits"] },
};

function flatten(entries: RouteConfigEntry[], parent = ""): { pattern: string; file: string }[] {
  return entries.flatMap((entry) => {
    const joined = entry.index ? parent : [parent, entry.path ?? ""].filter(Boolean).join("/");
    return [{ pattern: `/${joined.replace(/^\/+/, "")}`, file: entry.file }, ...flatten(entry.children ?? [], joined)];
  });
}
const allRoutes = flatten(routes);
const load = (file: string) => import(path.resolve("app", file)) as Promise<Record<string, unknown>>;

/** Intents, values and field names the route's own source mentions. */
function vocabulary(file: string): { names: string[]; words: string[] } {
  const source = readFileSync(path.resolve("app", file), "utf8");
  const grab = (re: RegExp) => [...source.matchAll(re)].map((m) => m[1]);
  const names = new Set([...grab(/name="([\w.[\]-]+)"/g), ...grab(/\.get(?:All)?\("([\w.[\]-]+)"\)/g), ...grab(/^\s+(\w+): z\./gm), "intent"]);
  const words = new Set([...grab(/value="([^"{}]{1,60})"/g), ...grab(/z\.literal\("([^"]{1,60})"\)/g), ...grab(/case "([^"]{1,60})":/g), ...grab(/z\.enum\(\[([^\]]+)\]/g).flatMap((l) => [...l.matchAll(/"([^"]+)"/g)].map((m) => m[1]))]);
  return { names: [...names], words: [...words] };
}

const junkValue = (words: string[]) =>
  fc.oneof(
    { weight: 3, arbitrary: fc.constantFrom(...words, "") },
    { weight: 2, arbitrary: fc.string({ maxLength: 30 }) },
    { weight: 1, arbitrary: fc.string({ unit: "grapheme", maxLength: 30 }) },
    { weight: 1, arbitrary: fc.integer({ min: -1_000_000, max: 1_000_000 }).map(String) },
    { weight: 1, arbitrary: fc.double({ noNaN: false }).map(String) },
    { weight: 1, arbitrary: fc.uuid().map(String) },
    { weight: 1, arbitrary: fc.constantFrom("x".repeat(20_000), "NaN", "-0", "1e309", "12 cm", "0.5 N/cm", "<script>alert(1)</script>", "' or 1=1 --", "../../etc/passwd", "\u0000", "2026-02-30T25:61", "  ") },
  );

type Body =
  | { kind: "form"; fields: [string, string][] }
  | { kind: "json"; text: string }
  | { kind: "text"; text: string; contentType: string }
  | { kind: "multipart"; text: string; boundary: string | null };

function bodyArbitrary(names: string[], words: string[]): fc.Arbitrary<Body> {
  const field = fc.tuple(fc.oneof(fc.constantFrom(...names), fc.string({ maxLength: 12 })), junkValue(words));
  const form = fc
    .record({ intent: fc.option(junkValue(words), { nil: undefined }), fields: fc.array(field, { maxLength: 10 }) })
    .map(({ intent, fields }): Body => ({ kind: "form", fields: intent === undefined ? fields : [["intent", intent], ...fields] }));
  const json = fc.oneof(fc.json(), fc.jsonValue().map((v) => JSON.stringify(v)), fc.string()).map((text): Body => ({ kind: "json", text }));
  const text = fc
    .tuple(fc.string({ maxLength: 200 }), fc.constantFrom("text/plain", "application/xml", "application/x-www-form-urlencoded", "application/octet-stream", ""))
    .map(([text, contentType]): Body => ({ kind: "text", text, contentType }));
  const multipart = fc
    .tuple(fc.array(field, { maxLength: 5 }), fc.constantFrom("ok", "no-boundary", "truncated", "wrong-boundary"))
    .map(([fields, flaw]): Body => {
      const boundary = "----bendwisefuzz";
      let text = fields.map(([k, v]) => `--${boundary}\r\nContent-Disposition: form-data; name="${k.replace(/"/g, "")}"\r\n\r\n${v}\r\n`).join("") + `--${boundary}--\r\n`;
      if (flaw === "truncated") text = text.slice(0, Math.max(1, Math.floor(text.length / 2)));
      if (flaw === "wrong-boundary") text = text.replaceAll(boundary, "----other");
      return { kind: "multipart", text, boundary: flaw === "no-boundary" ? null : boundary };
    });
  return fc.oneof({ weight: 6, arbitrary: form }, { weight: 1, arbitrary: json }, { weight: 1, arbitrary: text }, { weight: 1, arbitrary: multipart });
}

function requestFor(url: string, body: Body, cookie: string | undefined): Request {
  const headers = new Headers({ origin: appUrl, "sec-fetch-site": "same-origin" });
  if (cookie) headers.set("cookie", cookie);
  let payload: string | URLSearchParams;
  switch (body.kind) {
    case "form":
      headers.set("content-type", "application/x-www-form-urlencoded");
      payload = new URLSearchParams(body.fields);
      break;
    case "json":
      headers.set("content-type", "application/json");
      payload = body.text;
      break;
    case "text":
      if (body.contentType) headers.set("content-type", body.contentType);
      payload = body.text;
      break;
    case "multipart":
      headers.set("content-type", body.boundary ? `multipart/form-data; boundary=${body.boundary}` : "multipart/form-data");
      payload = body.text;
      break;
  }
  return new Request(`${appUrl}${url}`, { method: "POST", headers, body: payload });
}

let snapshot: () => Promise<Snapshot>;

function matchParams(pattern: string, pathname: string): Record<string, string> {
  const regex = new RegExp(`^${pattern.replace(/\/\*$/, "/(?<splat>.*)").replace(/:(\w+)/g, (_, name) => `(?<${name}>[^/]+)`)}$`);
  const groups = regex.exec(pathname)?.groups ?? {};
  return Object.fromEntries(Object.entries(groups).map(([k, v]) => [k === "splat" ? "*" : k, decodeURIComponent(v)]));
}

const cookies: Partial<Record<Who, string>> = {};
let ids: Ids;

beforeAll(async () => {
  for (const who of new Set(Object.values(FUZZ_TARGETS).flatMap((target) => target.who).concat(Object.values(JSON_GETS).flatMap((g) => g.who)))) {
    if (who !== "anon") cookies[who] = await sessionCookieFor(who);
  }
  const [mapleClass] = await db.select({ id: classes.id }).from(classes).where(eq(classes.signInCode, "MAPLE7A"));
  ids = { mapleClass: mapleClass.id, amira: await userIdOf("student"), juno: await userIdOf("child") };
  snapshot = await snapshotter(RECORDS_REFUSALS);
}, 120_000);

describe("fuzzing", () => {
  it("has a target for every route with an action, and for every JSON route", async () => {
    const missing: string[] = [];
    for (const { pattern, file } of allRoutes) {
      const module = await load(file);
      if (typeof module.action === "function" && !(pattern in FUZZ_TARGETS)) missing.push(pattern);
      if (!module.default && typeof module.loader === "function" && pattern.startsWith("/api/") && !(pattern in FUZZ_TARGETS) && !(pattern in JSON_GETS)) missing.push(pattern);
    }
    expect(missing, "add these routes to FUZZ_TARGETS or JSON_GETS in tests/integration/fuzz-actions.test.ts").toEqual([]);
  });

  for (const { pattern, file } of allRoutes) {
    const target = FUZZ_TARGETS[pattern];
    if (!target) continue;
    for (const who of target.who) {
      it(`POST ${pattern} as ${who}: never a 500, and a refusal changes no row`, async () => {
        const module = await load(file);
        const action = module.action as (args: never) => unknown;
        const { names, words } = vocabulary(file);
        const url = target.url(ids);
        const params = matchParams(pattern, new URL(url, appUrl).pathname);
        await fc.assert(
          fc.asyncProperty(bodyArbitrary(names, words), async (body) => {
            const before = await snapshot();
            const result = await runRoute(action, requestFor(url, body, cookies[who]), params);
            expect(result.status, `${who} posting ${JSON.stringify(body).slice(0, 300)}`).toBeLessThan(500);
            const refused = result.status >= 400 || (result.status >= 300 && (result.location ?? "").startsWith("/sign-in"));
            if (!refused) return;
            const keeps = body.kind === "form" && KEEPS_ON_REFUSAL[pattern]?.when(body.fields) ? KEEPS_ON_REFUSAL[pattern].tables : [];
            const changed = changedTables(before, await snapshot()).filter((table) => !keeps.includes(table));
            expect(changed, `a refused post (${result.status}) to ${pattern} changed these tables: ${JSON.stringify(body).slice(0, 300)}`).toEqual([]);
          }),
          { numRuns: RUNS, endOnFailure: true },
        );
      }, 180_000);
    }
  }

  for (const { pattern, file } of allRoutes) {
    const target = JSON_GETS[pattern];
    if (!target) continue;
    for (const who of target.who) {
      it(`GET ${pattern} as ${who} with random addresses: never a 500, nothing changed`, async () => {
        const module = await load(file);
        const loader = module.loader as (args: never) => unknown;
        await fc.assert(
          fc.asyncProperty(fc.oneof(fc.string({ maxLength: 60 }), fc.string({ unit: "grapheme", maxLength: 30 }), fc.uuid().map(String), fc.constant(NO_SUCH_ID)), async (junk) => {
            const before = await snapshot();
            const url = target.url(ids, junk || "x");
            const headers = new Headers(cookies[who] ? { cookie: cookies[who]! } : {});
            const result = await runRoute(loader, new Request(`${appUrl}${url}`, { headers }), matchParams(pattern, new URL(url, appUrl).pathname));
            expect(result.status, `${who} GET ${url}`).toBeLessThan(500);
            expect(changedTables(before, await snapshot())).toEqual([]);
          }),
          { numRuns: RUNS },
        );
      }, 180_000);
    }
  }
});
