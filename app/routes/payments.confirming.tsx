// /payments/confirming?purchase=<id> — where the payment service sends the buyer after paying.
// It grants nothing: the seats come only from the service's signed event. The page says so, and
// asks /api/payments/status every few seconds until the event has arrived.
import { eq } from "drizzle-orm";
import { useEffect, useState } from "react";
import { Link, data, useFetcher } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/payments.confirming";
import { db } from "~/db/client.server";
import { organisations } from "~/db/schema.server";
import { requireUser } from "~/lib/auth.server";
import { noticeBox } from "~/components/auth-forms";
import { formatPrice } from "~/lib/pricing";
import { buyerOrganisationIds, purchaseIn, seatsPagePath } from "~/lib/purchases.server";
import { seatLedgerForYear } from "~/lib/seats.server";

const query = z.object({ purchase: z.uuid() });
const POLL_EVERY_MS = 1500;
const POLL_AT_MOST = 120;

type Status = "pending" | "paid" | "void";
type Ledger = { bought: number; inUse: number; free: number };

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const parsed = query.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  const purchase = parsed.success ? await purchaseIn({ db }, parsed.data.purchase, buyerOrganisationIds(user)) : null;
  if (!purchase) throw data("There is no such purchase among yours.", { status: 404 });
  const [org] = await db.select({ kind: organisations.kind }).from(organisations).where(eq(organisations.id, purchase.organisationId));
  return {
    purchase: {
      id: purchase.id,
      status: purchase.status as Status,
      seats: purchase.seats,
      schoolYear: purchase.schoolYear,
      amount: formatPrice(purchase.amountCents, purchase.currency),
    },
    ledger: (await seatLedgerForYear({ db }, purchase.organisationId, purchase.schoolYear)) as Ledger,
    backTo: seatsPagePath(org.kind),
  };
}

export default function PaymentConfirming({ loaderData }: Route.ComponentProps) {
  const { purchase, backTo } = loaderData;
  const fetcher = useFetcher<{ status: Status; ledger: Ledger }>();
  const [polls, setPolls] = useState(0);
  const status: Status = fetcher.data?.status ?? purchase.status;
  const ledger = fetcher.data?.ledger ?? loaderData.ledger;

  useEffect(() => {
    if (status !== "pending" || polls >= POLL_AT_MOST || fetcher.state !== "idle") return;
    const timer = setTimeout(() => {
      fetcher.load(`/api/payments/status?purchase=${purchase.id}`);
      setPolls((n) => n + 1);
    }, POLL_EVERY_MS);
    return () => clearTimeout(timer);
  }, [status, polls, fetcher.state, fetcher, purchase.id]);

  const seatsWord = purchase.seats === 1 ? "seat" : "seats";
  const family = backTo === "/family/seats";
  const heading = status === "paid" ? "Payment confirmed" : status === "void" ? "This payment did not go through" : "Thank you, the payment is being confirmed";
  const box = { paid: noticeBox("done"), void: noticeBox("problem"), pending: "card" }[status];
  return (
    <div className="mx-auto max-w-2xl px-5 py-12">
      <h1 className="mb-4 text-[length:var(--text-step-3)]">{heading}</h1>
      {/* One live region for every state, there from the first render: a screen reader reads the change
          to "confirmed" in the region it was already following (a region put in new is often not read). */}
      <div role="status" aria-live="polite" className={`mb-4 text-ink ${box}`} data-testid="payment-state">
        {status === "paid" ? (
          <>
            <p className="font-bold" data-testid="confirmed">
              {purchase.seats} {seatsWord} for {purchase.schoolYear} {purchase.seats === 1 ? "has" : "have"} been added.
            </p>
            <p>
              Seats for {purchase.schoolYear} now: {ledger.bought} bought, {ledger.inUse} in use, {ledger.free} free. A receipt is on its way by
              e-mail.
            </p>
          </>
        ) : status === "void" ? (
          <p>No money was taken and no seats were added.</p>
        ) : (
          <>
            <p className="mb-2">
              You paid {purchase.amount} for {purchase.seats} {seatsWord} for {purchase.schoolYear}.{" "}
              <strong>The seats appear as soon as the payment service confirms the payment</strong>, usually within a few seconds. This page
              checks by itself.
            </p>
            {polls >= POLL_AT_MOST ? (
              <p className="font-bold">Still waiting. It can take a few minutes; you will get a receipt by e-mail once the seats are added.</p>
            ) : (
              <p className="text-ink-soft">Waiting for the confirmation…</p>
            )}
          </>
        )}
      </div>
      {status === "pending" ? (
        <p className="mb-4">
          <a href={`/payments/confirming?purchase=${purchase.id}`}>Check again now</a>
        </p>
      ) : null}
      <div className="flex flex-wrap gap-3">
        {status === "paid" && family ? (
          <Link className="btn" to="/family/children/new">
            Add a child
          </Link>
        ) : null}
        {status === "paid" ? (
          <Link className={family ? "btn btn-quiet" : "btn"} to={`/receipts/${purchase.id}`}>
            Open the receipt
          </Link>
        ) : null}
        <Link className={status === "paid" ? "btn btn-quiet" : "btn"} to={backTo}>
          Back to your seats
        </Link>
      </div>
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Payment — Bendwise" }];
