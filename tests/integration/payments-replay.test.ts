// Payment events replayed and reordered, as a property (fast-check): for a school that pays one card
// checkout (4 seats) and one invoice (7 seats), the provider's events arrive in any order, any number
// of times (each freshly signed, as a provider's retry is). Whatever the sequence:
//   - once every event has arrived at least once, the school has exactly 11 more seats, both purchases
//     are paid, each once, and nothing else was bought;
//   - delivering the whole sequence again changes nothing at all (every table has the same rows and
//     checksum), except the count of deliveries the event log keeps for each event id.
// payments-webhook.test.ts covers the single cases (a repeat, two at once, invoice.paid first, a late
// event after a void); this file throws random sequences at the same route.
import { eq } from "drizzle-orm";
import fc from "fast-check";
import type Stripe from "stripe";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { paymentEvents, seatPurchases } from "~/db/schema.server";
import { startPaymentsFake, type PaymentsFake } from "../fakes/payments-server";
import { appPaymentModules, type PaymentModules } from "./payments-helpers";
import { createSchool } from "../factories/schools";
import type { Snapshot } from "./db-snapshot";

type Modules = PaymentModules & {
  snapshotter: typeof import("./db-snapshot").snapshotter;
  changedTables: typeof import("./db-snapshot").changedTables;
};

let fake: PaymentsFake;
let m: Modules;
let stripe: Stripe;
/** Bodies of every event the fake sent; none reaches the app until the test delivers it. */
const caught = new Map<string, string>();

async function deliver(body: string) {
  const request = new Request("http://127.0.0.1/api/payments/webhook", {
    method: "POST",
    headers: { "content-type": "application/json", "stripe-signature": fake.sign(body) },
    body,
  });
  const response = (await m.webhook.action({ request, params: {}, context: {} } as never)) as Response;
  return response.status;
}

beforeAll(async () => {
  fake = await startPaymentsFake({
    port: 0,
    webhookSecret: process.env.PAYMENTS_WEBHOOK_SECRET!,
    retryDelaysMs: [],
    transport: async ({ body }) => {
      caught.set(JSON.parse(body).id, body);
      return 503; // "down": the test delivers the events itself, in its own order
    },
  });
  const app = await appPaymentModules(fake.url);
  const snapshots = await import("./db-snapshot");
  m = { ...app.modules, snapshotter: snapshots.snapshotter, changedTables: snapshots.changedTables };
  stripe = app.stripe;
}, 60_000);

afterAll(async () => {
  await fake.settled();
  await m.receipts.receiptsSettled();
  await fake.stop();
});

/** A school with one paid card checkout and one paid invoice; answers their events' bodies, none delivered yet. */
async function schoolThatPaid() {
  const { school, admin } = await createSchool(m.db, { seats: 2 });
  const before = new Set(caught.keys());
  const card = await m.purchases.startCardCheckout({ db: m.db, stripe }, { organisationId: school.id, buyer: admin, schoolYear: "2026-27", seats: 4, appUrl: "http://127.0.0.1:9" });
  fake.payCheckout(card.url.split("/pay/")[1], "4242424242424242");
  const invoice = await m.purchases.requestInvoice({ db: m.db, stripe }, { organisationId: school.id, buyer: admin, schoolYear: "2026-27", seats: 7, purchaseOrder: `PO-REPLAY-${school.id.slice(0, 6)}` });
  const [row] = await m.db.select().from(seatPurchases).where(eq(seatPurchases.id, invoice.purchaseId));
  fake.markInvoicePaid(row.providerRef!);
  await fake.settled();
  const bodies = [...caught].filter(([id]) => !before.has(id)).map(([, body]) => body);
  const ours = bodies.filter((b) => {
    const object = JSON.parse(b).data.object as { id: string; metadata?: Record<string, string> };
    return object.id === row.providerRef || object.id === card.url.split("/pay/")[1];
  });
  return { school, bodies: ours, purchaseIds: [card.purchaseId, invoice.purchaseId] };
}

const ledger = (organisationId: string) => m.seats.seatLedgerForYear({ db: m.db }, organisationId, "2026-27");

describe("replayed and reordered payment events", () => {
  it("grant each purchase once, whatever the order and the repeats; a second pass changes nothing", async () => {
    const snapshot = await m.snapshotter(["payment_events", "rate_limits", "sign_in_failures"]);
    await fc.assert(
      fc.asyncProperty(fc.array(fc.nat(), { minLength: 1, maxLength: 16 }), fc.integer({ min: 0, max: 1000 }), async (picks, rotation) => {
        const { school, bodies, purchaseIds } = await schoolThatPaid();
        expect(bodies.map((b) => JSON.parse(b).type)).toEqual(expect.arrayContaining(["checkout.session.completed", "invoice.paid"]));
        // A random sequence with repeats, then every event once more in a rotated order, so each has arrived.
        const sequence = [...picks.map((p) => bodies[p % bodies.length]), ...bodies.map((_, i) => bodies[(i + rotation) % bodies.length])];
        for (const body of sequence) expect(await deliver(body)).toBe(200);

        expect(await ledger(school.id)).toMatchObject({ bought: 2 + 4 + 7 });
        const purchases = await m.db.select().from(seatPurchases).where(eq(seatPurchases.organisationId, school.id));
        expect(purchases.filter((p) => p.status === "paid").map((p) => p.seats).sort((a, b) => a - b)).toEqual([2, 4, 7]);
        expect(purchases.filter((p) => purchaseIds.includes(p.id)).every((p) => p.status === "paid")).toBe(true);

        await m.receipts.receiptsSettled();
        const tablesBefore: Snapshot = await snapshot();
        const eventsBefore = await m.db.select({ id: paymentEvents.id, processedAt: paymentEvents.processedAt, outcome: paymentEvents.outcome }).from(paymentEvents);
        for (const body of [...sequence].reverse()) expect(await deliver(body)).toBe(200);
        await m.receipts.receiptsSettled();
        expect(m.changedTables(tablesBefore, await snapshot()), "tables changed by delivering the same events again").toEqual([]);
        const eventsAfter = await m.db.select({ id: paymentEvents.id, processedAt: paymentEvents.processedAt, outcome: paymentEvents.outcome }).from(paymentEvents);
        expect(eventsAfter.sort((a, b) => a.id.localeCompare(b.id))).toEqual(eventsBefore.sort((a, b) => a.id.localeCompare(b.id)));
      }),
      { numRuns: Number(process.env.FUZZ_RUNS ?? 8), endOnFailure: true },
    );
  }, 180_000);
});
