// The fake's own web pages: the hosted payment page, the hosted invoice page and the operator page.
// They have a look of their own ("Loopback Pay", cool greys and indigo) so nobody mistakes them for
// Bendwise, and every text colour keeps 4.5:1 or more on its background.
import type { CheckoutLineItem, CheckoutSession, EventRecord, FakeState, Invoice, Json } from "./store";
import { invoiceLines } from "./store";

export function escapeHtml(text: unknown): string {
  return String(text ?? "").replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}

const money = (cents: number, currency: string) =>
  new Intl.NumberFormat("en-US", { style: "currency", currency: currency.toUpperCase() }).format(cents / 100);
const when = (unix: unknown) => (unix ? new Date(Number(unix) * 1000).toISOString().replace("T", " ").slice(0, 19) + " UTC" : "—");

const styles = `
:root{--bg:#eef1f6;--panel:#fff;--ink:#14213d;--muted:#4a5568;--line:#c9d1de;--accent:#3a36a8;--accent-deep:#27247a;--bad:#a4161a;--good:#1b6e3a}
*{box-sizing:border-box}body{margin:0;background:var(--bg);color:var(--ink);font:16px/1.5 system-ui,-apple-system,"Segoe UI",Roboto,sans-serif}
.mode{background:#2b2d42;color:#ffd166;text-align:center;font-weight:700;letter-spacing:.04em;padding:.45rem;font-size:.85rem}
.wrap{max-width:60rem;margin:0 auto;padding:1.5rem 1rem}.brand{font-weight:800;font-size:1.1rem;color:var(--accent);margin-bottom:1rem}
.grid{display:grid;gap:1.25rem}@media(min-width:48rem){.grid{grid-template-columns:1fr 1fr}}
.panel{background:var(--panel);border:1px solid var(--line);border-radius:10px;padding:1.25rem;box-shadow:0 1px 2px rgba(20,33,61,.06)}
h1{font-size:1.35rem;margin:.2rem 0 1rem}h2{font-size:1.1rem;margin:0 0 .75rem}.muted{color:var(--muted)}
.total{font-size:1.6rem;font-weight:800}table{border-collapse:collapse;width:100%}th,td{text-align:left;padding:.45rem .4rem;border-bottom:1px solid var(--line);vertical-align:top;font-size:.93rem}
label{display:block;font-weight:600;margin:.8rem 0 .25rem}input{width:100%;padding:.55rem .6rem;font-size:1rem;border:1.5px solid #6b7688;border-radius:6px;color:var(--ink);background:#fff}
.row{display:grid;grid-template-columns:1fr 1fr;gap:.75rem}
button,.button{display:inline-block;margin-top:1rem;padding:.65rem 1.2rem;font-size:1rem;font-weight:700;border-radius:6px;border:2px solid var(--accent);background:var(--accent);color:#fff;cursor:pointer;text-decoration:none}
button:hover{background:var(--accent-deep)}.small{margin:0;padding:.3rem .6rem;font-size:.85rem}.plain{background:#fff;color:var(--accent)}
a{color:var(--accent)}:focus-visible{outline:3px solid #e09f00;outline-offset:2px}
.problem{border:2px solid var(--bad);color:var(--bad);background:#fff;border-radius:6px;padding:.6rem .8rem;font-weight:700}
.ok{color:var(--good);font-weight:700}.tag{display:inline-block;padding:.05rem .45rem;border-radius:99px;border:1px solid currentColor;font-size:.8rem;font-weight:700}
.cards{font-size:.9rem}.cards code{background:#e4e8f0;padding:.05rem .3rem;border-radius:4px;color:var(--ink)}
`;

