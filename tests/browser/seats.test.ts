// Buying seats in Debian's Chromium against the production build and the payments fake: the demo
// administrator buys 10 seats with the success test card and sees 10 more once the signed event has
// arrived; the declined card gives no seats and a clear message; an invoice is asked for, marked paid
// on the fake's operator desk, and its seats appear. Screenshots land in tests/.artifacts/.
import { mkdirSync } from "node:fs";
import path from "node:path";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { demoSignIns } from "../../drizzle/scripts/seed";
import { listCaughtMail } from "../fakes/mail-catcher";
import { launchBrowser, openPage } from "./browser";

const paymentsUrl = process.env.PAYMENTS_API_URL!;
const mailWebPort = Number(process.env.BENDWISE_MAIL_WEB_PORT);
const shots = path.join(process.cwd(), "tests", ".artifacts", "seats");
mkdirSync(shots, { recursive: true });

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

// The fake's card page answers a refused card with 402 on purpose; Chromium notes that in the console.
const expected = /Failed to load resource: the server responded with a status of 402/;
const unexpected = (errors: string[]) => errors.filter((e) => !expected.test(e));

async function signInAsAdmin(page: Page) {
  await page.goto("/sign-in");
  const door = page.getByRole("region", { name: "Adults" });
  await door.getByLabel("E-mail address").fill(demoSignIns.schoolAdmin.email);
  await door.getByLabel("Password").fill(demoSignIns.schoolAdmin.password);
  await door.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL((url) => url.pathname === "/school");
}

async function seatsBought(page: Page, year = "2026-27"): Promise<number> {
  await page.goto("/school/seats");
  return Number(await page.locator(`[data-testid="seat-ledger"] tr[data-year="${year}"] [data-cell="bought"]`).innerText());
}

async function orderSeats(page: Page, seats: number, method: "card" | "invoice", purchaseOrder = "") {
  await page.goto("/school/seats");
  await page.getByRole("link", { name: "Buy seats" }).click();
  await page.waitForURL(/\/school\/seats\/buy/);
  await page.getByRole("heading", { name: "Buy student seats" }).waitFor();
  // A number out of range is named as such, with the order's own limits, instead of a total.
  for (const wrong of ["0", "99999", "99999999999999999999"]) {
    await page.getByLabel("How many seats?").fill(wrong);
    await expect(page.getByTestId("order-total").innerText()).resolves.toBe("That is outside the range: enter a whole number of seats from 1 to 5,000.");
  }
  await page.getByLabel("How many seats?").fill("1e3");
  await expect(page.getByTestId("order-total").innerText()).resolves.toBe("Use digits only: a whole number of seats from 1 to 5,000.");
  await page.getByLabel("How many seats?").fill("");
  await expect(page.getByTestId("order-total").innerText()).resolves.toBe("Enter a whole number of seats from 1 to 5,000.");
  await page.getByLabel("How many seats?").fill(String(seats));
  if (method === "invoice") {
    await page.getByLabel("By invoice").check();
    await page.getByRole("textbox", { name: "Purchase-order number" }).fill(purchaseOrder);
  }
  await expect(page.getByTestId("order-total").innerText()).resolves.toContain(`$${(seats * 9).toFixed(2)}`);
}

async function payOnFakePage(page: Page, card: string) {
  await page.getByLabel("Card number").fill(card);
  await page.getByLabel("Expiry (MM/YY)").fill("12/34");
  await page.getByLabel("Security code").fill("123");
  await page.getByLabel("Name on card").fill("Dana Whitcombe");
  await page.getByRole("button", { name: /^Pay \$/ }).click();
}

