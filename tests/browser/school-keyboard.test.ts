// The school administrator's pages with the keyboard alone and a screen reader's view of them, in
// Debian's Chromium against the production build: a form sent back with problems puts the keyboard
// on the first field to fix; an answer that replaces what had the keyboard takes it; a table wider
// than a phone can be slid with the keys; every purchase's links say which purchase; the payment
// page says "confirmed" in the region it was already reading.
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { demoSignIns } from "../../drizzle/scripts/seed";
import { listCaughtMail } from "../fakes/mail-catcher";
import { axeViolations, launchBrowser, openPage, signInAsAdult, signInAsStudent } from "./browser";

const paymentsUrl = process.env.PAYMENTS_API_URL!;
const mailWebPort = Number(process.env.BENDWISE_MAIL_WEB_PORT);
const phone = { width: 375, height: 740 };

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

async function signInAsAdmin(page: Page) {
  await page.goto("/sign-in");
  await signInAsAdult(page, demoSignIns.schoolAdmin.email, demoSignIns.schoolAdmin.password);
  await page.waitForURL((url) => url.pathname === "/school");
}

/** The element that has the keyboard: its tag, name, whether it is marked wrong, and what describes it. */
function focused(page: Page) {
  return page.evaluate(() => {
    const el = document.activeElement as HTMLElement | null;
    const described = (el?.getAttribute("aria-describedby") ?? "")
      .split(" ")
      .map((id) => document.getElementById(id)?.textContent ?? "")
      .join(" ");
    const text = el && el !== document.body ? (el.textContent ?? "") : "";
    return { tag: el?.tagName.toLowerCase(), name: el?.getAttribute("name"), invalid: el?.getAttribute("aria-invalid"), described, text };
  });
}

