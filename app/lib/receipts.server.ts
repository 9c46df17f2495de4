// Receipts for seat purchases: the same words on the receipt page and in the e-mail that goes out
// once a purchase is paid (amount, seats, school year, how it was paid).
import { and, eq, inArray, isNull, ne } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { memberships, organisations, seatPurchases, users } from "~/db/schema.server";
import type { OutgoingMail } from "~/lib/mailer.server";
import { renderEmail } from "~/lib/mailer.server";
import { formatPrice } from "~/lib/pricing";
import { seatLedgerForYear } from "~/lib/seats.server";
import { formatLongDate } from "~/lib/teaching/time";

type Purchase = typeof seatPurchases.$inferSelect;

/** A short, stable receipt number people can quote: BW- and the start of the purchase id. */
export function receiptNumber(purchaseId: string): string {
  return `BW-${purchaseId.replace(/-/g, "").slice(0, 10).toUpperCase()}`;
}


export interface ReceiptView {
  number: string;
  organisationName: string;
  schoolYear: string;
  seats: number;
  amount: string;
  unitPrice: string;
  paidOn: string | null;
  howPaid: string;
  purchaseOrder: string | null;
  providerRef: string | null;
  status: Purchase["status"];
}

export function receiptView(purchase: Purchase, organisationName: string): ReceiptView {
  const unit = purchase.seats > 0 ? Math.round(purchase.amountCents / purchase.seats) : 0;
  const howPaid =
    purchase.method === "card"
      ? "By card"
      : purchase.method === "invoice"
        ? `By invoice${purchase.invoiceNumber ? ` ${purchase.invoiceNumber}` : ""}`
        : "Included in the demo";
  return {
    number: receiptNumber(purchase.id),
    organisationName,
    schoolYear: purchase.schoolYear,
    seats: purchase.seats,
    amount: formatPrice(purchase.amountCents, purchase.currency),
    unitPrice: formatPrice(unit, purchase.currency),
    paidOn: purchase.paidAt ? formatLongDate(purchase.paidAt) : null,
    howPaid,
    purchaseOrder: purchase.purchaseOrder,
    providerRef: purchase.providerRef,
    status: purchase.status,
  };
}

/** Who gets the receipt: the buyer, or when they are gone, the organisation's administrators or parents. */
async function receiptRecipients(db: Database, purchase: Purchase, kind: "school" | "household"): Promise<string[]> {
  if (purchase.buyerUserId) {
    const [buyer] = await db.select({ email: users.email }).from(users).where(eq(users.id, purchase.buyerUserId));
    if (buyer?.email) return [buyer.email];
  }
  const rows = await db
    .select({ email: users.email })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.organisationId, purchase.organisationId), eq(memberships.role, kind === "school" ? "school_admin" : "parent")));
  return rows.map((r) => r.email).filter((e): e is string => Boolean(e));
}

export type SendMail = (mail: OutgoingMail) => Promise<void>;

/**
 * E-mails the receipt of a paid purchase, once: the row is claimed (receipt_sent_at set) before
 * sending and released again if sending fails, so a later sweep tries again.
 */
export async function sendReceipt(
  { db, sendMail, appUrl }: { db: Database; sendMail: SendMail; appUrl: string },
  purchaseId: string,
): Promise<"sent" | "not-due" | "no-recipient"> {
  const [purchase] = await db
    .update(seatPurchases)
    .set({ receiptSentAt: new Date() })
    .where(and(eq(seatPurchases.id, purchaseId), eq(seatPurchases.status, "paid"), isNull(seatPurchases.receiptSentAt), ne(seatPurchases.method, "demo")))
    .returning();
  if (!purchase) return "not-due";
  try {
    const [org] = await db.select({ name: organisations.name, kind: organisations.kind }).from(organisations).where(eq(organisations.id, purchase.organisationId));
    const recipients = await receiptRecipients(db, purchase, org.kind);
    if (recipients.length === 0) return "no-recipient";
    const view = receiptView(purchase, org.name);
    const ledger = await seatLedgerForYear({ db }, purchase.organisationId, purchase.schoolYear);
    const seatsWord = view.seats === 1 ? "seat" : "seats";
    const home = org.kind === "school" ? "/school/seats" : "/family/seats";
    const { text, html } = renderEmail({
      heading: `Receipt ${view.number}: ${view.seats} ${seatsWord} for ${view.schoolYear}`,
      paragraphs: [
        `${view.organisationName} has ${view.seats} more ${org.kind === "school" ? "student" : "child"} ${seatsWord} for the school year ${view.schoolYear}.`,
        `Amount paid: ${view.amount} (${view.seats} × ${view.unitPrice}). ${view.howPaid}${view.purchaseOrder ? `, purchase order ${view.purchaseOrder}` : ""}${view.paidOn ? `, paid on ${view.paidOn}` : ""}.`,
        `Seats for ${view.schoolYear} now: ${ledger.bought} bought, ${ledger.inUse} in use, ${ledger.free} free.`,
        `Receipt number ${view.number}${view.providerRef ? `; payment reference ${view.providerRef}` : ""}.`,
      ],
      button: { label: "See your seats and receipts", url: `${appUrl.replace(/\/$/, "")}${home}` },
      footnote: "You get this e-mail because seats were bought on Bendwise with your account. Keep it for your records.",
    });
    const subject = `Bendwise receipt ${view.number}: ${view.seats} ${seatsWord} for ${view.schoolYear}, ${view.amount}`;
    for (const to of recipients) await sendMail({ to, subject, text, html });
    return "sent";
  } catch (error) {
    await db.update(seatPurchases).set({ receiptSentAt: null }).where(eq(seatPurchases.id, purchaseId));
    throw error;
  }
}

