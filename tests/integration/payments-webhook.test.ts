// Seats granted from signed events only, against a real PostgreSQL and our own payments fake (on a
// free port; its webhooks are handed straight to the webhook route's action). Checks: a bad signature
// is a 400 and changes nothing; the same event twice adds seats once; events out of order; the app
// being down at first (the fake retries); the invoice path with its receipt in the mail catcher.
import { count, eq } from "drizzle-orm";
import Stripe from "stripe";
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import { paymentEvents, seatPurchases } from "~/db/schema.server";
import { listCaughtMail, type CaughtMail } from "../fakes/mail-catcher";
import { startPaymentsFake, type PaymentsFake } from "../fakes/payments-server";
import { appPaymentModules, type PaymentModules } from "./payments-helpers";
import { createHousehold, createSchool } from "../factories/schools";

type Modules = PaymentModules;

let fake: PaymentsFake;
let m: Modules;
let stripe: Stripe;
/** "app": events reach the route; "down": the app answers 503 (as if it were restarting). */
let appMode: "app" | "down" = "app";
const answers: Array<{ type: string; status: number; ms: number; body: Record<string, unknown> }> = [];
const secret = process.env.PAYMENTS_WEBHOOK_SECRET!;

async function postToWebhook(body: string, signature: string | null) {
  const headers: Record<string, string> = { "content-type": "application/json" };
  if (signature !== null) headers["stripe-signature"] = signature;
  const request = new Request("http://127.0.0.1/api/payments/webhook", { method: "POST", headers, body });
  const started = performance.now();
  const response = (await m.webhook.action({ request, params: {}, context: {} } as never)) as Response;
  const ms = performance.now() - started;
  return { response, ms, json: (await response.clone().json()) as Record<string, unknown> };
}

beforeAll(async () => {
  fake = await startPaymentsFake({
    port: 0,
    webhookSecret: secret,
    retryDelaysMs: [40, 80],
    transport: async ({ body, headers }) => {
      if (appMode === "down") return 503;
      const { response, ms, json } = await postToWebhook(body, headers["stripe-signature"]);
      answers.push({ type: JSON.parse(body).type, status: response.status, ms, body: json });
      return response.status;
    },
  });
  // The app's SDK client must talk to this fake: its address is set before the app's modules read it.
  ({ modules: m, stripe } = await appPaymentModules(fake.url));
});

afterAll(async () => {
  await fake.settled();
  await m.receipts.receiptsSettled();
  await fake.stop();
});

beforeEach(() => {
  appMode = "app";
});

const deps = () => ({ db: m.db, stripe });
const ledger = (orgId: string, year = "2026-27") => m.seats.seatLedgerForYear({ db: m.db }, orgId, year);

async function buyByCard(organisationId: string, buyer: { id: string; email: string | null }, seats: number, schoolYear = "2026-27") {
  const started = await m.purchases.startCardCheckout(deps(), { organisationId, buyer, schoolYear, seats, appUrl: "http://127.0.0.1:9" });
  const sessionId = started.url.split("/pay/")[1];
  return { ...started, sessionId };
}

async function mailTo(address: string, timeoutMs = 5000): Promise<CaughtMail[]> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    await m.receipts.receiptsSettled();
    const mine = (await listCaughtMail(Number(process.env.BENDWISE_MAIL_WEB_PORT))).filter((mail) => mail.to.some((t) => t.address === address));
    if (mine.length > 0 || Date.now() > deadline) return mine;
    await new Promise((r) => setTimeout(r, 100));
  }
}

async function eventCount() {
  const [row] = await m.db.select({ n: count() }).from(paymentEvents);
  return row.n;
}

