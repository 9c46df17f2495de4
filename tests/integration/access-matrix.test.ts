// Every route in app/routes.ts, with the HTTP status each kind of visitor gets on a GET, checked by
// calling the route's loader (after the root loader) with a real Request carrying a real session
// cookie, obtained by signing in through Auth's own /auth/* endpoints. A route without a line here
// fails the test: add one line when you add a route. 302 = sent to sign in; 403 = refused with a
// reason; 404 = not found (another school's record is simply not found).
//
// It also posts cross-site to every route that has an action: each must answer 403 (assertSameOrigin).
import path from "node:path";
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import type { RouteConfigEntry } from "@react-router/dev/routes";
import routes from "~/routes";
import * as root from "~/root";
import { db } from "~/db/client.server";
import { classes } from "~/db/schema.server";
import { get, post, runRoute, sessionCookieFor, userIdOf } from "./auth-helpers";

const PERSONAS = ["anon", "schoolAdmin", "teacher", "student", "parent", "otherSchool"] as const;
type Persona = (typeof PERSONAS)[number];
type Ids = { mapleClass: string; harborClass: string; amira: string; juno: string };
type Row = { url: string | ((ids: Ids) => string); expect: Record<Persona, number> };

/** One line per route: the URL to request, then the status for each persona in PERSONAS order. */
const row = (url: Row["url"], ...statuses: [number, number, number, number, number, number]): Row => ({
  url,
  expect: Object.fromEntries(PERSONAS.map((p, i) => [p, statuses[i]])) as Record<Persona, number>,
});

const NO_SUCH_ID = "00000000-0000-4000-8000-000000000000";