describe("forms sent back with problems", () => {
  it("the teacher invitation, the seat order and the sign-in doors put the keyboard on the first field to fix", async () => {
    const { page, context } = await openPage(browser);

    await page.goto("/sign-in");
    await signInAsStudent(page, "", "", "");
    await page.getByText("Enter the code your teacher or parent gave you.").waitFor();
    await expect(focused(page)).resolves.toMatchObject({ tag: "input", name: "code", invalid: "true", described: expect.stringContaining("Enter the code your teacher or parent gave you.") });

    await page.goto("/reset-password");
    await page.getByRole("button", { name: "Send me the link" }).press("Enter");
    await page.getByText(/Enter the e-mail address you use for Bendwise/).waitFor();
    await expect(focused(page)).resolves.toMatchObject({ tag: "input", name: "email", invalid: "true" });

    await signInAsAdmin(page);
    await page.goto("/school/teachers");
    const invite = page.getByRole("region", { name: "Invite a teacher" });
    await invite.getByLabel("Name").fill("Mo Keyboard");
    await invite.getByRole("button", { name: "Send the invitation" }).press("Enter");
    await invite.getByText(/Enter the teacher's e-mail address/).waitFor();
    await expect(focused(page)).resolves.toMatchObject({ tag: "input", name: "email", invalid: "true", described: expect.stringContaining("Enter the teacher's e-mail address") });
    await expect(invite.getByLabel("Name").inputValue()).resolves.toBe("Mo Keyboard");

    await page.goto("/school/seats/buy");
    // The ways to pay are named by their titles, the sentence under each its description.
    await expect(page.getByRole("radio", { name: "By invoice", exact: true }).getAttribute("aria-describedby")).resolves.toBeTruthy();
    await expect(page.getByRole("radio", { name: "By card, now", exact: true }).isChecked()).resolves.toBe(true);
    await page.getByLabel("How many seats?").fill("abc");
    await page.getByRole("button", { name: "Go to card payment" }).press("Enter");
    await page.getByText(/things? to fix below/).waitFor();
    await expect(focused(page)).resolves.toMatchObject({ tag: "input", name: "seats", invalid: "true" });
    await context.close();
  });
});

describe("answers that replace what had the keyboard", () => {
  it("after an invitation is sent, sent again or withdrawn the keyboard is on the answer, not back at the top of the page", async () => {
    const { page, context } = await openPage(browser);
    await signInAsAdmin(page);
    await page.goto("/school/teachers");
    const email = `keys.${Date.now()}@maplebrook.example`;
    const invite = page.getByRole("region", { name: "Invite a teacher" });
    await invite.getByLabel("Name").fill("Kim Keys");
    await invite.getByLabel("E-mail address").fill(email);
    await invite.getByRole("button", { name: "Send the invitation" }).press("Enter");
    await page.getByText(`Invitation sent to ${email}.`).waitFor();
    await expect(focused(page).then((f) => f.text)).resolves.toContain(`Invitation sent to ${email}.`);
    // The next Tab goes on into the form, ready for the next teacher.
    await page.keyboard.press("Tab");
    await expect(focused(page)).resolves.toMatchObject({ tag: "input", name: "displayName" });

    // The invited teacher, at the link of the e-mail, chooses a password too short: the keyboard goes to it.
    let link: string | undefined;
    for (let i = 0; i < 50 && !link; i++) {
      const mail = (await listCaughtMail(mailWebPort)).find((m) => m.to.some((t) => t.address === email));
      link = mail ? /https?:\/\/\S+\/join\/teacher\?token=\S+/.exec(mail.text ?? "")?.[0] : undefined;
      if (!link) await page.waitForTimeout(200);
    }
    const invited = await openPage(browser);
    await invited.page.goto(new URL(link!).pathname + new URL(link!).search);
    await invited.page.getByLabel("Choose a password").fill("short");
    await invited.page.getByRole("button", { name: /^Accept and join/ }).press("Enter");
    await invited.page.locator('input[name="password"][aria-invalid="true"]').waitFor();
    await expect(focused(invited.page)).resolves.toMatchObject({ tag: "input", name: "password", described: expect.stringMatching(/8 characters/) });
    await invited.context.close();

    await page.getByRole("button", { name: `Send again to ${email}` }).press("Enter");
    await page.getByText(/^Sent again, with a new link/).waitFor();
    await expect(focused(page).then((f) => f.text)).resolves.toMatch(/^Sent again, with a new link/);

    await page.getByRole("button", { name: `Withdraw the invitation to ${email}` }).press("Enter");
    await page.getByText("Withdrawn. Its link no longer works.").waitFor();
    await expect(focused(page).then((f) => f.text)).resolves.toBe("Withdrawn. Its link no longer works.");
    await context.close();
  });
});

describe("deleting a student's account", () => {
  it("with the keys alone: a wrong name is refused and keeps what was typed; once deleted the keyboard is on the answer's heading", async () => {
    const { page, context } = await openPage(browser);
    await signInAsAdmin(page);
    await page.goto("/school/students");
    await page.getByRole("link", { name: "Delete Xia Q.'s account and data" }).press("Enter");
    await page.waitForURL(/\/school\/students\/[^/]+\/delete$/);
    const confirm = page.getByLabel(/To confirm, type the name/);
    await confirm.fill("Xia");
    await confirm.press("Enter");
    await expect(page.getByRole("alert").innerText()).resolves.toBe("Type Xia Q.'s name exactly as it is shown, to confirm. Nothing was deleted.");
    await expect(confirm.inputValue()).resolves.toBe("Xia");
    await confirm.fill("Xia Q.");
    await confirm.press("Enter");
    await page.getByText("Xia Q.'s account and everything recorded for it are gone.").waitFor();
    await expect(focused(page)).resolves.toMatchObject({ tag: "h1", text: "Deleted" });
    await context.close();
  });
});

describe("at 375 px", () => {
  it("the classes page's tables slide with the keys and the student list shows every Delete link whole", async () => {
    const { page, context } = await openPage(browser, { viewport: phone, bypassCSP: true });
    await signInAsAdmin(page);
    await page.goto("/school/classes");
    await page.waitForLoadState("networkidle");
    expect(await axeViolations(page)).toEqual([]);
    const box = page.getByRole("region", { name: /Every class of the school/ });
    await page.getByText(/slide it sideways/).first().waitFor();
    await box.focus();
    for (let i = 0; i < 3; i++) await page.keyboard.press("ArrowRight");
    await expect.poll(() => box.evaluate((el) => el.scrollLeft)).toBeGreaterThan(0);

    await page.goto("/school/students");
    await page.waitForLoadState("networkidle");
    expect(await axeViolations(page)).toEqual([]);
    const cut = await page.evaluate(() => {
      const table = document.querySelector('[data-testid="school-students"]')!;
      const box = table.parentElement!.getBoundingClientRect();
      return [...table.querySelectorAll("a")].filter((a) => a.getBoundingClientRect().right > box.right + 0.5).map((a) => a.textContent);
    });
    expect(cut).toEqual([]);
    await context.close();
  });
});

describe("buying by card", () => {
  it("every purchase's links name the purchase, and the payment page says 'confirmed' in the region it was reading, with the receipt", async () => {
    const { page, context } = await openPage(browser);
    await signInAsAdmin(page);
    // Two orders left at the payment page: two "Finish or drop" links.
    const checkouts: string[] = [];
    for (const seats of [2, 3]) {
      await page.goto("/school/seats/buy");
      await page.getByLabel("How many seats?").fill(String(seats));
      await page.getByRole("button", { name: "Go to card payment" }).click();
      await page.waitForURL((url) => url.href.startsWith(`${paymentsUrl}/pay/`));
      checkouts.push(page.url());
    }
    await page.goto("/school/seats");
    const names = await page
      .getByTestId("purchases")
      .locator("a, button")
      .evaluateAll((els) => els.map((el) => (el as HTMLElement).innerText.replace(/\s+/g, " ").trim()));
    expect(names.filter((n) => n.startsWith("Finish or drop")).length).toBeGreaterThanOrEqual(2);
    expect(new Set(names).size).toBe(names.length);

    // The 3-seat order: its waiting page is open while it is paid in another tab.
    const payPage = await context.newPage();
    await payPage.goto(checkouts[1]);
    const stoppedHref = await payPage.getByRole("link", { name: "Cancel and go back" }).getAttribute("href");
    const purchaseId = new URL(stoppedHref!, paymentsUrl).searchParams.get("purchase")!;
    await page.goto(`/payments/confirming?purchase=${purchaseId}`);
    await page.getByText("Waiting for the confirmation…").waitFor();
    const region = await page.locator('[role="status"]').elementHandle();
    await payPage.getByLabel("Card number").fill("4242 4242 4242 4242");
    await payPage.getByLabel("Expiry (MM/YY)").fill("12/34");
    await payPage.getByLabel("Security code").fill("123");
    await payPage.getByLabel("Name on card").fill("Dana Whitcombe");
    await payPage.getByRole("button", { name: /^Pay \$/ }).click();
    await page.getByTestId("confirmed").waitFor({ timeout: 15_000 });
    await expect(region!.evaluate((el) => el.isConnected && el.textContent)).resolves.toContain("3 seats for 2026-27 have been added.");
    await page.getByRole("link", { name: "Open the receipt" }).click();
    await page.waitForURL(`**/receipts/${purchaseId}`);
    await expect(page.getByTestId("receipt").innerText()).resolves.toMatch(/3 student seats for the school year 2026-27/);
    await context.close();
  });
});