describe("paying by card", () => {
  it("adds the seats only once the signed checkout.session.completed arrives, and e-mails a receipt", async () => {
    const { school, admin } = await createSchool(m.db, { seats: 5 });
    const { purchaseId, sessionId, url } = await buyByCard(school.id, admin, 10);
    expect(url).toBe(`${fake.url}/pay/${sessionId}`);
    const [pending] = await m.db.select().from(seatPurchases).where(eq(seatPurchases.id, purchaseId));
    expect(pending).toMatchObject({ status: "pending", method: "card", seats: 10, amountCents: 9000, providerRef: sessionId });
    expect(await ledger(school.id)).toMatchObject({ bought: 5 });

    const items = await stripe.checkout.sessions.listLineItems(sessionId);
    expect(items.data[0]).toMatchObject({ quantity: 10, amount_total: 9000, description: "Bendwise student seat, school year 2026-27" });

    expect(fake.payCheckout(sessionId, "4242 4242 4242 4242").ok).toBe(true);
    await fake.settled();
    expect(await ledger(school.id)).toEqual({ schoolYear: "2026-27", bought: 15, inUse: 0, free: 15 });
    const [paid] = await m.db.select().from(seatPurchases).where(eq(seatPurchases.id, purchaseId));
    expect(paid).toMatchObject({ status: "paid", seats: 10, amountCents: 9000 });
    expect(paid.paidAt).toBeInstanceOf(Date);
    const answer = answers.findLast((a) => a.type === "checkout.session.completed")!;
    expect(answer).toMatchObject({ status: 200, body: { received: true, outcome: "seats-added", duplicate: false } });

    const [receipt] = await mailTo(admin.email!);
    expect(receipt.subject).toMatch(/^Bendwise receipt BW-[0-9A-F]{10}: 10 seats for 2026-27, \$90\.00$/);
    expect(receipt.text).toContain("10 more student seats for the school year 2026-27");
    expect(receipt.text).toContain("Amount paid: $90.00 (10 × $9.00). By card");
    expect(receipt.text).toContain("Seats for 2026-27 now: 15 bought, 0 in use, 15 free.");
  });

  it("a declined card adds nothing and sends no event", async () => {
    const { school, admin } = await createSchool(m.db, { seats: 5 });
    const { sessionId, purchaseId } = await buyByCard(school.id, admin, 3);
    const before = fake.events().length;
    expect(fake.payCheckout(sessionId, "4000 0000 0000 0002")).toMatchObject({ ok: false, code: "card_declined" });
    expect(fake.events().length).toBe(before);
    expect(await ledger(school.id)).toMatchObject({ bought: 5 });
    const [row] = await m.db.select().from(seatPurchases).where(eq(seatPurchases.id, purchaseId));
    expect(row.status).toBe("pending");
  });

  it("a dropped checkout is expired at the provider and its purchase closed by the expiry event", async () => {
    const { school, admin } = await createSchool(m.db);
    const { purchaseId } = await buyByCard(school.id, admin, 3);
    await m.purchases.abandonCheckout(deps(), purchaseId);
    await fake.settled();
    const [row] = await m.db.select().from(seatPurchases).where(eq(seatPurchases.id, purchaseId));
    expect(row.status).toBe("void");
    expect(await m.purchases.purchasesOf({ db: m.db }, school.id)).toEqual([]);
  });

  it("a family buys seats at the per-child price through the same checkout", async () => {
    const { household, parent } = await createHousehold(m.db);
    const { sessionId } = await buyByCard(household.id, parent, 2);
    const items = await stripe.checkout.sessions.listLineItems(sessionId);
    expect(items.data[0]).toMatchObject({ quantity: 2, amount_total: 2800, description: "Bendwise child seat, school year 2026-27" });
    fake.payCheckout(sessionId, "4242424242424242");
    await fake.settled();
    expect(await ledger(household.id)).toMatchObject({ bought: 2, free: 2 });
    const [receipt] = await mailTo(parent.email!);
    expect(receipt.text).toContain("2 more child seats for the school year 2026-27");
    expect(receipt.text).toContain("$28.00");
  });
});

