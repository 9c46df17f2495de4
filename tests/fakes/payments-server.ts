// A local stand-in for the payment provider's REST API: the part Bendwise uses, answered on loopback,
// so the official `stripe` SDK runs unchanged against it (pointed here by PAYMENTS_API_URL).
// Webhooks are signed with the SDK's own test-header helper, as the real provider signs them.
import { randomBytes } from "node:crypto";
import { createServer, type IncomingMessage, type Server, type ServerResponse } from "node:http";
import qs from "qs";
import Stripe from "stripe";

export interface PaymentsFakeOptions {
  port: number;
  /** Where signed events are delivered (the app's webhook route). */
  webhookUrl: string;
  webhookSecret: string;
}

type Json = Record<string, unknown>;

interface FakeState {
  customers: Map<string, Json>;
  checkoutSessions: Map<string, Json & { line_items_data: Json[] }>;
  invoices: Map<string, Json>;
  events: Json[];
}

const newId = (prefix: string) => `${prefix}_${randomBytes(12).toString("hex")}`;
const now = () => Math.floor(Date.now() / 1000);

export interface PaymentsFake {
  port: number;
  url: string;
  state: FakeState;
  /** Delivers an event to the webhook address; resolves with the HTTP status the app answered. */
  deliver(event: Json): Promise<number>;
  stop(): Promise<void>;
}