// prettier-ignore
const matrix: Record<string, Row | Row[]> = {
  //                                  url                                          anon admin teach stud parent other
  "/":                          row("/",                                           200, 200, 200, 200, 200, 200),
  "/healthz":                   row("/healthz",                                    200, 200, 200, 200, 200, 200),
  "/favicon.ico":               row("/favicon.ico",                                301, 301, 301, 301, 301, 301),
  "/api/ping":                  row("/api/ping",                                   200, 200, 200, 200, 200, 200),
  "/auth/*":                    row("/auth/session",                               200, 200, 200, 200, 200, 200),
  "/sign-in":                   row("/sign-in?redirectTo=/teach",                  200, 200, 200, 200, 200, 200),
  "/sign-in/link":              row("/sign-in/link",                               200, 200, 200, 200, 200, 200),
  "/sign-out":                  row("/sign-out",                                   200, 200, 200, 200, 200, 200),
  "/reset-password":            row("/reset-password",                             200, 200, 200, 200, 200, 200),
  "/reset-password/:token":     row("/reset-password/not-a-real-token-0123456789", 200, 200, 200, 200, 200, 200),
  "/learn":                     row("/learn",                                      302, 403, 403, 200, 403, 403),
  "/teach":                     row("/teach",                                      302, 403, 200, 403, 403, 200),
  "/teach/classes/:classId": [
                                row((ids) => `/teach/classes/${ids.mapleClass}`,   302, 403, 302, 403, 403, 404),
                                row(`/teach/classes/${NO_SUCH_ID}`,                302, 403, 404, 403, 403, 404),
  ],
  "/school":                    row("/school",                                     302, 200, 403, 403, 403, 403),
  "/family":                    row("/family",                                     302, 403, 403, 403, 200, 403),
  "/learn/:slug": [
                                row("/learn/02-force-and-deformation",             302, 200, 200, 200, 200, 200),
                                row("/learn/99-no-such-lesson",                    302, 404, 404, 404, 404, 404),
  ],
  "/lesson-code/:file":         row("/lesson-code/99-nothing.0123456789abcdef0123.js", 404, 404, 404, 404, 404, 404),
  "/photos/:id":                row(`/photos/${NO_SUCH_ID}`,                       302, 404, 404, 404, 404, 404),
  "/api/analysis":              row("/api/analysis",                               405, 405, 405, 405, 405, 405),
  "/tools/analyse":             row("/tools/analyse",                              200, 200, 200, 200, 200, 200),
  "/school/seats":              row("/school/seats",                               302, 200, 403, 403, 403, 403),
  "/school/seats/buy":          row("/school/seats/buy",                           302, 200, 403, 403, 403, 403),
  "/family/seats":              row("/family/seats",                               302, 403, 403, 403, 200, 403),
  "/receipts/:purchaseId":      row(`/receipts/${NO_SUCH_ID}`,                     302, 404, 404, 404, 404, 404),
  "/payments/confirming":       row(`/payments/confirming?purchase=${NO_SUCH_ID}`, 302, 404, 404, 404, 404, 404),
  "/payments/stopped":          row(`/payments/stopped?purchase=${NO_SUCH_ID}`,    302, 404, 404, 404, 404, 404),
  "/api/payments/status":       row(`/api/payments/status?purchase=${NO_SUCH_ID}`, 401, 404, 404, 404, 404, 404),
  "/api/payments/webhook":      row("/api/payments/webhook",                       405, 405, 405, 405, 405, 405),
  // Teaching (issue 6): "teacher" teaches MAPLE7A; "otherSchool" teaches HARBOR8 at the other school.
  "/teach/classes":             row("/teach/classes",                              302, 403, 200, 403, 403, 200),
  "/teach/classes/:classId/roster": [
                                row((ids) => `/teach/classes/${ids.mapleClass}/roster`, 302, 403, 200, 403, 403, 404),
                                row((ids) => `/teach/classes/${ids.harborClass}/roster`, 302, 403, 404, 403, 403, 200),
  ],
  "/teach/classes/:classId/settings": row((ids) => `/teach/classes/${ids.mapleClass}/settings`, 302, 403, 200, 403, 403, 404),
  "/teach/classes/:classId/assignments": row((ids) => `/teach/classes/${ids.mapleClass}/assignments`, 302, 403, 200, 403, 403, 404),
  "/teach/classes/:classId/gradebook": [
                                row((ids) => `/teach/classes/${ids.mapleClass}/gradebook`, 302, 403, 200, 403, 403, 404),
                                row(`/teach/classes/${NO_SUCH_ID}/gradebook`,      302, 403, 404, 403, 403, 404),
  ],
  "/teach/classes/:classId/gradebook/csv": row((ids) => `/teach/classes/${ids.mapleClass}/gradebook/csv`, 302, 403, 200, 403, 403, 404),
  "/teach/classes/:classId/students/:studentId": [
                                row((ids) => `/teach/classes/${ids.mapleClass}/students/${ids.amira}`, 302, 403, 200, 403, 403, 404),
                                row((ids) => `/teach/classes/${ids.harborClass}/students/${ids.amira}`, 302, 403, 404, 403, 403, 404),
  ],
  "/teach/classes/:classId/lessons/:slug": row((ids) => `/teach/classes/${ids.mapleClass}/lessons/02-force-and-deformation`, 302, 403, 200, 403, 403, 404),
  "/teach/classes/:classId/lessons/:slug/exercises/:exerciseId": row((ids) => `/teach/classes/${ids.mapleClass}/lessons/02-force-and-deformation/exercises/deformation-from-readings`, 302, 403, 200, 403, 403, 404),
  "/teach/classes/:classId/lessons/:slug/exercises/:exerciseId/csv": row((ids) => `/teach/classes/${ids.mapleClass}/lessons/02-force-and-deformation/exercises/deformation-from-readings/csv`, 302, 403, 200, 403, 403, 404),
  "/api/teach/classes/:classId/gradebook": [
                                row((ids) => `/api/teach/classes/${ids.mapleClass}/gradebook`, 302, 403, 200, 403, 403, 404),
                                row((ids) => `/api/teach/classes/${ids.harborClass}/gradebook`, 302, 403, 404, 403, 403, 200),
  ],
  "/school/classes":            row("/school/classes",                             302, 200, 403, 403, 403, 403),
  // Families, invitations and e-mail (issue 8): "parent" is the Lindqvist household's parent, Juno their child.
  "/join/family":               row("/join/family",                                200, 200, 200, 200, 200, 200),
  "/join/family/confirm":       row("/join/family/confirm?token=not-a-real-token-0123456789", 200, 200, 200, 200, 200, 200),
  "/join/teacher":              row("/join/teacher?token=not-a-real-token-0123456789", 200, 200, 200, 200, 200, 200),
  "/family/children/new":       row("/family/children/new",                        302, 403, 403, 403, 200, 403),
  "/family/children/:childId": [
                                row((ids) => `/family/children/${ids.juno}`,       302, 403, 403, 403, 200, 403),
                                row((ids) => `/family/children/${ids.amira}`,      302, 403, 403, 403, 404, 403),
  ],
  "/family/children/:childId/delete": [
                                row((ids) => `/family/children/${ids.juno}/delete`, 302, 403, 403, 403, 200, 403),
                                row(`/family/children/${NO_SUCH_ID}/delete`,       302, 403, 403, 403, 404, 403),
  ],
  "/family/lessons":            row("/family/lessons",                             302, 403, 403, 403, 200, 403),
  "/family/lessons/:slug": [
                                row("/family/lessons/02-force-and-deformation",    302, 403, 403, 403, 200, 403),
                                row("/family/lessons/99-no-such-lesson",           302, 403, 403, 403, 404, 403),
  ],
  "/school/teachers":           row("/school/teachers",                            302, 200, 403, 403, 403, 403),
  "/school/students":           row("/school/students",                            302, 200, 403, 403, 403, 403),
  "/school/students/:studentId/delete": [
                                row((ids) => `/school/students/${ids.amira}/delete`, 302, 200, 403, 403, 403, 403),
                                row((ids) => `/school/students/${ids.juno}/delete`,  302, 404, 403, 403, 403, 403),
  ],
  "/mail/weekly-summary":       row("/mail/weekly-summary?token=not-a-real-token", 404, 404, 404, 404, 404, 404),
};

