// The payments fake on its own, driven by the real `stripe` SDK: checkout sessions and their line
// items, the hosted page with every published test card, invoices with a purchase-order number that the
// operator marks paid, webhooks that the SDK's own verifier accepts, retries with backoff, and replay.
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import Stripe from "stripe";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { startPaymentsFake, type PaymentsFake } from "../fakes/payments-server";

const secret = "whsec_fake_tests";

interface Received {
  body: string;
  signature: string;
  at: number;
}

/** A stand-in webhook address that records what arrives and answers the statuses it is told to. */
async function startReceiver(answers: number[] = []) {
  const received: Received[] = [];
  const server: Server = createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on("data", (c: Buffer) => chunks.push(c));
    req.on("end", () => {
      received.push({ body: Buffer.concat(chunks).toString("utf8"), signature: String(req.headers["stripe-signature"]), at: Date.now() });
      res.writeHead(answers.shift() ?? 200);
      res.end();
    });
  });
  await new Promise<void>((r) => server.listen(0, "127.0.0.1", r));
  const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}/hook`;
  return { url, received, answers, stop: () => new Promise<void>((r) => server.close(() => r())) };
}

function sdkFor(fake: PaymentsFake, key = "sk_test_fake_tests") {
  return new Stripe(key, { host: "127.0.0.1", port: fake.port, protocol: "http", telemetry: false, maxNetworkRetries: 0 });
}

async function startFake(receiverUrl?: string, retryDelaysMs = [40, 80, 160]) {
  return startPaymentsFake({ port: 0, webhookUrl: receiverUrl, webhookSecret: secret, retryDelaysMs });
}

async function payOnHostedPage(sessionUrl: string, fields: Record<string, string>) {
  return fetch(sessionUrl, {
    method: "POST",
    redirect: "manual",
    headers: { "content-type": "application/x-www-form-urlencoded" },
    body: new URLSearchParams({ action: "pay", expiry: "12/34", cvc: "123", ...fields }),
  });
}

async function seatCheckout(stripe: Stripe, quantity = 3) {
  return stripe.checkout.sessions.create({
    mode: "payment",
    line_items: [{ quantity, price_data: { currency: "usd", unit_amount: 900, product_data: { name: "Student seat, 2026-27" } } }],
    success_url: "http://127.0.0.1:9/back/done?session_id={CHECKOUT_SESSION_ID}",
    cancel_url: "http://127.0.0.1:9/back/stopped",
    metadata: { organisation: "org-1", school_year: "2026-27" },
    customer_email: "buyer@school.example",
  });
}

const toStop: Array<() => Promise<void>> = [];
afterEach(async () => {
  while (toStop.length) await toStop.pop()!();
});

describe("checkout sessions and line items", () => {
  it("creates a session whose line items, totals and metadata read back through the SDK", async () => {
    const fake = await startFake();
    toStop.push(fake.stop);
    const stripe = sdkFor(fake);
    const session = await seatCheckout(stripe, 12);
    expect(session.id).toMatch(/^cs_test_/);
    expect(session.status).toBe("open");
    expect(session.payment_status).toBe("unpaid");
    expect(session.amount_total).toBe(12 * 900);
    expect(session.url).toBe(`${fake.url}/pay/${session.id}`);
    expect(session.metadata).toEqual({ organisation: "org-1", school_year: "2026-27" });

    const items = await stripe.checkout.sessions.listLineItems(session.id);
    expect(items.data).toHaveLength(1);
    expect(items.data[0]).toMatchObject({ object: "item", quantity: 12, amount_total: 10_800, currency: "usd", description: "Student seat, 2026-27" });
    expect(items.data[0].price?.unit_amount).toBe(900);

    const expanded = await stripe.checkout.sessions.retrieve(session.id, { expand: ["line_items"] });
    expect(expanded.line_items?.data[0].quantity).toBe(12);
  });

  it("refuses a session without line items, or with a quantity of zero, as the provider does", async () => {
    const fake = await startFake();
    toStop.push(fake.stop);
    const stripe = sdkFor(fake);
    await expect(stripe.checkout.sessions.create({ mode: "payment", success_url: "http://x.example/" })).rejects.toMatchObject({
      type: "StripeInvalidRequestError",
      param: "line_items",
    });
    await expect(
      stripe.checkout.sessions.create({
        mode: "payment",
        success_url: "http://x.example/",
        line_items: [{ quantity: 0, price_data: { currency: "usd", unit_amount: 900, product_data: { name: "Seat" } } }],
      }),
    ).rejects.toMatchObject({ param: "line_items[0][quantity]" });
  });

  it("answers 401 to a key that is not a test key, and 404 with resource_missing for an unknown id", async () => {
    const fake = await startFake();
    toStop.push(fake.stop);
    await expect(sdkFor(fake, "sk_live_nope").customers.create({})).rejects.toMatchObject({ type: "StripeAuthenticationError" });
    await expect(sdkFor(fake).checkout.sessions.retrieve("cs_test_missing")).rejects.toMatchObject({ code: "resource_missing", statusCode: 404 });
  });

  it("gives a retried request with the same idempotency key the first answer", async () => {
    const fake = await startFake();
    toStop.push(fake.stop);
    const stripe = sdkFor(fake);
    const first = await stripe.customers.create({ email: "a@school.example" }, { idempotencyKey: "same-key" });
    const second = await stripe.customers.create({ email: "a@school.example" }, { idempotencyKey: "same-key" });
    expect(second.id).toBe(first.id);
    expect(fake.state.customers.size).toBe(1);
  });
});

describe("the hosted payment page and the published test cards", () => {
  let receiver: Awaited<ReturnType<typeof startReceiver>>;
  let fake: PaymentsFake;
  let stripe: Stripe;
  beforeAll(async () => {
    receiver = await startReceiver();
    fake = await startFake(receiver.url);
    stripe = sdkFor(fake);
  });
  afterAll(async () => {
    await fake.stop();
    await receiver.stop();
  });

  it("shows the order in a look of its own, with the total and the test card numbers", async () => {
    const session = await seatCheckout(stripe, 10);
    const page = await (await fetch(session.url!)).text();
    expect(page).toContain("Loopback Pay");
    expect(page).toContain("TEST MODE");
    expect(page).toContain("Student seat, 2026-27");
    expect(page).toContain("$90.00");
    expect(page).toContain("4242 4242 4242 4242");
    expect(page).toContain('href="http://127.0.0.1:9/back/stopped"');
    expect(page).not.toMatch(/bendwise/i);
  });

  it("4242 4242 4242 4242 pays: back to the success address, the session complete and checkout.session.completed sent", async () => {
    const session = await seatCheckout(stripe, 10);
    const response = await payOnHostedPage(session.url!, { number: "4242 4242 4242 4242", email: "buyer@school.example" });
    expect(response.status).toBe(303);
    expect(response.headers.get("location")).toBe(`http://127.0.0.1:9/back/done?session_id=${session.id}`);
    const after = await stripe.checkout.sessions.retrieve(session.id);
    expect(after).toMatchObject({ status: "complete", payment_status: "paid" });
    expect(after.payment_intent).toMatch(/^pi_/);
    await fake.settled();
    const completed = receiver.received.map((r) => JSON.parse(r.body)).find((e) => e.data.object.id === session.id);
    expect(completed).toMatchObject({ object: "event", type: "checkout.session.completed", livemode: false, data: { object: { id: session.id, payment_status: "paid", metadata: { school_year: "2026-27" } } } });
    expect(completed.api_version).toBe(Stripe.API_VERSION);
  });

  for (const [card, words, code] of [
    ["4000 0000 0000 0002", /declined/, "card_declined"],
    ["4000 0000 0000 9995", /insufficient funds/, "insufficient_funds"],
    ["4000 0000 0000 0069", /expired/, "expired_card"],
  ] as const) {
    it(`${card} is refused (${code}) with a clear message; the session stays open and nothing is sent`, async () => {
      const session = await seatCheckout(stripe, 2);
      const eventsBefore = fake.events().length;
      const response = await payOnHostedPage(session.url!, { number: card, email: "keep@school.example", name: "Dana W" });
      expect(response.status).toBe(402);
      const page = await response.text();
      expect(page).toMatch(words);
      expect(page).toContain('role="alert"');
      expect(page).toContain("No money was taken");
      // What was typed stays in the form.
      expect(page).toContain('value="keep@school.example"');
      expect(page).toContain('value="Dana W"');
      expect((await stripe.checkout.sessions.retrieve(session.id)).status).toBe("open");
      expect(fake.events().length).toBe(eventsBefore);
    });
  }

  it("refuses any number that is not a published test card, and an incomplete form, with what to fix", async () => {
    const session = await seatCheckout(stripe, 1);
    const other = await payOnHostedPage(session.url!, { number: "5555 5555 5555 4444" });
    expect(await other.text()).toMatch(/Only the published test card numbers work here/);
    const noExpiry = await payOnHostedPage(session.url!, { number: "4242424242424242", expiry: "" });
    expect(await noExpiry.text()).toMatch(/Enter the expiry date as MM\/YY/);
    const pastExpiry = await payOnHostedPage(session.url!, { number: "4242424242424242", expiry: "01/20" });
    expect(await pastExpiry.text()).toMatch(/in the past/);
  });

  it("a paid session cannot be paid twice, and an expired one says so and cannot be paid", async () => {
    const paid = await seatCheckout(stripe, 1);
    expect(fake.payCheckout(paid.id, "4242424242424242").ok).toBe(true);
    expect(fake.payCheckout(paid.id, "4242424242424242")).toMatchObject({ ok: false, message: "This checkout is already paid." });

    const abandoned = await seatCheckout(stripe, 1);
    const expired = await stripe.checkout.sessions.expire(abandoned.id);
    expect(expired.status).toBe("expired");
    expect(fake.events("checkout.session.expired").at(-1)?.data.object).toMatchObject({ id: abandoned.id, status: "expired" });
    expect(await (await fetch(`${fake.url}/pay/${abandoned.id}`)).text()).toMatch(/This checkout has expired/);
  });

  it("expires an open session once its time is up, with checkout.session.expired", async () => {
    // A fake of its own, so no other test's session runs out at the same moment.
    const fake = await startFake();
    toStop.push(fake.stop);
    const stripe = sdkFor(fake);
    const session = await seatCheckout(stripe, 1);
    expect(session.expires_at).toBeGreaterThan(Date.now() / 1000 + 23 * 3600);
    expect(fake.ops.expireOverdueSessions(Number(session.expires_at) - 1)).toBe(0);
    expect(fake.ops.expireOverdueSessions(Number(session.expires_at))).toBe(1);
    expect((await stripe.checkout.sessions.retrieve(session.id)).status).toBe("expired");
    expect(fake.events("checkout.session.expired").some((e) => (e.data.object as { id: string }).id === session.id)).toBe(true);
    await expect(
      stripe.checkout.sessions.create({
        mode: "payment",
        success_url: "http://x.example/",
        expires_at: Math.floor(Date.now() / 1000) + 60,
        line_items: [{ quantity: 1, price_data: { currency: "usd", unit_amount: 900, product_data: { name: "Seat" } } }],
      }),
    ).rejects.toMatchObject({ param: "expires_at" });
  });
});

