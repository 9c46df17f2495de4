// /family/children/new: a parent makes a child's account — a display name, a username, a password and
// a grade band, nothing else. It takes one of the family's seats for this school year; with none free
// the page says so and links to buying a seat; the name, username and grade band stay in the tab
// (sessionStorage, never the password) and are filled in again when the parent comes back.
import { useEffect, useRef, useState } from "react";
import { Form, Link, data, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/family.children.new";
import { Field, Notice } from "~/components/auth-forms";
import { db } from "~/db/client.server";
import { assertSameOrigin, requireRole } from "~/lib/auth.server";
import { readChildDraft, saveChildDraft } from "~/lib/family/child-draft";
import { addChild, newChildSchema } from "~/lib/family/children.server";
import { householdsOf } from "~/lib/family/household.server";
import { schoolYearOf } from "~/lib/school-year";
import { seatLedgerForYear } from "~/lib/seats.server";
import { SendButton } from "~/components/send-button";

type Values = { displayName: string; username: string; gradeBand: string };
type Errors = Partial<Record<keyof Values | "password", string>>;
type ActionData = { values: Values; errors: Errors; seatProblem?: string };

async function householdFor(request: Request) {
  const { user } = await requireRole(request, ["parent"]);
  const [household] = await householdsOf({ db }, user);
  if (!household) throw new Response("Child accounts belong to a family, and you are not a parent in one.", { status: 403 });
  return { user, household };
}

export async function loader({ request }: Route.LoaderArgs) {
  const { household } = await householdFor(request);
  const year = schoolYearOf();
  return { household: { name: household.name, code: household.signInCode }, schoolYear: year, ledger: await seatLedgerForYear({ db }, household.id, year) };
}

export async function action({ request }: Route.ActionArgs) {
  assertSameOrigin(request);
  const { household } = await householdFor(request);
  const form = await request.formData();
  const text = (name: string) => String(form.get(name) ?? "");
  const values: Values = { displayName: text("displayName"), username: text("username"), gradeBand: text("gradeBand") };
  const parsed = newChildSchema.safeParse({ ...values, password: text("password") });
  if (!parsed.success) {
    const errors: Errors = {};
    for (const issue of parsed.error.issues) errors[String(issue.path[0]) as keyof Errors] ??= issue.message;
    return data<ActionData>({ values, errors }, { status: 400 });
  }
  const result = await addChild({ db }, household.id, parsed.data);
  if (!result.ok) {
    if (result.field === "seat") return data<ActionData>({ values, errors: {}, seatProblem: result.message }, { status: 409 });
    return data<ActionData>({ values, errors: { username: result.message } }, { status: 409 });
  }
  return redirect(`/family/children/${result.child.id}?made=1`);
}

export default function NewChild({ loaderData, actionData }: Route.ComponentProps) {
  const { household, schoolYear, ledger } = loaderData;
  const busy = useNavigation().state !== "idle";
  const result = actionData as ActionData | undefined;
  const values = result?.values ?? { displayName: "", username: "", gradeBand: "6-8" };
  const errors = result?.errors ?? {};
  const noSeat = ledger.free === 0;
  const draftKey = household.code ?? household.name;
  const formRef = useRef<HTMLFormElement>(null);
  const [restored, setRestored] = useState(false);
  const typed = (): Values => {
    const fields = new FormData(formRef.current ?? undefined);
    return { displayName: String(fields.get("displayName") ?? ""), username: String(fields.get("username") ?? ""), gradeBand: String(fields.get("gradeBand") ?? "") };
  };
  // Coming back (Back, or "Add a child" after buying a seat): fill in what this tab kept.
  useEffect(() => {
    const form = formRef.current;
    const draft = readChildDraft(draftKey);
    if (!form || !draft || result) return;
    const set = (name: string, value: string) => {
      const input = form.elements.namedItem(name);
      if (input instanceof HTMLInputElement && input.value === "") input.value = value;
    };
    set("displayName", draft.displayName);
    set("username", draft.username);
    const band = form.querySelector<HTMLInputElement>(`input[name="gradeBand"][value="${CSS.escape(draft.gradeBand)}"]`);
    if (band) band.checked = true;
    setRestored(draft.displayName !== "" || draft.username !== "");
  }, []); // once, when the page opens
  // Whatever the server answered, keep the fields it sent back for a trip to buy a seat.
  useEffect(() => {
    if (result) saveChildDraft(draftKey, typed());
  }, [result, draftKey]);
  return (
    <div className="mx-auto max-w-2xl px-5 py-10">
      <p className="mb-1">
        <Link to="/family">{household.name}</Link>
      </p>
      <h1 className="mb-2 text-[length:var(--text-step-3)]">Add a child</h1>
      <p className="mb-6 text-ink-soft">
        Your child signs in with the family code <strong className="font-mono text-ink">{household.code}</strong>, the username and the password you
        choose here. We keep nothing else about them: no e-mail address, no birth date.
      </p>
      {result?.seatProblem ? (
        <Notice tone="problem">
          <p>{result.seatProblem}</p>
          <p className="mt-2">
            <Link to="/family/seats">Buy a seat</Link>. This browser tab keeps your child's name, username and grade band meanwhile (not the
            password): come back through “Add a child”, type a password again and press “Make the account”.
          </p>
        </Notice>
      ) : noSeat ? (
        <Notice tone="info">
          {ledger.bought === 0 ? `Your family has no seats for ${schoolYear} yet.` : ledger.bought === 1 ? `Your 1 seat for ${schoolYear} is in use.` : `All ${ledger.bought} of your seats for ${schoolYear} are in use.`} Each
          child needs a seat: <Link to="/family/seats">buy one first</Link>. This browser tab keeps the name, username and grade band you type here
          (not the password) until you come back.
        </Notice>
      ) : (
        <p className="mb-4" data-testid="free-seats">
          {ledger.free} free {ledger.free === 1 ? "seat" : "seats"} for {schoolYear}; this child takes one.
        </p>
      )}
      {restored ? (
        <Notice tone="info">
          <span data-testid="draft-restored">We filled in the name and username you typed before; choose the password again.</span>
        </Notice>
      ) : null}
      {Object.keys(errors).length > 0 ? <Notice tone="problem">Please fix what is marked below; everything else you typed is still there.</Notice> : null}
      <Form method="post" noValidate className="card" ref={formRef} onChange={() => saveChildDraft(draftKey, typed())}>
        <Field label="Your child's name" hint="What Bendwise calls them, e.g. a first name." name="displayName" autoComplete="off" required defaultValue={values.displayName} error={errors.displayName} />
        <Field
          label="Username"
          hint="For signing in: 3 to 40 letters a–z, digits, dots, hyphens or underscores, e.g. juno or juno.s."
          name="username"
          autoComplete="off"
          autoCapitalize="none"
          spellCheck={false}
          required
          defaultValue={values.username}
          error={errors.username}
        />
        <Field
          label="Password"
          hint="At least 8 characters; easy for your child to type, hard to guess, e.g. three short words."
          name="password"
          type="text"
          autoComplete="off"
          autoCapitalize="none"
          spellCheck={false}
          required
          error={errors.password}
        />
        <fieldset className="mb-5">
          <legend className="mb-1 font-bold">Grade band</legend>
          <p className="mb-2 text-[length:var(--text-step--1)] text-ink-soft">All we need to know about your child's age.</p>
          {[
            { value: "6-8", label: "Grades 6–8" },
            { value: "9-10", label: "Grades 9–10" },
          ].map((o) => (
            <label key={o.value} className="mr-6 inline-flex items-center gap-2 py-1">
              <input type="radio" name="gradeBand" value={o.value} defaultChecked={values.gradeBand === o.value} />
              {o.label}
            </label>
          ))}
          {errors.gradeBand ? <p className="mt-1 text-[length:var(--text-step--1)] font-bold text-danger">{errors.gradeBand}</p> : null}
        </fieldset>
        <SendButton className="btn" busy={busy}>
          {busy ? "Making the account…" : "Make the account"}
        </SendButton>
      </Form>
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Add a child — Bendwise" }];