export async function startPaymentsFake(options: PaymentsFakeOptions): Promise<PaymentsFake> {
  const state: FakeState = { customers: new Map(), checkoutSessions: new Map(), invoices: new Map(), events: [] };
  const signer = new Stripe("sk_test_fake_signer");
  const selfUrl = `http://127.0.0.1:${options.port}`;

  async function deliver(event: Json): Promise<number> {
    const payload = JSON.stringify(event);
    const header = signer.webhooks.generateTestHeaderString({ payload, secret: options.webhookSecret });
    try {
      const response = await fetch(options.webhookUrl, {
        method: "POST",
        headers: { "content-type": "application/json", "stripe-signature": header },
        body: payload,
      });
      return response.status;
    } catch {
      return 0;
    }
  }

  function recordEvent(type: string, object: Json): Json {
    const event = {
      id: newId("evt"),
      object: "event",
      api_version: "2025-01-27",
      created: now(),
      livemode: false,
      type,
      data: { object },
    };
    state.events.push(event);
    void deliver(event);
    return event;
  }

  const routes: Array<[string, RegExp, (match: RegExpMatchArray, body: Json, url: URL) => [number, unknown]]> = [
    ["POST", /^\/v1\/customers$/, (_m, body) => {
      const customer = { id: newId("cus"), object: "customer", created: now(), email: body.email ?? null, name: body.name ?? null, metadata: body.metadata ?? {} };
      state.customers.set(customer.id, customer);
      return [200, customer];
    }],
    ["POST", /^\/v1\/checkout\/sessions$/, (_m, body) => {
      const id = newId("cs_test");
      const lineItems = ((body.line_items as Json[] | undefined) ?? []).map((item) => {
        const priceData = (item.price_data ?? {}) as Json;
        const quantity = Number(item.quantity ?? 1);
        const unitAmount = Number(priceData.unit_amount ?? 0);
        return {
          id: newId("li"),
          object: "item",
          quantity,
          amount_total: unitAmount * quantity,
          currency: priceData.currency ?? "usd",
          description: ((priceData.product_data ?? {}) as Json).name ?? null,
          price: { object: "price", unit_amount: unitAmount, currency: priceData.currency ?? "usd" },
        };
      });
      const session = {
        id,
        object: "checkout.session",
        created: now(),
        mode: body.mode ?? "payment",
        status: "open",
        payment_status: "unpaid",
        customer: body.customer ?? null,
        customer_email: body.customer_email ?? null,
        client_reference_id: body.client_reference_id ?? null,
        metadata: body.metadata ?? {},
        success_url: body.success_url,
        cancel_url: body.cancel_url,
        amount_total: lineItems.reduce((sum, li) => sum + li.amount_total, 0),
        currency: lineItems[0]?.currency ?? "usd",
        url: `${selfUrl}/pay/${id}`,
        line_items_data: lineItems,
      };
      state.checkoutSessions.set(id, session);
      return [200, publicSession(session)];
    }],
    ["GET", /^\/v1\/checkout\/sessions\/([^/]+)$/, (m) => {
      const session = state.checkoutSessions.get(m[1]);
      return session ? [200, publicSession(session)] : notFound("checkout session", m[1]);
    }],
    ["GET", /^\/v1\/checkout\/sessions\/([^/]+)\/line_items$/, (m) => {
      const session = state.checkoutSessions.get(m[1]);
      if (!session) return notFound("checkout session", m[1]);
      return [200, { object: "list", data: session.line_items_data, has_more: false, url: `/v1/checkout/sessions/${m[1]}/line_items` }];
    }],
  ];

  function publicSession(session: Json & { line_items_data: Json[] }) {
    const { line_items_data: _hidden, ...rest } = session;
    return rest;
  }

  function notFound(kind: string, id: string): [number, unknown] {
    return [404, { error: { type: "invalid_request_error", code: "resource_missing", message: `No such ${kind}: '${id}'` } }];
  }

  /** The hosted payment page's outcome for the provider's published test card numbers. */
  function payWithCard(sessionId: string, cardNumber: string): { ok: boolean; message: string; redirect?: string } {
    const session = state.checkoutSessions.get(sessionId);
    if (!session) return { ok: false, message: "This payment page has expired." };
    const digits = cardNumber.replace(/\D/g, "");
    const declines: Record<string, string> = {
      "4000000000000002": "Your card was declined.",
      "4000000000009995": "Your card has insufficient funds.",
      "4000000000000069": "Your card has expired.",
    };
    if (declines[digits]) return { ok: false, message: declines[digits] };
    if (digits !== "4242424242424242") return { ok: false, message: "Your card number is not valid." };
    session.status = "complete";
    session.payment_status = "paid";
    recordEvent("checkout.session.completed", publicSession(session));
    return { ok: true, message: "Paid", redirect: String(session.success_url).replace("{CHECKOUT_SESSION_ID}", sessionId) };
  }

  const server: Server = createServer(async (req: IncomingMessage, res: ServerResponse) => {
    const url = new URL(req.url ?? "/", selfUrl);
    const raw = await readBody(req);
    const send = (status: number, body: unknown, type = "application/json") => {
      res.writeHead(status, { "content-type": type });
      res.end(type === "application/json" ? JSON.stringify(body) : String(body));
    };

    if (url.pathname.startsWith("/v1/")) {
      if (!String(req.headers.authorization ?? "").startsWith("Bearer sk_test_")) {
        return send(401, { error: { type: "invalid_request_error", message: "Invalid API key provided." } });
      }
      const body = (req.headers["content-type"] ?? "").includes("application/x-www-form-urlencoded")
        ? (qs.parse(raw, { depth: 10, arrayLimit: 1000 }) as Json)
        : {};
      for (const [method, pattern, handle] of routes) {
        const match = url.pathname.match(pattern);
        if (match && method === req.method) {
          const [status, payload] = handle(match, body, url);
          return send(status, payload);
        }
      }
      return send(404, { error: { type: "invalid_request_error", message: `Unrecognized request URL (${req.method}: ${url.pathname}).` } });
    }

    const payMatch = url.pathname.match(/^\/pay\/([^/]+)$/);
    if (payMatch && req.method === "GET") return send(200, payPage(payMatch[1]), "text/html; charset=utf-8");
    if (payMatch && req.method === "POST") {
      const form = new URLSearchParams(raw);
      const session = state.checkoutSessions.get(payMatch[1]);
      if (form.get("action") === "cancel" && session) {
        res.writeHead(303, { location: String(session.cancel_url) });
        return res.end();
      }
      const outcome = payWithCard(payMatch[1], form.get("card") ?? "");
      if (outcome.ok && outcome.redirect) {
        res.writeHead(303, { location: outcome.redirect });
        return res.end();
      }
      return send(402, payPage(payMatch[1], outcome.message), "text/html; charset=utf-8");
    }
    send(404, "Not found", "text/plain");
  });

  function payPage(sessionId: string, problem?: string): string {
    const session = state.checkoutSessions.get(sessionId);
    if (!session) return "<!doctype html><title>Expired</title><p>This payment page has expired.</p>";
    const total = (Number(session.amount_total) / 100).toFixed(2);
    const lines = session.line_items_data.map((li) => `<li>${escapeHtml(String(li.description))} × ${li.quantity}</li>`).join("");
    return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width,initial-scale=1">
<title>Test payment</title><style>body{font-family:system-ui,sans-serif;background:#f4f1ea;color:#1c2726;max-width:30rem;margin:3rem auto;padding:0 1rem}
.box{background:#fff;border:1px solid #cfc7b6;border-radius:12px;padding:1.5rem}label{display:block;font-weight:700;margin:.8rem 0 .3rem}
input{width:100%;padding:.5rem;font-size:1.1rem;border:2px solid #46524f;border-radius:6px}button{margin-top:1rem;padding:.6rem 1.2rem;font-size:1rem;font-weight:700;border-radius:6px;border:2px solid #0d5c57;background:#0d5c57;color:#fff}
.quiet{background:#fff;color:#0d5c57}.problem{color:#a11d2b;font-weight:700}</style></head><body><div class="box">
<p><strong>Local test payments</strong> — no real money moves here.</p><ul>${lines}</ul><p>Total: <strong>$${total}</strong></p>
${problem ? `<p class="problem" role="alert">${escapeHtml(problem)}</p>` : ""}
<form method="post"><label for="card">Card number</label><input id="card" name="card" inputmode="numeric" autocomplete="off" placeholder="4242 4242 4242 4242">
<button type="submit" name="action" value="pay">Pay $${total}</button> <button class="quiet" type="submit" name="action" value="cancel">Cancel</button></form></div></body></html>`;
  }

  await new Promise<void>((resolve) => server.listen(options.port, "127.0.0.1", resolve));
  return {
    port: options.port,
    url: selfUrl,
    state,
    deliver,
    stop: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

function readBody(req: IncomingMessage): Promise<string> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    req.on("data", (c: Buffer) => chunks.push(c));
    req.on("end", () => resolve(Buffer.concat(chunks).toString("utf8")));
    req.on("error", reject);
  });
}

function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}
