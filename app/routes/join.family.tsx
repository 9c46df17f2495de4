// /join/family: a homeschooling parent makes a family account. They give their name, e-mail address,
// a name for the family and a password; a link to confirm the address goes to their inbox, and the
// account exists once it is opened (/join/family/confirm). The answer is the same whether or not the
// address already has an account.
import { Form, Link, data, useNavigation } from "react-router";
import type { Route } from "./+types/join.family";
import { Field, Notice } from "~/components/auth-forms";
import { db } from "~/db/client.server";
import { serverEnv } from "~/env.server";
import { assertSameOrigin, getUser, homePathFor } from "~/lib/auth.server";
import { familySignUpSchema, startFamilySignUp } from "~/lib/family/sign-up.server";
import { FAMILY_SEAT_PRICE_CENTS, formatPrice } from "~/lib/pricing";
import { SendButton } from "~/components/send-button";

type Values = { displayName: string; email: string; householdName: string };
type FieldErrors = Partial<Record<keyof Values | "password", string>>;
type ActionData = { values: Values; fieldErrors: FieldErrors; problem?: string } | { sentTo: string };

export async function loader({ request }: Route.LoaderArgs) {
  const user = await getUser(request);
  return {
    signedInAs: user ? { displayName: user.displayName, home: homePathFor(user) } : null,
    price: formatPrice(FAMILY_SEAT_PRICE_CENTS),
  };
}

export async function action({ request }: Route.ActionArgs) {
  assertSameOrigin(request);
  const form = await request.formData();
  const text = (name: string) => String(form.get(name) ?? "");
  const values: Values = { displayName: text("displayName"), email: text("email").trim(), householdName: text("householdName") };
  const parsed = familySignUpSchema.safeParse({ ...values, password: text("password") });
  if (!parsed.success) {
    const fieldErrors: FieldErrors = {};
    for (const issue of parsed.error.issues) fieldErrors[String(issue.path[0]) as keyof FieldErrors] ??= issue.message;
    return data<ActionData>({ values, fieldErrors }, { status: 400 });
  }
  try {
    // "sent", "account-exists" and "too-many" all get the same answer: the page never tells who has an account.
    await startFamilySignUp({ db }, parsed.data, serverEnv().APP_URL);
  } catch (error) {
    console.error("family sign-up could not be queued:", (error as Error).message);
    return data<ActionData>({ values, fieldErrors: {}, problem: "Bendwise could not take your sign-up just now. Nothing was saved; please try again in a few minutes." }, { status: 503 });
  }
  return { sentTo: parsed.data.email } satisfies ActionData;
}

export default function JoinFamily({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state !== "idle";
  const result = actionData as ActionData | undefined;
  if (result && "sentTo" in result) {
    return (
      <div className="mx-auto max-w-2xl px-5 py-12">
        <h1 className="mb-4 text-[length:var(--text-step-3)]">Check your inbox</h1>
        <Notice tone="done">
          We sent a link to <strong data-testid="sent-to">{result.sentTo}</strong>. Open it within 24 hours to confirm the address; your family account is made
          when you do.
        </Notice>
        <p className="mb-2">Nothing there after a few minutes? Look in the spam folder, or fill in the form again: a new link replaces the old one.</p>
        <p>
          <Link to="/join/family">Start again with another address</Link>
        </p>
      </div>
    );
  }
  const values = result?.values ?? { displayName: "", email: "", householdName: "" };
  const errors = result?.fieldErrors ?? {};
  return (
    <div className="mx-auto max-w-2xl px-5 py-12">
      <h1 className="mb-2 text-[length:var(--text-step-3)]">Make a family account</h1>
      <p className="mb-6 text-ink-soft">
        For parents teaching at home. You buy a seat for each child ({loaderData.price} a school year) and make their accounts: children sign in with
        your family's code, a username and a password. They need no e-mail address, and we ask nothing about them but a name and a grade band.
      </p>
      {loaderData.signedInAs ? (
        <Notice tone="info">
          You are signed in as <strong>{loaderData.signedInAs.displayName}</strong>. <Link to={loaderData.signedInAs.home}>Go to your page</Link>, or make a new
          family account below with another e-mail address.
        </Notice>
      ) : null}
      {result && "problem" in result && result.problem ? <Notice tone="problem">{result.problem}</Notice> : null}
      {Object.keys(errors).length > 0 ? (
        <Notice tone="problem">Please fix what is marked below; everything you typed is still there.</Notice>
      ) : null}
      <Form method="post" noValidate className="card">
        <Field label="Your name" name="displayName" autoComplete="name" required defaultValue={values.displayName} error={errors.displayName} />
        <Field
          label="Your e-mail address"
          hint="We send a link here to confirm it. Receipts and the weekly summary come here too."
          name="email"
          type="email"
          inputMode="email"
          autoComplete="email"
          spellCheck={false}
          required
          defaultValue={values.email}
          error={errors.email}
        />
        <Field
          label="A name for your family"
          hint="Shown on your family page and your receipts, e.g. “The Okafor family”."
          name="householdName"
          required
          defaultValue={values.householdName}
          error={errors.householdName}
        />
        <Field
          label="Choose a password"
          hint="At least 8 characters. A few ordinary words in a row make a good one."
          name="password"
          type="password"
          autoComplete="new-password"
          required
          error={errors.password}
        />
        <SendButton className="btn" busy={busy}>
          {busy ? "One moment…" : "Send me the link"}
        </SendButton>
      </Form>
      <p className="mt-6 text-ink-soft">
        Already have an account? <Link to="/sign-in">Sign in</Link>.
      </p>
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Make a family account — Bendwise" }];
