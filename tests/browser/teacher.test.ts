// The teacher's journey in a real browser: the demo teacher makes a class, checks a roster file with
// one bad row (the preview names it and nothing is saved), fixes it and adds the students, adds a demo
// student who already has an account, assigns lesson 2 with a due date, and watches the gradebook
// change without a reload while that student answers an exercise in a second browser.
//
// The gradebook normally refreshes every 30 s; `?refresh=2` (allowed from 2 to 30 s) keeps this fast.
import { and, eq, inArray } from "drizzle-orm";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { classes, users } from "~/db/schema.server";
import { exerciseInstance, findExercise } from "~/lib/course.server";
import { dateToZonedInput } from "~/lib/teaching/time";
import { demoSignIns } from "../../drizzle/scripts/seed";
import { launchBrowser, openAsStudent, openPage, signInAsAdult } from "./browser";

const LESSON = "02-force-and-deformation";
/** A demo student of the teacher's class whom no other browser test uses. */
const STUDENT = "grace.w";
let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const csv = (rows: string[]) => Buffer.from(["display name,username,student number", ...rows].join("\n") + "\n", "utf8");

describe("a teacher's class from nothing to a live gradebook", () => {
  it("makes a class, checks a roster file (a bad row is named, nothing saved), adds the fixed file, assigns lesson 2 and sees progress arrive", async () => {
    const teacher = await openPage(browser);
    const { page } = teacher;
    // The bad file is answered 400 on purpose (Chromium logs that as a console error): note each 4xx.
    const refused: string[] = [];
    page.on("response", (r) => {
      if (r.status() >= 400) refused.push(`${r.status()} ${r.request().method()} ${new URL(r.url()).pathname}`);
    });
    await page.goto("/sign-in");
    await signInAsAdult(page, demoSignIns.teacher.email, demoSignIns.teacher.password);
    await page.waitForURL(/\/teach/);

    // 1. A new class.
    await page.getByRole("link", { name: /All your classes, and make a new one/ }).click();
    await page.waitForURL(/\/teach\/classes$/);
    const className = `Grade 7 Science, period 6 (browser test ${Date.now() % 100000})`;
    await page.getByLabel("Class name").fill(className);
    await page.getByRole("button", { name: "Make the class" }).click();
    await page.getByText(`${className} is ready`).waitFor();
    await page.getByRole("link", { name: "add students" }).click();
    await page.waitForURL(/\/roster$/);
    const classId = page.url().split("/").at(-2)!;
    const [made] = await db.select().from(classes).where(eq(classes.id, classId));
    expect(made.name).toBe(className);

    // 2. A roster file with one bad row: the preview names it, and nothing is saved.
    const suffix = String(Date.now() % 100000);
    const usernames = [`tove.a${suffix}`, `ugo.b${suffix}`, `wren.c${suffix}`];
    await page.getByLabel("CSV file", { exact: true }).setInputFiles({
      name: "period-6.csv",
      mimeType: "text/csv",
      buffer: csv([`Tove A.,${usernames[0]},91001`, `Ugo B.,ugo b${suffix},91002`, `Wren C.,${usernames[2]},`]),
    });
    await page.getByRole("button", { name: "Check the file" }).click();
    const problems = page.getByTestId("roster-problems");
    await problems.waitFor();
    await expect(problems.innerText()).resolves.toMatch(/Row 3, column “username”: The username “ugo b\d+” may use only/);
    await expect(page.getByText("Nothing has been saved.").count()).resolves.toBe(1);
    await expect(page.locator('tr[data-row="3"]').innerText()).resolves.toMatch(/Problem/);
    const saved = () => db.select({ id: users.id }).from(users).where(and(eq(users.homeOrganisationId, made.organisationId), inArray(users.username, usernames)));
    expect(await saved()).toHaveLength(0);

    // 3. The fixed file: ready, then saved whole when confirmed, with first passwords shown once.
    await page.getByLabel("CSV file", { exact: true }).setInputFiles({
      name: "period-6-fixed.csv",
      mimeType: "text/csv",
      buffer: csv([`Tove A.,${usernames[0]},91001`, `Ugo B.,${usernames[1]},91002`, `Wren C.,${usernames[2]},`]),
    });
    await page.getByRole("button", { name: "Check the file" }).click();
    await page.getByText("3 students are ready to add.").waitFor();
    expect(await saved()).toHaveLength(0);
    await page.getByRole("button", { name: "Add these 3 students to the class" }).click();
    await page.getByRole("heading", { name: "3 students are in the class" }).waitFor();
    expect(await saved()).toHaveLength(3);
    await expect(page.getByRole("table", { name: "First passwords" }).innerText()).resolves.toMatch(new RegExp(usernames[1]));

    // The form for one student states the username rule the check applies.
    await expect(page.getByText("3 to 40 letters a–z, digits, dots, hyphens and underscores, starting and ending with a letter or digit; unique at your school.").count()).resolves.toBe(1);

    // 4. A demo student who already has an account joins this class too.
    await page.getByLabel("Their username").fill(STUDENT);
    await page.getByRole("button", { name: "Add to this class" }).click();
    await page.getByText("Grace W. is now in this class.").waitFor();
    // The first passwords stay in the list to hand out through the next action, until cleared.
    await expect(page.getByRole("table", { name: "First passwords" }).innerText()).resolves.toMatch(new RegExp(usernames[2]));
    // Handed out: the list is cleared, so leaving the roster asks nothing (teacher-week.test.ts asks).
    await page.getByRole("button", { name: "I have handed these out: clear the list" }).click();

    // 5. Lesson 2, due in five days at 5 pm in the class's time zone.
    await page.getByRole("link", { name: "Lessons assigned" }).click();
    await page.waitForURL(/\/assignments$/);
    const lesson2 = page.locator(`[data-lesson="${LESSON}"]`);
    const due = dateToZonedInput(new Date(Date.now() + 5 * 24 * 3600 * 1000), made.timeZone).slice(0, 10) + "T17:00";
    await lesson2.getByText("Assign lesson 2…").click();
    await lesson2.getByLabel("Due").fill(due);
    await lesson2.getByRole("button", { name: "Assign lesson 2" }).click();
    await lesson2.getByText(/^Assigned, due /).waitFor();

    // 6. The gradebook, refreshing every 2 s; a marker on the window proves there is no reload.
    await page.goto(`/teach/classes/${classId}/gradebook?refresh=2`);
    const cell = page.locator(`tr[data-student="${STUDENT}"] td[data-lesson="${LESSON}"]`);
    await expect(cell.innerText()).resolves.toMatch(/Not started/);
    await expect(page.locator("tr[data-student]").count()).resolves.toBe(4);
    // Nobody has started yet and the lesson is not due: no average counts anything yet.
    await expect(page.getByTestId("average").allInnerTexts()).resolves.toEqual(["—", "—", "—", "—"]);
    await page.evaluate(() => ((window as unknown as { stillHere: boolean }).stillHere = true));

    // 7. The student answers an exercise of lesson 2 in another browser.
    const student = await openPage(browser);
    await openAsStudent(student.page, { ...demoSignIns.student, username: STUDENT });
    await student.page.goto(`/learn/${LESSON}`);
    await expect(student.page.getByTestId("lesson-due").innerText()).resolves.toMatch(/due /);
    const [grace] = await db.select({ id: users.id }).from(users).where(and(eq(users.homeOrganisationId, made.organisationId), eq(users.username, STUDENT)));
    const definition = findExercise(LESSON, "deformation-from-readings")!;
    const expected = exerciseInstance(grace.id, LESSON, definition, []).expected!;
    const box = student.page.locator(`[data-exercise="${definition.id}"]`);
    await box.getByLabel(/Your answer/).fill(`${expected.value} ${expected.unit}`);
    await box.getByRole("button", { name: "Check my answer" }).click();
    await box.getByText("That's right.").waitFor();

    // 8. The teacher's gradebook shows it within a few refreshes, without reloading the page.
    await expect
      .poll(() => cell.innerText(), { timeout: 15_000, interval: 500 })
      .toMatch(/1 of 7 done/);
    await expect(cell.getByTestId("score").innerText()).resolves.toBe("17%");
    expect(await page.evaluate(() => (window as unknown as { stillHere?: boolean }).stillHere)).toBe(true);
    // One rule everywhere: the lesson counts for the student who started it, not yet for the others.
    await expect(page.locator(`tr[data-student="${STUDENT}"]`).getByTestId("average").innerText()).resolves.toBe("17%");
    await expect(page.getByTestId("averaged-students").innerText()).resolves.toMatch(/of the 1 student with a lesson that counts yet/);
    await expect(page.getByTestId("average-rule").textContent()).resolves.toMatch(/once they have started it, or once its due date for them has passed/);

    // The filters work on the rows already in the page.
    await page.getByRole("link", { name: /^Not started/ }).click();
    await page.waitForURL(/show=not-started/);
    await expect(page.getByTestId("filter-means").innerText()).resolves.toMatch(/not started at least one lesson that is open/);
    await expect.poll(() => page.locator(`tr[data-student="${STUDENT}"]`).count()).toBe(0);
    await expect(page.locator("tr[data-student]").count()).resolves.toBe(3);
    expect(await page.evaluate(() => (window as unknown as { stillHere?: boolean }).stillHere)).toBe(true);
    // Each filter is a step in the history: Back returns to the filter before, then to everyone.
    await page.getByRole("link", { name: /^Stuck/ }).click();
    await page.waitForURL(/show=stuck/);
    await page.goBack();
    await page.waitForURL(/show=not-started/);
    await expect.poll(() => page.locator("tr[data-student]").count()).toBe(3);
    await page.goBack();
    await page.waitForURL((url) => url.pathname.endsWith("/gradebook") && !url.searchParams.has("show"));
    await expect.poll(() => page.locator("tr[data-student]").count()).toBe(4);
    expect(await page.evaluate(() => (window as unknown as { stillHere?: boolean }).stillHere)).toBe(true);

    // 9. Taking the lesson off the list asks once more, then keeps the student's work.
    await page.goto(`/teach/classes/${classId}/assignments`);
    await lesson2.getByText("Change the dates or the late-work rule").click();
    // Escape closes the open form and leaves the keyboard on its summary.
    await lesson2.getByLabel("Due").press("Escape");
    await expect(lesson2.locator("details").first().evaluate((d) => (d as HTMLDetailsElement).open)).resolves.toBe(false);
    await expect(page.evaluate(() => document.activeElement?.tagName)).resolves.toBe("SUMMARY");
    await lesson2.getByText("Change the dates or the late-work rule").click();
    await lesson2.getByText("Take off the list…").click();
    await lesson2.getByText(/the students' work on it stays/).waitFor();
    await lesson2.getByRole("button", { name: "Yes, take it off the list" }).click();
    await lesson2.getByText("Taken off the class's list. The students' work stays.").waitFor();
    await expect.poll(() => lesson2.innerText(), { timeout: 5_000 }).toMatch(/Not assigned/);

    expect(refused).toEqual([`400 POST /teach/classes/${classId}/roster.data`]);
    expect(teacher.consoleErrors.filter((e) => !/status of 400/.test(e))).toEqual([]);
    expect(student.consoleErrors).toEqual([]);
    await student.context.close();
    await teacher.context.close();
  }, 120_000);

  it("fits a phone screen for the school's administrator: wide tables scroll inside their box, not the page", async () => {
    const { page, context, consoleErrors } = await openPage(browser, { viewport: { width: 375, height: 740 } });
    await page.goto("/sign-in");
    await signInAsAdult(page, demoSignIns.schoolAdmin.email, demoSignIns.schoolAdmin.password);
    await page.waitForURL(/\/school/);
    for (const path of ["/school", "/school/seats", "/school/teachers", "/school/students", "/school/classes"]) {
      await page.goto(path);
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
      expect(overflow, path).toBeLessThanOrEqual(0);
    }
    // A class's name breaks between words, not inside them.
    const name = page.locator("tr[data-class] th").first();
    const lines = await name.evaluate((cell) => {
      const range = document.createRange();
      range.selectNodeContents(cell);
      return new Set([...range.getClientRects()].map((r) => Math.round(r.top))).size;
    });
    expect(lines).toBeLessThanOrEqual(2);
    expect(consoleErrors).toEqual([]);
    await context.close();
  });

  it("fits a phone screen: the gradebook scrolls inside its own box, not the page", async () => {
    const { page, context, consoleErrors } = await openPage(browser, { viewport: { width: 375, height: 740 } });
    await page.goto("/sign-in");
    await signInAsAdult(page, demoSignIns.teacher.email, demoSignIns.teacher.password);
    await page.waitForURL(/\/teach/);
    const [klass] = await db.select().from(classes).where(eq(classes.name, "Grade 7 Physical Science A"));
    for (const path of ["gradebook", "roster", "assignments", "settings", `lessons/${LESSON}`]) {
      await page.goto(`/teach/classes/${klass.id}/${path}`);
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
      expect(overflow, path).toBeLessThanOrEqual(0);
    }
    // The lesson's item analysis keeps its headers readable (one or two lines each, not a word per
    // line) and scrolls sideways inside its own box.
    const box = page.getByTestId("item-analysis");
    await box.screenshot({ path: "tests/.artifacts/item-analysis-375.png" });
    const headerLines = await box.locator("thead th").evaluateAll((cells) =>
      cells.map((cell) => {
        const range = document.createRange();
        range.selectNodeContents(cell);
        return new Set([...range.getClientRects()].map((r) => Math.round(r.top))).size;
      }),
    );
    expect(Math.max(...headerLines)).toBeLessThanOrEqual(2);
    expect(await box.evaluate((el) => el.scrollWidth > el.clientWidth)).toBe(true);
    expect(consoleErrors).toEqual([]);
    await context.close();
  }, 60_000);
});
