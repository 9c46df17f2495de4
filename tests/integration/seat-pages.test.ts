// The seat pages called as React Router would call them, with real session cookies: the ledger, the
// buy form (every input parsed, nothing lost on a bad one), card and invoice orders, the return pages
// (which never grant seats), the status JSON they poll, receipts scoped to their organisation.
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Database } from "~/db/client.server";
import { organisations, seatPurchases } from "~/db/schema.server";
import { startPaymentsFake, type PaymentsFake } from "../fakes/payments-server";

type Helpers = typeof import("./auth-helpers");
let h: Helpers;
let db: Database;
let fake: PaymentsFake;
/** While true, the fake's webhooks do not reach the app (answered 503, no retries). */
let holdEvents = false;
const routes = {} as {
  seats: typeof import("~/routes/school.seats");
  buy: typeof import("~/routes/school.seats.buy");
  family: typeof import("~/routes/family.seats");
  confirming: typeof import("~/routes/payments.confirming");
  stopped: typeof import("~/routes/payments.stopped");
  status: typeof import("~/routes/api.payments.status");
  receipt: typeof import("~/routes/receipts.$purchaseId");
  webhook: typeof import("~/routes/api.payments.webhook");
};
const cookies = {} as Record<"admin" | "teacher" | "parent" | "otherAdmin", string>;
let maplebrookId: string;

beforeAll(async () => {
  fake = await startPaymentsFake({
    port: 0,
    webhookSecret: process.env.PAYMENTS_WEBHOOK_SECRET!,
    retryDelaysMs: [],
    transport: async ({ body, headers }) => {
      if (holdEvents) return 503;
      const request = new Request("http://127.0.0.1/api/payments/webhook", { method: "POST", headers, body });
      return ((await routes.webhook.action({ request, params: {}, context: {} } as never)) as Response).status;
    },
  });
  process.env.PAYMENTS_API_URL = fake.url;
  h = await import("./auth-helpers");
  db = (await import("~/db/client.server")).db;
  Object.assign(routes, {
    seats: await import("~/routes/school.seats"),
    buy: await import("~/routes/school.seats.buy"),
    family: await import("~/routes/family.seats"),
    confirming: await import("~/routes/payments.confirming"),
    stopped: await import("~/routes/payments.stopped"),
    status: await import("~/routes/api.payments.status"),
    receipt: await import("~/routes/receipts.$purchaseId"),
    webhook: await import("~/routes/api.payments.webhook"),
  });
  cookies.admin = await h.sessionCookieFor("schoolAdmin");
  cookies.teacher = await h.sessionCookieFor("teacher");
  cookies.parent = await h.sessionCookieFor("parent");
  cookies.otherAdmin = await h.sessionCookieFor("otherSchoolAdmin");
  [{ id: maplebrookId }] = await db.select({ id: organisations.id }).from(organisations).where(eq(organisations.slug, "maplebrook"));
}, 120_000);

afterAll(async () => {
  await fake.settled();
  await (await import("~/lib/receipts.server")).receiptsSettled();
  await fake.stop();
});

const ledgerOf = async (cookie: string) => {
  const result = await h.runRoute(routes.seats.loader as never, h.get("/school/seats", { cookie }));
  const rows = (result.body as { ledger: Array<{ schoolYear: string; bought: number; inUse: number; free: number }> }).ledger;
  return rows.filter((r) => r.schoolYear === "2026-27");
};

describe("/school", () => {
  it("shows each school year's seats as the ledger does: bought, in use and free", async () => {
    const school = await import("~/routes/school");
    const home = await h.runRoute(school.loader as never, h.get("/school", { cookie: cookies.admin }));
    const seats = (home.body as { schools: Array<{ seats: unknown[] }> }).schools[0].seats;
    const ledger = await h.runRoute(routes.seats.loader as never, h.get("/school/seats", { cookie: cookies.admin }));
    expect(seats).toEqual((ledger.body as { ledger: unknown[] }).ledger.toReversed());
    expect(seats).toContainEqual(expect.objectContaining({ schoolYear: "2026-27", inUse: expect.any(Number), free: expect.any(Number) }));
  });
});

describe("/school/seats", () => {
  it("shows the demo school's ledger per school year", async () => {
    const result = await h.runRoute(routes.seats.loader as never, h.get("/school/seats", { cookie: cookies.admin }));
    expect(result.status).toBe(200);
    const body = result.body as { school: { name: string }; ledger: unknown[]; purchases: Array<{ seats: number; state: string; receiptUrl: string }> };
    expect(body.school.name).toMatch(/Maplebrook/);
    expect(body.ledger[0]).toEqual({ schoolYear: "2026-27", bought: 40, inUse: 30, free: 10 });
    expect(body.purchases[0]).toMatchObject({ seats: 40, state: "paid", howPaid: "Included in the demo" });
  });
});

