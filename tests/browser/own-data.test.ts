// Own readings in the home lab: six readings typed into lesson 7 give the same stiffness and fit as
// POST /api/analysis on the same readings, an own-data exercise is checked against them, bad rows are
// named and lose nothing, and a set-up photo is checked by its real type.
import { deflateSync } from "node:zlib";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { formatForStudent } from "~/lib/science";
import { demoSignIns } from "../../drizzle/scripts/seed";
import { appUrl, launchBrowser, openAsStudent, openPage } from "./browser";

const LESSON = "07-home-lab";
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});


// Invented readings of a plastic ruler bending under water bottles.
const unloadedCm = 24.0;
const readings = [
  { forceN: 0.5, readingCm: 23.7 },
  { forceN: 1.0, readingCm: 23.3 },
  { forceN: 1.5, readingCm: 23.0 },
  { forceN: 2.0, readingCm: 22.6 },
  { forceN: 2.5, readingCm: 22.3 },
  { forceN: 3.0, readingCm: 21.9 },
];

/** A real 1×1 PNG, made here so no image file is needed. */
function tinyPng(): Buffer {
  const crc = (buf: Buffer) => {
    let c = ~0;
    for (const b of buf) {
      c ^= b;
      for (let k = 0; k < 8; k++) c = c & 1 ? (c >>> 1) ^ 0xedb88320 : c >>> 1;
    }
    return ~c >>> 0;
  };
  const chunk = (type: string, data: Buffer) => {
    const body = Buffer.concat([Buffer.from(type), data]);
    const out = Buffer.alloc(12 + data.length);
    out.writeUInt32BE(data.length, 0);
    body.copy(out, 4);
    out.writeUInt32BE(crc(body), 8 + data.length);
    return out;
  };
  const header = Buffer.from([0, 0, 0, 1, 0, 0, 0, 1, 8, 2, 0, 0, 0]);
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk("IHDR", header),
    chunk("IDAT", deflateSync(Buffer.from([0, 200, 120, 80]))),
    chunk("IEND", Buffer.alloc(0)),
  ]);
}