describe("invoices with a purchase-order number", () => {
  async function invoiceFor(stripe: Stripe, seats: number) {
    const customer = await stripe.customers.create({ email: "office@school.example", name: "An invented school", metadata: { organisation: "org-2" } });
    const product = await stripe.products.create({ id: "seat-product-test", name: "Student seat" }).catch(() => stripe.products.retrieve("seat-product-test"));
    const draft = await stripe.invoices.create({
      customer: customer.id,
      collection_method: "send_invoice",
      days_until_due: 30,
      pending_invoice_items_behavior: "exclude",
      custom_fields: [{ name: "Purchase order", value: "PO-7781" }],
      metadata: { organisation: "org-2", school_year: "2026-27", purchase_order: "PO-7781" },
    });
    await stripe.invoiceItems.create({ customer: customer.id, invoice: draft.id, quantity: seats, price_data: { currency: "usd", product: product.id, unit_amount: 900 }, description: "Student seats, 2026-27" });
    return { customer, draft };
  }

  it("is created, finalized and sent through the SDK, numbered, with its lines, total and purchase order", async () => {
    const receiver = await startReceiver();
    const fake = await startFake(receiver.url);
    toStop.push(fake.stop, receiver.stop);
    const stripe = sdkFor(fake);
    const { draft } = await invoiceFor(stripe, 25);
    expect(draft.status).toBe("draft");
    const finalized = await stripe.invoices.finalizeInvoice(draft.id);
    expect(finalized.status).toBe("open");
    expect(finalized.number).toMatch(/^BWTEST-[0-9A-Z]{5}-\d{4}$/);
    expect(finalized.amount_due).toBe(25 * 900);
    expect(finalized.custom_fields).toEqual([{ name: "Purchase order", value: "PO-7781" }]);
    expect(finalized.hosted_invoice_url).toBe(`${fake.url}/invoice/${draft.id}`);
    const sent = await stripe.invoices.sendInvoice(draft.id);
    expect(sent.status).toBe("open");

    const lines = await stripe.invoices.listLineItems(draft.id);
    expect(lines.data[0]).toMatchObject({ object: "line_item", quantity: 25, amount: 22_500 });
    expect(lines.data[0].pricing?.unit_amount_decimal?.toString()).toBe("900");

    await fake.settled();
    const types = receiver.received.map((r) => JSON.parse(r.body).type);
    expect(types).toEqual(["customer.created", "invoice.created", "invoice.finalized", "invoice.sent"]);

    const hosted = await (await fetch(finalized.hosted_invoice_url!)).text();
    expect(hosted).toContain("PO-7781");
    expect(hosted).toContain("$225.00");
  });

  it("the operator desk lists it and marks it paid; invoice.paid carries the paid invoice", async () => {
    const receiver = await startReceiver();
    const fake = await startFake(receiver.url);
    toStop.push(fake.stop, receiver.stop);
    const stripe = sdkFor(fake);
    const { draft } = await invoiceFor(stripe, 4);
    await stripe.invoices.sendInvoice(draft.id);

    const desk = await (await fetch(`${fake.url}/operator`)).text();
    expect(desk).toContain("Operator desk");
    expect(desk).toContain("PO-7781");
    expect(desk).toContain(`/operator/invoices/${draft.id}/pay`);

    const marked = await fetch(`${fake.url}/operator/invoices/${draft.id}/pay`, { method: "POST", redirect: "manual" });
    expect(marked.status).toBe(303);
    const paid = await stripe.invoices.retrieve(draft.id);
    expect(paid).toMatchObject({ status: "paid", amount_paid: 3600, amount_remaining: 0 });
    expect(paid.status_transitions.paid_at).toBeGreaterThan(0);
    await fake.settled();
    const event = receiver.received.map((r) => JSON.parse(r.body)).find((e) => e.type === "invoice.paid");
    expect(event.data.object).toMatchObject({ id: draft.id, status: "paid", metadata: { purchase_order: "PO-7781" } });
    expect(event.data.previous_attributes).toEqual({ status: "open" });

    const again = await fetch(`${fake.url}/operator/invoices/${draft.id}/pay`, { method: "POST", headers: { accept: "application/json" } });
    expect(again.status).toBe(400);
  });

  it("can be paid by card on the hosted invoice page (declined card first), or voided", async () => {
    const fake = await startFake();
    toStop.push(fake.stop);
    const stripe = sdkFor(fake);
    const { draft } = await invoiceFor(stripe, 2);
    const open = await stripe.invoices.finalizeInvoice(draft.id);
    const post = (number: string) =>
      fetch(open.hosted_invoice_url!, { method: "POST", headers: { "content-type": "application/x-www-form-urlencoded" }, body: new URLSearchParams({ number, expiry: "12/34", cvc: "123" }) });
    const declined = await post("4000000000000002");
    expect(declined.status).toBe(402);
    expect(await declined.text()).toMatch(/declined/);
    expect(fake.events().map((e) => e.type)).toContain("invoice.payment_failed");
    expect((await post("4242424242424242")).status).toBe(200);
    expect((await stripe.invoices.retrieve(draft.id)).status).toBe("paid");
    expect(fake.events().map((e) => e.type).slice(-2)).toEqual(["invoice.paid", "invoice.payment_succeeded"]);

    const other = await invoiceFor(stripe, 1);
    await stripe.invoices.finalizeInvoice(other.draft.id);
    const voided = await stripe.invoices.voidInvoice(other.draft.id);
    expect(voided.status).toBe("void");
    await expect(stripe.invoices.pay(other.draft.id, { paid_out_of_band: true })).rejects.toMatchObject({ code: "invoice_not_payable" });
  });
});