describe("the webhook route", () => {
  it("answers 400 to a bad signature and changes nothing", async () => {
    const { school, admin } = await createSchool(m.db, { seats: 5 });
    const { sessionId, purchaseId } = await buyByCard(school.id, admin, 10);
    appMode = "down"; // keep the genuine event away from the app for now
    fake.payCheckout(sessionId, "4242424242424242");
    await fake.settled();
    const event = fake.events("checkout.session.completed").find((e) => (e.data.object as { id: string }).id === sessionId)!;
    const body = JSON.stringify(event);
    const eventsBefore = await eventCount();

    const attempts = [
      await postToWebhook(body, null),
      await postToWebhook(body, "t=1,v1=0000"),
      await postToWebhook(body, new Stripe("sk_test_x").webhooks.generateTestHeaderString({ payload: body, secret: "whsec_someone_else" })),
      await postToWebhook(body.replace(`"quantity"`, `"quantity"`).replace(/"livemode": ?false/, '"livemode":true'), fake.sign(body)),
      // A correct signature from long ago is refused too (replayed capture).
      await postToWebhook(body, new Stripe("sk_test_x").webhooks.generateTestHeaderString({ payload: body, secret, timestamp: Math.floor(Date.now() / 1000) - 3600 })),
    ];
    for (const { response, json } of attempts) {
      expect(response.status).toBe(400);
      expect(json).toEqual({ received: false, error: "The signature does not match this body; nothing was done." });
    }
    expect(await eventCount()).toBe(eventsBefore);
    expect(await ledger(school.id)).toMatchObject({ bought: 5 });
    const [row] = await m.db.select().from(seatPurchases).where(eq(seatPurchases.id, purchaseId));
    expect(row.status).toBe("pending");

    // The same event, correctly signed, does the work.
    const good = await postToWebhook(body, fake.sign(body));
    expect(good.response.status).toBe(200);
    expect(await ledger(school.id)).toMatchObject({ bought: 15 });
  });

  it("adds seats once when the same event comes twice, one after the other or at the same moment", async () => {
    const { school, admin } = await createSchool(m.db, { seats: 5 });
    const { sessionId } = await buyByCard(school.id, admin, 4);
    fake.payCheckout(sessionId, "4242424242424242");
    await fake.settled();
    expect(await ledger(school.id)).toMatchObject({ bought: 9 });
    const event = fake.events("checkout.session.completed").find((e) => (e.data.object as { id: string }).id === sessionId)!;

    expect(await fake.resend(event.id)).toBe(200);
    expect(answers.at(-1)!.body).toMatchObject({ outcome: "seats-added", duplicate: true });
    const body = JSON.stringify(event);
    const together = await Promise.all(Array.from({ length: 5 }, () => postToWebhook(body, fake.sign(body))));
    expect(together.every((t) => t.response.status === 200)).toBe(true);
    expect(await ledger(school.id)).toMatchObject({ bought: 9 });
    const [recorded] = await m.db.select().from(paymentEvents).where(eq(paymentEvents.id, event.id));
    expect(recorded).toMatchObject({ type: "checkout.session.completed", objectId: sessionId, outcome: "seats-added", deliveries: 7 });

    // A different event about the same paid session (as if the provider sent two) adds nothing either.
    const twin = { ...event, id: "evt_twin_" + event.id.slice(4) };
    const twinBody = JSON.stringify(twin);
    const second = await postToWebhook(twinBody, fake.sign(twinBody));
    expect(second.json).toMatchObject({ outcome: "already-fulfilled", duplicate: false });
    expect(await ledger(school.id)).toMatchObject({ bought: 9 });
    const purchases = await m.db.select().from(seatPurchases).where(eq(seatPurchases.organisationId, school.id));
    expect(purchases.filter((p) => p.method === "card")).toHaveLength(1);
  });

  it("answers fast", async () => {
    const completed = answers.filter((a) => a.type === "checkout.session.completed" && a.status === 200);
    expect(completed.length).toBeGreaterThan(0);
    const slowest = Math.max(...completed.map((a) => a.ms));
    const mean = completed.reduce((s, a) => s + a.ms, 0) / completed.length;
    console.log(`webhook answer time over ${completed.length} checkout.session.completed deliveries: mean ${mean.toFixed(1)} ms, slowest ${slowest.toFixed(1)} ms`);
    expect(slowest).toBeLessThan(1000);
  });

  it("when the app is down the fake retries with backoff, and the seats appear once it answers", async () => {
    const { school, admin } = await createSchool(m.db);
    const { sessionId } = await buyByCard(school.id, admin, 6);
    appMode = "down";
    fake.payCheckout(sessionId, "4242424242424242");
    setTimeout(() => (appMode = "app"), 60); // back up before the second retry
    await fake.settled();
    const record = fake.state.events.find((r) => r.event.type === "checkout.session.completed" && (r.event.data.object as { id: string }).id === sessionId)!;
    expect(record.deliveries.map((d) => d.status)).toEqual([503, 503, 200]);
    expect(await ledger(school.id)).toMatchObject({ bought: 6 });
  });

  it("ignores events it does not use and objects that are not Bendwise's, with a 200", async () => {
    const customer = await stripe.customers.create({ email: "someone@elsewhere.example" });
    await fake.settled();
    expect(answers.findLast((a) => a.type === "customer.created")!.body).toMatchObject({ outcome: "ignored" });
    const foreign = await stripe.checkout.sessions.create({
      mode: "payment",
      success_url: "http://127.0.0.1:9/",
      line_items: [{ quantity: 99, price_data: { currency: "usd", unit_amount: 100, product_data: { name: "Something else" } } }],
    });
    fake.payCheckout(foreign.id, "4242424242424242");
    await fake.settled();
    expect(answers.at(-1)!).toMatchObject({ status: 200, body: { outcome: "not-ours" } });
    void customer;
  });

  it("answers 500 and keeps the event unprocessed when it cannot be acted on, so the provider sends it again", async () => {
    const ghost = { id: "evt_ghost_1", object: "event", type: "checkout.session.completed", created: 1, livemode: false, data: { object: { id: "cs_test_does_not_exist", object: "checkout.session" } } };
    const body = JSON.stringify(ghost);
    const logged = vi.spyOn(console, "error").mockImplementation(() => {});
    const first = await postToWebhook(body, fake.sign(body));
    expect(logged).toHaveBeenCalledWith(expect.stringMatching(/^Payment event evt_ghost_1 \(checkout.session.completed\) could not be processed/), expect.anything());
    logged.mockRestore();
    expect(first.response.status).toBe(500);
    const [row] = await m.db.select().from(paymentEvents).where(eq(paymentEvents.id, "evt_ghost_1"));
    expect(row.processedAt).toBeNull();
    expect(row.lastError).toMatch(/No such checkout.session/);
    vi.spyOn(console, "error").mockImplementationOnce(() => {});
    expect((await postToWebhook(body, fake.sign(body))).response.status).toBe(500);
  });

  it("refuses anything but POST", async () => {
    const response = await m.webhook.loader();
    expect(response.status).toBe(405);
    expect(response.headers.get("allow")).toBe("POST");
  });
});

