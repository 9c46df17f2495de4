// The public landing page in a real browser: it says what Bendwise does, and everything it loads
// (fonts and scripts above all) comes from the app itself.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { appUrl, launchBrowser, openPage } from "./browser";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("landing page", () => {
  it("loads every font and script from the app's own origin, with Literata among the fonts", async () => {
    const { page, consoleErrors, context } = await openPage(browser);
    const loaded: { url: string; type: string }[] = [];
    page.on("request", (request) => loaded.push({ url: request.url(), type: request.resourceType() }));
    const response = await page.goto("/", { waitUntil: "networkidle" });
    expect(response?.status()).toBe(200);
    await page.evaluate(() => document.fonts.ready);

    const origin = new URL(appUrl).origin;
    const fonts = loaded.filter((r) => r.type === "font");
    const scripts = loaded.filter((r) => r.type === "script");
    expect(scripts.length).toBeGreaterThan(0);
    expect(fonts.some((f) => /literata/i.test(f.url))).toBe(true);
    for (const resource of loaded) expect(new URL(resource.url).origin).toBe(origin);

    const literataLoaded = await page.evaluate(() =>
      [...document.fonts].some((f) => f.family.replace(/"/g, "") === "Literata" && f.status === "loaded"),
    );
    expect(literataLoaded).toBe(true);
    const headingFont = await page.locator("h1").evaluate((el) => getComputedStyle(el).fontFamily);
    expect(headingFont).toMatch(/Literata/);
    expect(consoleErrors).toEqual([]);
    await context.close();
  });

  it("says what Bendwise does for schools, teachers and families, with prices", async () => {
    const { page, context } = await openPage(browser);
    await page.goto("/");
    await expect(page.getByRole("heading", { name: "For schools" }).isVisible()).resolves.toBe(true);
    await expect(page.getByRole("heading", { name: "For teachers" }).isVisible()).resolves.toBe(true);
    await expect(page.getByRole("heading", { name: "For families" }).isVisible()).resolves.toBe(true);
    const pricing = await page.locator("#pricing").innerText();
    expect(pricing).toMatch(/per student seat per school year/);
    expect(pricing).toMatch(/per child per school year/);
    await context.close();
  });

  it("fits a phone screen without sideways scrolling", async () => {
    const { page, context } = await openPage(browser, { viewport: { width: 360, height: 740 } });
    await page.goto("/");
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow).toBeLessThanOrEqual(0);
    await context.close();
  });

  it("shows a visible focus ring when moving by keyboard", async () => {
    const { page, context } = await openPage(browser);
    await page.goto("/");
    await page.keyboard.press("Tab");
    await page.keyboard.press("Tab");
    const outline = await page.evaluate(() => {
      const el = document.activeElement as HTMLElement;
      const style = getComputedStyle(el);
      return { width: parseFloat(style.outlineWidth), style: style.outlineStyle };
    });
    expect(outline.style).not.toBe("none");
    expect(outline.width).toBeGreaterThanOrEqual(2);
    await context.close();
  });

  it("sends a content-security policy that allows only the app's own scripts and fonts", async () => {
    const response = await fetch(`${appUrl}/`);
    const csp = response.headers.get("content-security-policy") ?? "";
    expect(csp).toMatch(/script-src 'self' 'nonce-/);
    expect(csp).toMatch(/font-src 'self'/);
  });
});
