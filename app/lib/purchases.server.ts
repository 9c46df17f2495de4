// Buying seats through the payment provider, and granting them from its signed events.
//
//  - A card purchase: a pending purchase row, then a checkout session (one line item: N seats at the
//    organisation's price) whose hosted page the buyer is sent to.
//  - An invoice: a pending purchase row, then a customer, an invoice with one invoice item and the
//    purchase-order number as a custom field, finalized and sent, all through the SDK.
//  - Seats are granted ONLY from a signed event (see handlePaymentEvent), never from a return page.
//    The event is only a nudge: the current state of the session or invoice is read back from the
//    API, the quantity from its line items, and the purchase row turns paid in one transaction. The
//    provider's id is unique on the row, so a repeated or late event changes nothing.
import { and, desc, eq, isNotNull, isNull, ne, or, sql } from "drizzle-orm";
import type Stripe from "stripe";
import type { Database } from "~/db/client.server";
import { organisations, paymentCustomers, paymentEvents, seatPurchases, users } from "~/db/schema.server";
import { FAMILY_SEAT_PRICE_CENTS, SCHOOL_SEAT_PRICE_CENTS } from "~/lib/pricing";
import { isSchoolYear } from "~/lib/school-year";

export interface PaymentsDeps {
  db: Database;
  stripe: Stripe;
}

type Tx = Parameters<Parameters<Database["transaction"]>[0]>[0];

/** Metadata Bendwise puts on every checkout session and invoice, and reads back from events. */
export const META = {
  purchase: "bendwise_purchase_id",
  organisation: "bendwise_organisation_id",
  schoolYear: "bendwise_school_year",
  buyer: "bendwise_buyer_id",
} as const;

export const PURCHASE_ORDER_FIELD = "Purchase order";
/** The longest purchase-order number we accept; a longer one is refused, never cut to fit the invoice. */
export const PURCHASE_ORDER_MAX = 40;

const sqlIncrement = () => sql`${paymentEvents.deliveries} + 1`;

export class PaymentServiceError extends Error {
  constructor(readonly userMessage: string, cause?: unknown) {
    super(userMessage, { cause });
  }
}

async function organisationFor(db: Database, organisationId: string) {
  const [org] = await db
    .select({ id: organisations.id, kind: organisations.kind, name: organisations.name })
    .from(organisations)
    .where(eq(organisations.id, organisationId));
  if (!org) throw new Error(`no organisation ${organisationId}`);
  return org;
}

export function seatPriceCents(kind: "school" | "household"): number {
  return kind === "school" ? SCHOOL_SEAT_PRICE_CENTS : FAMILY_SEAT_PRICE_CENTS;
}

export function seatItemName(kind: "school" | "household", schoolYear: string): string {
  return kind === "school" ? `Bendwise student seat, school year ${schoolYear}` : `Bendwise child seat, school year ${schoolYear}`;
}

export interface PurchaseRequest {
  organisationId: string;
  buyer: { id: string; email: string | null };
  schoolYear: string;
  seats: number;
}

/** The pages parse their forms; this guards the model against a caller that did not. */
function assertOrder(request: PurchaseRequest) {
  if (!Number.isInteger(request.seats) || request.seats < 1) throw new Error(`seats must be a positive whole number, not ${request.seats}`);
  if (!isSchoolYear(request.schoolYear)) throw new Error(`not a school year: ${request.schoolYear}`);
}

// ───────────────────────── Card: a checkout session on the provider's hosted page ─────────────────────────