describe("events out of order", () => {
  it("invoice.paid before invoice.finalized and invoice.sent: seats once, the late events change nothing", async () => {
    const { school, admin } = await createSchool(m.db, { seats: 1 });
    appMode = "down";
    const { purchaseId } = await m.purchases.requestInvoice(deps(), { organisationId: school.id, buyer: admin, schoolYear: "2026-27", seats: 8, purchaseOrder: "PO-OOO-1" });
    const [row] = await m.db.select().from(seatPurchases).where(eq(seatPurchases.id, purchaseId));
    fake.markInvoicePaid(row.providerRef!);
    await fake.settled(); // nothing reached the app
    appMode = "app";
    const about = (type: string) => fake.events(type).find((e) => (e.data.object as { id: string }).id === row.providerRef)!;
    const paid = about("invoice.paid");
    expect(await fake.resend(paid.id)).toBe(200);
    expect(await ledger(school.id)).toMatchObject({ bought: 9 });
    for (const late of [about("invoice.sent"), about("invoice.finalized"), about("invoice.created")]) {
      expect(await fake.resend(late.id)).toBe(200);
    }
    expect(await ledger(school.id)).toMatchObject({ bought: 9 });
    const [after] = await m.db.select().from(seatPurchases).where(eq(seatPurchases.id, purchaseId));
    expect(after).toMatchObject({ status: "paid", seats: 8, invoiceNumber: expect.stringMatching(/^BWTEST-/) });
  });

  it("a late invoice.finalized after invoice.voided leaves the purchase closed", async () => {
    const { school, admin } = await createSchool(m.db);
    appMode = "down";
    const { purchaseId } = await m.purchases.requestInvoice(deps(), { organisationId: school.id, buyer: admin, schoolYear: "2026-27", seats: 3, purchaseOrder: "PO-VOID" });
    const [row] = await m.db.select().from(seatPurchases).where(eq(seatPurchases.id, purchaseId));
    await stripe.invoices.voidInvoice(row.providerRef!);
    await fake.settled();
    appMode = "app";
    const about = (type: string) => fake.events(type).find((e) => (e.data.object as { id: string }).id === row.providerRef)!;
    await fake.resend(about("invoice.voided").id);
    await fake.resend(about("invoice.finalized").id);
    const [after] = await m.db.select().from(seatPurchases).where(eq(seatPurchases.id, purchaseId));
    expect(after.status).toBe("void");
    expect(await ledger(school.id)).toMatchObject({ bought: 0 });
  });

  it("an event that arrives before Bendwise noted the session id still finds its purchase by the id in the metadata", async () => {
    const { school, admin } = await createSchool(m.db);
    const [row] = await m.db
      .insert(seatPurchases)
      .values({ organisationId: school.id, schoolYear: "2026-27", seats: 2, amountCents: 1800, method: "card", status: "pending", buyerUserId: admin.id })
      .returning();
    const session = await stripe.checkout.sessions.create({
      mode: "payment",
      success_url: "http://127.0.0.1:9/",
      line_items: [{ quantity: 2, price_data: { currency: "usd", unit_amount: 900, product_data: { name: "Seat" } } }],
      metadata: { bendwise_purchase_id: row.id, bendwise_organisation_id: school.id, bendwise_school_year: "2026-27", bendwise_buyer_id: admin.id },
    });
    fake.payCheckout(session.id, "4242424242424242");
    await fake.settled();
    const [after] = await m.db.select().from(seatPurchases).where(eq(seatPurchases.id, row.id));
    expect(after).toMatchObject({ status: "paid", providerRef: session.id, seats: 2 });
    expect(await ledger(school.id)).toMatchObject({ bought: 2 });
  });
});

