// Signing in, in Debian's Chromium against the production build: every demo sign-in from the README
// lands on its own home with the person's name in the header; signing out works; a signed-out visit
// comes back after sign-in; a student is told why /teach is not theirs; wrong passwords are slowed
// with a message saying when to try again.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import postgres from "postgres";
import { demoSignIns } from "../../drizzle/scripts/seed";
import { launchBrowser, openPage, signInAsAdult, signInAsStudent } from "./browser";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

// A refused form post answers 400/403/429 on purpose; Chromium notes each such answer in the console.
const expectedRefusal = /Failed to load resource: the server responded with a status of (400|403|429)/;
const unexpected = (errors: string[]) => errors.filter((e) => !expectedRefusal.test(e));

const s = demoSignIns;
// The README's table of demo sign-ins, with where each lands and the name the header shows.
const readmeSignIns = [
  { who: "School administrator, Maplebrook", adult: s.schoolAdmin, home: "/school", name: "Dana Whitcombe", heading: /Maplebrook Middle School/ },
  { who: "Teacher, Maplebrook", adult: s.teacher, home: "/teach", name: "Ruth Oduya", heading: /Ruth Oduya's classes/ },
  { who: "Second teacher, Maplebrook", adult: s.secondTeacher, home: "/teach", name: "Lars Fenwick", heading: /Lars Fenwick's classes/ },
  { who: "Student, Maplebrook", student: s.student, home: "/learn", name: "Amira K.", heading: /Hello, Amira K\./ },
  { who: "Parent, Lindqvist household", adult: s.parent, home: "/family", name: "Sam Lindqvist", heading: /Lindqvist household/ },
  { who: "Child, Lindqvist household", student: s.child, home: "/learn", name: "Juno", heading: /Hello, Juno/ },
  { who: "Administrator of the second school", adult: s.otherSchoolAdmin, home: "/school", name: "Ines Calder", heading: /Harborside Academy/ },
];

describe("demo sign-ins", () => {
  for (const person of readmeSignIns) {
    it(`${person.who} signs in and lands on ${person.home}`, async () => {
      const { page, context, consoleErrors } = await openPage(browser);
      await page.goto("/sign-in");
      if (person.adult) await signInAsAdult(page, person.adult.email, person.adult.password);
      else await signInAsStudent(page, person.student!.code, person.student!.username, person.student!.password);
      await page.waitForURL((url) => url.pathname === person.home);
      // The page renders just after the address changes: wait for the home's own heading.
      await page.getByRole("heading", { level: 1, name: person.heading }).first().waitFor();
      const header = page.getByRole("navigation", { name: "Main" });
      await header.getByText(`Signed in as ${person.name}`).waitFor();

      // Signing out from the header.
      await header.getByRole("button", { name: "Sign out" }).click();
      await page.waitForURL(/\/sign-out\?done=here/);
      await page.getByRole("heading", { name: "You are signed out" }).waitFor();
      await header.getByRole("link", { name: "Sign in" }).waitFor();
      await page.goto(person.home);
      await page.waitForURL(/\/sign-in\?redirectTo=/);
      expect(unexpected(consoleErrors)).toEqual([]);
      await context.close();
    });
  }
});

describe("around sign-in", () => {
  it("brings a signed-out visitor back to the page they asked for", async () => {
    const { page, context, consoleErrors } = await openPage(browser);
    await page.goto("/teach/classes/not-a-class");
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    await signInAsAdult(page, s.teacher.email, s.teacher.password);
    await page.waitForURL((url) => url.pathname === "/teach/classes/not-a-class");
    await page.getByRole("heading", { level: 1, name: "Page not found" }).waitFor();
    await page.goto("/teach");
    await page.getByRole("link", { name: "Grade 7 Physical Science A" }).click();
    await page.waitForURL(/\/teach\/classes\/[0-9a-f-]+\/gradebook/);
    await page.locator('tr[data-student="amira.k"]').waitFor();
    expect(consoleErrors.filter((e) => !/status of 404/.test(e))).toEqual([]);
    await context.close();
  });

  it("tells a student that the teaching page is not theirs (403), with the reason", async () => {
    const { page, context } = await openPage(browser);
    await page.goto("/sign-in");
    await signInAsStudent(page, s.student.code, s.student.username, s.student.password);
    await page.waitForURL((url) => url.pathname === "/learn");
    await page.getByRole("heading", { level: 1, name: "Hello, Amira K." }).waitFor();
    const response = await page.goto("/teach");
    expect(response?.status()).toBe(403);
    await expect(page.getByRole("heading", { level: 1 }).innerText()).resolves.toBe("Not yours to open");
    await expect(page.locator("main").innerText()).resolves.toContain("This page is for teachers.");
    expect((await page.goto("/school"))?.status()).toBe(403);
    await context.close();
  });

  it("shows the students' door first on a phone, and the adults' door first when an adult comes back to it", async () => {
    const { page, context, consoleErrors } = await openPage(browser, { viewport: { width: 375, height: 740 } });
    const top = async (name: string) => (await page.getByRole("region", { name }).boundingBox())!.y;
    await page.goto("/sign-in");
    expect(await top("Students")).toBeLessThan(await top("Adults"));
    // The intro's link jumps to the adults' door below.
    await page.getByRole("link", { name: "Adults", exact: true }).click();
    await page.waitForURL(/#adult-door$/);

    await signInAsAdult(page, "no.such.adult@maplebrook.example", "not the password");
    await page.getByRole("region", { name: "Adults" }).getByRole("alert").waitFor();
    expect(await top("Adults")).toBeLessThan(await top("Students"));
    await expect(page.getByRole("region", { name: "Adults" }).getByLabel("E-mail address").inputValue()).resolves.toBe("no.such.adult@maplebrook.example");
    // After a password reset, the page that says so opens on the adults' door too.
    await page.goto("/sign-in?notice=password-changed");
    expect(await top("Adults")).toBeLessThan(await top("Students"));
    expect(unexpected(consoleErrors)).toEqual([]);
    await context.close();
  });

  it("keeps the typed e-mail address and says what is wrong", async () => {
    const { page, context, consoleErrors } = await openPage(browser);
    await page.goto("/sign-in");
    await signInAsAdult(page, "r.oduya@maplebrook", "");
    const door = page.getByRole("region", { name: "Adults" });
    await door.getByText("Enter the e-mail address you use for Bendwise").waitFor();
    await expect(door.getByLabel("E-mail address").inputValue()).resolves.toBe("r.oduya@maplebrook");
    await expect(door.getByLabel("E-mail address").getAttribute("aria-invalid")).resolves.toBe("true");
    expect(unexpected(consoleErrors)).toEqual([]);
    await context.close();
  });

  it("slows down wrong passwords with a message saying when to try again; then the right one works", async () => {
    const { page, context, consoleErrors } = await openPage(browser);
    const person = s.otherSchoolTeacher;
    await page.goto("/sign-in");
    const door = page.getByRole("region", { name: "Adults" });
    for (let i = 1; i <= 6; i++) {
      // Each try waits for its own answer: the alert of the try before is still on the page meanwhile.
      const answered = page.waitForResponse((r) => r.request().method() === "POST" && new URL(r.url()).pathname.startsWith("/sign-in"));
      await signInAsAdult(page, person.email, `not it ${i}`);
      await answered;
      await door.getByRole("alert").waitFor();
      await page.waitForFunction(() => !document.querySelector("button[aria-disabled=true]"));
    }
    await door.getByRole("alert").filter({ hasText: "Too many wrong tries" }).waitFor({ timeout: 5_000 });
    const alert = await door.getByRole("alert").innerText();
    expect(alert).toContain("Too many wrong tries for this account. Try again in 2 seconds.");
    // The clock time, in the browser's own time zone once the page is live.
    expect(alert).toMatch(/You can try again from \d{1,2}:\d{2}(:\d{2})?/);
    await expect(door.getByLabel("E-mail address").inputValue()).resolves.toBe(person.email);

    // The wait passes (moved along in the database rather than slept through).
    const sql = postgres(process.env.DATABASE_URL!, { max: 1, onnotice: () => {} });
    await sql`update sign_in_failures set blocked_until = now() - interval '1 second'
              where bucket = (select 'account:' || id from users where email = ${person.email})`;
    await sql.end();
    await signInAsAdult(page, person.email, person.password);
    await page.waitForURL((url) => url.pathname === "/teach");
    await page.getByRole("heading", { level: 1, name: "Paul Nakamura's classes" }).waitFor();
    expect(unexpected(consoleErrors)).toEqual([]);
    await context.close();
  });
});
