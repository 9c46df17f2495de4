// A written answer loses nothing typed: the draft saves itself after a pause in the typing, and when
// the page is left by a link or a reload before that pause; changes to a handed-in answer are not a
// draft, so leaving with them asks first.
import type { Browser, Locator } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { demoSignIns } from "../../drizzle/scripts/seed";
import { launchBrowser, openAsStudent, openPage } from "./browser";

// A demo student of the second class whom no other browser test uses.
const student = { code: "MAPLE7B", username: "olu.e", password: demoSignIns.student.password };
const LESSON = "/learn/03-proportional-or-not";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const part = (answer: Locator, name: string) => answer.getByLabel(name, { exact: true });

describe("a written answer", () => {
  it("keeps what was typed through a pause, a link away and back, and a reload at once", async () => {
    const { page, context, consoleErrors } = await openPage(browser);
    await openAsStudent(page, student);
    await page.goto(LESSON);
    const answer = page.locator("#answer-cer-proportional");

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
    // Put back once the page runs (from the tab's copy, if the reload outran the save).
    await expect.poll(() => part(answer, "Reasoning").inputValue()).toBe("Double the force gives double the deformation.");
    await answer.getByText("Draft saved by itself.").waitFor();
    await page.reload();
    await expect(part(answer, "Reasoning").inputValue()).resolves.toBe("Double the force gives double the deformation.");
    expect(consoleErrors).toEqual([]);
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