describe("buying seats", () => {
  it("by card: 10 seats with 4242 4242 4242 4242 appear once the payment is confirmed", async () => {
    const { page, context, consoleErrors } = await openPage(browser);
    await signInAsAdmin(page);
    const before = await seatsBought(page);
    await page.screenshot({ path: path.join(shots, "1-ledger-before.png"), fullPage: true });

    await orderSeats(page, 10, "card");
    await page.screenshot({ path: path.join(shots, "2-buy-form.png"), fullPage: true });
    await page.getByRole("button", { name: "Go to card payment" }).click();
    await page.waitForURL((url) => url.href.startsWith(`${paymentsUrl}/pay/`));
    await expect(page.getByTestId("total").innerText()).resolves.toBe("$90.00");
    await page.screenshot({ path: path.join(shots, "3-payment-page.png"), fullPage: true });

    await payOnFakePage(page, "4242 4242 4242 4242");
    await page.waitForURL(/\/payments\/confirming\?purchase=/);
    // The page waits for the signed event, polling; no seat is granted by the return itself.
    await page.getByTestId("confirmed").waitFor({ timeout: 15_000 });
    await expect(page.getByTestId("confirmed").innerText()).resolves.toBe("10 seats for 2026-27 have been added.");
    await page.screenshot({ path: path.join(shots, "4-confirmed.png"), fullPage: true });

    expect(await seatsBought(page)).toBe(before + 10);
    const newest = page.getByTestId("purchases").locator("li").first();
    await expect(newest.innerText()).resolves.toMatch(/10 seats for 2026-27 · \$90\.00[\s\S]*By card[\s\S]*Paid on/);
    await page.screenshot({ path: path.join(shots, "5-ledger-after.png"), fullPage: true });

    await newest.getByRole("link", { name: /Receipt/ }).click();
    await page.waitForURL(/\/receipts\//);
    await expect(page.getByTestId("receipt").innerText()).resolves.toMatch(/10 student seats for the school year 2026-27[\s\S]*\$90\.00/);
    expect(unexpected(consoleErrors)).toEqual([]);
    await context.close();
  });

  it("by card: the declined card 4000 0000 0000 0002 adds no seats and says so clearly", async () => {
    const { page, context, consoleErrors } = await openPage(browser);
    await signInAsAdmin(page);
    const before = await seatsBought(page);

    await orderSeats(page, 5, "card");
    await page.getByRole("button", { name: "Go to card payment" }).click();
    await page.waitForURL((url) => url.href.startsWith(`${paymentsUrl}/pay/`));
    await payOnFakePage(page, "4000 0000 0000 0002");
    const alert = page.getByRole("alert");
    await alert.waitFor();
    await expect(alert.innerText()).resolves.toBe("The card was declined. No money was taken. Try another card.");
    // What was typed is still there (except the security code).
    await expect(page.getByLabel("Card number").inputValue()).resolves.toBe("4000 0000 0000 0002");
    await page.screenshot({ path: path.join(shots, "6-declined.png"), fullPage: true });

    await page.getByRole("link", { name: "Cancel and go back" }).click();
    await page.waitForURL(/\/payments\/stopped\?purchase=/);
    await expect(page.getByTestId("stopped").innerText()).resolves.toMatch(/no money was taken and no seats were added/);
    await page.screenshot({ path: path.join(shots, "7-stopped.png"), fullPage: true });
    await page.getByRole("button", { name: "Drop this order" }).click();
    await page.waitForURL(/\/school\/seats\?dropped=1/);
    await page.getByText("The card payment was dropped. No money was taken and no seats were added.").waitFor();

    expect(await seatsBought(page)).toBe(before);
    expect(unexpected(consoleErrors)).toEqual([]);
    await context.close();
  });

  it("by invoice: asked for with a purchase-order number, marked paid on the operator desk, then the seats appear", async () => {
    const { page, context, consoleErrors } = await openPage(browser);
    await signInAsAdmin(page);
    const before = await seatsBought(page);

    await orderSeats(page, 20, "invoice", "PO-MAPLE-0099");
    await page.getByRole("button", { name: "Send me the invoice" }).click();
    await page.waitForURL(/\/school\/seats\?invoice=/);
    const sentLine = await page.getByText(/Invoice BWTEST-[0-9A-Z]{5}-\d{4} is on its way to admin@maplebrook\.example\./).innerText();
    // The provider e-mails the invoice itself; the fake does too, to the local inbox, with its page's address.
    const number = /BWTEST-[0-9A-Z]{5}-\d{4}/.exec(sentLine)![0];
    let invoiceMail;
    for (let i = 0; i < 50 && !invoiceMail; i++) {
      invoiceMail = (await listCaughtMail(mailWebPort)).find((m) => m.subject.startsWith(`Invoice ${number} `) && m.to.some((t) => t.address === demoSignIns.schoolAdmin.email));
      if (!invoiceMail) await page.waitForTimeout(200);
    }
    expect(invoiceMail?.text).toContain(`${paymentsUrl}/invoice/`);
    const waiting = page.getByTestId("purchases").locator("li").first();
    await expect(waiting.innerText()).resolves.toMatch(/20 seats for 2026-27[\s\S]*purchase order PO-MAPLE-0099[\s\S]*Invoice sent; the seats are added when it is paid/);
    await page.screenshot({ path: path.join(shots, "8-invoice-asked.png"), fullPage: true });
    expect(await seatsBought(page)).toBe(before);

    const desk = await context.newPage();
    await desk.goto(`${paymentsUrl}/operator`);
    const row = desk.locator("tr", { hasText: "PO-MAPLE-0099" });
    await desk.screenshot({ path: path.join(shots, "9-operator-desk.png"), fullPage: true });
    await row.getByRole("button", { name: /^Mark paid/ }).click();
    await desk.waitForURL(/\/operator\?notice=/);

    for (let i = 0; i < 50 && (await seatsBought(page)) !== before + 20; i++) await page.waitForTimeout(200);
    expect(await seatsBought(page)).toBe(before + 20);
    await expect(page.getByTestId("purchases").locator("li").first().innerText()).resolves.toMatch(/By invoice BWTEST-[0-9A-Z]{5}-\d{4}[\s\S]*Paid on/);
    await page.screenshot({ path: path.join(shots, "10-invoice-paid.png"), fullPage: true });
    expect(unexpected(consoleErrors)).toEqual([]);
    await context.close();
  });
});
