// Shared set-up for browser tests: Debian's Chromium driven by playwright-core (never a browser download).
import { chromium, type Browser, type BrowserContext, type Page } from "playwright-core";

export const appUrl = process.env.BENDWISE_APP_URL ?? "";
if (!appUrl) throw new Error("Browser tests run through `npm test`, which serves the app first.");

export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: "/usr/bin/chromium",
    args: [
      "--headless",
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
    ],
  });
}

/** A page that records console errors and failed requests, so a test can fail on them. */
export async function openPage(browser: Browser, options: Parameters<Browser["newContext"]>[0] = {}) {
  const context: BrowserContext = await browser.newContext({ baseURL: appUrl, ...options });
  const page: Page = await context.newPage();
  const consoleErrors: string[] = [];
  page.on("console", (message) => {
    if (message.type() === "error") consoleErrors.push(message.text());
  });
  page.on("pageerror", (error) => consoleErrors.push(error.message));
  return { context, page, consoleErrors };
}