/** Routes whose posts are checked by something other than assertSameOrigin, and why. */
const CROSS_SITE_POST_EXEMPT: Record<string, string> = {
  "/auth/*": "Auth.js checks its own double-submit CSRF token (see sign-in.test.ts)",
  "/api/analysis": "a public JSON API: no cookie is read, no account is touched, nothing is stored",
  "/api/payments/webhook": "called by the payment provider's servers; every event must carry its signature",
  "/mail/weekly-summary": "the signed token in the address is the permission, no cookie is read; mail programs post their one-click opt-out (RFC 8058) from their own servers",
};

// The demo people behind the columns; "otherSchool" teaches at Harborside, the second demo school.
const PEOPLE: Record<Exclude<Persona, "anon">, Parameters<typeof sessionCookieFor>[0]> = {
  schoolAdmin: "schoolAdmin",
  teacher: "teacher",
  student: "student",
  parent: "parent",
  otherSchool: "otherSchoolTeacher",
};

function flatten(entries: RouteConfigEntry[], parent = ""): { pattern: string; file: string }[] {
  return entries.flatMap((entry) => {
    const joined = entry.index ? parent : [parent, entry.path ?? ""].filter(Boolean).join("/");
    const here = { pattern: `/${joined.replace(/^\/+/, "")}`, file: entry.file };
    return [here, ...flatten(entry.children ?? [], joined)];
  });
}

const allRoutes = flatten(routes);
const load = (file: string) => import(path.resolve("app", file)) as Promise<Record<string, unknown>>;
const cookies: Partial<Record<Persona, string>> = {};
let ids: Ids;

