// A local stand-in for the payment provider: the part of its REST API Bendwise uses (customers,
// products, checkout sessions with line items, invoice items, invoices, events), its hosted payment
// and invoice pages, and its webhooks (signed with the SDK's own test-header helper, retried with
// backoff, re-sendable). The official `stripe` SDK runs unchanged against it via PAYMENTS_API_URL.
// An operator desk at /operator marks invoices paid, voids them, expires checkouts and re-sends events.
// The pieces live in tests/fakes/payments/; this file starts the HTTP server.
import { createServer, type IncomingMessage, type Server, type ServerResponse } from "node:http";
import type { AddressInfo } from "node:net";
import nodemailer from "nodemailer";
import { apiRoutes, handleApiRequest } from "./payments/api";
import type { CardOutcome } from "./payments/cards";
import { ApiError, FakeOperations } from "./payments/operations";
import { checkoutPage, hostedInvoicePage, notFoundPage, operatorPage, type CardFormValues } from "./payments/pages";
import { emptyState, type FakeEvent, type FakeState, type Invoice, type Json } from "./payments/store";
import { DEFAULT_RETRY_DELAYS_MS, WebhookSender, type WebhookTransport } from "./payments/webhooks";

export type { FakeEvent, FakeState, WebhookTransport };

export interface PaymentsFakeOptions {
  /** 0 picks a free port. */
  port: number;
  /** Where signed events are delivered (the app's webhook route); leave out to only record events. */
  webhookUrl?: string;
  webhookSecret: string;
  /** Pauses between delivery attempts (default 1 s, 4 s, 16 s, 64 s, 256 s). */
  retryDelaysMs?: number[];
  /** Replaces the HTTP post, e.g. to call the webhook route's action directly in a test. */
  transport?: WebhookTransport;
  /** An SMTP server (the local mail catcher) to e-mail a sent invoice to its customer through, as the provider does. */
  smtpUrl?: string;
}

export interface PaymentsFake {
  port: number;
  url: string;
  state: FakeState;
  ops: FakeOperations;
  /** Signs and delivers an arbitrary event body once; resolves with the HTTP status the app answered. */
  deliver(event: Json): Promise<number>;
  /** Re-sends a recorded event, as the operator's "Send again" does. */
  resend(eventId: string): Promise<number>;
  /** The operator marks an invoice paid (money arrived by bank transfer). */
  markInvoicePaid(invoiceId: string): Invoice;
  /** Pays a checkout session as the hosted page does, with one of the published test cards. */
  payCheckout(sessionId: string, cardNumber: string): CardOutcome;
  /** Signs a body with the webhook secret, as the provider does. */
  sign(payload: string): string;
  events(type?: string): FakeEvent[];
  /** Resolves when no webhook delivery is running or waiting for a retry. */
  settled(): Promise<void>;
  stop(): Promise<void>;
}

