// The payments fake's memory: every object it knows, shaped as the provider's API returns them
// (field names, id prefixes, statuses), so the app reads the fake and the real service alike.
import { randomBytes } from "node:crypto";

export type Json = Record<string, unknown>;

/** The API version the fake claims in its events; the SDK pins the same one. */
export const FAKE_API_VERSION = "2026-10-28.endive";

export const newId = (prefix: string) => `${prefix}_${randomBytes(12).toString("hex")}`;
export const unixNow = () => Math.floor(Date.now() / 1000);

export interface Customer extends Json {
  id: string;
  object: "customer";
  email: string | null;
  name: string | null;
  metadata: Record<string, string>;
}

export interface Product extends Json {
  id: string;
  object: "product";
  name: string;
  metadata: Record<string, string>;
}

/** A checkout session's line item (object "item"), as GET …/line_items returns it. */
export interface CheckoutLineItem extends Json {
  id: string;
  object: "item";
  quantity: number;
  amount_subtotal: number;
  amount_total: number;
  currency: string;
  description: string;
  price: Json & { id: string; unit_amount: number; product: string };
}

export interface CheckoutSession extends Json {
  id: string;
  object: "checkout.session";
  status: "open" | "complete" | "expired";
  payment_status: "unpaid" | "paid" | "no_payment_required";
  amount_total: number;
  currency: string;
  metadata: Record<string, string>;
  success_url: string;
  cancel_url: string | null;
  url: string | null;
  payment_intent: string | null;
}

export interface InvoiceItem extends Json {
  id: string;
  object: "invoiceitem";
  customer: string;
  invoice: string | null;
  amount: number;
  quantity: number;
  currency: string;
  description: string;
  metadata: Record<string, string>;
  pricing: Json;
}

export interface Invoice extends Json {
  id: string;
  object: "invoice";
  status: "draft" | "open" | "paid" | "void" | "uncollectible";
  customer: string;
  currency: string;
  number: string | null;
  total: number;
  amount_due: number;
  amount_paid: number;
  amount_remaining: number;
  metadata: Record<string, string>;
  custom_fields: Array<{ name: string; value: string }> | null;
  hosted_invoice_url: string | null;
  status_transitions: { finalized_at: number | null; paid_at: number | null; voided_at: number | null; marked_uncollectible_at: number | null };
}

export interface DeliveryAttempt {
  attempt: number;
  at: number;
  /** The HTTP status the webhook address answered; 0 when it could not be reached. */
  status: number;
  ms: number;
  error?: string;
}

export interface FakeEvent extends Json {
  id: string;
  object: "event";
  type: string;
  created: number;
  data: { object: Json; previous_attributes?: Json };
  pending_webhooks: number;
}

export interface EventRecord {
  event: FakeEvent;
  /** The exact JSON body sent (and re-sent) for this event. */
  payload: string;
  deliveries: DeliveryAttempt[];
  delivered: boolean;
  /** No more automatic retries are scheduled. */
  gaveUp: boolean;
}

export interface FakeState {
  customers: Map<string, Customer>;
  products: Map<string, Product>;
  checkoutSessions: Map<string, CheckoutSession>;
  checkoutLineItems: Map<string, CheckoutLineItem[]>;
  invoices: Map<string, Invoice>;
  invoiceItems: Map<string, InvoiceItem>;
  events: EventRecord[];
  /** POST responses by Idempotency-Key, so a retried request gets the first answer. */
  idempotent: Map<string, { status: number; body: unknown }>;
  invoiceCounter: number;
  /**
   * Begins every invoice number of this run of the fake (from its start time), so numbers stay unique
   * across restarts as a provider's do: the fake keeps no state on disk, and its counter starts at 1 again.
   */
  invoicePrefix: string;
}

export function emptyState(): FakeState {
  return {
    customers: new Map(),
    products: new Map(),
    checkoutSessions: new Map(),
    checkoutLineItems: new Map(),
    invoices: new Map(),
    invoiceItems: new Map(),
    events: [],
    idempotent: new Map(),
    invoiceCounter: 0,
    invoicePrefix: Date.now().toString(36).toUpperCase().slice(-5),
  };
}

/** The invoice's lines as the provider returns them (object "line_item"), built from its invoice items. */
export function invoiceLines(state: FakeState, invoice: Invoice): Json[] {
  return [...state.invoiceItems.values()]
    .filter((item) => item.invoice === invoice.id)
    .map((item) => ({
      id: `il_${item.id.slice(3)}`,
      object: "line_item",
      amount: item.amount,
      currency: item.currency,
      description: item.description,
      discount_amounts: [],
      discountable: true,
      discounts: [],
      invoice: invoice.id,
      livemode: false,
      metadata: item.metadata,
      parent: {
        type: "invoice_item_details",
        invoice_item_details: { invoice_item: item.id, proration: false, proration_details: { credited_items: null }, subscription: null },
        subscription_item_details: null,
      },
      period: { start: Number(invoice.created), end: Number(invoice.created) },
      pretax_credit_amounts: [],
      pricing: item.pricing,
      quantity: item.quantity,
      quantity_decimal: String(item.quantity),
      subscription: null,
      subtotal: item.amount,
      taxes: [],
    }));
}

/** The invoice with its first page of lines, as GET /v1/invoices/:id answers. */
export function invoiceView(state: FakeState, invoice: Invoice): Json {
  const lines = invoiceLines(state, invoice);
  return {
    ...invoice,
    lines: { object: "list", data: lines, has_more: false, total_count: lines.length, url: `/v1/invoices/${invoice.id}/lines` },
  };
}

/** Recomputes a draft invoice's totals from its items. */
export function retotal(state: FakeState, invoice: Invoice) {
  const total = [...state.invoiceItems.values()].filter((i) => i.invoice === invoice.id).reduce((sum, i) => sum + i.amount, 0);
  invoice.subtotal = total;
  invoice.subtotal_excluding_tax = total;
  invoice.total = total;
  invoice.total_excluding_tax = total;
  invoice.amount_due = total;
  invoice.amount_remaining = total - invoice.amount_paid;
}
