// Shared set-up for browser tests: Debian's Chromium driven by playwright-core (never a browser download).
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
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

/** Fills the adults' door of the sign-in page (the page must be open) and sends it. */
export async function signInAsAdult(page: Page, email: string, password: string) {
  const door = page.getByRole("region", { name: "Adults" });
  await door.getByLabel("E-mail address").fill(email);
  await door.getByLabel("Password").fill(password);
  await door.getByRole("button", { name: "Sign in" }).click();
}

/** Fills the students' door of the sign-in page (the page must be open) and sends it. */
export async function signInAsStudent(page: Page, code: string, username: string, password: string) {
  const door = page.getByRole("region", { name: "Students" });
  await door.getByLabel("Class or family code").fill(code);
  await door.getByLabel("Username").fill(username);
  await door.getByLabel("Password").fill(password);
  await door.getByRole("button", { name: "Sign in" }).click();
}

/** Opens the sign-in page, signs a demo student in and waits for their home. */
export async function openAsStudent(page: Page, who: { code: string; username: string; password: string }) {
  await page.goto("/sign-in");
  await signInAsStudent(page, who.code, who.username, who.password);
  await page.waitForURL(/\/learn/);
}

export interface AxeViolation {
  id: string;
  impact: string | null;
  nodes: string[];
  help: string;
}

const axeSource = () => readFileSync(createRequire(import.meta.url).resolve("axe-core/axe.min.js"), "utf8");

/**
 * Runs the axe-core accessibility scan (WCAG 2 A/AA rules and axe's best practices) on the page as it
 * is now. The page's context must be opened with `bypassCSP: true`: the scan's script is injected by
 * the test, and only such a context may run it past the app's script policy.
 */
export async function axeViolations(page: Page): Promise<AxeViolation[]> {
  await page.addScriptTag({ content: axeSource() });
  return page.evaluate(async () => {
    type Result = { violations: { id: string; impact: string | null; help: string; nodes: { html: string }[] }[] };
    const result = await (window as unknown as { axe: { run: () => Promise<Result> } }).axe.run();
    return result.violations.map((v) => ({ id: v.id, impact: v.impact, help: v.help, nodes: v.nodes.map((n) => n.html.slice(0, 200)) }));
  });
}