describe("/school/seats/buy", () => {
  const order = (fields: Record<string, string>, cookie = cookies.admin) =>
    h.runRoute(routes.buy.action as never, h.post("/school/seats/buy", fields, { cookie }));

  it("explains every bad input and keeps what was typed", async () => {
    const bad = await order({ seats: "twelve", schoolYear: "2019-20", method: "invoice", purchaseOrder: "" });
    expect(bad.status).toBe(400);
    expect(bad.body).toEqual({
      values: { seats: "twelve", schoolYear: "2019-20", method: "invoice", purchaseOrder: "" },
      fieldErrors: {
        seats: "Use digits only: a whole number of seats from 1 to 5,000.",
        schoolYear: "Choose 2026-27 or 2027-28.",
        purchaseOrder: "Enter your purchase-order number; it is printed on the invoice.",
      },
      problem: null,
    });
    expect((await order({ seats: "", schoolYear: "2026-27", method: "card" })).body).toMatchObject({ fieldErrors: { seats: "Enter a whole number of seats from 1 to 5,000." } });
    // Digits only: "1e3" is not taken for 1,000 seats, nor "2.5" rounded.
    for (const seats of ["2.5", "1e3", "-3", "0x10"]) expect((await order({ seats, schoolYear: "2026-27", method: "card" })).body).toMatchObject({ fieldErrors: { seats: "Use digits only: a whole number of seats from 1 to 5,000." } });
    // A whole number out of range is told the range, however long it is.
    for (const seats of ["0", "5001", "99999999999999999999"]) expect((await order({ seats, schoolYear: "2026-27", method: "card" })).body).toMatchObject({ fieldErrors: { seats: "That is outside the range: enter a whole number of seats from 1 to 5,000." } });
    // A pasted purchase-order number too long for the invoice is refused whole, never cut.
    const longPo = "PO-" + "7".repeat(5000);
    expect((await order({ seats: "3", schoolYear: "2026-27", method: "invoice", purchaseOrder: longPo })).body).toMatchObject({
      values: { purchaseOrder: longPo },
      fieldErrors: { purchaseOrder: "A purchase-order number has at most 40 characters; this one has 5,003. Check that only the number was pasted." },
    });
    expect((await order({ seats: "3", schoolYear: "2026-27" })).body).toMatchObject({ fieldErrors: { method: "Choose how the school will pay: by card now, or by invoice." } });
    expect((await order({ seats: "3", schoolYear: "2026-27", method: "invoice", purchaseOrder: "PO<script>" })).body).toMatchObject({
      fieldErrors: { purchaseOrder: "Use letters, digits, spaces and . / # _ - only." },
    });
    const purchases = await db.select().from(seatPurchases).where(eq(seatPurchases.organisationId, maplebrookId));
    expect(purchases).toHaveLength(1); // only the demo's
  });

  it("by card: sends the administrator to the hosted payment page; the return page grants nothing, the signed event does", async () => {
    const sent = await order({ seats: "10", schoolYear: "2026-27", method: "card", purchaseOrder: "" });
    expect(sent.status).toBe(302);
    expect(sent.location).toMatch(new RegExp(`^${fake.url}/pay/cs_test_`));
    const sessionId = sent.location!.split("/pay/")[1];
    const [purchase] = await db.select().from(seatPurchases).where(eq(seatPurchases.providerRef, sessionId));
    expect(purchase).toMatchObject({ status: "pending", seats: 10, method: "card" });
    const session = fake.state.checkoutSessions.get(sessionId)!;
    expect(session.success_url).toBe(`${h.appUrl}/payments/confirming?purchase=${purchase.id}`);
    expect(session.cancel_url).toBe(`${h.appUrl}/payments/stopped?purchase=${purchase.id}`);

    // Paid at the provider, but the event has not reached us yet: the return page and the status say "waiting".
    holdEvents = true;
    expect(fake.payCheckout(sessionId, "4242 4242 4242 4242").ok).toBe(true);
    await fake.settled();
    const waiting = await h.runRoute(routes.confirming.loader as never, h.get(`/payments/confirming?purchase=${purchase.id}`, { cookie: cookies.admin }));
    expect(waiting.body).toMatchObject({ purchase: { status: "pending", seats: 10, amount: "$90.00" }, ledger: { bought: 40, free: 10 } });
    const early = await h.runRoute(routes.status.loader as never, h.get(`/api/payments/status?purchase=${purchase.id}`, { cookie: cookies.admin }));
    expect(early.body).toMatchObject({ status: "pending" });

    // The signed event arrives (the provider retries it): now the seats are there.
    holdEvents = false;
    expect(await fake.resend(fake.events("checkout.session.completed").at(-1)!.id)).toBe(200);
    const polled = await h.runRoute(routes.status.loader as never, h.get(`/api/payments/status?purchase=${purchase.id}`, { cookie: cookies.admin }));
    expect(polled.status).toBe(200);
    expect(polled.body).toEqual({ status: "paid", seats: 10, schoolYear: "2026-27", ledger: { schoolYear: "2026-27", bought: 50, inUse: 30, free: 20 } });
    expect(polled.headers.get("cache-control")).toBe("no-store");
    const after = await h.runRoute(routes.confirming.loader as never, h.get(`/payments/confirming?purchase=${purchase.id}`, { cookie: cookies.admin }));
    expect(after.body).toMatchObject({ purchase: { status: "paid", seats: 10 }, ledger: { bought: 50, free: 20 }, backTo: "/school/seats" });
    expect((await ledgerOf(cookies.admin))[0]).toEqual({ schoolYear: "2026-27", bought: 50, inUse: 30, free: 20 });
  });

  it("the return page alone, visited before any event, changes nothing", async () => {
    const sent = await order({ seats: "7", schoolYear: "2027-28", method: "card" });
    const sessionId = sent.location!.split("/pay/")[1];
    const [purchase] = await db.select().from(seatPurchases).where(eq(seatPurchases.providerRef, sessionId));
    for (let i = 0; i < 3; i++) {
      const page = await h.runRoute(routes.confirming.loader as never, h.get(`/payments/confirming?purchase=${purchase.id}`, { cookie: cookies.admin }));
      expect(page.body).toMatchObject({ purchase: { status: "pending" }, ledger: { schoolYear: "2027-28", bought: 0 } });
    }
    const [still] = await db.select().from(seatPurchases).where(eq(seatPurchases.id, purchase.id));
    expect(still.status).toBe("pending");
  });

  it("by invoice: the invoice is made and sent, the seats page says so, and the seats come when it is paid", async () => {
    const sent = await order({ seats: "12", schoolYear: "2026-27", method: "invoice", purchaseOrder: "PO-MB-2026-77" });
    expect(sent.status).toBe(302);
    expect(sent.location).toMatch(/^\/school\/seats\?invoice=[0-9a-f-]{36}$/);
    const purchaseId = new URLSearchParams(sent.location!.split("?")[1]).get("invoice")!;
    const page = await h.runRoute(routes.seats.loader as never, h.get(sent.location!, { cookie: cookies.admin }));
    expect(page.body).toMatchObject({ invoiceAsked: { number: expect.stringMatching(/^BWTEST-/), seats: 12, schoolYear: "2026-27", to: "admin@maplebrook.example" } });
    const listed = (page.body as { purchases: Array<{ id: string; state: string; purchaseOrder: string; invoiceUrl: string }> }).purchases.find((p) => p.id === purchaseId)!;
    expect(listed).toMatchObject({ state: "invoice-waiting", purchaseOrder: "PO-MB-2026-77", invoiceUrl: expect.stringContaining(`${fake.url}/invoice/`) });

    const [row] = await db.select().from(seatPurchases).where(eq(seatPurchases.id, purchaseId));
    const before = (await ledgerOf(cookies.admin))[0].bought;
    fake.markInvoicePaid(row.providerRef!);
    await fake.settled();
    expect((await ledgerOf(cookies.admin))[0].bought).toBe(before + 12);
  });

  it("a teacher cannot buy seats (403), and a post from another site is refused", async () => {
    const asTeacher = await order({ seats: "10", schoolYear: "2026-27", method: "card" }, cookies.teacher);
    expect(asTeacher.status).toBe(403);
    const crossSite = await h.runRoute(
      routes.buy.action as never,
      h.post("/school/seats/buy", { seats: "10", schoolYear: "2026-27", method: "card" }, { cookie: cookies.admin, origin: "https://elsewhere.example", fetchSite: "cross-site" }),
    );
    expect(crossSite.status).toBe(403);
  });
});

