// /family/seats: a parent's seats: one seat per child per school year at the family price, bought by
// card through the same checkout as schools; each child account holds one. Seats are granted only
// when the payment service confirms the payment.
import { and, asc, eq, inArray } from "drizzle-orm";
import { useState } from "react";
import { Form, Link, data, redirect, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/family.seats";
import { Field, Notice } from "~/components/auth-forms";
import { PurchaseList, SeatLedgerTable } from "~/components/seats";
import { db } from "~/db/client.server";
import { memberships, seatAssignments, users } from "~/db/schema.server";
import { serverEnv } from "~/env.server";
import { assertSameOrigin, requireRole } from "~/lib/auth.server";
import { payments } from "~/lib/payments.server";
import { FAMILY_SEAT_PRICE_CENTS, formatPrice } from "~/lib/pricing";
import { PaymentServiceError, purchasesOf, startCardCheckout } from "~/lib/purchases.server";
import { purchaseSummary } from "~/lib/receipts.server";
import { purchasableSchoolYears, schoolYearOf } from "~/lib/school-year";
import { seatLedger } from "~/lib/seats.server";
import { SendButton } from "~/components/send-button";

const MAX_CHILD_SEATS = 10;
const blankToUndefined = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : v);

function familyOrderSchema(years: readonly string[]) {
  return z.object({
    seats: z.preprocess(
      blankToUndefined,
      z.coerce
        .number({ error: "Enter how many seats, as a whole number (one for each child)." })
        .int("Enter a whole number of seats (one for each child).")
        .min(1, "Buy at least 1 seat.")
        .max(MAX_CHILD_SEATS, `A family buys up to ${MAX_CHILD_SEATS} seats at a time.`),
    ),
    schoolYear: z.string({ error: "Choose the school year." }).refine((y) => years.includes(y), `Choose ${years.join(" or ")}.`),
  });
}

type Values = { seats: string; schoolYear: string };

export async function loader({ request }: Route.LoaderArgs) {
  const { membership } = await requireRole(request, ["parent"]);
  const householdId = membership.organisationId;
  const currentYear = schoolYearOf();
  const [ledger, purchases, children, seatHolders] = await Promise.all([
    seatLedger({ db }, householdId),
    purchasesOf({ db }, householdId),
    db
      .select({ id: users.id, displayName: users.displayName })
      .from(users)
      .innerJoin(memberships, and(eq(memberships.userId, users.id), eq(memberships.organisationId, householdId), eq(memberships.role, "student")))
      .orderBy(asc(users.displayName)),
    db
      .select({ studentId: seatAssignments.studentId })
      .from(seatAssignments)
      .where(and(eq(seatAssignments.organisationId, householdId), inArray(seatAssignments.schoolYear, [currentYear]))),
  ]);
  const holding = new Set(seatHolders.map((s) => s.studentId));
  const years = purchasableSchoolYears();
  return {
    household: membership.organisationName,
    currentYear,
    years,
    price: FAMILY_SEAT_PRICE_CENTS,
    ledger,
    purchases: purchases.map(purchaseSummary),
    children: children.map((c) => ({ displayName: c.displayName, hasSeat: holding.has(c.id) })),
    defaults: { seats: "1", schoolYear: years[0] } satisfies Values,
    dropped: new URL(request.url).searchParams.get("dropped") === "1",
  };
}

export async function action({ request }: Route.ActionArgs) {
  assertSameOrigin(request);
  const { user, membership } = await requireRole(request, ["parent"]);
  const form = await request.formData();
  const values: Values = { seats: String(form.get("seats") ?? ""), schoolYear: String(form.get("schoolYear") ?? "") };
  const parsed = familyOrderSchema(purchasableSchoolYears()).safeParse(values);
  if (!parsed.success) {
    const fieldErrors: Partial<Record<keyof Values, string>> = {};
    for (const issue of parsed.error.issues) fieldErrors[String(issue.path[0]) as keyof Values] ??= issue.message;
    return data({ values, fieldErrors, problem: null as string | null }, { status: 400 });
  }
  try {
    const { url } = await startCardCheckout(
      { db, stripe: payments() },
      { organisationId: membership.organisationId, buyer: { id: user.id, email: user.email }, schoolYear: parsed.data.schoolYear, seats: parsed.data.seats, appUrl: serverEnv().APP_URL },
    );
    return redirect(url);
  } catch (error) {
    if (!(error instanceof PaymentServiceError)) throw error;
    console.error(error.cause ?? error);
    return data({ values, fieldErrors: {} as Partial<Record<keyof Values, string>>, problem: error.userMessage }, { status: 503 });
  }
}

