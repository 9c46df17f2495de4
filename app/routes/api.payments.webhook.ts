// POST /api/payments/webhook — the payment provider's signed events. The signature is checked on the
// raw body exactly as it arrived; a bad one is a 400 and nothing changes. Each event id is acted on
// once (payment_events), by reading the session or invoice as it is now, so repeats and late or
// out-of-order events are harmless. No session cookie and no same-origin check here: the signature
// is the proof of origin. Receipts are e-mailed after the answer, which stays fast.
import type Stripe from "stripe";
import { db } from "~/db/client.server";
import { serverEnv } from "~/env.server";
import { sendMail } from "~/lib/mailer.server";
import { payments } from "~/lib/payments.server";
import { handlePaymentEvent } from "~/lib/purchases.server";
import { sendDueReceiptsSoon } from "~/lib/receipts.server";
import type { Route } from "./+types/api.payments.webhook";

const MAX_BODY_BYTES = 512 * 1024;

export async function loader() {
  return new Response("This address takes signed payment events, by POST only.", { status: 405, headers: { Allow: "POST" } });
}

export async function action({ request }: Route.ActionArgs) {
  if (request.method !== "POST") return new Response(null, { status: 405, headers: { Allow: "POST" } });
  if (Number(request.headers.get("content-length") ?? 0) > MAX_BODY_BYTES) {
    return Response.json({ received: false, error: "The body is too large for a payment event." }, { status: 413 });
  }
  const rawBody = await request.text();
  const stripe = payments();
  let event: Stripe.Event;
  try {
    event = stripe.webhooks.constructEvent(rawBody, request.headers.get("stripe-signature") ?? "", serverEnv().PAYMENTS_WEBHOOK_SECRET);
  } catch {
    return Response.json({ received: false, error: "The signature does not match this body; nothing was done." }, { status: 400 });
  }

  try {
    const handled = await handlePaymentEvent({ db, stripe }, event);
    if (handled.outcome === "seats-added") sendDueReceiptsSoon({ db, sendMail, appUrl: serverEnv().APP_URL });
    return Response.json({ received: true, eventId: event.id, ...handled });
  } catch (error) {
    // Not processed: a 5xx makes the provider deliver the event again later.
    console.error(`Payment event ${event.id} (${event.type}) could not be processed:`, error);
    return Response.json({ received: false, error: "The event could not be processed now; please deliver it again." }, { status: 500 });
  }
}
