// What can happen to the fake's objects, with the events the provider sends for each change.
// Used by the REST API, the hosted pages, the operator page and the tests alike.
import { chargeTestCard, type CardForm, type CardOutcome } from "./cards";
import {
  newId,
  retotal,
  unixNow,
  invoiceView,
  type CheckoutLineItem,
  type CheckoutSession,
  type Customer,
  type FakeState,
  type Invoice,
  type InvoiceItem,
  type Json,
  type Product,
} from "./store";
import type { WebhookSender } from "./webhooks";

/** An error the API answers as the provider does: `{ error: { type, code, message, param } }`. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly code?: string,
    readonly param?: string,
    readonly type = "invalid_request_error",
  ) {
    super(message);
  }
}

const str = (v: unknown) => (typeof v === "string" ? v : undefined);
const metadataOf = (v: unknown): Record<string, string> => {
  if (!v || typeof v !== "object") return {};
  return Object.fromEntries(Object.entries(v as Json).map(([k, val]) => [k, String(val)]));
};
function positiveInt(v: unknown, param: string, allowZero = false): number {
  const n = Number(v);
  if (!Number.isInteger(n) || n < (allowZero ? 0 : 1)) throw new ApiError(400, `Invalid integer: ${String(v)}`, "parameter_invalid_integer", param);
  return n;
}

export class FakeOperations {
  /** Called when an invoice is sent, with the customer's e-mail address: the provider e-mails invoices itself. */
  onInvoiceSent?: (invoice: Invoice, email: string | null) => void;

  constructor(
    private readonly state: FakeState,
    private readonly webhooks: WebhookSender,
    private readonly selfUrl: () => string,
  ) {}

  // --- customers and products ---

  createCustomer(body: Json): Customer {
    const customer: Customer = {
      id: newId("cus"),
      object: "customer",
      created: unixNow(),
      email: str(body.email) ?? null,
      name: str(body.name) ?? null,
      description: str(body.description) ?? null,
      livemode: false,
      metadata: metadataOf(body.metadata),
    };
    this.state.customers.set(customer.id, customer);
    this.webhooks.emit("customer.created", customer);
    return customer;
  }

  customer(id: string): Customer {
    const customer = this.state.customers.get(id);
    if (!customer) throw new ApiError(404, `No such customer: '${id}'`, "resource_missing", "id");
    return customer;
  }

  createProduct(body: Json): Product {
    const name = str(body.name);
    if (!name) throw new ApiError(400, "Missing required param: name.", "parameter_missing", "name");
    const id = str(body.id) ?? newId("prod");
    if (this.state.products.has(id)) throw new ApiError(400, `Product already exists.`, "resource_already_exists", "id");
    const product: Product = { id, object: "product", active: true, created: unixNow(), livemode: false, name, description: str(body.description) ?? null, metadata: metadataOf(body.metadata) };
    this.state.products.set(id, product);
    return product;
  }

  product(id: string): Product {
    const product = this.state.products.get(id);
    if (!product) throw new ApiError(404, `No such product: '${id}'`, "resource_missing", "id");
    return product;
  }

  // --- checkout sessions ---

  createCheckoutSession(body: Json): CheckoutSession {
    if (str(body.mode) !== "payment") throw new ApiError(400, "The fake supports mode=payment only.", "parameter_invalid", "mode");
    const successUrl = str(body.success_url);
    if (!successUrl) throw new ApiError(400, "Missing required param: success_url.", "parameter_missing", "success_url");
    const rawItems = Array.isArray(body.line_items) ? (body.line_items as Json[]) : Object.values((body.line_items as Json) ?? {});
    if (rawItems.length === 0) throw new ApiError(400, "Missing required param: line_items.", "parameter_missing", "line_items");
    const id = newId("cs_test");
    const items: CheckoutLineItem[] = rawItems.map((raw, i) => {
      const item = raw as Json;
      const priceData = (item.price_data ?? {}) as Json;
      const productData = (priceData.product_data ?? {}) as Json;
      const currency = str(priceData.currency);
      if (!currency) throw new ApiError(400, "Missing required param: line_items[0][price_data][currency].", "parameter_missing", `line_items[${i}][price_data][currency]`);
      const unitAmount = positiveInt(priceData.unit_amount, `line_items[${i}][price_data][unit_amount]`, true);
      const quantity = positiveInt(item.quantity, `line_items[${i}][quantity]`);
      const productName = str(productData.name);
      const productId = str(priceData.product);
      if (!productName && !productId) throw new ApiError(400, "Give price_data either product or product_data.", "parameter_missing", `line_items[${i}][price_data][product_data][name]`);
      const product = productId ? this.product(productId) : this.createProduct({ name: productName, metadata: productData.metadata });
      return {
        id: newId("li"),
        object: "item",
        adjustable_quantity: null,
        amount_discount: 0,
        amount_subtotal: unitAmount * quantity,
        amount_tax: 0,
        amount_total: unitAmount * quantity,
        currency,
        description: product.name,
        metadata: {},
        price: {
          id: newId("price"),
          object: "price",
          active: false,
          currency,
          product: product.id,
          type: "one_time",
          unit_amount: unitAmount,
          unit_amount_decimal: String(unitAmount),
        },
        quantity,
      };
    });
    const customerId = str(body.customer);
    if (customerId) this.customer(customerId);
    // As the provider allows: expires_at between 30 minutes and 24 hours from now (24 hours by default).
    const expiresAt = body.expires_at === undefined ? unixNow() + 24 * 3600 : positiveInt(body.expires_at, "expires_at");
    if (expiresAt < unixNow() + 30 * 60 - 5 || expiresAt > unixNow() + 24 * 3600 + 5) {
      throw new ApiError(400, "expires_at must be between 30 minutes and 24 hours from now.", "parameter_invalid", "expires_at");
    }
    const session: CheckoutSession = {
      id,
      object: "checkout.session",
      amount_subtotal: items.reduce((s, li) => s + li.amount_subtotal, 0),
      amount_total: items.reduce((s, li) => s + li.amount_total, 0),
      cancel_url: str(body.cancel_url) ?? null,
      client_reference_id: str(body.client_reference_id) ?? null,
      created: unixNow(),
      currency: items[0].currency,
      customer: customerId ?? null,
      customer_details: null,
      customer_email: str(body.customer_email) ?? null,
      expires_at: expiresAt,
      livemode: false,
      metadata: metadataOf(body.metadata),
      mode: "payment",
      payment_intent: null,
      payment_method_types: ["card"],
      payment_status: "unpaid",
      status: "open",
      success_url: successUrl,
      ui_mode: "hosted",
      url: `${this.selfUrl()}/pay/${id}`,
    };
    this.state.checkoutSessions.set(id, session);
    this.state.checkoutLineItems.set(id, items);
    return session;
  }

  checkoutSession(id: string): CheckoutSession {
    const session = this.state.checkoutSessions.get(id);
    if (!session) throw new ApiError(404, `No such checkout.session: '${id}'`, "resource_missing", "session");
    return session;
  }

  checkoutLineItems(id: string): CheckoutLineItem[] {
    this.checkoutSession(id);
    return this.state.checkoutLineItems.get(id) ?? [];
  }

  /** The hosted payment page's "Pay" button. */
  payCheckoutSession(id: string, card: CardForm, payer: { email?: string; name?: string } = {}): CardOutcome & { redirect?: string } {
    const session = this.checkoutSession(id);
    if (session.status !== "open") {
      return { ok: false, code: "incomplete", message: session.status === "complete" ? "This checkout is already paid." : "This checkout has expired. Start again from Bendwise." };
    }
    const outcome = chargeTestCard(card);
    if (!outcome.ok) return outcome;
    session.status = "complete";
    session.payment_status = "paid";
    session.payment_intent = newId("pi");
    session.url = null;
    session.customer_details = { email: payer.email || session.customer_email, name: payer.name || null, address: null, phone: null, tax_exempt: "none", tax_ids: [] };
    this.webhooks.emit("checkout.session.completed", session);
    return { ...outcome, redirect: session.success_url.replace("{CHECKOUT_SESSION_ID}", session.id) };
  }

  /** Expires every open session whose time is up, as the provider does (with checkout.session.expired). */
  expireOverdueSessions(now = unixNow()): number {
    let expired = 0;
    for (const session of this.state.checkoutSessions.values()) {
      if (session.status === "open" && Number(session.expires_at) <= now) {
        this.expireCheckoutSession(session.id);
        expired += 1;
      }
    }
    return expired;
  }

  expireCheckoutSession(id: string): CheckoutSession {
    const session = this.checkoutSession(id);
    if (session.status !== "open") throw new ApiError(400, `Only open sessions can be expired; this one is ${session.status}.`, "checkout_session_not_open");
    session.status = "expired";
    session.url = null;
    this.webhooks.emit("checkout.session.expired", session);
    return session;
  }

  // --- invoice items and invoices ---

  createInvoiceItem(body: Json): InvoiceItem {
    const customer = this.customer(str(body.customer) ?? "");
    const invoiceId = str(body.invoice) ?? null;
    if (invoiceId) {
      const invoice = this.invoice(invoiceId);
      if (invoice.status !== "draft") throw new ApiError(400, "Items can only be added to a draft invoice.", "invoice_not_editable", "invoice");
      if (invoice.customer !== customer.id) throw new ApiError(400, "The invoice belongs to another customer.", "parameter_invalid", "invoice");
    }
    const quantity = body.quantity === undefined ? 1 : positiveInt(body.quantity, "quantity");
    const priceData = body.price_data as Json | undefined;
    let unitAmount: number;
    let currency: string;
    let productId: string | null = null;
    if (priceData) {
      productId = this.product(str(priceData.product) ?? "").id;
      unitAmount = positiveInt(priceData.unit_amount, "price_data[unit_amount]", true);
      currency = str(priceData.currency) ?? "usd";
    } else if (body.amount !== undefined) {
      if (body.quantity !== undefined) throw new ApiError(400, "Give either amount, or price_data with quantity.", "parameter_invalid", "quantity");
      unitAmount = positiveInt(body.amount, "amount", true);
      currency = str(body.currency) ?? "usd";
    } else {
      throw new ApiError(400, "Give price_data (with quantity) or amount.", "parameter_missing", "price_data");
    }
    const item: InvoiceItem = {
      id: newId("ii"),
      object: "invoiceitem",
      amount: unitAmount * quantity,
      currency,
      customer: customer.id,
      date: unixNow(),
      description: str(body.description) ?? (productId ? this.product(productId).name : ""),
      invoice: invoiceId,
      livemode: false,
      metadata: metadataOf(body.metadata),
      pricing: {
        type: "price_details",
        price_details: { price: newId("price"), product: productId },
        unit_amount_decimal: String(unitAmount),
      },
      quantity,
    };
    this.state.invoiceItems.set(item.id, item);
    if (invoiceId) retotal(this.state, this.invoice(invoiceId));
    return item;
  }

  createInvoice(body: Json): Invoice {
    const customer = this.customer(str(body.customer) ?? "");
    const collection = str(body.collection_method) ?? "charge_automatically";
    if (collection === "send_invoice" && body.days_until_due === undefined && body.due_date === undefined) {
      throw new ApiError(400, "Invoices with collection_method=send_invoice need days_until_due or due_date.", "parameter_missing", "days_until_due");
    }
    const customFields = body.custom_fields
      ? Object.values(body.custom_fields as Json).map((f) => {
          const field = f as Json;
          const name = str(field.name) ?? "";
          const value = str(field.value) ?? "";
          if (!name || name.length > 40 || !value || value.length > 140) throw new ApiError(400, "A custom field needs a name (up to 40 characters) and a value (up to 140).", "parameter_invalid", "custom_fields");
          return { name, value };
        })
      : null;
    const created = unixNow();
    const invoice: Invoice = {
      id: newId("in"),
      object: "invoice",
      account_country: "US",
      account_name: "Bendwise (local test payments)",
      amount_due: 0,
      amount_paid: 0,
      amount_remaining: 0,
      attempt_count: 0,
      attempted: false,
      auto_advance: body.auto_advance === "true",
      collection_method: collection,
      created,
      currency: str(body.currency) ?? "usd",
      custom_fields: customFields,
      customer: customer.id,
      customer_email: customer.email,
      customer_name: customer.name,
      description: str(body.description) ?? null,
      due_date: body.days_until_due !== undefined ? created + positiveInt(body.days_until_due, "days_until_due") * 86400 : body.due_date ? Number(body.due_date) : null,
      footer: str(body.footer) ?? null,
      hosted_invoice_url: null,
      invoice_pdf: null,
      livemode: false,
      metadata: metadataOf(body.metadata),
      number: null,
      parent: null,
      period_end: created,
      period_start: created,
      status: "draft",
      status_transitions: { finalized_at: null, paid_at: null, voided_at: null, marked_uncollectible_at: null },
      subtotal: 0,
      total: 0,
      webhooks_delivered_at: null,
    };
    this.state.invoices.set(invoice.id, invoice);
    if (str(body.pending_invoice_items_behavior) === "include") {
      for (const item of this.state.invoiceItems.values()) if (item.customer === customer.id && !item.invoice) item.invoice = invoice.id;
    }
    retotal(this.state, invoice);
    this.webhooks.emit("invoice.created", invoiceView(this.state, invoice));
    return invoice;
  }

  invoice(id: string): Invoice {
    const invoice = this.state.invoices.get(id);
    if (!invoice) throw new ApiError(404, `No such invoice: '${id}'`, "resource_missing", "invoice");
    return invoice;
  }

  finalizeInvoice(id: string): Invoice {
    const invoice = this.invoice(id);
    if (invoice.status !== "draft") throw new ApiError(400, `This invoice is already finalized (status ${invoice.status}).`, "invoice_not_editable");
    this.state.invoiceCounter += 1;
    invoice.status = "open";
    invoice.number = `BWTEST-${this.state.invoicePrefix}-${String(this.state.invoiceCounter).padStart(4, "0")}`;
    invoice.hosted_invoice_url = `${this.selfUrl()}/invoice/${invoice.id}`;
    invoice.status_transitions.finalized_at = unixNow();
    invoice.effective_at = unixNow();
    retotal(this.state, invoice);
    this.webhooks.emit("invoice.finalized", invoiceView(this.state, invoice), { status: "draft" });
    // As the provider does, an invoice with nothing to pay is paid the moment it is finalized.
    if (invoice.amount_due === 0) this.settleInvoice(invoice, false);
    return invoice;
  }

  sendInvoice(id: string): Invoice {
    const invoice = this.invoice(id);
    if (invoice.collection_method !== "send_invoice") throw new ApiError(400, "Only invoices with collection_method=send_invoice can be sent.", "invoice_not_sendable");
    if (invoice.status === "draft") this.finalizeInvoice(id);
    if (invoice.status !== "open") throw new ApiError(400, `An invoice with status ${invoice.status} cannot be sent.`, "invoice_not_sendable");
    this.webhooks.emit("invoice.sent", invoiceView(this.state, invoice));
    this.onInvoiceSent?.(invoice, this.state.customers.get(String(invoice.customer))?.email ?? null);
    return invoice;
  }

  /** Marks the invoice paid, as the operator does when the school's bank transfer arrives. */
  payInvoiceOutOfBand(id: string): Invoice {
    const invoice = this.invoice(id);
    if (invoice.status === "draft") this.finalizeInvoice(id);
    if (invoice.status === "paid") throw new ApiError(400, "Invoice is already paid.", "invoice_already_paid");
    if (invoice.status !== "open") throw new ApiError(400, `An invoice with status ${invoice.status} cannot be paid.`, "invoice_not_payable");
    return this.settleInvoice(invoice, true);
  }

  /** Someone paid the hosted invoice page with a test card. */
  payInvoiceWithCard(id: string, card: CardForm): CardOutcome {
    const invoice = this.invoice(id);
    if (invoice.status !== "open") return { ok: false, code: "incomplete", message: invoice.status === "paid" ? "This invoice is already paid." : "This invoice cannot be paid." };
    const outcome = chargeTestCard(card);
    invoice.attempt_count = Number(invoice.attempt_count) + 1;
    invoice.attempted = true;
    if (!outcome.ok) {
      if (outcome.code !== "incomplete" && outcome.code !== "invalid_number") this.webhooks.emit("invoice.payment_failed", invoiceView(this.state, invoice));
      return outcome;
    }
    this.settleInvoice(invoice, false);
    this.webhooks.emit("invoice.payment_succeeded", invoiceView(this.state, invoice));
    return outcome;
  }

  voidInvoice(id: string): Invoice {
    const invoice = this.invoice(id);
    if (invoice.status !== "open" && invoice.status !== "uncollectible") throw new ApiError(400, `An invoice with status ${invoice.status} cannot be voided.`, "invoice_not_voidable");
    invoice.status = "void";
    invoice.status_transitions.voided_at = unixNow();
    invoice.amount_remaining = 0;
    this.webhooks.emit("invoice.voided", invoiceView(this.state, invoice), { status: "open" });
    return invoice;
  }

  private settleInvoice(invoice: Invoice, outOfBand: boolean): Invoice {
    const previous = { status: invoice.status };
    invoice.status = "paid";
    invoice.amount_paid = invoice.amount_due;
    invoice.amount_remaining = 0;
    invoice.paid_out_of_band = outOfBand;
    invoice.status_transitions.paid_at = unixNow();
    this.webhooks.emit("invoice.paid", invoiceView(this.state, invoice), previous);
    return invoice;
  }
}