describe("/payments/stopped", () => {
  it("offers to go back to the payment page, or to drop the order, which closes it", async () => {
    const sent = await h.runRoute(routes.buy.action as never, h.post("/school/seats/buy", { seats: "3", schoolYear: "2026-27", method: "card" }, { cookie: cookies.admin }));
    const sessionId = sent.location!.split("/pay/")[1];
    const [purchase] = await db.select().from(seatPurchases).where(eq(seatPurchases.providerRef, sessionId));
    const page = await h.runRoute(routes.stopped.loader as never, h.get(`/payments/stopped?purchase=${purchase.id}`, { cookie: cookies.admin }));
    expect(page.body).toMatchObject({ purchase: { status: "pending" }, continueUrl: `${fake.url}/pay/${sessionId}`, backTo: "/school/seats" });

    const dropped = await h.runRoute(routes.stopped.action as never, h.post("/payments/stopped", { intent: "drop", purchase: purchase.id }, { cookie: cookies.admin }));
    expect(dropped).toMatchObject({ status: 302, location: "/school/seats?dropped=1" });
    const [after] = await db.select().from(seatPurchases).where(eq(seatPurchases.id, purchase.id));
    expect(after.status).toBe("void");
    expect(fake.state.checkoutSessions.get(sessionId)!.status).toBe("expired");
    const list = await h.runRoute(routes.seats.loader as never, h.get("/school/seats", { cookie: cookies.admin }));
    expect((list.body as { purchases: Array<{ id: string }> }).purchases.some((p) => p.id === purchase.id)).toBe(false);
  });

  it("another school's administrator cannot see or drop it", async () => {
    const sent = await h.runRoute(routes.buy.action as never, h.post("/school/seats/buy", { seats: "2", schoolYear: "2026-27", method: "card" }, { cookie: cookies.admin }));
    const [purchase] = await db.select().from(seatPurchases).where(eq(seatPurchases.providerRef, sent.location!.split("/pay/")[1]));
    expect((await h.runRoute(routes.stopped.loader as never, h.get(`/payments/stopped?purchase=${purchase.id}`, { cookie: cookies.otherAdmin }))).status).toBe(404);
    expect((await h.runRoute(routes.stopped.action as never, h.post("/payments/stopped", { intent: "drop", purchase: purchase.id }, { cookie: cookies.otherAdmin }))).status).toBe(404);
    expect((await h.runRoute(routes.status.loader as never, h.get(`/api/payments/status?purchase=${purchase.id}`, { cookie: cookies.otherAdmin }))).status).toBe(404);
    const [still] = await db.select().from(seatPurchases).where(eq(seatPurchases.id, purchase.id));
    expect(still.status).toBe("pending");
  });
});

