// /sign-in: one page, two doors. Adults (school staff, teachers, parents) use their e-mail address;
// students use the code from their teacher or parent, their username and their password.
import { Form, Link, data, redirect, useNavigation } from "react-router";
import type { ReactNode } from "react";
import { z } from "zod";
import type { Route } from "./+types/sign-in";
import { ClockTime, Field, Notice, useFocusFirstProblem } from "~/components/auth-forms";
import { getUser, homePathFor, safeRedirectTo } from "~/lib/auth.server";
import { adultCredentials, signInThroughAuth, studentCredentials, SignInPaused } from "~/lib/auth/auth-config.server";
import { assertSameOrigin } from "~/lib/auth/same-origin.server";
import { loadUser } from "~/lib/auth/session.server";
import { waitMessage } from "~/lib/auth/throttle.server";
import { SendButton } from "~/components/send-button";

// The door a form came through; an unknown one is treated as the adults' door.
const doorSchema = z.enum(["adult", "student"]).catch("adult");
type Door = z.infer<typeof doorSchema>;

export type SignInActionData = {
  door: Door;
  values: { email?: string; code?: string; username?: string };
  fieldErrors: Partial<Record<"email" | "code" | "username" | "password", string>>;
  problem?: string;
  /** When a wait is running: when it ends (ISO), for the clock time in the message. */
  waitUntil?: string;
};

const AUTH_ERROR_MESSAGES: Record<string, string> = {
  paused: "Too many wrong tries. Wait a few minutes, then try again.",
  "link-not-valid": "That sign-in link has been used or has run out. Ask for a new one below.",
};

export async function loader({ request }: Route.LoaderArgs) {
  const url = new URL(request.url);
  const user = await getUser(request);
  // Auth's own endpoints send refusals here as ?error=…&code=….
  const authError = url.searchParams.get("error");
  return {
    signedInAs: user ? { displayName: user.displayName, home: homePathFor(user) } : null,
    redirectTo: safeRedirectTo(url.searchParams.get("redirectTo")) ?? "",
    notice:
      url.searchParams.get("notice") === "password-changed"
        ? "Your new password is set. Sign in with it below."
        : null,
    authProblem: authError
      ? (AUTH_ERROR_MESSAGES[url.searchParams.get("code") ?? ""] ??
        "That sign-in did not work. Check what you typed and try again.")
      : null,
  };
}

const CODE_LOOKS = "A code is short: a few letters and digits, like KTXQ 9MWE for a class or HOME-AB12CD for a family.";

/** What is wrong with a typed code that was not left empty, in words that say what a code looks like; null when it may be one. */
function typedCodeProblem(typed: string): string | null {
  const code = typed.trim();
  if (code === "") return null; // the schema's "Enter the code…" is right for an empty field
  if ([...code].length > 40) return `That is far longer than a code. ${CODE_LOOKS}`;
  if (code.replace(/[^A-Za-z0-9]/g, "").length < 3) return `That does not look like a code. ${CODE_LOOKS}`;
  return null;
}

function firstErrors(issues: { path: PropertyKey[]; message: string }[]) {
  const errors: Record<string, string> = {};
  for (const issue of issues) {
    const key = String(issue.path[0] ?? "form");
    errors[key] ??= issue.message;
  }
  return errors;
}

export async function action({ request }: Route.ActionArgs) {
  assertSameOrigin(request);
  const form = await request.formData();
  const raw = Object.fromEntries([...form.entries()].filter(([, v]) => typeof v === "string")) as Record<string, string>;
  const door: Door = doorSchema.parse(raw.door);
  const redirectTo = safeRedirectTo(raw.redirectTo);
  const values =
    door === "adult"
      ? { email: (raw.email ?? "").trim() }
      : { code: (raw.code ?? "").trim(), username: (raw.username ?? "").trim() };

  const parsed = door === "adult" ? adultCredentials.safeParse(raw) : studentCredentials.safeParse(raw);
  if (!parsed.success) {
    const fieldErrors = firstErrors(parsed.error.issues);
    const codeProblem = door === "student" ? typedCodeProblem(raw.code ?? "") : null;
    if (codeProblem && fieldErrors.code) fieldErrors.code = codeProblem;
    return data<SignInActionData>({ door, values, fieldErrors }, { status: 400 });
  }

  const result = await signInThroughAuth(
    request,
    door === "adult" ? "adult-password" : "student-password",
    parsed.data as Record<string, string>,
  );
  if (!result.ok) {
    const refusal = result.refusal;
    if (refusal instanceof SignInPaused) {
      return data<SignInActionData>(
        { door, values, fieldErrors: {}, problem: waitMessage(refusal.wait), waitUntil: refusal.wait.until.toISOString() },
        { status: 429, headers: { "Retry-After": String(refusal.wait.seconds) } },
      );
    }
    const problem =
      door === "adult"
        ? "That e-mail address and password do not match an account. Check both and try again."
        : "That code, username and password do not match a student. Check all three and try again.";
    return data<SignInActionData>({ door, values, fieldErrors: {}, problem }, { status: 400 });
  }

  const user = await loadUser(request, result.cookieHeader);
  const headers = new Headers();
  for (const cookie of result.setCookies) headers.append("Set-Cookie", cookie);
  return redirect(redirectTo ?? (user ? homePathFor(user) : "/"), { headers });
}