/** Sends every receipt that is due (paid, not yet e-mailed); safe to call as often as wanted. */
export async function sendDueReceipts(deps: { db: Database; sendMail: SendMail; appUrl: string }, organisationIds?: string[]): Promise<number> {
  const due = await deps.db
    .select({ id: seatPurchases.id })
    .from(seatPurchases)
    .where(
      and(
        eq(seatPurchases.status, "paid"),
        isNull(seatPurchases.receiptSentAt),
        ne(seatPurchases.method, "demo"),
        organisationIds ? inArray(seatPurchases.organisationId, organisationIds) : undefined,
      ),
    );
  let sent = 0;
  for (const { id } of due) if ((await sendReceipt(deps, id)) === "sent") sent += 1;
  return sent;
}

// Receipts go out after the webhook has answered, so a slow mail server never delays the provider.
const inFlight = new Set<Promise<unknown>>();

/** Starts sending due receipts without waiting; failures are logged and retried by the next sweep. */
export function sendDueReceiptsSoon(deps: { db: Database; sendMail: SendMail; appUrl: string }): void {
  const job = sendDueReceipts(deps).catch((error) => console.error("Sending receipts failed; the next payment event tries again:", error));
  inFlight.add(job);
  void job.finally(() => inFlight.delete(job));
}

/** Resolves when the receipts started so far have gone out (for tests and orderly shutdown). */
export async function receiptsSettled(): Promise<void> {
  while (inFlight.size > 0) await Promise.allSettled([...inFlight]);
}

export interface PurchaseSummary {
  id: string;
  orderedOn: string;
  schoolYear: string;
  seats: number;
  amount: string;
  howPaid: string;
  purchaseOrder: string | null;
  state: "paid" | "invoice-waiting" | "card-unfinished" | "cancelled";
  stateText: string;
  receiptUrl: string | null;
  invoiceUrl: string | null;
  /** For an unfinished card payment: the page to finish or drop it. */
  unfinishedUrl: string | null;
}

/** One line of a purchase list, in words. */
export function purchaseSummary(purchase: Purchase): PurchaseSummary {
  const view = receiptView(purchase, "");
  const state: PurchaseSummary["state"] =
    purchase.status === "paid" ? "paid" : purchase.status === "void" ? "cancelled" : purchase.method === "invoice" ? "invoice-waiting" : "card-unfinished";
  const stateText = {
    paid: `Paid${view.paidOn ? ` on ${view.paidOn}` : ""}`,
    "invoice-waiting": "Invoice sent; the seats are added when it is paid",
    "card-unfinished": "Card payment not finished; no seats added yet",
    cancelled: purchase.method === "invoice" ? "Invoice cancelled; no seats added" : "Stopped; no seats added",
  }[state];
  return {
    id: purchase.id,
    orderedOn: formatLongDate(purchase.createdAt),
    schoolYear: purchase.schoolYear,
    seats: purchase.seats,
    amount: view.amount,
    howPaid: view.howPaid,
    purchaseOrder: purchase.purchaseOrder,
    state,
    stateText,
    receiptUrl: purchase.status === "paid" ? `/receipts/${purchase.id}` : null,
    invoiceUrl: purchase.method === "invoice" && purchase.status === "pending" ? purchase.invoiceUrl : null,
    unfinishedUrl: state === "card-unfinished" ? `/payments/stopped?${new URLSearchParams({ purchase: purchase.id })}` : null,
  };
}