export async function startPaymentsFake(options: PaymentsFakeOptions): Promise<PaymentsFake> {
  const state = emptyState();
  let selfUrl = `http://127.0.0.1:${options.port}`;
  const webhooks = new WebhookSender(state, {
    webhookUrl: options.webhookUrl,
    webhookSecret: options.webhookSecret,
    retryDelaysMs: options.retryDelaysMs ?? DEFAULT_RETRY_DELAYS_MS,
    transport: options.transport,
  });
  const ops = new FakeOperations(state, webhooks, () => selfUrl);
  const mailer = options.smtpUrl ? nodemailer.createTransport(options.smtpUrl) : null;
  if (mailer) {
    ops.onInvoiceSent = (invoice, email) => {
      if (!email) return;
      const amount = `${(Number(invoice.amount_due) / 100).toFixed(2)} ${String(invoice.currency).toUpperCase()}`;
      mailer
        .sendMail({
          from: "Payments (test mode) <invoices@payments.test>",
          to: email,
          subject: `Invoice ${invoice.number} for ${amount}`,
          text: `Invoice ${invoice.number} for ${amount} (test mode: no money moves).\nRead or pay it: ${invoice.hosted_invoice_url}\n`,
        })
        .catch((error: Error) => console.error(`[payments fake] the invoice e-mail to ${email} was not sent: ${error.message}`));
    };
  }
  const routes = apiRoutes(ops, state);

  const server: Server = createServer(async (req: IncomingMessage, res: ServerResponse) => {
    try {
      await handle(req, res);
    } catch (error) {
      res.writeHead(500, { "content-type": "application/json" });
      res.end(JSON.stringify({ error: { type: "api_error", message: (error as Error).message } }));
    }
  });

  async function handle(req: IncomingMessage, res: ServerResponse) {
    ops.expireOverdueSessions();
    const url = new URL(req.url ?? "/", selfUrl);
    const raw = await readBody(req);
    const method = req.method ?? "GET";
    const html = (status: number, body: string) => {
      res.writeHead(status, { "content-type": "text/html; charset=utf-8", "cache-control": "no-store" });
      res.end(body);
    };
    const redirect = (location: string) => {
      res.writeHead(303, { location });
      res.end();
    };

    if (url.pathname.startsWith("/v1/")) {
      const [status, body] = handleApiRequest(routes, state, {
        method,
        pathname: url.pathname,
        search: url.search,
        contentType: String(req.headers["content-type"] ?? ""),
        authorization: String(req.headers.authorization ?? ""),
        idempotencyKey: req.headers["idempotency-key"] ? String(req.headers["idempotency-key"]) : undefined,
        raw,
      });
      res.writeHead(status, { "content-type": "application/json", "request-id": `req_${Math.random().toString(36).slice(2, 14)}` });
      return res.end(JSON.stringify(body));
    }

    const form = new URLSearchParams(raw);
    const values: CardFormValues = {
      email: form.get("email") ?? undefined,
      name: form.get("name") ?? undefined,
      number: form.get("number") ?? undefined,
      expiry: form.get("expiry") ?? undefined,
      cvc: form.get("cvc") ?? undefined,
    };
    const card = { number: values.number ?? "", expiry: values.expiry ?? "", cvc: values.cvc ?? "" };

    const pay = url.pathname.match(/^\/pay\/([^/]+)$/);
    if (pay) {
      const session = state.checkoutSessions.get(pay[1]);
      const items = state.checkoutLineItems.get(pay[1]) ?? [];
      if (method === "GET") return html(session ? 200 : 404, checkoutPage(session, items));
      if (!session) return html(404, checkoutPage(undefined, []));
      const outcome = ops.payCheckoutSession(session.id, card, { email: values.email, name: values.name });
      if (outcome.ok && outcome.redirect) return redirect(outcome.redirect);
      // Nothing typed is lost except what a card page never keeps: the security code.
      return html(402, checkoutPage(session, items, outcome.ok ? undefined : outcome.message, { ...values, cvc: "" }));
    }

    const invoicePage = url.pathname.match(/^\/invoice\/([^/]+)$/);
    if (invoicePage) {
      const invoice = state.invoices.get(invoicePage[1]);
      if (method === "GET" || !invoice) return html(invoice ? 200 : 404, hostedInvoicePage(state, invoice));
      const outcome = ops.payInvoiceWithCard(invoice.id, card);
      return html(outcome.ok ? 200 : 402, hostedInvoicePage(state, invoice, outcome.ok ? undefined : outcome.message, outcome.ok ? {} : { ...values, cvc: "" }));
    }

    if (url.pathname === "/operator" && method === "GET") {
      return html(200, operatorPage(state, options.webhookUrl, url.searchParams.get("notice") ?? undefined));
    }
    const operatorAction = url.pathname.match(/^\/operator\/(invoices|checkout|events)\/([^/]+)\/(pay|void|expire|resend)$/);
    if (operatorAction && method === "POST") {
      const [, kind, id, verb] = operatorAction;
      let notice: string;
      let result: unknown;
      try {
        if (kind === "invoices" && verb === "pay") result = ops.payInvoiceOutOfBand(id);
        else if (kind === "invoices" && verb === "void") result = ops.voidInvoice(id);
        else if (kind === "checkout" && verb === "expire") result = ops.expireCheckoutSession(id);
        else if (kind === "events" && verb === "resend") result = { status: await webhooks.resend(id) };
        else throw new ApiError(404, "Unknown operator action.");
        notice = kind === "events" ? `Event sent again; the webhook answered ${(result as { status: number }).status}.` : `Done: ${verb} ${id}.`;
      } catch (error) {
        const status = error instanceof ApiError ? error.status : 404;
        if (wantsJson(req)) {
          res.writeHead(status, { "content-type": "application/json" });
          return res.end(JSON.stringify({ error: { message: (error as Error).message } }));
        }
        notice = `Could not ${verb}: ${(error as Error).message}`;
      }
      if (wantsJson(req)) {
        res.writeHead(200, { "content-type": "application/json" });
        return res.end(JSON.stringify(result));
      }
      return redirect(`/operator?notice=${encodeURIComponent(notice)}`);
    }

    if (url.pathname === "/" && method === "GET") return redirect("/operator");
    html(404, notFoundPage());
  }

  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(options.port, "127.0.0.1", resolve);
  });
  const port = (server.address() as AddressInfo).port;
  selfUrl = `http://127.0.0.1:${port}`;
  // Abandoned checkouts run out even when nobody calls the fake (a demo left running overnight).
  const sweep = setInterval(() => ops.expireOverdueSessions(), 60_000);
  sweep.unref();

  return {
    port,
    url: selfUrl,
    state,
    ops,
    async deliver(event) {
      const payload = JSON.stringify(event);
      if (!options.webhookUrl && !options.transport) return 0;
      const headers = { "content-type": "application/json", "stripe-signature": webhooks.sign(payload) };
      if (options.transport) return options.transport({ url: options.webhookUrl ?? "", body: payload, headers });
      try {
        const response = await fetch(options.webhookUrl!, { method: "POST", headers, body: payload });
        return response.status;
      } catch {
        return 0;
      }
    },
    resend: (eventId) => webhooks.resend(eventId),
    markInvoicePaid: (invoiceId) => ops.payInvoiceOutOfBand(invoiceId),
    payCheckout: (sessionId, cardNumber) => ops.payCheckoutSession(sessionId, { number: cardNumber, expiry: "12/34", cvc: "123" }),
    sign: (payload) => webhooks.sign(payload),
    events: (type) => state.events.map((r) => r.event).filter((e) => !type || e.type === type),
    settled: () => webhooks.settled(),
    stop: () =>
      new Promise<void>((resolve) => {
        clearInterval(sweep);
        webhooks.stop();
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}

function wantsJson(req: IncomingMessage): boolean {
  return String(req.headers.accept ?? "").includes("application/json");
}

function readBody(req: IncomingMessage): Promise<string> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    req.on("data", (c: Buffer) => {
      size += c.length;
      if (size > 1_000_000) {
        reject(new Error("request body too large"));
        req.destroy();
        return;
      }
      chunks.push(c);
    });
    req.on("end", () => resolve(Buffer.concat(chunks).toString("utf8")));
    req.on("error", reject);
  });
}