describe("own readings in the home lab", () => {
  it("on a phone: numbered rows, a marked cell for each problem, readings not clipped, columns reachable; a slipped decimal is named", { timeout: 60_000 }, async () => {
    const { page, context, consoleErrors } = await openPage(browser, { viewport: { width: 375, height: 800 } });
    await openAsStudent(page, { ...demoSignIns.student, username: "ines.r" });
    await page.goto(`/learn/${LESSON}`);
    const table = page.locator("#readings-stirrer-readings");
    await table.locator("tbody tr").first().waitFor();
    // Row numbers are shown beside the rows.
    expect(await table.locator("tbody th[scope=row]").allInnerTexts()).toEqual(["1", "2", "3", "4", "5", "6"]);

    await table.getByLabel(/Unloaded reading/).fill("38.0");
    const heights = ["37.7", "37.5", "2O.5", "36.9", "36.6"];
    for (const [i, h] of heights.entries()) {
      await table.getByLabel(`Force, row ${i + 1}`).fill((0.98 * (i + 1)).toFixed(2));
      await table.getByLabel(new RegExp(`Loaded reading \\(cm\\), row ${i + 1}$`)).fill(h);
    }
    // "37.2cm" as a student types it fits its cell.
    const row6 = table.getByLabel(/Loaded reading \(cm\), row 6$/);
    await row6.fill("37.2cm");
    expect(await row6.evaluate((el: HTMLInputElement) => el.scrollWidth <= el.clientWidth)).toBe(true);
    await row6.fill("");
    await table.getByRole("button", { name: "Save and analyse" }).click();
    await table.getByRole("alert").waitFor();
    expect(await table.getByRole("alert").innerText()).toMatch(/Row 3: the reading “2O.5” is not a number/);
    const bad = table.getByLabel(/Loaded reading \(cm\), row 3$/);
    expect(await bad.getAttribute("aria-invalid")).toBe("true");
    expect(await bad.evaluate((el) => getComputedStyle(el).borderColor)).not.toBe(await table.getByLabel(/Loaded reading \(cm\), row 2$/).evaluate((el) => getComputedStyle(el).borderColor));
    expect(await table.getByLabel(/Loaded reading \(cm\), row 2$/).getAttribute("aria-invalid")).toBeNull();
    consoleErrors.splice(0, consoleErrors.length, ...consoleErrors.filter((e) => !/status of 400/.test(e)));

    // Every column can be reached: the table fits, or it says it slides and the last column scrolls into view.
    const fits = await table.locator("div.overflow-x-auto").evaluate((el) => el.scrollWidth <= el.clientWidth + 1);
    if (!fits) {
      expect(await table.getByTestId("readings-slide-hint").isVisible()).toBe(true);
      await table.locator("div.overflow-x-auto").evaluate((el) => el.scrollTo({ left: el.scrollWidth }));
    }
    const box = await table.locator("div.overflow-x-auto").boundingBox();
    const broke = await table.getByRole("columnheader", { name: "Broke" }).boundingBox();
    expect(broke!.x + broke!.width).toBeLessThanOrEqual(box!.x + box!.width + 1);

    // 3.69 typed for 36.9: saved, analysed, and named as worth a second look.
    await table.getByLabel(/Loaded reading \(cm\), row 3$/).fill("37.2");
    await table.getByLabel(/Loaded reading \(cm\), row 4$/).fill("3.69");
    await table.getByRole("button", { name: "Save and analyse" }).click();
    await table.getByTestId("readings-analysis").waitFor();
    expect(await table.getByTestId("reading-cautions").innerText()).toContain("Row 4 (3.69 cm) is far from the other readings: was it typed right?");
    expect(await table.getByLabel(/Loaded reading \(cm\), row 3$/).getAttribute("aria-invalid")).toBeNull();
    // The cell it names is marked too (amber: a second look, not an error), the others not.
    const colour = (row: number) => table.getByLabel(new RegExp(`Loaded reading \\(cm\\), row ${row}$`)).evaluate((el) => getComputedStyle(el).backgroundColor);
    expect(await colour(4)).not.toBe(await colour(3));
    expect(await colour(5)).toBe(await colour(3));
    expect(consoleErrors).toEqual([]);
    await context.close();
  });

  it("gives the same stiffness and fit as POST /api/analysis, and checks an own-data exercise against them", async () => {
    const { page, context, consoleErrors } = await openPage(browser);
    await openAsStudent(page, { ...demoSignIns.student, username: "hugo.m" });
    await page.goto(`/learn/${LESSON}`);
    const table = page.locator("#readings-ruler-readings");

    // An own-data question waits for the readings.
    const question = page.locator('[data-exercise="own-ruler-largest-stiffness"]');
    await expect(question.getByText(/Save your readings above first/).count()).resolves.toBe(1);

    // A bad row is named, and what was typed stays.
    await table.getByLabel("What you tested").fill("plastic ruler");
    await table.getByLabel(/Unloaded reading/).fill(String(unloadedCm));
    await table.getByLabel("Force, row 1").fill("0.5");
    await table.getByLabel(/Loaded reading \(cm\), row 1/).fill("abc");
    await table.getByRole("button", { name: "Save and analyse" }).click();
    await table.getByRole("alert").waitFor();
    expect(await table.getByRole("alert").innerText()).toMatch(/Row 1: the reading “abc” is not a number/);
    expect(await table.getByLabel("Force, row 1").inputValue()).toBe("0.5");
    // The browser logs the expected 400 of that refusal; only later errors count.
    consoleErrors.splice(0, consoleErrors.length, ...consoleErrors.filter((e) => !/status of 400/.test(e)));

    for (const [i, r] of readings.entries()) {
      await table.getByLabel(`Force, row ${i + 1}`).fill(String(r.forceN));
      await table.getByLabel(new RegExp(`Loaded reading \\(cm\\), row ${i + 1}$`)).fill(String(r.readingCm));
    }
    await table.getByRole("button", { name: "Save and analyse" }).click();
    await table.getByTestId("readings-analysis").waitFor();
    const shown = await table.getByTestId("stiffness-through-origin").innerText();

    const api = await fetch(`${appUrl}/api/analysis`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ mode: "bend", unloadedCm, resolutionCm: 0.1, points: readings }),
    }).then((r) => r.json());
    expect(shown).toBe(`${formatForStudent(api.fit.throughOrigin.slope)} N/cm`);
    const page2 = await page.evaluate(async (url) => (await fetch(url)).json(), `/learn/${LESSON}.data`).catch(() => null);
    expect(page2).not.toBeUndefined();

    // The own-data question now uses these readings: the largest load's stiffness, from the API's own points.
    await page.reload();
    const top = api.points[api.points.length - 1];
    const k = top.forceN / top.deformationCm;
    await question.getByLabel(/Your answer/).fill(`${k.toPrecision(3)} N/cm`);
    await question.getByRole("button", { name: "Check my answer" }).click();
    await question.getByText("That's right.").waitFor();
    expect(consoleErrors).toEqual([]);
    await context.close();
  });

  it("keeps readings typed but not saved across a reload and a trip through the course, until they are saved", { timeout: 60_000 }, async () => {
    const { page, context, consoleErrors } = await openPage(browser, { viewport: { width: 375, height: 740 } });
    await openAsStudent(page, { ...demoSignIns.student, code: "MAPLE7B", username: "tara.c" });
    await page.goto(`/learn/${LESSON}`);
    const table = () => page.locator("#readings-ruler-readings");
    await table().getByLabel("What you tested").fill("blue ruler");
    await table().getByLabel(/Unloaded reading/).fill("38,0");
    await table().getByRole("button", { name: "Add a row" }).click();
    await table().getByLabel("Force, row 7").fill("6.87");
    await table().getByLabel(/Loaded reading \(cm\), row 7/).fill("35.2");
    await table().getByLabel("Force, row 1").fill("0.98");
    await table().getByLabel(/Loaded reading \(cm\), row 1/).fill("37.6");
    await table().getByLabel(/Broke at this load, row 7/).check();

    // The phone drops the page (a reload): every cell comes back, and the page says they are not saved yet.
    await page.reload();
    await table().getByTestId("readings-put-back").waitFor();
    expect(await table().getByLabel("What you tested").inputValue()).toBe("blue ruler");
    expect(await table().getByLabel(/Unloaded reading/).inputValue()).toBe("38,0");
    expect(await table().getByLabel("Force, row 7").inputValue()).toBe("6.87");
    expect(await table().getByLabel(/Broke at this load, row 7/).isChecked()).toBe(true);
    expect(await table().getByLabel(/Loaded reading \(cm\), row 1/).inputValue()).toBe("37.6");

    // Away through the course and back: still there.
    await page.getByRole("link", { name: "← Your course" }).click();
    await page.waitForURL(/\/learn$/);
    await page.goBack();
    await table().getByTestId("readings-put-back").waitFor();
    expect(await table().getByLabel(/Loaded reading \(cm\), row 7/).inputValue()).toBe("35.2");

    // Saved: the copy has done its work; a reload shows the saved readings and no note.
    await table().getByLabel(/Broke at this load, row 7/).uncheck();
    await table().getByRole("button", { name: "Save and analyse" }).click();
    await table().getByText("Saved.").waitFor();
    await page.reload();
    await table().getByTestId("readings-analysis").waitFor();
    await page.waitForTimeout(300);
    expect(await table().getByTestId("readings-put-back").count()).toBe(0);
    expect(await table().getByLabel(/Unloaded reading/).inputValue()).toBe("38.0");
    expect(await table().getByLabel("Force, row 2").inputValue()).toBe("6.87");
    expect(consoleErrors).toEqual([]);
    await context.close();
  });

  it("stores a real photo and refuses a file that only pretends to be one", { timeout: 60_000 }, async () => {
    const { page, context } = await openPage(browser);
    await openAsStudent(page, { ...demoSignIns.student, username: "ines.r" });
    await page.goto(`/learn/${LESSON}`);
    const box = page.locator("#photo-setup-photo");

    await box.locator('input[type="file"]').setInputFiles({ name: "setup.png", mimeType: "image/png", buffer: Buffer.from("this is not a picture at all") });
    await box.getByRole("button", { name: "Upload the photo" }).click();
    await box.getByRole("alert").waitFor({ timeout: 10_000 }).catch(async (e) => {
      await page.screenshot({ path: "tests/.artifacts/photo-refusal.png", fullPage: true });
      throw e;
    });
    expect(await box.getByRole("alert").innerText()).toMatch(/not a JPEG, PNG or WebP photo/);
    await expect(box.locator("img").count()).resolves.toBe(0);

    await box.locator('input[type="file"]').setInputFiles({ name: "setup.png", mimeType: "image/png", buffer: tinyPng() });
    await box.getByRole("button", { name: "Upload the photo" }).click();
    await box.locator("img").waitFor();
    const src = await box.locator("img").getAttribute("src");
    const photo = await page.evaluate(async (url) => {
      const r = await fetch(url!);
      return { status: r.status, type: r.headers.get("content-type") };
    }, src);
    expect(photo).toEqual({ status: 200, type: "image/png" });

    // Saved: the box no longer holds the file, so a second press does not send the same photo again.
    await box.getByText("Photo saved.").waitFor();
    expect(await box.locator('input[type="file"]').evaluate((input: HTMLInputElement) => input.files?.length ?? 0)).toBe(0);
    await box.getByRole("button", { name: "Upload the photo" }).click();
    expect(await box.getByRole("alert").innerText()).toMatch(/Choose a photo first/);
    await expect(box.locator("img").count()).resolves.toBe(1);

    // Another student cannot open it.
    const other = await openPage(browser);
    await openAsStudent(other.page, { ...demoSignIns.student, username: "jonah.b" });
    const response = await other.page.goto(src!);
    expect(response!.status()).toBe(404);
    await other.context.close();
    await context.close();
  });
});

