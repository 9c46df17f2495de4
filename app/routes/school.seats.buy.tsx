// /school/seats/buy: a school administrator buys seats for a school year, by card (on the payment
// service's hosted page) or by invoice with the school's purchase-order number. Seats are granted
// only when the payment service confirms the payment by a signed event, never by this page.
import { useState } from "react";
import { Form, Link, data, redirect, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/school.seats.buy";
import { Field, Notice, useFocusFirstProblem } from "~/components/auth-forms";
import { db } from "~/db/client.server";
import { serverEnv } from "~/env.server";
import { assertSameOrigin, requireRole } from "~/lib/auth.server";
import { payments } from "~/lib/payments.server";
import { formatPrice, SCHOOL_SEAT_PRICE_CENTS } from "~/lib/pricing";
import { PaymentServiceError, PURCHASE_ORDER_MAX, requestInvoice, startCardCheckout } from "~/lib/purchases.server";
import { purchasableSchoolYears } from "~/lib/school-year";
import { rangeWords, readWholeNumber } from "~/lib/teaching/shared";
import { SendButton } from "~/components/send-button";

const MIN_SEATS_PER_ORDER = 1;
const MAX_SEATS_PER_ORDER = 5000;

const purchaseOrderSchema = z
  .string()
  .trim()
  .refine((po) => [...po].length <= PURCHASE_ORDER_MAX, {
    error: (issue) =>
      `A purchase-order number has at most ${PURCHASE_ORDER_MAX} characters; this one has ${[...String(issue.input)].length.toLocaleString("en-US")}. Check that only the number was pasted.`,
  })
  .regex(/^[\p{L}\p{N} ./#_-]*$/u, "Use letters, digits, spaces and . / # _ - only.")
  .default("");
const methodSchema = z.enum(["card", "invoice"], { error: "Choose how the school will pay: by card now, or by invoice." });

/** The number of seats: the order checks it, and the page checks it as it is typed to show the total or what is wrong. */
const seatsSchema = z.string().transform((typed, ctx) => {
  const seats = readWholeNumber(typed, MIN_SEATS_PER_ORDER, MAX_SEATS_PER_ORDER, "seats");
  if (seats.ok) return seats.value;
  ctx.addIssue({ code: "custom", message: seats.message });
  return z.NEVER;
});

function seatOrderSchema(years: readonly string[]) {
  return z
    .object({
      seats: seatsSchema,
      schoolYear: z.string({ error: "Choose the school year." }).refine((y) => years.includes(y), `Choose ${years.join(" or ")}.`),
      method: methodSchema,
      purchaseOrder: purchaseOrderSchema,
    })
    .refine((order) => order.method !== "invoice" || order.purchaseOrder !== "", {
      path: ["purchaseOrder"],
      message: "Enter your purchase-order number; it is printed on the invoice.",
      // Say so even when another field is wrong too, so everything is explained at once.
      when: (payload) => z.object({ method: methodSchema, purchaseOrder: purchaseOrderSchema }).safeParse(payload.value).success,
    });
}

type Values = { seats: string; schoolYear: string; method: string; purchaseOrder: string };
type FieldName = keyof Values;

export async function loader({ request }: Route.LoaderArgs) {
  const { membership } = await requireRole(request, ["school_admin"]);
  const url = new URL(request.url);
  const years = purchasableSchoolYears();
  const year = url.searchParams.get("year");
  const seats = url.searchParams.get("seats") ?? "";
  return {
    school: membership.organisationName,
    years,
    price: SCHOOL_SEAT_PRICE_CENTS,
    purchaseOrderMax: PURCHASE_ORDER_MAX,
    defaults: {
      seats: seatsSchema.safeParse(seats).success ? seats : "10",
      schoolYear: year && years.includes(year) ? year : years[0],
      method: "card",
      purchaseOrder: "",
    } satisfies Values,
  };
}

export async function action({ request }: Route.ActionArgs) {
  assertSameOrigin(request);
  const { user, membership } = await requireRole(request, ["school_admin"]);
  const form = await request.formData();
  const values: Values = {
    seats: String(form.get("seats") ?? ""),
    schoolYear: String(form.get("schoolYear") ?? ""),
    method: String(form.get("method") ?? ""),
    purchaseOrder: String(form.get("purchaseOrder") ?? ""),
  };
  const parsed = seatOrderSchema(purchasableSchoolYears()).safeParse(values);
  if (!parsed.success) {
    const fieldErrors: Partial<Record<FieldName, string>> = {};
    for (const issue of parsed.error.issues) fieldErrors[String(issue.path[0]) as FieldName] ??= issue.message;
    return data({ values, fieldErrors, problem: null as string | null }, { status: 400 });
  }
  const order = parsed.data;
  const deps = { db, stripe: payments() };
  const base = { organisationId: membership.organisationId, buyer: { id: user.id, email: user.email }, schoolYear: order.schoolYear, seats: order.seats };
  try {
    if (order.method === "card") {
      const { url } = await startCardCheckout(deps, { ...base, appUrl: serverEnv().APP_URL });
      return redirect(url);
    }
    const { purchaseId } = await requestInvoice(deps, { ...base, purchaseOrder: order.purchaseOrder });
    return redirect(`/school/seats?${new URLSearchParams({ invoice: purchaseId })}`);
  } catch (error) {
    if (!(error instanceof PaymentServiceError)) throw error;
    console.error(error.cause ?? error);
    return data({ values, fieldErrors: {} as Partial<Record<FieldName, string>>, problem: error.userMessage }, { status: 503 });
  }
}

export default function BuySeats({ loaderData, actionData }: Route.ComponentProps) {
  const { school, years, price, purchaseOrderMax, defaults } = loaderData;
  const values = actionData?.values ?? defaults;
  const errors = actionData?.fieldErrors ?? {};
  const form = useFocusFirstProblem(actionData);
  const [seats, setSeats] = useState(values.seats);
  const [method, setMethod] = useState(values.method);
  const navigation = useNavigation();
  const busy = navigation.state !== "idle" && navigation.formMethod === "POST";
  const count = seatsSchema.safeParse(seats);
  const errorCount = Object.keys(errors).length;

  return (
    <div className="mx-auto max-w-2xl px-5 py-12">
      <p className="mb-1 text-ink-soft">
        <Link to="/school/seats">Seats</Link> · {school}
      </p>
      <h1 className="mb-6 text-[length:var(--text-step-3)]">Buy student seats</h1>
      {actionData?.problem ? <Notice tone="problem">{actionData.problem}</Notice> : null}
      {errorCount > 0 ? (
        <Notice tone="problem">
          {errorCount === 1 ? "One thing to fix" : `${errorCount} things to fix`} below. Everything else you entered is kept.
        </Notice>
      ) : null}

      <Form method="post" className="card" noValidate ref={form}>
        <Field
          label="How many seats?"
          hint={`One seat is one student for one school year, ${formatPrice(price)} each. In digits, ${rangeWords(MIN_SEATS_PER_ORDER, MAX_SEATS_PER_ORDER)} in one order.`}
          name="seats"
          type="text"
          inputMode="numeric"
          autoComplete="off"
          required
          value={seats}
          onChange={(e) => setSeats(e.currentTarget.value)}
          error={errors.seats}
        />

        <div className="mb-4">
          <label htmlFor="schoolYear" className="mb-1 block font-bold">
            For the school year
          </label>
          <select
            id="schoolYear"
            name="schoolYear"
            className="field"
            defaultValue={values.schoolYear}
            aria-invalid={errors.schoolYear ? true : undefined}
            aria-describedby={errors.schoolYear ? "schoolYear-error" : undefined}
          >
            {years.map((y, i) => (
              <option key={y} value={y}>
                {y} {i === 0 ? "(this school year)" : "(next school year)"}
              </option>
            ))}
          </select>
          {errors.schoolYear ? (
            <p id="schoolYear-error" className="mt-1 text-[length:var(--text-step--1)] font-bold text-danger">
              {errors.schoolYear}
            </p>
          ) : null}
        </div>

        {/* Each choice is named by its title alone and described by the sentence under it, so a screen reader says "By invoice, radio button" before the details. */}
        <fieldset className="mb-4" aria-describedby={errors.method ? "method-error" : undefined}>
          <legend className="mb-1 font-bold">How will the school pay?</legend>
          <label className="mb-2 flex gap-3 rounded-lg border border-rule p-3">
            <input type="radio" name="method" value="card" checked={method === "card"} onChange={() => setMethod("card")} aria-labelledby="method-card" aria-describedby="method-card-about" className="mt-1 shrink-0 self-start" />
            <span>
              <span id="method-card" className="block font-bold">By card, now</span>
              <span id="method-card-about" className="text-[length:var(--text-step--1)] text-ink-soft">
                You pay on the payment service's page and come back here. The seats appear as soon as the payment is confirmed.
              </span>
            </span>
          </label>
          <label className="flex gap-3 rounded-lg border border-rule p-3">
            <input type="radio" name="method" value="invoice" checked={method === "invoice"} onChange={() => setMethod("invoice")} aria-labelledby="method-invoice" aria-describedby="method-invoice-about" className="mt-1 shrink-0 self-start" />
            <span>
              <span id="method-invoice" className="block font-bold">By invoice</span>
              <span id="method-invoice-about" className="text-[length:var(--text-step--1)] text-ink-soft">
                We e-mail you an invoice with your purchase-order number, payable by bank transfer within 30 days. The seats are added when it
                is paid.
              </span>
            </span>
          </label>
          {errors.method ? (
            <p id="method-error" className="mt-1 text-[length:var(--text-step--1)] font-bold text-danger">
              {errors.method}
            </p>
          ) : null}
        </fieldset>

        <Field
          label={method === "invoice" ? "Purchase-order number" : "Purchase-order number (only for an invoice)"}
          hint={`As your school's office gave it, e.g. PO-2026-0147. Up to ${purchaseOrderMax} characters.`}
          name="purchaseOrder"
          autoComplete="off"
          defaultValue={values.purchaseOrder}
          error={errors.purchaseOrder}
        />

        <p className="mb-4 text-[length:var(--text-step-1)]" aria-live="polite" data-testid="order-total">
          {count.success ? (
            <>
              Total: <strong>{formatPrice(count.data * price)}</strong> ({count.data} × {formatPrice(price)})
            </>
          ) : (
            // What is wrong with the number typed, in the words the order would use.
            <span data-testid="order-total-problem">{count.error.issues[0]?.message}</span>
          )}
        </p>
        <SendButton className="btn" busy={busy}>
          {busy ? "One moment…" : method === "invoice" ? "Send me the invoice" : "Go to card payment"}
        </SendButton>
      </Form>
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Buy seats — Bendwise" }];