function shell(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width,initial-scale=1">
<title>${escapeHtml(title)} · Loopback Pay (test mode)</title><link rel="icon" href="data:,"><style>${styles}</style></head>
<body><div class="mode" role="note">TEST MODE · Loopback Pay runs on this computer · no real money moves</div>
<div class="wrap"><div class="brand">Loopback Pay</div>${body}</div></body></html>`;
}

const testCardHelp = `<details class="cards"><summary>Test card numbers</summary><ul>
<li><code>4242 4242 4242 4242</code> pays</li><li><code>4000 0000 0000 0002</code> is declined</li>
<li><code>4000 0000 0000 9995</code> has insufficient funds</li><li><code>4000 0000 0000 0069</code> has expired</li></ul>
<p class="muted">Any future expiry date (e.g. 12/34) and any 3 digits as the security code.</p></details>`;

export interface CardFormValues {
  email?: string;
  name?: string;
  number?: string;
  expiry?: string;
  cvc?: string;
}

function cardForm(action: string, payLabel: string, values: CardFormValues, withEmail: boolean, cancelUrl?: string | null): string {
  const v = (key: keyof CardFormValues) => escapeHtml(values[key] ?? "");
  return `<form method="post" action="${escapeHtml(action)}" novalidate>
${withEmail ? `<label for="email">E-mail for the payment confirmation</label><input id="email" name="email" type="email" autocomplete="email" value="${v("email")}">` : ""}
<label for="number">Card number</label><input id="number" name="number" inputmode="numeric" autocomplete="cc-number" placeholder="1234 1234 1234 1234" value="${v("number")}">
<div class="row"><div><label for="expiry">Expiry (MM/YY)</label><input id="expiry" name="expiry" inputmode="numeric" autocomplete="cc-exp" placeholder="MM/YY" value="${v("expiry")}"></div>
<div><label for="cvc">Security code</label><input id="cvc" name="cvc" inputmode="numeric" autocomplete="cc-csc" placeholder="123" value="${v("cvc")}"></div></div>
<label for="name">Name on card</label><input id="name" name="name" autocomplete="cc-name" value="${v("name")}">
<button type="submit" name="action" value="pay">${escapeHtml(payLabel)}</button>
</form>${cancelUrl ? `<p><a href="${escapeHtml(cancelUrl)}">Cancel and go back</a></p>` : ""}${testCardHelp}`;
}

export function checkoutPage(session: CheckoutSession | undefined, items: CheckoutLineItem[], problem?: string, values: CardFormValues = {}): string {
  if (!session) return shell("Not found", `<div class="panel"><h1>This payment page does not exist</h1><p>Start again from the site you came from.</p></div>`);
  const total = money(session.amount_total, session.currency);
  const summary = `<div class="panel"><h2>Order summary</h2><table><thead><tr><th scope="col">Item</th><th scope="col">Qty</th><th scope="col">Amount</th></tr></thead><tbody>
${items.map((li) => `<tr><td>${escapeHtml(li.description)}<br><span class="muted">${money(li.price.unit_amount, li.currency)} each</span></td><td>${li.quantity}</td><td>${money(li.amount_total, li.currency)}</td></tr>`).join("")}
</tbody></table><p>Total due</p><p class="total" data-testid="total">${total}</p></div>`;
  let right: string;
  if (session.status === "complete") right = `<div class="panel"><h1 class="ok">Paid</h1><p>This checkout is paid. You can close this page.</p></div>`;
  else if (session.status === "expired") right = `<div class="panel"><h1>This checkout has expired</h1><p>No payment was taken. Start again from the site you came from.</p></div>`;
  else
    right = `<div class="panel"><h1>Pay by card</h1>${problem ? `<p class="problem" role="alert">${escapeHtml(problem)}</p>` : ""}
${cardForm(`/pay/${session.id}`, `Pay ${total}`, { email: session.customer_email ? String(session.customer_email) : undefined, ...values }, true, session.cancel_url)}</div>`;
  return shell(`Pay ${total}`, `<div class="grid">${summary}${right}</div>`);
}

export function hostedInvoicePage(state: FakeState, invoice: Invoice | undefined, problem?: string, values: CardFormValues = {}): string {
  if (!invoice || invoice.status === "draft") return shell("Not found", `<div class="panel"><h1>This invoice does not exist</h1></div>`);
  const lines = invoiceLines(state, invoice);
  const po = invoice.custom_fields?.map((f) => `<p><strong>${escapeHtml(f.name)}:</strong> ${escapeHtml(f.value)}</p>`).join("") ?? "";
  const head = `<div class="panel"><h1>Invoice ${escapeHtml(invoice.number)}</h1>
<p>From <strong>${escapeHtml(invoice.account_name)}</strong> to <strong>${escapeHtml(invoice.customer_name ?? invoice.customer_email)}</strong></p>${po}
<table><thead><tr><th scope="col">Description</th><th scope="col">Qty</th><th scope="col">Amount</th></tr></thead><tbody>
${lines.map((l) => `<tr><td>${escapeHtml(l.description)}</td><td>${escapeHtml(l.quantity)}</td><td>${money(Number(l.amount), String(l.currency))}</td></tr>`).join("")}
</tbody></table><p>Amount due ${invoice.due_date ? `by ${when(invoice.due_date).slice(0, 10)}` : ""}</p><p class="total">${money(invoice.amount_remaining, invoice.currency)}</p>
<p>Status: <span class="tag">${escapeHtml(invoice.status)}</span></p></div>`;
  const right =
    invoice.status === "open"
      ? `<div class="panel"><h2>Pay this invoice by card</h2>${problem ? `<p class="problem" role="alert">${escapeHtml(problem)}</p>` : ""}
<p class="muted">Or pay by bank transfer quoting the invoice number; the operator marks it paid when it arrives.</p>${cardForm(`/invoice/${invoice.id}`, `Pay ${money(invoice.amount_remaining, invoice.currency)}`, values, false)}</div>`
      : `<div class="panel"><h2>${invoice.status === "paid" ? '<span class="ok">Paid</span>' : "Nothing to pay"}</h2><p>${invoice.status === "paid" ? `Paid on ${when(invoice.status_transitions.paid_at)}.` : `This invoice is ${escapeHtml(invoice.status)}.`}</p></div>`;
  return shell(`Invoice ${invoice.number}`, `<div class="grid">${head}${right}</div>`);
}

function deliverySummary(record: EventRecord): string {
  if (record.deliveries.length === 0) return record.event.pending_webhooks ? "waiting" : "no webhook address";
  const last = record.deliveries[record.deliveries.length - 1];
  const tries = `${record.deliveries.length} attempt${record.deliveries.length === 1 ? "" : "s"}`;
  if (record.delivered) return `<span class="ok">delivered</span> · ${tries} · last answer ${last.status} in ${last.ms} ms`;
  return `<span class="tag" style="color:var(--bad)">not delivered</span> · ${tries} · last answer ${last.status || "none"}${last.error ? ` (${escapeHtml(last.error)})` : ""}${record.gaveUp ? " · retries used up" : " · will retry"}`;
}

export function operatorPage(state: FakeState, webhookUrl: string | undefined, notice?: string): string {
  const invoices = [...state.invoices.values()].reverse();
  const sessions = [...state.checkoutSessions.values()].reverse();
  const events = [...state.events].reverse().slice(0, 100);
  const button = (path: string, label: string, id: string) =>
    `<form method="post" action="${escapeHtml(path)}" style="display:inline"><button class="small${label === "Void" || label === "Expire" ? " plain" : ""}" type="submit" aria-label="${escapeHtml(`${label} ${id}`)}">${escapeHtml(label)}</button></form>`;
  const body = `<h1>Operator desk</h1>
<p class="muted">Everything this fake payment service holds. Webhooks go to <code>${escapeHtml(webhookUrl ?? "(none)")}</code>. <a href="/operator">Refresh</a></p>
${notice ? `<p class="panel ok" role="status">${escapeHtml(notice)}</p>` : ""}
<section class="panel" aria-labelledby="inv"><h2 id="inv">Invoices</h2>${invoices.length === 0 ? `<p class="muted">No invoices yet.</p>` : `<table><thead><tr><th scope="col">Number</th><th scope="col">Customer</th><th scope="col">Purchase order</th><th scope="col">Amount</th><th scope="col">Status</th><th scope="col">Actions</th></tr></thead><tbody>
${invoices.map((inv) => `<tr data-invoice="${escapeHtml(inv.id)}"><td><a href="/invoice/${escapeHtml(inv.id)}">${escapeHtml(inv.number ?? "(draft)")}</a><br><span class="muted">${escapeHtml(inv.id)}</span></td><td>${escapeHtml(inv.customer_name ?? "")}<br><span class="muted">${escapeHtml(inv.customer_email ?? "")}</span></td><td>${escapeHtml(inv.custom_fields?.map((f) => f.value).join(", ") ?? "")}</td><td>${money(inv.total, inv.currency)}</td><td><span class="tag">${escapeHtml(inv.status)}</span></td><td>${inv.status === "open" ? `${button(`/operator/invoices/${inv.id}/pay`, "Mark paid", inv.number ?? inv.id)} ${button(`/operator/invoices/${inv.id}/void`, "Void", inv.number ?? inv.id)}` : ""}</td></tr>`).join("")}
</tbody></table>`}</section>
<section class="panel" aria-labelledby="cs" style="margin-top:1rem"><h2 id="cs">Checkout sessions</h2>${sessions.length === 0 ? `<p class="muted">No checkout sessions yet.</p>` : `<table><thead><tr><th scope="col">Session</th><th scope="col">Created</th><th scope="col">Amount</th><th scope="col">Status</th><th scope="col">Actions</th></tr></thead><tbody>
${sessions.map((s) => `<tr><td>${escapeHtml(s.id)}</td><td>${when(s.created)}</td><td>${money(s.amount_total, s.currency)}</td><td><span class="tag">${escapeHtml(s.status)}</span> <span class="muted">${escapeHtml(s.payment_status)}</span></td><td>${s.status === "open" ? button(`/operator/checkout/${s.id}/expire`, "Expire", s.id) : ""}</td></tr>`).join("")}
</tbody></table>`}</section>
<section class="panel" aria-labelledby="ev" style="margin-top:1rem"><h2 id="ev">Events</h2>${events.length === 0 ? `<p class="muted">No events yet.</p>` : `<table><thead><tr><th scope="col">Created</th><th scope="col">Type</th><th scope="col">About</th><th scope="col">Delivery</th><th scope="col">Actions</th></tr></thead><tbody>
${events.map((r) => `<tr data-event="${escapeHtml(r.event.id)}"><td>${when(r.event.created)}</td><td><code>${escapeHtml(r.event.type)}</code><br><span class="muted">${escapeHtml(r.event.id)}</span></td><td>${escapeHtml((r.event.data.object as Json).id)}</td><td>${deliverySummary(r)}</td><td>${button(`/operator/events/${r.event.id}/resend`, "Send again", r.event.id)}</td></tr>`).join("")}
</tbody></table>`}</section>`;
  return shell("Operator desk", body);
}

export function notFoundPage(): string {
  return shell("Not found", `<div class="panel"><h1>Nothing here</h1><p><a href="/operator">Operator desk</a></p></div>`);
}