describe("the analyser (/tools/analyse)", () => {
  it("starts empty, analyses only what was typed, keeps it across a reload until Clear", { timeout: 60_000 }, async () => {
    const { page, context, consoleErrors } = await openPage(browser);
    await page.goto("/tools/analyse");
    const box = page.getByLabel("Readings");
    expect(await box.inputValue()).toBe("");
    expect(await box.getAttribute("placeholder")).toMatch(/^For example:\nforce \(N\)/);
    expect(await page.getByLabel("Unloaded reading (cm)").inputValue()).toBe("");

    // Own readings pasted into the empty box: these and nothing else are analysed.
    const own = "1, 24.6\n2, 24.2\n3, 23.8\n4, 23.4";
    await box.fill(own);
    await page.getByLabel("Unloaded reading (cm)").fill("25.0");
    await page.getByRole("button", { name: "Analyse" }).click();
    await page.getByTestId("analysis-report").waitFor();
    expect(await page.getByTestId("analysis-report").locator("tbody tr").count()).toBe(4);
    expect(await page.getByTestId("slope-through-origin").innerText()).toBe("2.50 N/cm (± 0.00)");

    // A reload keeps what was typed.
    await page.reload();
    await page.waitForFunction(() => (document.querySelector("#readings") as HTMLTextAreaElement | null)?.value !== "");
    expect(await box.inputValue()).toBe(own);
    expect(await page.getByLabel("Unloaded reading (cm)").inputValue()).toBe("25.0");

    // Clear empties the form, and a reload keeps it empty.
    await page.getByRole("button", { name: "Clear" }).click();
    expect(await box.inputValue()).toBe("");
    await page.reload();
    await page.getByRole("button", { name: "Fill in the example" }).waitFor();
    await page.waitForTimeout(300);
    expect(await box.inputValue()).toBe("");

    // The example goes in only when asked for.
    await page.getByRole("button", { name: "Fill in the example" }).click();
    expect(await box.inputValue()).toMatch(/^force \(N\), loaded reading \(cm\)\n0, 21\.0/);
    expect(await page.getByLabel("Unloaded reading (cm)").inputValue()).toBe("21.0");
    expect(consoleErrors).toEqual([]);
    await context.close();
  });
});
