// A teacher's ordinary week, where a slip would lose work or hide a student's standing: the first
// passwords of new students and a review begun are not left behind by a click on a tab, the extra tries and days of a
// student are not set back to 0 when only one of them is changed, and on a phone the gradebook and
// the item analysis say that they slide sideways (the averages and the usual wrong answers sit out of view).
import { and, eq, isNull } from "drizzle-orm";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { accommodations, classes, users } from "~/db/schema.server";
import { demoSignIns } from "../../drizzle/scripts/seed";
import { SLIDES_SIDEWAYS } from "~/components/use-overflows";
import { launchBrowser, openPage, signInAsAdult } from "./browser";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const classNamed = async (name: string) => (await db.select().from(classes).where(eq(classes.name, name)))[0];

async function signInTeacher(page: Page) {
  await page.goto("/sign-in");
  await signInAsAdult(page, demoSignIns.teacher.email, demoSignIns.teacher.password);
  await page.waitForURL(/\/teach/);
}

describe("a teacher's week", () => {
  it("asks before leaving the roster while new students' first passwords are still on it", async () => {
    const { page, context, consoleErrors } = await openPage(browser);
    await signInTeacher(page);
    const klass = await classNamed("Grade 7 Physical Science B");
    await page.goto(`/teach/classes/${klass.id}/roster`);
    const username = `pia.w${Date.now() % 100000}`;
    const addOne = page.locator("section", { has: page.getByRole("heading", { name: "Add one student" }) });
    await addOne.getByLabel("Display name").fill("Pia W.");
    await addOne.getByLabel("Username").fill(username);
    await addOne.getByRole("button", { name: "Add the student" }).click();
    await page.getByRole("heading", { name: "Pia W. is in the class" }).waitFor();

    // A click on a tab of the class stops at a question; staying keeps the list.
    await page.getByRole("link", { name: "Gradebook", exact: true }).click();
    const question = page.getByRole("alertdialog");
    await question.getByText(/These first passwords are not kept anywhere else/).waitFor();
    await question.getByRole("button", { name: "Stay and hand them out" }).click();
    expect(page.url()).toMatch(/\/roster$/);
    await expect.poll(() => page.getByRole("alertdialog").count()).toBe(0);
    await page.getByRole("cell", { name: username }).first().waitFor();

    // Leaving on purpose goes; once the list is cleared, nothing asks.
    await page.getByRole("link", { name: "Gradebook", exact: true }).click();
    await page.getByRole("alertdialog").getByRole("button", { name: "Leave without them" }).click();
    await page.waitForURL(/\/gradebook$/);
    await page.goBack();
    await page.waitForURL(/\/roster$/);
    expect(await page.getByRole("heading", { name: /is in the class/ }).count()).toBe(0);
    await page.getByRole("link", { name: "Lessons assigned", exact: true }).click();
    await page.waitForURL(/\/assignments$/);
    expect(consoleErrors).toEqual([]);
    await context.close();
  }, 60_000);

  it("starts the extra tries and days from what the student has, so changing one keeps the other", async () => {
    const { page, context, consoleErrors } = await openPage(browser);
    await signInTeacher(page);
    const klass = await classNamed("Grade 7 Physical Science B");
    const [leo] = await db.select().from(users).where(and(eq(users.homeOrganisationId, klass.organisationId), eq(users.username, "leo.f")));
    await page.goto(`/teach/classes/${klass.id}/students/${leo.id}`);
    // Below all of the student's work, and reached from the top of the page.
    await page.getByRole("navigation", { name: "For Leo F." }).getByRole("link", { name: "More tries or more time" }).click();
    await page.waitForURL(/#more$/);
    const more = page.locator("section", { has: page.getByRole("heading", { name: "More tries or more time" }) });
    await expect(more.getByTestId("accommodation-now").innerText()).resolves.toBe("Now: the class's usual tries and due dates.");

    await more.getByLabel("More tries per exercise").fill("2");
    await more.getByRole("button", { name: "Save" }).click();
    await more.getByText("Now: 2 more tries per exercise and 0 more days.").waitFor();
    // Only the days are changed now: the 2 tries stay in their field and in the saved setting.
    await expect(more.getByLabel("More tries per exercise").inputValue()).resolves.toBe("2");
    await more.getByLabel("More days").fill("3");
    await more.getByRole("button", { name: "Save" }).click();
    await more.getByText("Now: 2 more tries per exercise and 3 more days.").waitFor();
    const [kept] = await db
      .select()
      .from(accommodations)
      .where(and(eq(accommodations.classId, klass.id), eq(accommodations.studentId, leo.id), isNull(accommodations.assignmentId)));
    expect(kept).toMatchObject({ extraAttempts: 2, extraDays: 3 });

    // A refused number keeps what was typed, beside its message.
    await more.getByLabel("More days").fill("three");
    await more.getByRole("button", { name: "Save" }).click();
    await more.getByText("Use digits only: a whole number from 0 to 60.").waitFor();
    await expect(more.getByLabel("More days").inputValue()).resolves.toBe("three");
    await expect(more.getByLabel("More tries per exercise").inputValue()).resolves.toBe("2");
    expect(consoleErrors.filter((e) => !/status of 400/.test(e))).toEqual([]);
    await context.close();
  }, 60_000);

  it("asks before leaving a review begun and not saved, and not once it is saved", async () => {
    const { page, context, consoleErrors } = await openPage(browser);
    await signInTeacher(page);
    const klass = await classNamed("Grade 7 Physical Science A");
    await page.goto(`/teach/classes/${klass.id}/lessons/02-force-and-deformation`);
    const review = page.getByRole("form", { name: "Your review of Hugo M.'s answer" });
    await review.getByLabel("Comment for the student").fill("Your evidence has every number with its unit.");
    await page.getByRole("link", { name: "Gradebook", exact: true }).click();
    const question = page.getByRole("alertdialog");
    await question.getByText("A review you began is not saved yet. Leave the page without it?").waitFor();
    await question.getByRole("button", { name: "Stay and save it" }).click();
    expect(page.url()).toMatch(/\/lessons\/02-force-and-deformation$/);
    await expect(review.getByLabel("Comment for the student").inputValue()).resolves.toBe("Your evidence has every number with its unit.");

    for (const [criterion, points] of [["claim", "2"], ["evidence", "2"], ["reasoning", "1"]]) await review.locator(`input[name=${criterion}][value="${points}"]`).check();
    await review.getByRole("button", { name: "Save the review" }).click();
    await review.getByText("Saved. The student sees your comment on their lesson page.").waitFor();
    await page.getByRole("link", { name: "Gradebook", exact: true }).click();
    await page.waitForURL(/\/gradebook$/);
    expect(consoleErrors).toEqual([]);
    await context.close();
  }, 60_000);

  it("says on an archived class's roster that it takes no students, instead of forms that would be refused", async () => {
    const { page, context, consoleErrors } = await openPage(browser, { viewport: { width: 375, height: 740 } });
    await signInTeacher(page);
    const open = await classNamed("Grade 7 Physical Science B");
    const [archived] = await db
      .insert(classes)
      .values({ organisationId: open.organisationId, teacherId: open.teacherId, name: `Put away ${Date.now() % 100000}`, schoolYear: open.schoolYear, signInCode: `PUT${Date.now() % 100000}`, archivedAt: new Date() })
      .returning();
    await page.goto(`/teach/classes/${archived.id}/roster`);
    await page.getByTestId("archived-roster").getByText("This class is archived, so no student can be added to it.").waitFor();
    expect(await page.getByRole("button", { name: "Add the student" }).count()).toBe(0);
    expect(await page.getByRole("button", { name: "Check the file" }).count()).toBe(0);
    await page.getByRole("link", { name: "Restore it in the class settings" }).click();
    await page.waitForURL(/\/settings$/);
    await page.goto(`/teach/classes/${open.id}/roster`);
    await page.getByRole("button", { name: "Add the student" }).waitFor();
    expect(consoleErrors).toEqual([]);
    await context.close();
  }, 60_000);

  it("says on a phone that the gradebook and the item analysis slide sideways, and not on a wide screen", async () => {
    const klass = await classNamed("Grade 7 Physical Science A");
    for (const [width, slides] of [
      [375, true],
      [1280, false],
    ] as const) {
      const { page, context, consoleErrors } = await openPage(browser, { viewport: { width, height: 800 } });
      await signInTeacher(page);
      for (const [path, box] of [
        ["gradebook", "gradebook"],
        ["lessons/02-force-and-deformation", "item-analysis"],
      ]) {
        await page.goto(`/teach/classes/${klass.id}/${path}`);
        await page.getByTestId(box).waitFor();
        await expect.poll(() => page.getByText(SLIDES_SIDEWAYS).count(), { timeout: 5_000, message: `${path} at ${width} px` }).toBe(slides ? 1 : 0);
        // Sliding, the box takes the keyboard (the arrow keys scroll it), named after its table.
        if (slides) await expect(page.getByTestId(box).getAttribute("tabindex")).resolves.toBe("0");
      }
      expect(consoleErrors).toEqual([]);
      await context.close();
    }
  }, 60_000);
});