/** Starts a card purchase; answers the hosted payment page to send the buyer to. */
export async function startCardCheckout(
  { db, stripe }: PaymentsDeps,
  request: PurchaseRequest & { appUrl: string },
): Promise<{ purchaseId: string; url: string }> {
  assertOrder(request);
  const org = await organisationFor(db, request.organisationId);
  const unitAmount = seatPriceCents(org.kind);
  const [purchase] = await db
    .insert(seatPurchases)
    .values({
      organisationId: org.id,
      schoolYear: request.schoolYear,
      seats: request.seats,
      amountCents: unitAmount * request.seats,
      method: "card",
      status: "pending",
      buyerUserId: request.buyer.id,
    })
    .returning({ id: seatPurchases.id });

  const back = (path: string) => `${request.appUrl.replace(/\/$/, "")}${path}?${new URLSearchParams({ purchase: purchase.id })}`;
  let session: Stripe.Checkout.Session;
  try {
    session = await stripe.checkout.sessions.create(
      {
        mode: "payment",
        line_items: [
          {
            quantity: request.seats,
            price_data: { currency: "usd", unit_amount: unitAmount, product_data: { name: seatItemName(org.kind, request.schoolYear) } },
          },
        ],
        success_url: back("/payments/confirming"),
        cancel_url: back("/payments/stopped"),
        client_reference_id: purchase.id,
        customer_email: request.buyer.email ?? undefined,
        metadata: {
          [META.purchase]: purchase.id,
          [META.organisation]: org.id,
          [META.schoolYear]: request.schoolYear,
          [META.buyer]: request.buyer.id,
        },
      },
      { idempotencyKey: `bendwise-checkout-${purchase.id}` },
    );
  } catch (error) {
    await db.update(seatPurchases).set({ status: "void" }).where(eq(seatPurchases.id, purchase.id));
    throw new PaymentServiceError("The payment service did not answer, so nothing was charged. Please try again in a minute.", error);
  }
  await db.update(seatPurchases).set({ providerRef: session.id }).where(and(eq(seatPurchases.id, purchase.id), isNull(seatPurchases.providerRef)));
  if (!session.url) throw new PaymentServiceError("The payment service gave no payment page. Please try again.");
  return { purchaseId: purchase.id, url: session.url };
}

/**
 * The buyer left the payment page without paying and chose to drop the checkout: the session is
 * expired at the provider, whose checkout.session.expired event then closes the purchase row.
 */
export async function abandonCheckout({ db, stripe }: PaymentsDeps, purchaseId: string): Promise<void> {
  const [purchase] = await db.select().from(seatPurchases).where(eq(seatPurchases.id, purchaseId));
  if (!purchase || purchase.method !== "card" || purchase.status !== "pending" || !purchase.providerRef) return;
  let session: Stripe.Checkout.Session | null;
  try {
    session = await stripe.checkout.sessions.retrieve(purchase.providerRef);
  } catch (error) {
    // A session the provider does not know (made with another key, or by a local payments fake that
    // has since restarted) can never be paid either.
    if ((error as { code?: string }).code !== "resource_missing") throw error;
    session = null;
  }
  // Complete: paid, or being paid; the signed event decides, not this page.
  if (session?.status === "complete") return;
  if (session?.status === "open") await stripe.checkout.sessions.expire(session.id);
  // An expired (or unknown) session can never be paid, so the row can close now; the expiry event agrees later.
  await db.update(seatPurchases).set({ status: "void" }).where(and(eq(seatPurchases.id, purchase.id), eq(seatPurchases.status, "pending")));
}

/** The organisation's seat page, where the buyer goes back to. */
export function seatsPagePath(kind: "school" | "household"): string {
  return kind === "school" ? "/school/seats" : "/family/seats";
}

/** The organisation ids whose purchases a user may see: where they are a school administrator or a parent. */
export function buyerOrganisationIds(user: { memberships: Array<{ organisationId: string; role: string }> }): string[] {
  return user.memberships.filter((m) => m.role === "school_admin" || m.role === "parent").map((m) => m.organisationId);
}

/** Where to continue paying an unfinished checkout, if it can still be paid. */
export async function openCheckoutUrl({ stripe }: { stripe: Stripe }, providerRef: string): Promise<string | null> {
  const session = await stripe.checkout.sessions.retrieve(providerRef);
  return session.status === "open" ? session.url : null;
}

// ───────────────────────── Invoice: for schools that pay by bank transfer ─────────────────────────