describe("paying by invoice", () => {
  it("request, the operator marks it paid, the seats appear and the receipt arrives", async () => {
    const { school, admin } = await createSchool(m.db, { seats: 10 });
    const asked = await m.purchases.requestInvoice(deps(), { organisationId: school.id, buyer: admin, schoolYear: "2026-27", seats: 25, purchaseOrder: "PO-2026-0042" });
    expect(asked.invoiceNumber).toMatch(/^BWTEST-[0-9A-Z]{5}-\d{4}$/);
    expect(asked.invoiceUrl).toMatch(new RegExp(`^${fake.url}/invoice/in_`));
    const [pending] = await m.db.select().from(seatPurchases).where(eq(seatPurchases.id, asked.purchaseId));
    expect(pending).toMatchObject({ status: "pending", method: "invoice", seats: 25, amountCents: 22_500, purchaseOrder: "PO-2026-0042", invoiceNumber: asked.invoiceNumber });

    // What the provider holds: a sent invoice with the purchase order and 25 seats.
    const invoice = await stripe.invoices.retrieve(pending.providerRef!);
    expect(invoice).toMatchObject({ status: "open", collection_method: "send_invoice", amount_due: 22_500, custom_fields: [{ name: "Purchase order", value: "PO-2026-0042" }] });
    expect(invoice.metadata).toMatchObject({ bendwise_purchase_id: asked.purchaseId, purchase_order: "PO-2026-0042" });
    expect(fake.events("invoice.sent").some((e) => (e.data.object as { id: string }).id === invoice.id)).toBe(true);
    await fake.settled();
    expect(await ledger(school.id)).toMatchObject({ bought: 10 });

    // The school pays by transfer; the operator desk marks the invoice paid.
    const marked = await fetch(`${fake.url}/operator/invoices/${invoice.id}/pay`, { method: "POST", redirect: "manual" });
    expect(marked.status).toBe(303);
    await fake.settled();
    expect(await ledger(school.id)).toEqual({ schoolYear: "2026-27", bought: 35, inUse: 0, free: 35 });
    const [paid] = await m.db.select().from(seatPurchases).where(eq(seatPurchases.id, asked.purchaseId));
    expect(paid).toMatchObject({ status: "paid", seats: 25, amountCents: 22_500 });

    const mails = await mailTo(admin.email!);
    expect(mails).toHaveLength(1);
    expect(mails[0].subject).toMatch(/25 seats for 2026-27, \$225\.00$/);
    expect(mails[0].text).toContain(`By invoice ${asked.invoiceNumber}, purchase order PO-2026-0042`);
    expect(mails[0].text).toContain("Seats for 2026-27 now: 35 bought, 0 in use, 35 free.");
    expect(mails[0].html).toContain("PO-2026-0042");

    // The invoice.paid event again: no second receipt, no more seats.
    await fake.resend(fake.events("invoice.paid").find((e) => (e.data.object as { id: string }).id === invoice.id)!.id);
    await m.receipts.receiptsSettled();
    expect(await mailTo(admin.email!)).toHaveLength(1);
    expect(await ledger(school.id)).toMatchObject({ bought: 35 });
  });

  it("reuses the organisation's customer at the provider for a second invoice", async () => {
    const { school, admin } = await createSchool(m.db);
    const one = await m.purchases.requestInvoice(deps(), { organisationId: school.id, buyer: admin, schoolYear: "2026-27", seats: 1, purchaseOrder: "A" });
    const two = await m.purchases.requestInvoice(deps(), { organisationId: school.id, buyer: admin, schoolYear: "2027-28", seats: 1, purchaseOrder: "B" });
    const rows = await m.db.select().from(seatPurchases).where(eq(seatPurchases.organisationId, school.id));
    const invoices = await Promise.all(rows.map((r) => stripe.invoices.retrieve(r.providerRef!)));
    expect(new Set(invoices.map((i) => i.customer)).size).toBe(1);
    expect([one.invoiceNumber, two.invoiceNumber].every(Boolean)).toBe(true);
  });

  it("seat purchases that need no payment service (the demo's) never get a receipt", async () => {
    const { school } = await createSchool(m.db, { seats: 3 });
    expect(await m.receipts.sendDueReceipts({ db: m.db, sendMail: async () => { throw new Error("no mail expected"); }, appUrl: "http://x" }, [school.id])).toBe(0);
  });
});
