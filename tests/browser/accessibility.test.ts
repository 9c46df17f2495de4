// Every page a person can reach, scanned for accessibility (axe-core: WCAG 2 A/AA rules and axe's best
// practices) in Debian's Chromium against the production build. For each kind of visitor the test
// follows the links of their pages from their home, as they would, and scans one page of each kind
// (one class, one student…; every lesson, as each has its own parts): a page that fails a rule fails
// the test with the rule and the elements it found. The visitor's and the administrator's pages are
// scanned at a phone's width as well.
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { demoSignIns } from "../../drizzle/scripts/seed";
import { appUrl, axeViolations, launchBrowser, openAsStudent, openPage, signInAsAdult, type AxeViolation } from "./browser";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

/** The kind of page an address is: ids, a class's or family's lesson and exercises replaced by their names. */
function pageKind(pathname: string): string {
  return pathname
    .replace(/[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}/g, ":id")
    .replace(/\/lessons\/\d{2}-[a-z0-9-]+/, "/lessons/:lesson")
    .replace(/\/exercises\/[a-z0-9-]+/, "/exercises/:exercise");
}

// Not pages: downloads, sign-out, Auth.js's own endpoints, photos and lesson code.
const NOT_A_PAGE = /\/(csv|sign-out)$|^\/auth\/|^\/photos\/|^\/lesson-code\/|\.csv$/;
const MOST_KINDS = 40;

/** Follows same-origin links from `home` and scans one page of each kind. */
async function scanReachablePages(page: Page, home: string) {
  const origin = new URL(appUrl).origin;
  const found: Record<string, AxeViolation[]> = {};
  const queue = [home];
  const seen = new Set<string>();
  while (queue.length > 0 && Object.keys(found).length < MOST_KINDS) {
    const address = queue.shift()!;
    const kind = pageKind(new URL(address, origin).pathname);
    if (seen.has(kind)) continue;
    seen.add(kind);
    const response = await page.goto(address);
    if (!response || !response.ok() || !(response.headers()["content-type"] ?? "").startsWith("text/html")) continue;
    await page.waitForLoadState("networkidle");
    found[kind] = await axeViolations(page);
    const links = await page.evaluate(() => [...document.querySelectorAll("a[href]")].map((a) => (a as HTMLAnchorElement).href));
    for (const link of links) {
      const url = new URL(link);
      if (url.origin === origin && !NOT_A_PAGE.test(url.pathname)) queue.push(url.pathname + url.search);
    }
  }
  return found;
}

/** Signs an adult in from the sign-in page and waits for their home. */
const adult = (who: { email: string; password: string }, home: RegExp) => async (page: Page) => {
  await page.goto("/sign-in");
  await signInAsAdult(page, who.email, who.password);
  await page.waitForURL(home);
};

const visitors: { who: string; home: string; signIn: (page: Page) => Promise<void>; atLeast: string[] }[] = [
  { who: "a visitor", home: "/", signIn: async () => {}, atLeast: ["/", "/sign-in", "/join/family"] },
  {
    who: "a teacher",
    home: "/teach",
    signIn: adult(demoSignIns.teacher, /\/teach/),
    atLeast: ["/teach", "/teach/classes", "/teach/classes/:id/gradebook", "/teach/classes/:id/roster", "/teach/classes/:id/assignments", "/teach/classes/:id/students/:id"],
  },
  {
    who: "a school administrator",
    home: "/school",
    signIn: adult(demoSignIns.schoolAdmin, /\/school/),
    atLeast: ["/school", "/school/seats", "/school/seats/buy", "/school/teachers", "/school/students"],
  },
  { who: "a parent", home: "/family", signIn: adult(demoSignIns.parent, /\/family/), atLeast: ["/family", "/family/children/:id", "/family/lessons"] },
  {
    who: "a student",
    home: "/learn",
    signIn: (page) => openAsStudent(page, { ...demoSignIns.student, username: "dev.p" }),
    atLeast: ["/learn", "/learn/01-measuring-deformation", "/learn/07-home-lab", "/tools/analyse"],
  },
];

// At a phone's width too, for everyone: a table that slides sideways must take the keyboard (the
// gradebook, a lesson's tables, the readings, an example file), also where its fields are disabled.
const runs = [
  ...visitors.map((visitor) => ({ visitor, viewport: undefined, width: "" })),
  ...visitors.map((visitor) => ({ visitor, viewport: { width: 375, height: 740 }, width: " at 375 px" })),
];

describe("accessibility of every page", () => {
  for (const { visitor, viewport, width } of runs) {
    it(`finds no accessibility problem on the pages ${visitor.who} reaches${width}`, async () => {
      // The scan's script is injected by the test, so this context alone may bypass the page's CSP.
      const { page, context, consoleErrors } = await openPage(browser, { bypassCSP: true, ...(viewport ? { viewport } : {}) });
      await visitor.signIn(page);
      const found = await scanReachablePages(page, visitor.home);
      expect(Object.keys(found)).toEqual(expect.arrayContaining(visitor.atLeast));
      const problems = Object.entries(found).filter(([, violations]) => violations.length > 0);
      expect(Object.fromEntries(problems)).toEqual({});
      expect(consoleErrors).toEqual([]);
      await context.close();
    }, 240_000);
  }
});