async function customerFor({ db, stripe }: PaymentsDeps, org: { id: string; name: string }, email: string | null): Promise<string> {
  const [known] = await db.select().from(paymentCustomers).where(eq(paymentCustomers.organisationId, org.id));
  if (known && (await customerStillThere(stripe, known.providerCustomerId))) return known.providerCustomerId;
  // None yet, or the provider no longer knows the one we kept: deleted in its dashboard, made with the
  // test-mode key before the switch to the live one, or made by a local payments fake that has since
  // restarted. A new one replaces it; a key of its own keeps the replacement from answering the old one.
  const customer = await stripe.customers.create(
    { name: org.name, email: email ?? undefined, metadata: { [META.organisation]: org.id } },
    { idempotencyKey: known ? `bendwise-customer-${org.id}-after-${known.providerCustomerId}` : `bendwise-customer-${org.id}` },
  );
  if (known) {
    await db
      .update(paymentCustomers)
      .set({ providerCustomerId: customer.id })
      .where(and(eq(paymentCustomers.organisationId, org.id), eq(paymentCustomers.providerCustomerId, known.providerCustomerId)));
  } else {
    await db.insert(paymentCustomers).values({ organisationId: org.id, providerCustomerId: customer.id }).onConflictDoNothing();
  }
  const [row] = await db.select().from(paymentCustomers).where(eq(paymentCustomers.organisationId, org.id));
  return row.providerCustomerId;
}

/** Whether the provider still has this customer (a deleted one is answered with `deleted: true`, an unknown one with 404). */
async function customerStillThere(stripe: Stripe, customerId: string): Promise<boolean> {
  try {
    const customer = await stripe.customers.retrieve(customerId);
    return !("deleted" in customer && customer.deleted);
  } catch (error) {
    if ((error as { code?: string }).code === "resource_missing") return false;
    throw error;
  }
}

/** The provider's product for a seat; made once with a fixed id, then reused. */
async function seatProduct(stripe: Stripe, kind: "school" | "household"): Promise<string> {
  const id = kind === "school" ? "bendwise-student-seat" : "bendwise-child-seat";
  try {
    return (await stripe.products.retrieve(id)).id;
  } catch (error) {
    if ((error as { code?: string }).code !== "resource_missing") throw error;
    try {
      return (await stripe.products.create({ id, name: kind === "school" ? "Bendwise student seat" : "Bendwise child seat" })).id;
    } catch (again) {
      // Another request made it a moment ago.
      if ((again as { code?: string }).code === "resource_already_exists") return id;
      throw again;
    }
  }
}

/**
 * Asks for an invoice: the school gets it by e-mail from the provider, pays it by transfer, and the
 * seats are granted when the provider says it is paid (invoice.paid).
 */
export async function requestInvoice(
  deps: PaymentsDeps,
  request: PurchaseRequest & { purchaseOrder: string },
): Promise<{ purchaseId: string; invoiceNumber: string | null; invoiceUrl: string | null }> {
  const { db, stripe } = deps;
  assertOrder(request);
  if ([...request.purchaseOrder].length > PURCHASE_ORDER_MAX) throw new Error(`a purchase-order number has at most ${PURCHASE_ORDER_MAX} characters; it is never cut`);
  const org = await organisationFor(db, request.organisationId);
  const unitAmount = seatPriceCents(org.kind);
  const [purchase] = await db
    .insert(seatPurchases)
    .values({
      organisationId: org.id,
      schoolYear: request.schoolYear,
      seats: request.seats,
      amountCents: unitAmount * request.seats,
      method: "invoice",
      status: "pending",
      purchaseOrder: request.purchaseOrder,
      buyerUserId: request.buyer.id,
    })
    .returning({ id: seatPurchases.id });

  try {
    const customer = await customerFor(deps, org, request.buyer.email);
    const product = await seatProduct(stripe, org.kind);
    const key = (step: string) => ({ idempotencyKey: `bendwise-invoice-${purchase.id}-${step}` });
    const draft = await stripe.invoices.create(
      {
        customer,
        collection_method: "send_invoice",
        days_until_due: 30,
        currency: "usd",
        pending_invoice_items_behavior: "exclude",
        description: `${request.seats} ${request.seats === 1 ? "seat" : "seats"} for the school year ${request.schoolYear}`,
        custom_fields: [{ name: PURCHASE_ORDER_FIELD, value: request.purchaseOrder }],
        metadata: {
          [META.purchase]: purchase.id,
          [META.organisation]: org.id,
          [META.schoolYear]: request.schoolYear,
          [META.buyer]: request.buyer.id,
          purchase_order: request.purchaseOrder,
        },
      },
      key("create"),
    );
    await db.update(seatPurchases).set({ providerRef: draft.id }).where(and(eq(seatPurchases.id, purchase.id), isNull(seatPurchases.providerRef)));
    await stripe.invoiceItems.create(
      {
        customer,
        invoice: draft.id,
        quantity: request.seats,
        price_data: { currency: "usd", product, unit_amount: unitAmount },
        description: seatItemName(org.kind, request.schoolYear),
      },
      key("item"),
    );
    await stripe.invoices.finalizeInvoice(draft.id, {}, key("finalize"));
    const sent = await stripe.invoices.sendInvoice(draft.id, {}, key("send"));
    await db
      .update(seatPurchases)
      .set({ invoiceNumber: sent.number, invoiceUrl: sent.hosted_invoice_url ?? null, amountCents: sent.amount_due })
      .where(and(eq(seatPurchases.id, purchase.id), eq(seatPurchases.status, "pending")));
    return { purchaseId: purchase.id, invoiceNumber: sent.number, invoiceUrl: sent.hosted_invoice_url ?? null };
  } catch (error) {
    await db.update(seatPurchases).set({ status: "void" }).where(and(eq(seatPurchases.id, purchase.id), eq(seatPurchases.status, "pending")));
    throw new PaymentServiceError("The invoice could not be made because the payment service did not answer. Nothing was ordered; please try again in a minute.", error);
  }
}