export default function FamilySeats({ loaderData, actionData }: Route.ComponentProps) {
  const { household, currentYear, years, price, ledger, purchases, children, defaults, dropped } = loaderData;
  const values = actionData?.values ?? defaults;
  const errors = actionData?.fieldErrors ?? {};
  const [seats, setSeats] = useState(values.seats);
  const navigation = useNavigation();
  const busy = navigation.state !== "idle" && navigation.formMethod === "POST";
  const count = Number(seats);
  const total = Number.isInteger(count) && count > 0 && count <= MAX_CHILD_SEATS ? formatPrice(count * price) : null;

  return (
    <div className="mx-auto max-w-3xl px-5 py-12">
      <p className="mb-1 text-ink-soft">
        <Link to="/family">{household}</Link>
      </p>
      <h1 className="mb-6 text-[length:var(--text-step-3)]">Seats for your children</h1>
      {dropped ? <Notice tone="info">The card payment was dropped. No money was taken and no seats were added.</Notice> : null}

      <section aria-labelledby="ledger-heading" className="card mb-8">
        <h2 id="ledger-heading" className="mb-3 text-[length:var(--text-step-2)]">
          Seat ledger
        </h2>
        <p className="mb-4 text-ink-soft">Each child's account holds one seat for the school year, at {formatPrice(price)} a seat.</p>
        <SeatLedgerTable rows={ledger} currentYear={currentYear} caption={`Seats of ${household} per school year`} />
        {children.length > 0 ? (
          <ul className="mt-4 space-y-1">
            {children.map((c) => (
              <li key={c.displayName}>
                <strong>{c.displayName}</strong>: {c.hasSeat ? `has a seat for ${currentYear}` : `no seat for ${currentYear} yet`}
              </li>
            ))}
          </ul>
        ) : null}
      </section>

      <section aria-labelledby="buy-heading" className="mb-8">
        <h2 id="buy-heading" className="mb-3 text-[length:var(--text-step-2)]">
          Buy seats
        </h2>
        {actionData?.problem ? <Notice tone="problem">{actionData.problem}</Notice> : null}
        <Form method="post" className="card" noValidate>
          <Field
            label="How many seats?"
            hint="One for each child who will take the course this school year."
            name="seats"
            type="number"
            inputMode="numeric"
            min={1}
            max={MAX_CHILD_SEATS}
            step={1}
            value={seats}
            onChange={(e) => setSeats(e.currentTarget.value)}
            error={errors.seats}
          />
          <div className="mb-4">
            <label htmlFor="schoolYear" className="mb-1 block font-bold">
              For the school year
            </label>
            <select id="schoolYear" name="schoolYear" className="field" defaultValue={values.schoolYear} aria-invalid={errors.schoolYear ? true : undefined}>
              {years.map((y, i) => (
                <option key={y} value={y}>
                  {y} {i === 0 ? "(this school year)" : "(next school year)"}
                </option>
              ))}
            </select>
            {errors.schoolYear ? <p className="mt-1 text-[length:var(--text-step--1)] font-bold text-danger">{errors.schoolYear}</p> : null}
          </div>
          <p className="mb-4" aria-live="polite">
            {total ? (
              <>
                Total: <strong>{total}</strong> ({count} × {formatPrice(price)}), paid by card on the payment service's page.
              </>
            ) : (
              "Enter a number of seats to see the total."
            )}
          </p>
          <SendButton className="btn" busy={busy}>
            {busy ? "One moment…" : "Go to card payment"}
          </SendButton>
        </Form>
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

export const meta: Route.MetaFunction = () => [{ title: "Family seats — Bendwise" }];
