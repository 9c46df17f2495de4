// A student's lesson in a real browser: per-student numbers, feedback with hints, answers in another
// unit, progress kept across a reload, no expected answer anywhere the browser can see, a whole
// lesson from start to finish, an accessibility scan, and math that carries MathML.
import { eq } from "drizzle-orm";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { users } from "~/db/schema.server";
import { exerciseInstance } from "~/lib/course.server";
import { lessonExercises } from "~/lib/lessons.server";
import { demoSignIns } from "../../drizzle/scripts/seed";
import { appUrl, axeViolations, launchBrowser, openAsStudent, openPage } from "./browser";

const LESSON = "02-force-and-deformation";
let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});


async function studentIdOf(username: string) {
  const [row] = await db.select({ id: users.id }).from(users).where(eq(users.username, username));
  return row.id;
}

/** The right answer of each exercise for a student, worked out the way the server does. */
async function answersFor(username: string) {
  const id = await studentIdOf(username);
  return lessonExercises(LESSON).exercises.map((definition) => ({ definition, instance: exerciseInstance(id, LESSON, definition, []) }));
}

const exercise = (page: Page, id: string) => page.locator(`[data-exercise="${id}"]`);

describe("a lesson in the browser", () => {
  it("shows each student their own numbers, hints a wrong answer, accepts mm for cm and keeps progress after a reload", async () => {
    const amira = await openPage(browser);
    await openAsStudent(amira.page, demoSignIns.student);
    await amira.page.goto(`/learn/${LESSON}`);
    const amiraPrompt = await exercise(amira.page, "deformation-from-readings").getByTestId("exercise-prompt").first().innerText();

    const ben = await openPage(browser);
    await openAsStudent(ben.page, demoSignIns.secondStudent);
    await ben.page.goto(`/learn/${LESSON}`);
    const benPrompt = await exercise(ben.page, "deformation-from-readings").getByTestId("exercise-prompt").first().innerText();
    expect(benPrompt).not.toBe(amiraPrompt);
    await ben.context.close();

    // Amira's numbers: "Its unloaded reading is X cm … the ruler reads Y cm."
    const [unloaded, loaded] = [...amiraPrompt.matchAll(/(\d+(?:\.\d+)?) cm/g)].map((m) => Number(m[1]));
    const box = exercise(amira.page, "deformation-from-readings");
    await box.getByLabel(/Your answer/).fill(`${loaded} cm`);
    await box.getByRole("button", { name: "Check my answer" }).click();
    await expect(box.getByTestId("exercise-hint").textContent()).resolves.toMatch(/unloaded reading − loaded reading/);
    await expect(box.getByTestId("exercise-feedback").textContent()).resolves.toMatch(/ruler reading with the load on/);

    const mm = Math.round((unloaded - loaded) * 100) / 10;
    await box.getByLabel(/Your answer/).fill(`${mm} mm`);
    await box.getByRole("button", { name: "Check my answer" }).click();
    await box.getByText("That's right.").waitFor();

    await amira.page.reload();
    await expect(exercise(amira.page, "deformation-from-readings").getByTestId("exercise-status").innerText()).resolves.toBe("Right");
    await expect(amira.page.getByTestId("lesson-progress").innerText()).resolves.toMatch(/^1 of 7 parts done\b/);

    await amira.page.goto("/learn");
    // /learn counts the same parts as the lesson page: six exercises and the written answer.
    await expect(amira.page.getByTestId(`path-${LESSON}`).innerText()).resolves.toMatch(/1 of 7 parts done/);
    expect(amira.consoleErrors).toEqual([]);
    await amira.context.close();
  });

  it("never sends an expected answer or a worked solution to the student's browser: not in the page, the loader data or the lesson bundle", async () => {
    const { page, context } = await openPage(browser);
    await openAsStudent(page, { ...demoSignIns.student, username: "carmen.l" });
    const html = await (await page.goto(`/learn/${LESSON}`))!.text();
    const loaderData = await page.evaluate(async (url) => (await fetch(url)).text(), `/learn/${LESSON}.data`);
    const bundleUrl = await page.locator('script[src^="/lesson-code/"]').getAttribute("src");
    const bundle = await page.evaluate(async (url) => (await fetch(url!)).text(), bundleUrl);
    const kinds = new Set<string>();
    for (const { definition, instance } of await answersFor("carmen.l")) {
      kinds.add(definition.kind);
      for (const [name, body] of [["page", html], ["loader data", loaderData], ["bundle", bundle]] as const) {
        for (const line of instance.solution.split("\n")) expect(body, `${definition.id} solution in the ${name}`).not.toContain(line);
        for (const key of ["correctChoice", "\"expected\"", "\"cells\""]) expect(body, `${key} in the ${name}`).not.toContain(key);
      }
    }
    expect(kinds).toEqual(new Set(["number", "table", "choice"]));
    await context.close();
  });

  it("goes through the whole lesson from the prediction to the handed-in written answer", async () => {
    const student = { ...demoSignIns.student, username: "dev.p" };
    const { page, context, consoleErrors } = await openPage(browser);
    await openAsStudent(page, student);
    await page.goto(`/learn/${LESSON}`);

    // The data stays hidden until a prediction is committed.
    await expect(page.getByRole("table", { name: /basswood strip/ }).count()).resolves.toBe(0);
    await page.getByLabel("Stay about the same").check();
    await page.getByRole("button", { name: /Commit my prediction/ }).click();
    await page.getByRole("table", { name: /basswood strip/ }).waitFor();
    await expect(page.getByText("Your prediction:").count()).resolves.toBe(1);

    for (const { definition, instance } of await answersFor(student.username)) {
      const box = exercise(page, definition.id);
      if (definition.kind === "choice") {
        const label = instance.choices!.find((c) => c.value === instance.correctChoice)!.label;
        await box.getByLabel(label).check();
        await box.getByLabel(/Why\?/).fill("I divided each force by its deformation and compared them.");
      } else if (definition.kind === "table") {
        const cells = box.locator('input[name="cell"]');
        for (const [i, cell] of instance.cells!.entries()) await cells.nth(i).fill(`${cell.value} ${cell.unit}`);
      } else {
        await box.getByLabel(/Your answer/).fill(`${Number(instance.expected!.value.toPrecision(4))} ${instance.expected!.unit}`);
      }
      await box.getByRole("button", { name: "Check my answer" }).click();
      await box.getByText("That's right.").waitFor();
    }

    const answer = page.locator("#answer-cer-stiffness");
    await answer.getByLabel("Claim", { exact: true }).fill("The stick's stiffness is about the same at every load.");
    await answer.getByLabel("Evidence", { exact: true }).fill("Force ÷ deformation gives about 2.5 N/cm for each reading up to 6 N.");
    // Near the 4,000-character limit the field counts what is left; a paste past it says the part is full.
    const reasoning = answer.getByLabel("Reasoning", { exact: true });
    await reasoning.fill("x".repeat(3990));
    await answer.getByText("10 of 4,000 characters left.").waitFor();
    await reasoning.fill("x".repeat(5000));
    await answer.getByText(/This part is full/).waitFor();
    await reasoning.fill("If the ratio stays the same, force and deformation grow together.");
    await expect(answer.getByTestId("characters-left").count()).resolves.toBe(0);
    await answer.getByRole("button", { name: "Hand in" }).click();
    await answer.getByText(/Handed in/).waitFor();

    await page.reload();
    await expect(page.getByTestId("lesson-progress").innerText()).resolves.toMatch(/^(\d+) of \1 parts done · lesson complete/);
    expect(consoleErrors).toEqual([]);
    await context.close();
  });

  it("keeps the keyboard where it was when an answer is sent, and takes it to a new row of readings", async () => {
    const { page, context, consoleErrors } = await openPage(browser);
    // A child learning at home: no other browser test uses their lesson 2 (grace.w is the teacher test's).
    await openAsStudent(page, demoSignIns.child);
    await page.goto(`/learn/${LESSON}`);
    // Enter on a prediction's option chooses it and does not commit it (a prediction cannot be changed).
    await page.getByLabel("Go up").focus();
    await page.keyboard.press("Space");
    await page.keyboard.press("Enter");
    await page.waitForTimeout(300);
    await expect(page.getByRole("button", { name: /Commit my prediction/ }).count()).resolves.toBe(1);
    await expect(page.getByText("Your prediction:").count()).resolves.toBe(0);
    const box = exercise(page, "stiffness-one-reading");
    await box.getByLabel(/Your answer/).fill("99 N/cm");
    await box.getByRole("button", { name: "Check my answer" }).focus();
    await page.keyboard.press("Enter");
    // The button stays where the keyboard is while the answer is checked ("Checking…") and after it
    // (a disabled button would drop focus to the page).
    await expect(page.evaluate(() => document.activeElement?.tagName)).resolves.toBe("BUTTON");
    await expect.poll(() => page.evaluate(() => document.activeElement?.textContent?.trim())).toBe("Check my answer");
    await expect(box.getByTestId("exercise-feedback").textContent()).resolves.not.toBe("");

    await page.goto("/learn/07-home-lab");
    const readings = page.locator("#readings-ruler-readings");
    await readings.getByRole("button", { name: "Add a row" }).focus();
    await page.keyboard.press("Enter");
    await expect(page.evaluate(() => document.activeElement?.getAttribute("aria-label"))).resolves.toBe("Force, row 7");
    expect(consoleErrors).toEqual([]);
    await context.close();
  });

  it("passes an accessibility scan (axe-core) with no violation, and its math carries MathML", async () => {
    // The scan script is injected by the test, so this context alone may bypass the page's CSP.
    const { page, context } = await openPage(browser, { bypassCSP: true });
    await openAsStudent(page, { ...demoSignIns.student, username: "elif.s" });
    await page.goto(`/learn/${LESSON}`);
    await expect(page.locator("math").count()).resolves.toBeGreaterThan(2);
    await expect(page.locator("annotation[encoding='application/x-tex']").count()).resolves.toBeGreaterThan(2);

    expect(await axeViolations(page)).toEqual([]);
    await context.close();
  });

  it("on a phone: a table names and marks its wrong cell (also after a reload) and says when it scrolls; a choice's last try reads as the last", async () => {
    // A student of the second class, whose lessons 3 and 5 no other browser test touches.
    const student = { code: "MAPLE7B", username: "priya.v", password: demoSignIns.student.password };
    const { page, context, consoleErrors } = await openPage(browser, { viewport: { width: 375, height: 740 } });
    await openAsStudent(page, student);
    const id = await studentIdOf(student.username);

    // Lesson 3's sums: three rows, two empty cells each (F × x and x²).
    const SUMS = "03-proportional-or-not";
    const definition = lessonExercises(SUMS).exercises.find((e) => e.id === "products-table")!;
    const instance = exerciseInstance(id, SUMS, definition, []);
    await page.goto(`/learn/${SUMS}`);
    const box = exercise(page, "products-table");
    const scroller = box.getByTestId("table-box");
    await scroller.scrollIntoViewIfNeeded();
    // Four columns are still wider than a 375 px screen: the table says it scrolls; on a wide screen it does not.
    const overflows = () => scroller.evaluate((el) => el.scrollWidth > el.clientWidth + 1);
    await expect(overflows()).resolves.toBe(true);
    await expect(box.getByTestId("table-scroll-hint").innerText()).resolves.toMatch(/slide it sideways to see every column/);
    await page.setViewportSize({ width: 1280, height: 800 });
    await expect.poll(() => box.getByTestId("table-scroll-hint").count()).toBe(0);
    await expect(overflows()).resolves.toBe(false);
    await page.setViewportSize({ width: 375, height: 740 });
    await box.getByTestId("table-scroll-hint").waitFor();
    // Typed as on a phone keyboard: "Ncm" for N·cm and "cm2" for cm²; the last x² is ten times too big.
    const typed = instance.cells!.map((cell, i) => {
      const value = Number((i === 5 ? cell.value * 10 : cell.value).toPrecision(4));
      return `${value} ${cell.unit === "cm^2" ? "cm2" : "Ncm"}`;
    });
    const cells = box.locator('input[name="cell"]');
    for (const [i, text] of typed.entries()) await cells.nth(i).fill(text);
    await box.getByRole("button", { name: "Check my answer" }).click();
    const feedback = box.getByTestId("exercise-feedback");
    await expect.poll(() => feedback.innerText()).toMatch(/Row 3, x²: That does not match/);
    expect(await feedback.innerText()).not.toMatch(/Row [4-6]/);
    const invalid = async () => cells.evaluateAll((inputs) => inputs.map((input) => input.getAttribute("aria-invalid") === "true"));
    await expect(invalid()).resolves.toEqual([false, false, false, false, false, true]);
    await page.reload();
    await expect(invalid()).resolves.toEqual([false, false, false, false, false, true]);
    await expect(exercise(page, "products-table").getByTestId("exercise-feedback").innerText()).resolves.toMatch(/^Not yet\./);

    // Lesson 5's choice has two options, so one try: a wrong one is the last, and says so.
    const CHOICE = "05-elastic-permanent-broken";
    const choiceDefinition = lessonExercises(CHOICE).exercises.find((e) => e.id === "came-back-choice")!;
    const choiceInstance = exerciseInstance(id, CHOICE, choiceDefinition, []);
    await page.goto(`/learn/${CHOICE}`);
    const choiceBox = exercise(page, "came-back-choice");
    await expect(choiceBox.getByTestId("exercise-status").innerText()).resolves.toBe("Last try (of 1)");
    for (const radio of await choiceBox.locator('input[type="radio"]').all()) {
      const size = (await radio.boundingBox())!;
      expect([Math.round(size.width), Math.round(size.height)]).toEqual([20, 20]);
    }
    const wrong = choiceInstance.choices!.find((c) => c.value !== choiceInstance.correctChoice)!;
    await choiceBox.getByLabel(wrong.label).check();
    await choiceBox.getByRole("button", { name: "Check my answer" }).click();
    await expect.poll(() => choiceBox.getByTestId("exercise-status").innerText()).toBe("Tries used up");
    await expect(choiceBox.getByTestId("exercise-feedback").innerText()).resolves.toMatch(/^Not right\. That was the last try\./);
    await choiceBox.getByTestId("exercise-solution").waitFor();
    const chosen = choiceBox.locator("label[data-chosen]");
    await expect(chosen.innerText()).resolves.toMatch(new RegExp(`^${wrong.label.replace(/[.*+?^${}()|[\]\\]/g, "\\$&")}\\s*your answer$`));
    await expect(choiceBox.locator("fieldset label:not([data-chosen])").innerText()).resolves.not.toMatch(/your answer/);
    await expect(chosen.evaluate((el) => getComputedStyle(el).fontWeight)).resolves.toBe("700");
    expect(consoleErrors).toEqual([]);
    await context.close();
  });

  it("serves the lesson's code from the app's own origin with no eval needed", async () => {
    const { page, context, consoleErrors } = await openPage(browser);
    await openAsStudent(page, { ...demoSignIns.student, username: "finn.o" });
    const response = await page.goto(`/learn/${LESSON}`);
    expect(response!.headers()["content-security-policy"]).not.toContain("unsafe-eval");
    // Client-side navigation to another lesson loads its script on the way.
    await page.getByRole("link", { name: /Next lesson/ }).click();
    await page.waitForURL(/\/learn\/03-/);
    await page.locator("h1").waitFor();
    expect(await page.locator("article h1").innerText()).not.toBe("");
    expect(consoleErrors).toEqual([]);
    expect(new URL(appUrl).origin).toBe(new URL(page.url()).origin);
    await context.close();
  });
});