// ───────────────────────── Fulfilment from events ─────────────────────────

export type FulfilmentOutcome =
  | "seats-added"
  | "already-fulfilled"
  | "invoice-details-noted"
  | "purchase-closed"
  | "waiting-for-payment"
  | "not-ours"
  | "ignored";

export interface FulfilmentResult {
  outcome: FulfilmentOutcome;
  purchaseId?: string;
}

interface PaidState {
  providerRef: string;
  metadata: Record<string, string>;
  seats: number;
  amountCents: number;
  currency: string;
  paidAt: Date;
  invoiceNumber?: string | null;
  invoiceUrl?: string | null;
}

/** The purchase row an object belongs to: by the provider's id, else by the purchase id in its metadata. */
async function lockPurchase(tx: Tx, providerRef: string, metadata: Record<string, string>) {
  const purchaseId = metadata[META.purchase];
  const idIsUuid = Boolean(purchaseId && /^[0-9a-f-]{36}$/i.test(purchaseId));
  const [row] = await tx
    .select()
    .from(seatPurchases)
    .where(idIsUuid ? or(eq(seatPurchases.providerRef, providerRef), eq(seatPurchases.id, purchaseId)) : eq(seatPurchases.providerRef, providerRef))
    .orderBy(desc(eq(seatPurchases.providerRef, providerRef)))
    .limit(1)
    .for("update");
  return row;
}

/** Turns the purchase paid with the seats read from the provider: one transaction, once. */
async function grantSeats(db: Database, paid: PaidState): Promise<FulfilmentResult> {
  return db.transaction(async (tx) => {
    const row = await lockPurchase(tx, paid.providerRef, paid.metadata);
    if (row?.status === "paid") return { outcome: "already-fulfilled", purchaseId: row.id } as const;
    const values = {
      status: "paid" as const,
      seats: paid.seats,
      amountCents: paid.amountCents,
      currency: paid.currency,
      paidAt: paid.paidAt,
      providerRef: paid.providerRef,
      ...(paid.invoiceNumber !== undefined ? { invoiceNumber: paid.invoiceNumber, invoiceUrl: paid.invoiceUrl ?? null } : {}),
    };
    if (row) {
      await tx.update(seatPurchases).set(values).where(eq(seatPurchases.id, row.id));
      return { outcome: "seats-added", purchaseId: row.id } as const;
    }
    // No row of ours (it was never written, or the object was made outside Bendwise with our metadata).
    const organisationId = paid.metadata[META.organisation];
    const schoolYear = paid.metadata[META.schoolYear];
    if (!organisationId || !schoolYear) return { outcome: "not-ours" } as const;
    const [org] = await tx.select({ id: organisations.id }).from(organisations).where(eq(organisations.id, organisationId));
    if (!org) return { outcome: "not-ours" } as const;
    const buyer = paid.metadata[META.buyer];
    const [buyerRow] = buyer && /^[0-9a-f-]{36}$/i.test(buyer) ? await tx.select({ id: users.id }).from(users).where(eq(users.id, buyer)) : [];
    const inserted = await tx
      .insert(seatPurchases)
      .values({
        ...values,
        organisationId,
        schoolYear,
        method: paid.invoiceNumber !== undefined ? "invoice" : "card",
        purchaseOrder: paid.metadata.purchase_order ?? null,
        buyerUserId: buyerRow?.id ?? null,
      })
      .onConflictDoNothing({ target: seatPurchases.providerRef })
      .returning({ id: seatPurchases.id });
    return inserted[0] ? ({ outcome: "seats-added", purchaseId: inserted[0].id } as const) : ({ outcome: "already-fulfilled" } as const);
  });
}

