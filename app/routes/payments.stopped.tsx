// /payments/stopped?purchase=<id> — where the payment service sends the buyer who left its page
// without paying. Nothing was charged; the buyer can go back and pay, or drop the order (the checkout
// is then expired at the payment service so it can never be paid by mistake later).
import { eq } from "drizzle-orm";
import { Form, Link, data, redirect } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/payments.stopped";
import { Notice } from "~/components/auth-forms";
import { db } from "~/db/client.server";
import { organisations } from "~/db/schema.server";
import { assertSameOrigin, requireUser } from "~/lib/auth.server";
import { payments } from "~/lib/payments.server";
import { abandonCheckout, buyerOrganisationIds, openCheckoutUrl, purchaseIn, seatsPagePath } from "~/lib/purchases.server";

const query = z.object({ purchase: z.uuid() });
const dropForm = z.object({ intent: z.literal("drop"), purchase: z.uuid() });

async function purchaseFor(request: Request, purchaseId: unknown) {
  const user = await requireUser(request);
  const parsed = query.safeParse({ purchase: purchaseId });
  const purchase = parsed.success ? await purchaseIn({ db }, parsed.data.purchase, buyerOrganisationIds(user)) : null;
  if (!purchase) throw data("There is no such purchase among yours.", { status: 404 });
  const [org] = await db.select({ kind: organisations.kind }).from(organisations).where(eq(organisations.id, purchase.organisationId));
  return { purchase, backTo: seatsPagePath(org.kind) };
}

export async function loader({ request }: Route.LoaderArgs) {
  const { purchase, backTo } = await purchaseFor(request, new URL(request.url).searchParams.get("purchase"));
  let continueUrl: string | null = null;
  if (purchase.status === "pending" && purchase.method === "card" && purchase.providerRef) {
    continueUrl = await openCheckoutUrl({ stripe: payments() }, purchase.providerRef).catch(() => null);
  }
  return { purchase: { id: purchase.id, status: purchase.status, method: purchase.method, seats: purchase.seats, schoolYear: purchase.schoolYear }, continueUrl, backTo };
}

export async function action({ request }: Route.ActionArgs) {
  assertSameOrigin(request);
  const form = Object.fromEntries(await request.formData());
  const parsed = dropForm.safeParse(form);
  if (!parsed.success) throw data("That request was not understood.", { status: 400 });
  const { purchase, backTo } = await purchaseFor(request, parsed.data.purchase);
  await abandonCheckout({ db, stripe: payments() }, purchase.id);
  return redirect(`${backTo}?dropped=1`);
}

export default function PaymentStopped({ loaderData }: Route.ComponentProps) {
  const { purchase, continueUrl, backTo } = loaderData;
  if (purchase.status === "paid") {
    return (
      <div className="mx-auto max-w-2xl px-5 py-12">
        <h1 className="mb-4 text-[length:var(--text-step-3)]">This order is paid</h1>
        <Notice tone="done">
          The {purchase.seats} seats for {purchase.schoolYear} have been added.
        </Notice>
        <Link className="btn" to={backTo}>Back to your seats</Link>
      </div>
    );
  }
  return (
    <div className="mx-auto max-w-2xl px-5 py-12">
      <h1 className="mb-4 text-[length:var(--text-step-3)]">No payment was made</h1>
      <Notice tone="info">
        <p data-testid="stopped">
          You left the payment page without paying, so no money was taken and <strong>no seats were added</strong>.
        </p>
      </Notice>
      {purchase.status === "pending" && purchase.method === "card" ? (
        <>
          {continueUrl ? null : <p className="mb-4">Its payment page has closed and can no longer be used. Drop the order, then buy again from your seats page.</p>}
          <div className="flex flex-wrap gap-3">
            {continueUrl ? (
              <a className="btn" href={continueUrl}>
                Go back to the payment page
              </a>
            ) : null}
            <Form method="post">
              <input type="hidden" name="purchase" value={purchase.id} />
              <button className={continueUrl ? "btn btn-quiet" : "btn"} type="submit" name="intent" value="drop">
                Drop this order
              </button>
            </Form>
            {continueUrl ? null : (
              <Link className="btn btn-quiet" to={backTo}>
                Back to your seats
              </Link>
            )}
          </div>
        </>
      ) : (
        <Link className="btn" to={backTo}>
          Back to your seats
        </Link>
      )}
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "No payment made — Bendwise" }];