describe("webhooks", () => {
  it("are signed so that the SDK's own verifier accepts them, and rejects a wrong secret or a changed body", async () => {
    const receiver = await startReceiver();
    const fake = await startFake(receiver.url);
    toStop.push(fake.stop, receiver.stop);
    const stripe = sdkFor(fake);
    fake.payCheckout((await seatCheckout(stripe, 5)).id, "4242424242424242");
    await fake.settled();
    const { body, signature } = receiver.received.at(-1)!;
    expect(signature).toMatch(/^t=\d+,v1=[0-9a-f]{64}$/);
    const event = stripe.webhooks.constructEvent(body, signature, secret);
    expect(event.type).toBe("checkout.session.completed");
    expect(() => stripe.webhooks.constructEvent(body, signature, "whsec_someone_else")).toThrow(Stripe.errors.StripeSignatureVerificationError);
    expect(() => stripe.webhooks.constructEvent(body.replace('"paid"', '"unpaid"'), signature, secret)).toThrow(Stripe.errors.StripeSignatureVerificationError);
  });

  it("are retried with growing pauses until the address answers 2xx", async () => {
    const receiver = await startReceiver([500, 503, 200]);
    const fake = await startFake(receiver.url, [60, 120, 240]);
    toStop.push(fake.stop, receiver.stop);
    await sdkFor(fake).customers.create({ email: "retry@school.example" });
    await fake.settled();
    expect(receiver.received).toHaveLength(3);
    const ids = receiver.received.map((r) => JSON.parse(r.body).id);
    expect(new Set(ids).size).toBe(1);
    const gaps = [receiver.received[1].at - receiver.received[0].at, receiver.received[2].at - receiver.received[1].at];
    expect(gaps[0]).toBeGreaterThanOrEqual(55);
    expect(gaps[1]).toBeGreaterThanOrEqual(115);
    expect(gaps[1]).toBeGreaterThan(gaps[0]);
    // Each attempt is signed afresh and verifies.
    for (const r of receiver.received) expect(() => Stripe.webhooks.constructEvent(r.body, r.signature, secret)).not.toThrow();
    const record = fake.state.events[0];
    expect(record.delivered).toBe(true);
    expect(record.deliveries.map((d) => d.status)).toEqual([500, 503, 200]);
  });

  it("stop after the last retry, and the operator can send the event again later", async () => {
    const receiver = await startReceiver([500, 500, 500]);
    const fake = await startFake(receiver.url, [20, 20]);
    toStop.push(fake.stop, receiver.stop);
    await sdkFor(fake).customers.create({ email: "down@school.example" });
    await fake.settled();
    const record = fake.state.events[0];
    expect(record.deliveries).toHaveLength(3);
    expect(record).toMatchObject({ delivered: false, gaveUp: true });
    expect(await (await fetch(`${fake.url}/operator`)).text()).toMatch(/retries used up/);

    const replay = await fetch(`${fake.url}/operator/events/${record.event.id}/resend`, { method: "POST", headers: { accept: "application/json" } });
    expect(await replay.json()).toEqual({ status: 200 });
    expect(record.delivered).toBe(true);
    expect(receiver.received.at(-1)!.body).toBe(receiver.received[0].body);
  });

  it("replay sends the identical body with a fresh, valid signature", async () => {
    const receiver = await startReceiver();
    const fake = await startFake(receiver.url);
    toStop.push(fake.stop, receiver.stop);
    await sdkFor(fake).customers.create({ email: "x@school.example" });
    await fake.settled();
    const [first] = receiver.received;
    expect(await fake.resend(JSON.parse(first.body).id)).toBe(200);
    const second = receiver.received[1];
    expect(second.body).toBe(first.body);
    expect(Stripe.webhooks.constructEvent(second.body, second.signature, secret).id).toBe(JSON.parse(first.body).id);
  });

  it("can be handed to a function instead of an HTTP address", async () => {
    const seen: string[] = [];
    const fake = await startPaymentsFake({
      port: 0,
      webhookSecret: secret,
      retryDelaysMs: [],
      transport: async ({ body, headers }) => {
        seen.push(Stripe.webhooks.constructEvent(body, headers["stripe-signature"], secret).type);
        return 200;
      },
    });
    toStop.push(fake.stop);
    await sdkFor(fake).customers.create({});
    await fake.settled();
    expect(seen).toEqual(["customer.created"]);
  });
});
