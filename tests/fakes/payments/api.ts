// The REST part of the fake: the provider's /v1 endpoints Bendwise calls through the SDK, with the
// provider's list and error shapes. Requests arrive form-encoded with bracketed keys, parsed with qs.
import qs from "qs";
import { ApiError, type FakeOperations } from "./operations";
import { invoiceLines, invoiceView, type FakeState, type Json } from "./store";

type Handler = (match: RegExpMatchArray, body: Json, query: Json) => unknown;

const list = (data: unknown[], url: string) => ({ object: "list", data, has_more: false, url });
const limitOf = (query: Json) => Math.min(Math.max(Number(query.limit ?? 10) || 10, 1), 100);
const expands = (query: Json, body: Json, field: string) => {
  const raw = query.expand ?? body.expand;
  const values = Array.isArray(raw) ? raw : raw ? Object.values(raw as Json) : [];
  return values.includes(field);
};

export function apiRoutes(ops: FakeOperations, state: FakeState): Array<[string, RegExp, Handler]> {
  return [
    ["POST", /^\/v1\/customers$/, (_m, body) => ops.createCustomer(body)],
    ["GET", /^\/v1\/customers$/, (_m, _b, query) => {
      const email = typeof query.email === "string" ? query.email : undefined;
      const found = [...state.customers.values()].filter((c) => !email || c.email === email).reverse();
      return list(found.slice(0, limitOf(query)), "/v1/customers");
    }],
    ["GET", /^\/v1\/customers\/([^/]+)$/, (m) => ops.customer(m[1])],

    ["POST", /^\/v1\/products$/, (_m, body) => ops.createProduct(body)],
    ["GET", /^\/v1\/products\/([^/]+)$/, (m) => ops.product(m[1])],

    ["POST", /^\/v1\/checkout\/sessions$/, (_m, body) => ops.createCheckoutSession(body)],
    ["GET", /^\/v1\/checkout\/sessions\/([^/]+)$/, (m, body, query) => {
      const session = ops.checkoutSession(m[1]);
      if (!expands(query, body, "line_items")) return session;
      return { ...session, line_items: list(ops.checkoutLineItems(m[1]), `/v1/checkout/sessions/${m[1]}/line_items`) };
    }],
    ["GET", /^\/v1\/checkout\/sessions\/([^/]+)\/line_items$/, (m) =>
      list(ops.checkoutLineItems(m[1]), `/v1/checkout/sessions/${m[1]}/line_items`)],
    ["POST", /^\/v1\/checkout\/sessions\/([^/]+)\/expire$/, (m) => ops.expireCheckoutSession(m[1])],

    ["POST", /^\/v1\/invoiceitems$/, (_m, body) => ops.createInvoiceItem(body)],
    ["POST", /^\/v1\/invoices$/, (_m, body) => invoiceView(state, ops.createInvoice(body))],
    ["GET", /^\/v1\/invoices\/([^/]+)$/, (m) => invoiceView(state, ops.invoice(m[1]))],
    ["GET", /^\/v1\/invoices\/([^/]+)\/lines$/, (m) => list(invoiceLines(state, ops.invoice(m[1])), `/v1/invoices/${m[1]}/lines`)],
    ["POST", /^\/v1\/invoices\/([^/]+)\/finalize$/, (m) => invoiceView(state, ops.finalizeInvoice(m[1]))],
    ["POST", /^\/v1\/invoices\/([^/]+)\/send$/, (m) => invoiceView(state, ops.sendInvoice(m[1]))],
    ["POST", /^\/v1\/invoices\/([^/]+)\/pay$/, (m, body) => {
      // Without a saved card there is nothing to charge: only "paid outside the provider" works here.
      if (String(body.paid_out_of_band) !== "true") {
        throw new ApiError(402, "This customer has no saved payment method; pass paid_out_of_band=true or pay on the hosted invoice page.", "invoice_no_payment_method", undefined, "card_error");
      }
      return invoiceView(state, ops.payInvoiceOutOfBand(m[1]));
    }],
    ["POST", /^\/v1\/invoices\/([^/]+)\/void$/, (m) => invoiceView(state, ops.voidInvoice(m[1]))],

    ["GET", /^\/v1\/events$/, (_m, _b, query) => {
      const type = typeof query.type === "string" ? query.type : undefined;
      const events = state.events.map((r) => r.event).filter((e) => !type || e.type === type).reverse();
      return list(events.slice(0, limitOf(query)), "/v1/events");
    }],
    ["GET", /^\/v1\/events\/([^/]+)$/, (m) => {
      const record = state.events.find((r) => r.event.id === m[1]);
      if (!record) throw new ApiError(404, `No such event: '${m[1]}'`, "resource_missing", "id");
      return record.event;
    }],
  ];
}

/** Answers one /v1 request: [status, JSON body]. */
export function handleApiRequest(
  routes: Array<[string, RegExp, Handler]>,
  state: FakeState,
  request: { method: string; pathname: string; search: string; contentType: string; authorization: string; idempotencyKey?: string; raw: string },
): [number, unknown] {
  if (!/^Bearer sk_test_\S+$/.test(request.authorization)) {
    return [401, { error: { type: "invalid_request_error", message: "Invalid API key provided. The fake accepts test keys only (sk_test_…)." } }];
  }
  const cacheKey = request.method === "POST" && request.idempotencyKey ? `${request.pathname} ${request.idempotencyKey}` : undefined;
  const cached = cacheKey ? state.idempotent.get(cacheKey) : undefined;
  if (cached) return [cached.status, cached.body];

  const body = request.contentType.includes("application/x-www-form-urlencoded")
    ? (qs.parse(request.raw, { depth: 10, arrayLimit: 1000 }) as Json)
    : {};
  const query = qs.parse(request.search.replace(/^\?/, ""), { depth: 10 }) as Json;
  let answer: [number, unknown] = [404, { error: { type: "invalid_request_error", message: `Unrecognized request URL (${request.method}: ${request.pathname}).` } }];
  for (const [method, pattern, handle] of routes) {
    const match = request.pathname.match(pattern);
    if (!match || method !== request.method) continue;
    try {
      answer = [200, handle(match, body, query)];
    } catch (error) {
      if (!(error instanceof ApiError)) throw error;
      answer = [error.status, { error: { type: error.type, code: error.code, message: error.message, param: error.param } }];
    }
    break;
  }
  if (cacheKey) state.idempotent.set(cacheKey, { status: answer[0], body: answer[1] });
  return answer;
}