/** A checkout that can no longer be paid (expired, or its delayed payment failed): the pending row is closed. */
async function closePurchase(db: Database, providerRef: string, metadata: Record<string, string>): Promise<FulfilmentResult> {
  return db.transaction(async (tx) => {
    const row = await lockPurchase(tx, providerRef, metadata);
    if (!row) return { outcome: "not-ours" } as const;
    if (row.status === "paid") return { outcome: "already-fulfilled", purchaseId: row.id } as const;
    await tx.update(seatPurchases).set({ status: "void", providerRef }).where(eq(seatPurchases.id, row.id));
    return { outcome: "purchase-closed", purchaseId: row.id } as const;
  });
}

const isOurs = (metadata: Record<string, string> | null | undefined): metadata is Record<string, string> =>
  Boolean(metadata?.[META.purchase] || metadata?.[META.organisation]);

/** Reads the checkout session as it is now and acts on that, whichever event brought us here. */
export async function syncCheckoutSession({ db, stripe }: PaymentsDeps, sessionId: string): Promise<FulfilmentResult> {
  const session = await stripe.checkout.sessions.retrieve(sessionId);
  if (!isOurs(session.metadata)) return { outcome: "not-ours" };
  if (session.status === "complete" && (session.payment_status === "paid" || session.payment_status === "no_payment_required")) {
    const items = await stripe.checkout.sessions.listLineItems(session.id, { limit: 100 });
    const seats = items.data.reduce((sum, item) => sum + (item.quantity ?? 0), 0);
    return grantSeats(db, {
      providerRef: session.id,
      metadata: session.metadata,
      seats,
      amountCents: session.amount_total ?? 0,
      currency: session.currency ?? "usd",
      paidAt: new Date(),
    });
  }
  if (session.status === "expired" || (session.status === "complete" && session.payment_status === "unpaid")) {
    return closePurchase(db, session.id, session.metadata);
  }
  return { outcome: "waiting-for-payment" };
}

/** Reads the invoice as it is now and acts on that. */
export async function syncInvoice({ db, stripe }: PaymentsDeps, invoiceId: string): Promise<FulfilmentResult> {
  const invoice = await stripe.invoices.retrieve(invoiceId);
  if (!isOurs(invoice.metadata)) return { outcome: "not-ours" };
  const metadata = invoice.metadata;
  if (invoice.status === "paid") {
    const lines = await stripe.invoices.listLineItems(invoice.id, { limit: 100 });
    const seats = lines.data.reduce((sum, line) => sum + (line.quantity ?? 0), 0);
    return grantSeats(db, {
      providerRef: invoice.id,
      metadata,
      seats,
      amountCents: invoice.amount_paid,
      currency: invoice.currency,
      paidAt: invoice.status_transitions?.paid_at ? new Date(invoice.status_transitions.paid_at * 1000) : new Date(),
      invoiceNumber: invoice.number,
      invoiceUrl: invoice.hosted_invoice_url ?? null,
    });
  }
  if (invoice.status === "void" || invoice.status === "uncollectible") return closePurchase(db, invoice.id, metadata);
  if (invoice.status === "open") {
    const noted = await db.transaction(async (tx) => {
      const row = await lockPurchase(tx, invoice.id, metadata);
      if (!row || row.status !== "pending") return row?.id;
      await tx
        .update(seatPurchases)
        .set({ providerRef: invoice.id, invoiceNumber: invoice.number, invoiceUrl: invoice.hosted_invoice_url ?? null })
        .where(eq(seatPurchases.id, row.id));
      return row.id;
    });
    return { outcome: "invoice-details-noted", purchaseId: noted };
  }
  return { outcome: "waiting-for-payment" };
}