describe("/receipts/:purchaseId", () => {
  it("shows the receipt to the school's administrator and to nobody else", async () => {
    const [demo] = await db.select().from(seatPurchases).where(eq(seatPurchases.providerRef, "demo-maplebrook-2026-27"));
    const mine = await h.runRoute(routes.receipt.loader as never, h.get(`/receipts/${demo.id}`, { cookie: cookies.admin }), { purchaseId: demo.id });
    expect(mine.status).toBe(200);
    expect(mine.body).toMatchObject({ receipt: { seats: 40, schoolYear: "2026-27", amount: "$360.00", unitPrice: "$9.00", status: "paid", number: expect.stringMatching(/^BW-/) } });
    for (const cookie of [cookies.otherAdmin, cookies.teacher, cookies.parent]) {
      const other = await h.runRoute(routes.receipt.loader as never, h.get(`/receipts/${demo.id}`, { cookie }), { purchaseId: demo.id });
      expect(other.status).toBe(404);
    }
  });
});

describe("/family/seats", () => {
  it("shows the household's seats and children, and buys child seats at the family price by card", async () => {
    const page = await h.runRoute(routes.family.loader as never, h.get("/family/seats", { cookie: cookies.parent }));
    expect(page.body).toMatchObject({
      ledger: [{ schoolYear: "2026-27", bought: 2, inUse: 2, free: 0 }],
      children: [{ displayName: "Juno", hasSeat: true }, { displayName: "Mika", hasSeat: true }],
    });
    const bad = await h.runRoute(routes.family.action as never, h.post("/family/seats", { seats: "11", schoolYear: "2026-27" }, { cookie: cookies.parent }));
    expect(bad).toMatchObject({ status: 400, body: { values: { seats: "11" }, fieldErrors: { seats: "A family buys up to 10 seats at a time." } } });

    const sent = await h.runRoute(routes.family.action as never, h.post("/family/seats", { seats: "1", schoolYear: "2026-27" }, { cookie: cookies.parent }));
    expect(sent.status).toBe(302);
    const sessionId = sent.location!.split("/pay/")[1];
    expect(fake.state.checkoutLineItems.get(sessionId)![0]).toMatchObject({ quantity: 1, amount_total: 1400, description: "Bendwise child seat, school year 2026-27" });
    expect(fake.payCheckout(sessionId, "4242424242424242").ok).toBe(true);
    await fake.settled();
    const after = await h.runRoute(routes.family.loader as never, h.get("/family/seats", { cookie: cookies.parent }));
    expect(after.body).toMatchObject({ ledger: [{ schoolYear: "2026-27", bought: 3, inUse: 2, free: 1 }] });
  });
});
