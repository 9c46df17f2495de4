// /school/seats: a school administrator's seats: the ledger per school year (bought, in use, free),
// every purchase with its receipt, and the way to buy more.
import { Link } from "react-router";
import type { Route } from "./+types/school.seats";
import { Notice } from "~/components/auth-forms";
import { PurchaseList, SeatLedgerTable } from "~/components/seats";
import { db } from "~/db/client.server";
import { requireMembership, requireRole } from "~/lib/auth.server";
import { formatPrice, SCHOOL_SEAT_PRICE_CENTS } from "~/lib/pricing";
import { purchaseIn, purchasesOf } from "~/lib/purchases.server";
import { purchaseSummary } from "~/lib/receipts.server";
import { schoolYearOf } from "~/lib/school-year";
import { seatLedger } from "~/lib/seats.server";

export async function loader({ request }: Route.LoaderArgs) {
  const { user, membership: first } = await requireRole(request, ["school_admin"]);
  const url = new URL(request.url);
  const asked = url.searchParams.get("school");
  const membership = asked ? requireMembership(user, asked, ["school_admin"]) : first;
  const [ledger, purchases] = await Promise.all([
    seatLedger({ db }, membership.organisationId),
    purchasesOf({ db }, membership.organisationId),
  ]);
  const invoiceId = url.searchParams.get("invoice");
  const invoice = invoiceId ? await purchaseIn({ db }, invoiceId, [membership.organisationId]) : null;
  return {
    school: { id: membership.organisationId, name: membership.organisationName },
    currentYear: schoolYearOf(),
    ledger,
    purchases: purchases.map(purchaseSummary),
    price: formatPrice(SCHOOL_SEAT_PRICE_CENTS),
    invoiceAsked: invoice ? { number: invoice.invoiceNumber, seats: invoice.seats, schoolYear: invoice.schoolYear, to: user.email, url: invoice.invoiceUrl } : null,
    dropped: url.searchParams.get("dropped") === "1",
  };
}

export default function SchoolSeats({ loaderData }: Route.ComponentProps) {
  const { school, currentYear, ledger, purchases, price, invoiceAsked, dropped } = loaderData;
  return (
    <div className="mx-auto max-w-4xl px-5 py-12">
      <p className="mb-1 text-ink-soft">
        <Link to="/school">{school.name}</Link>
      </p>
      <h1 className="mb-6 text-[length:var(--text-step-3)]">Seats</h1>

      {invoiceAsked ? (
        <Notice tone="done">
          <p className="font-bold">
            Invoice {invoiceAsked.number ?? ""} is on its way{invoiceAsked.to ? ` to ${invoiceAsked.to}` : ""}.
          </p>
          <p>
            The {invoiceAsked.seats} seats for {invoiceAsked.schoolYear} are added as soon as the invoice is paid. You get a receipt by e-mail then.
            {invoiceAsked.url ? (
              <>
                {" "}
                <a href={invoiceAsked.url}>Read the invoice</a>.
              </>
            ) : null}
          </p>
        </Notice>
      ) : null}
      {dropped ? <Notice tone="info">The card payment was dropped. No money was taken and no seats were added.</Notice> : null}

      <section aria-labelledby="ledger-heading" className="card mb-8">
        <div className="mb-3 flex flex-wrap items-baseline justify-between gap-3">
          <h2 id="ledger-heading" className="text-[length:var(--text-step-2)]">
            Seat ledger
          </h2>
          <Link className="btn" to="/school/seats/buy">
            Buy seats
          </Link>
        </div>
        <p className="mb-4 text-ink-soft">
          One seat is one student for one school year, at {price} a seat. A student takes a seat when a teacher adds them to a class, and
          gives it back when they leave their last class of that year.
        </p>
        <SeatLedgerTable rows={ledger} currentYear={currentYear} caption={`Seats of ${school.name} per school year`} />
      </section>

      <section aria-labelledby="purchases-heading">
        <h2 id="purchases-heading" className="mb-3 text-[length:var(--text-step-2)]">
          Purchases and receipts
        </h2>
        <PurchaseList purchases={purchases} />
      </section>
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Seats — Bendwise" }];