const CHECKOUT_EVENTS = new Set([
  "checkout.session.completed",
  "checkout.session.async_payment_succeeded",
  "checkout.session.async_payment_failed",
  "checkout.session.expired",
]);
const INVOICE_EVENTS = new Set([
  "invoice.finalized",
  "invoice.sent",
  "invoice.paid",
  "invoice.payment_succeeded",
  "invoice.voided",
  "invoice.marked_uncollectible",
]);

export interface EventHandling extends FulfilmentResult {
  /** True when this event id had already been acted on: nothing was done again. */
  duplicate: boolean;
}

/**
 * Acts on one verified event, once per event id: the id is recorded first; a delivery of an id that
 * was already processed does nothing. A failure leaves the event unprocessed and is thrown, so the
 * webhook answers 500 and the provider delivers it again later.
 */
export async function handlePaymentEvent(deps: PaymentsDeps, event: { id: string; type: string; data: { object: object } }): Promise<EventHandling> {
  const { db } = deps;
  const about = (event.data.object as { id?: unknown }).id;
  const objectId = typeof about === "string" ? about : null;
  const [recorded] = await db
    .insert(paymentEvents)
    .values({ id: event.id, type: event.type, objectId })
    .onConflictDoUpdate({ target: paymentEvents.id, set: { deliveries: sqlIncrement() } })
    .returning({ processedAt: paymentEvents.processedAt, outcome: paymentEvents.outcome });
  if (recorded.processedAt) return { outcome: (recorded.outcome as FulfilmentOutcome) ?? "ignored", duplicate: true };

  let result: FulfilmentResult;
  try {
    if (CHECKOUT_EVENTS.has(event.type) && objectId) result = await syncCheckoutSession(deps, objectId);
    else if (INVOICE_EVENTS.has(event.type) && objectId) result = await syncInvoice(deps, objectId);
    else result = { outcome: "ignored" };
  } catch (error) {
    await db.update(paymentEvents).set({ lastError: String((error as Error).message).slice(0, 500) }).where(eq(paymentEvents.id, event.id));
    throw error;
  }
  await db
    .update(paymentEvents)
    .set({ processedAt: new Date(), outcome: result.outcome, lastError: null })
    .where(eq(paymentEvents.id, event.id));
  return { ...result, duplicate: false };
}

// ───────────────────────── Reading purchases ─────────────────────────

export type PurchaseRow = typeof seatPurchases.$inferSelect;

/** Every purchase an organisation has, newest first, leaving out card checkouts that were dropped unpaid. */
export async function purchasesOf({ db }: { db: Database }, organisationId: string): Promise<PurchaseRow[]> {
  return db
    .select()
    .from(seatPurchases)
    .where(
      and(
        eq(seatPurchases.organisationId, organisationId),
        // A closed card checkout, or an invoice that could not be made (never numbered nor sent: the
        // buyer was told nothing was ordered), is no purchase to show; a sent invoice voided later is.
        or(ne(seatPurchases.status, "void"), and(eq(seatPurchases.method, "invoice"), isNotNull(seatPurchases.invoiceNumber))),
      ),
    )
    .orderBy(desc(seatPurchases.createdAt));
}

/** One purchase, only if it belongs to one of the given organisations (else null: "not found"). */
export async function purchaseIn({ db }: { db: Database }, purchaseId: string, organisationIds: string[]): Promise<PurchaseRow | null> {
  if (!/^[0-9a-f-]{36}$/i.test(purchaseId) || organisationIds.length === 0) return null;
  const [row] = await db.select().from(seatPurchases).where(eq(seatPurchases.id, purchaseId));
  return row && organisationIds.includes(row.organisationId) ? row : null;
}
