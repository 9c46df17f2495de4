// /receipts/:purchaseId — the receipt of one seat purchase, for the school's administrators or the
// family's parents. Another organisation's purchase is simply not found.
import { eq } from "drizzle-orm";
import { Link, data } from "react-router";
import type { Route } from "./+types/receipts.$purchaseId";
import { db } from "~/db/client.server";
import { organisations } from "~/db/schema.server";
import { requireUser } from "~/lib/auth.server";
import { buyerOrganisationIds, purchaseIn, seatsPagePath } from "~/lib/purchases.server";
import { receiptView } from "~/lib/receipts.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const purchase = await purchaseIn({ db }, params.purchaseId, buyerOrganisationIds(user));
  if (!purchase) throw data("There is no such purchase among yours.", { status: 404 });
  const [org] = await db.select({ name: organisations.name, kind: organisations.kind }).from(organisations).where(eq(organisations.id, purchase.organisationId));
  return { receipt: receiptView(purchase, org.name), backTo: seatsPagePath(org.kind), kind: org.kind };
}

export default function Receipt({ loaderData }: Route.ComponentProps) {
  const { receipt, backTo, kind } = loaderData;
  const paid = receipt.status === "paid";
  const rows: Array<[string, string | null]> = [
    ["Receipt number", receipt.number],
    ["For", receipt.organisationName],
    ["What", `${receipt.seats} ${kind === "school" ? "student" : "child"} ${receipt.seats === 1 ? "seat" : "seats"} for the school year ${receipt.schoolYear}`],
    ["Price", `${receipt.unitPrice} a seat`],
    [paid ? "Amount paid" : "Amount", receipt.amount],
    ["How", receipt.howPaid],
    ["Purchase order", receipt.purchaseOrder],
    ["Paid on", receipt.paidOn],
    ["Payment reference", receipt.providerRef],
  ];
  return (
    <div className="mx-auto max-w-2xl px-5 py-12">
      <p className="mb-1 text-ink-soft">
        <Link to={backTo}>Seats</Link>
      </p>
      <h1 className="mb-6 text-[length:var(--text-step-3)]">{paid ? "Receipt" : "Order, not paid yet"}</h1>
      {!paid ? (
        <p className="mb-4 font-bold text-caution">
          {receipt.status === "void" ? "This order was cancelled; nothing was paid." : "This becomes a receipt once the payment is confirmed."}
        </p>
      ) : null}
      <dl className="card grid grid-cols-1 gap-x-6 sm:grid-cols-[max-content_minmax(0,1fr)] sm:gap-y-2" data-testid="receipt">
        {rows
          .filter(([, value]) => value)
          .map(([label, value]) => (
            <div key={label} className="contents">
              <dt className="font-bold">{label}</dt>
              <dd className="mb-2 wrap-anywhere sm:mb-0">{value}</dd>
            </div>
          ))}
      </dl>
      <p className="mt-4 text-[length:var(--text-step--1)] text-ink-soft">Bendwise. Prices are those of this demo installation; no tax is charged on it.</p>
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Receipt — Bendwise" }];