beforeAll(async () => {
  for (const [persona, person] of Object.entries(PEOPLE)) cookies[persona as Persona] = await sessionCookieFor(person);
  const [mapleClass] = await db.select({ id: classes.id }).from(classes).where(and(eq(classes.signInCode, "MAPLE7A")));
  const [harborClass] = await db.select({ id: classes.id }).from(classes).where(eq(classes.signInCode, "HARBOR8"));
  ids = { mapleClass: mapleClass.id, harborClass: harborClass.id, amira: await userIdOf("student"), juno: await userIdOf("child") };
}, 120_000);

describe("access matrix", () => {
  it("has an entry for every route in app/routes.ts, and none for routes that are gone", () => {
    const patterns = allRoutes.map((r) => r.pattern);
    const missing = patterns.filter((p) => !(p in matrix));
    expect(missing, "add these routes to the access matrix in tests/integration/access-matrix.test.ts").toEqual([]);
    expect(Object.keys(matrix).filter((p) => !patterns.includes(p))).toEqual([]);
  });

  for (const { pattern, file } of flatten(routes)) {
    const rows = [matrix[pattern] ?? []].flat();
    for (const entry of rows) {
      it(`GET ${pattern} (${typeof entry.url === "string" ? entry.url : "a record"}) answers each persona as expected`, async () => {
        const module = await load(file);
        const url = typeof entry.url === "function" ? entry.url(ids) : entry.url;
        const got: Record<string, number> = {};
        for (const persona of PERSONAS) {
          const request = get(url, { cookie: cookies[persona] });
          if (module.default) {
            // Pages also run the root loader (the header); it must never fail.
            const rootResult = await runRoute(root.loader as never, request);
            expect(rootResult.status).toBe(200);
          }
          if (typeof module.loader === "function") {
            const params = matchParams(pattern, new URL(url, "http://x").pathname);
            got[persona] = (await runRoute(module.loader as never, request, params)).status;
          } else {
            got[persona] = module.default ? 200 : 404;
          }
        }
        expect(got).toEqual(entry.expect);
      }, 120_000);
    }
  }

  it("sends a signed-out visitor to sign in with a way back", async () => {
    const teach = await load("routes/teach.tsx");
    const result = await runRoute(teach.loader as never, get("/teach?tab=classes"));
    expect(result.status).toBe(302);
    expect(result.location).toBe("/sign-in?redirectTo=%2Fteach%3Ftab%3Dclasses");
  });
});

describe("cross-site posts", () => {
  for (const { pattern, file } of allRoutes) {
    it(`POST ${pattern} from another site is refused, or the route says why it is exempt`, async () => {
      const module = await load(file);
      if (typeof module.action !== "function" || pattern in CROSS_SITE_POST_EXEMPT) return;
      const rows = [matrix[pattern] ?? []].flat();
      const url = rows[0] ? (typeof rows[0].url === "function" ? rows[0].url(ids) : rows[0].url) : pattern;
      for (const persona of PERSONAS) {
        const request = post(new URL(url, "http://x").pathname, { intent: "here" }, {
          cookie: cookies[persona],
          origin: "https://elsewhere.example",
          fetchSite: "cross-site",
        });
        const result = await runRoute(module.action as never, request, matchParams(pattern, new URL(url, "http://x").pathname));
        expect(result.status, `${persona} posting cross-site to ${pattern}`).toBe(403);
        expect(result.setCookies).toEqual([]);
      }
    });
  }
});

/** The params React Router would pass for `pathname` matched against `pattern`. */
function matchParams(pattern: string, pathname: string): Record<string, string> {
  const names: string[] = [];
  const regex = new RegExp(
    `^${pattern.replace(/\/\*$/, "/(?<splat>.*)").replace(/:(\w+)/g, (_, name) => {
      names.push(name);
      return `(?<${name}>[^/]+)`;
    })}$`,
  );
  const groups = regex.exec(pathname)?.groups ?? {};
  const params: Record<string, string> = {};
  for (const [key, value] of Object.entries(groups)) params[key === "splat" ? "*" : key] = decodeURIComponent(value);
  return params;
}
