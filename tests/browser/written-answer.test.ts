// A written answer loses nothing typed: the draft saves itself after a pause in the typing, and when
// the page is left by a link or a reload before that pause; changes to a handed-in answer are not a
// draft, so leaving with them asks first.
import { and, eq } from "drizzle-orm";
import type { Browser, Locator } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { users, writtenAnswers } from "~/db/schema.server";
import { demoSignIns } from "../../drizzle/scripts/seed";
import { launchBrowser, openAsStudent, openPage } from "./browser";

// A demo student of the second class whom no other browser test uses.
const student = { code: "MAPLE7B", username: "olu.e", password: demoSignIns.student.password };
const LESSON = "/learn/03-proportional-or-not";
const BUNDLES = "/learn/04-bundles";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const part = (answer: Locator, name: string) => answer.getByLabel(name, { exact: true });

/** What the database holds of olu.e's written answer in a lesson. */
async function storedAnswer(slug: string, answerId: string) {
  const [row] = await db
    .select({ claim: writtenAnswers.claim, evidence: writtenAnswers.evidence, reasoning: writtenAnswers.reasoning })
    .from(writtenAnswers)
    .innerJoin(users, eq(users.id, writtenAnswers.studentId))
    .where(and(eq(users.username, student.username), eq(writtenAnswers.lessonSlug, slug), eq(writtenAnswers.answerId, answerId)));
  return row ?? null;
}

describe("a written answer", () => {
  it("keeps what was typed through a pause, a link away and back, and a reload at once", async () => {
    const { page, context, consoleErrors } = await openPage(browser);
    await openAsStudent(page, student);
    await page.goto(LESSON);
    // Lesson 3's write-up quotes the data, so it shows once the prediction is committed.
    await expect(page.locator("#answer-cer-proportional").count()).resolves.toBe(0);
    await page.getByLabel("Priya and Mateo's balsa strip").check();
    await page.getByRole("button", { name: /Commit my prediction/ }).click();
    const answer = page.locator("#answer-cer-proportional");
    await answer.waitFor();

    // 1. Typing, then a pause: the draft saves itself.
    await part(answer, "Claim").pressSequentially("The balsa strip is proportional.");
    await answer.getByText("Draft saved by itself.").waitFor();
    await page.reload();
    await expect(part(answer, "Claim").inputValue()).resolves.toBe("The balsa strip is proportional.");

    // 2. Typing, then a link in the app before the pause is over; back again, the words are there.
    await part(answer, "Evidence").pressSequentially("Its line goes through the origin.");
    const saved = page.waitForResponse((r) => r.request().method() === "POST" && r.url().endsWith(`${LESSON}.data`));
    await page.getByRole("link", { name: /Your course/ }).first().click();
    await page.waitForURL(/\/learn$/);
    expect((await saved).status()).toBe(200);
    await page.goto(LESSON);
    await expect(part(answer, "Evidence").inputValue()).resolves.toBe("Its line goes through the origin.");

    // 3. Typing, then a reload at once.
    await part(answer, "Reasoning").pressSequentially("Double the force gives double the deformation.");
    await page.reload();
    // Put back once the page runs (from the tab's copy, if the reload outran the save), and saved.
    await expect.poll(() => part(answer, "Reasoning").inputValue()).toBe("Double the force gives double the deformation.");
    await expect.poll(async () => (await storedAnswer("03-proportional-or-not", "cer-proportional"))?.reasoning, { timeout: 10_000 }).toBe("Double the force gives double the deformation.");
    expect(consoleErrors).toEqual([]);
    await context.close();
  }, 60_000);

  it("saves only the parts typed in one tab, so a second tab of the lesson does not wipe the others", async () => {
    const { page, context, consoleErrors } = await openPage(browser);
    await openAsStudent(page, student);
    const second = await context.newPage();
    await page.goto(BUNDLES);
    await second.goto(BUNDLES); // opened before the first tab's claim is saved: its claim box is empty
    const first = page.locator("#answer-cer-bundles");
    await part(first, "Claim").pressSequentially("Side by side the stiffnesses add.");
    await first.getByText("Draft saved by itself.").waitFor();
    const other = second.locator("#answer-cer-bundles");
    await part(other, "Evidence").pressSequentially("Three strips gave about 7 N/cm.");
    await other.getByText("Draft saved by itself.").waitFor();
    await expect(storedAnswer("04-bundles", "cer-bundles")).resolves.toMatchObject({ claim: "Side by side the stiffnesses add.", evidence: "Three strips gave about 7 N/cm." });
    expect(consoleErrors).toEqual([]);
    await context.close();
  }, 60_000);

  it("sends a draft before signing out, and says so when a draft cannot be saved because the session ended", async () => {
    const { page, context } = await openPage(browser);
    await openAsStudent(page, student);
    await page.goto(BUNDLES);
    const answer = page.locator("#answer-cer-bundles");
    // Signing out at once after typing: the draft goes first.
    await part(answer, "Reasoning").pressSequentially("Each strip bends as much as the others.");
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.waitForURL(/\/sign-out\?done=here/);
    await expect(storedAnswer("04-bundles", "cer-bundles")).resolves.toMatchObject({ reasoning: "Each strip bends as much as the others." });

    // Signed out in another tab: the draft is not saved, and the page says what to do.
    await openAsStudent(page, student);
    await page.goto(BUNDLES);
    const elsewhere = await context.newPage();
    await elsewhere.goto("/sign-out");
    await elsewhere.getByRole("button", { name: /Sign out/ }).first().click();
    await elsewhere.waitForURL(/done=/);
    await part(answer, "Reasoning").fill("Each strip bends as much as the others, so each carries a share.");
    await answer.getByTestId("draft-problem").getByText(/you are signed out/).waitFor();
    await expect(answer.getByText("Draft saved by itself.").count()).resolves.toBe(0);
    await expect(storedAnswer("04-bundles", "cer-bundles")).resolves.toMatchObject({ reasoning: "Each strip bends as much as the others." });
    await context.close();
  }, 60_000);

  it("asks before a link leaves changes to a handed-in answer behind", async () => {
    const { page, context, consoleErrors } = await openPage(browser);
    await openAsStudent(page, student);
    await page.goto(LESSON);
    const answer = page.locator("#answer-cer-proportional");
    await part(answer, "Claim").fill("The balsa strip is proportional.");
    await part(answer, "Evidence").fill("Its line goes through the origin.");
    await part(answer, "Reasoning").fill("Double the force gives double the deformation.");
    await answer.getByRole("button", { name: "Hand in" }).click();
    await answer.getByText(/Handed in\. Your teacher can read it now/).waitFor();

    await part(answer, "Claim").fill("The balsa strip is proportional. Also the pine one.");
    await answer.getByText(/hand it in again to send the changes/).waitFor();
    await page.getByRole("link", { name: /Your course/ }).first().click();
    await answer.getByText(/not handed in yet\. Leave without them\?/).waitFor();
    await answer.getByRole("button", { name: "Stay and hand in again" }).click();
    expect(new URL(page.url()).pathname).toBe(LESSON);
    await expect(part(answer, "Claim").inputValue()).resolves.toBe("The balsa strip is proportional. Also the pine one.");

    await page.getByRole("link", { name: /Your course/ }).first().click();
    await answer.getByRole("button", { name: "Leave without the changes" }).click();
    await page.waitForURL(/\/learn$/);
    expect(consoleErrors).toEqual([]);
    await context.close();
  }, 60_000);
});