export default function SignIn({ loaderData, actionData }: Route.ComponentProps) {
  const navigation = useNavigation();
  const busyDoor = navigation.state !== "idle" ? navigation.formData?.get("door") : null;
  const result = actionData as SignInActionData | undefined;
  const adult = result?.door === "adult" ? result : undefined;
  const student = result?.door === "student" ? result : undefined;
  // Most who sign in are students, so their door comes first (on a phone, the first form seen). An
  // adult's errand comes back here with the adults' door first: a wrong password, a notice after a
  // password reset, a sign-in link that has expired.
  const adultFirst = Boolean(adult || loaderData.notice || loaderData.authProblem);

  const studentDoor = (
    <SignInDoor
      key="student"
      door="student"
      title="Students"
      intro="Use the code your teacher or parent gave you, your username and your password."
      result={student}
      busy={busyDoor === "student"}
      redirectTo={loaderData.redirectTo}
      fields={
        <>
          <Field
            label="Class or family code"
            hint="For example MAPLE7A. Capitals or not, it does not matter."
            name="code"
            autoComplete="off"
            autoCapitalize="characters"
            spellCheck={false}
            required
            defaultValue={student?.values.code ?? ""}
            error={student?.fieldErrors.code}
          />
          <Field
            label="Username"
            name="username"
            autoComplete="username"
            autoCapitalize="none"
            spellCheck={false}
            required
            defaultValue={student?.values.username ?? ""}
            error={student?.fieldErrors.username}
          />
        </>
      }
    >
      <p className="mt-5 text-[length:var(--text-step--1)] text-ink-soft">
        Forgot your password? Ask your teacher, or the parent who made your account: they can set a new one for you.
      </p>
    </SignInDoor>
  );
  const adultDoor = (
    <SignInDoor
      key="adult"
      door="adult"
      title="Adults"
      intro="School administrators, teachers and parents: use your e-mail address."
      result={adult}
      busy={busyDoor === "adult"}
      redirectTo={loaderData.redirectTo}
      fields={
        <Field
          label="E-mail address"
          name="email"
          type="email"
          autoComplete="username"
          inputMode="email"
          spellCheck={false}
          required
          defaultValue={adult?.values.email ?? ""}
          error={adult?.fieldErrors.email}
        />
      }
    >
      <ul className="mt-5 space-y-1 text-[length:var(--text-step--1)]">
        <li>
          <Link to="/sign-in/link">E-mail me a sign-in link instead</Link>
        </li>
        <li>
          <Link to="/reset-password">Forgot your password?</Link>
        </li>
        <li>
          New here and teaching at home? <Link to="/join/family">Make a family account</Link>
        </li>
      </ul>
    </SignInDoor>
  );

  return (
    <div className="mx-auto max-w-5xl px-5 py-12">
      <h1 className="mb-2 text-[length:var(--text-step-3)]">Sign in to Bendwise</h1>
      <p className="mb-8 text-ink-soft">
        Students use their class or family code: no e-mail address needed. Grown-ups use their e-mail address, under{" "}
        <a href="#adult-door">Adults</a>.
      </p>

      {loaderData.signedInAs ? (
        <Notice tone="info">
          You are signed in as <strong>{loaderData.signedInAs.displayName}</strong>.{" "}
          <Link to={loaderData.signedInAs.home}>Go to your page</Link>, or sign in below as someone else.
        </Notice>
      ) : null}
      {loaderData.notice ? <Notice tone="done">{loaderData.notice}</Notice> : null}
      {loaderData.authProblem && !result ? <Notice tone="problem">{loaderData.authProblem}</Notice> : null}

      <div className="grid gap-6 md:grid-cols-2">{adultFirst ? [adultDoor, studentDoor] : [studentDoor, adultDoor]}</div>
    </div>
  );
}

/**
 * One door of the sign-in page: its heading (the region's name), what to use, the problem of the last
 * try with when to try again, the form with its own fields and the password, and what follows it.
 */
function SignInDoor(props: {
  door: "student" | "adult";
  title: string;
  intro: string;
  result: SignInActionData | undefined;
  busy: boolean;
  redirectTo: string;
  fields: ReactNode;
  children: ReactNode;
}) {
  const { door, result } = props;
  const form = useFocusFirstProblem(result);
  return (
    <section aria-labelledby={`${door}-door`} className="card">
      <h2 id={`${door}-door`} className="mb-1 text-[length:var(--text-step-2)]">
        {props.title}
      </h2>
      <p className="mb-5 text-ink-soft">{props.intro}</p>
      {result?.problem ? (
        <Notice tone="problem">
          <p>{result.problem}</p>
          {result.waitUntil ? (
            <p className="mt-1">
              You can try again from <ClockTime iso={result.waitUntil} />.
            </p>
          ) : null}
        </Notice>
      ) : null}
      <Form method="post" noValidate ref={form}>
        <input type="hidden" name="door" value={door} />
        <input type="hidden" name="redirectTo" value={props.redirectTo} />
        {props.fields}
        <Field label="Password" name="password" type="password" autoComplete="current-password" required error={result?.fieldErrors.password} />
        <SendButton className="btn" busy={props.busy}>
          {props.busy ? "Signing in…" : "Sign in"}
        </SendButton>
      </Form>
      {props.children}
    </section>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Sign in — Bendwise" }];
