// /reset-password/:token: the page an e-mailed link opens. It checks the link without using it up,
// and on submit sets the new password, ends every other session (session version + 1) and signs in.
import { Form, Link, data, redirect, useNavigation } from "react-router";
import { eq, sql } from "drizzle-orm";
import { useState } from "react";
import type { Route } from "./+types/reset-password.$token";
import { Field, Notice, useFocusFirstProblem } from "~/components/auth-forms";
import { db } from "~/db/client.server";
import { signInFailures, users } from "~/db/schema.server";
import { homePathFor } from "~/lib/auth.server";
import { signInThroughAuth } from "~/lib/auth/auth-config.server";
import { consumeEmailToken, peekEmailToken } from "~/lib/auth/email-tokens.server";
import { checkNewPassword } from "~/lib/auth/password-rules.server";
import { assertSameOrigin } from "~/lib/auth/same-origin.server";
import { loadUser } from "~/lib/auth/session.server";
import { bucketsFor } from "~/lib/auth/throttle.server";
import { hashPassword, MIN_PASSWORD_LENGTH } from "~/lib/passwords.server";
import { SendButton } from "~/components/send-button";

type ActionData = { error?: string; spent?: true };

async function adultFor(userId: string | null) {
  if (!userId) return null;
  const [user] = await db.select({ id: users.id, email: users.email }).from(users).where(eq(users.id, userId));
  return user?.email ? { id: user.id, email: user.email } : null;
}

export async function loader({ params }: Route.LoaderArgs) {
  const user = await adultFor(await peekEmailToken({ db }, params.token, "reset-password"));
  return { valid: Boolean(user), email: user?.email ?? null, minLength: MIN_PASSWORD_LENGTH };
}

export async function action({ request, params }: Route.ActionArgs) {
  assertSameOrigin(request);
  const form = await request.formData();
  const password = form.get("password");
  const user = await adultFor(await peekEmailToken({ db }, params.token, "reset-password"));
  if (!user) return data<ActionData>({ spent: true }, { status: 400 });
  const problem = typeof password === "string" ? checkNewPassword(password, { email: user.email }) : "Choose a password.";
  if (problem || typeof password !== "string") return data<ActionData>({ error: problem ?? "Choose a password." }, { status: 400 });

  // Use the link up only now that the password is acceptable, so a too-short try does not waste it.
  if ((await consumeEmailToken({ db }, params.token, "reset-password")) !== user.id) {
    return data<ActionData>({ spent: true }, { status: 400 });
  }
  await db
    .update(users)
    .set({ passwordHash: await hashPassword(password), sessionVersion: sql`${users.sessionVersion} + 1`, emailVerifiedAt: new Date() })
    .where(eq(users.id, user.id));
  // Whoever holds the mailbox may sign in again straight away.
  await db.delete(signInFailures).where(eq(signInFailures.bucket, bucketsFor(user.id, "").account));

  const result = await signInThroughAuth(request, "adult-password", { email: user.email, password });
  if (!result.ok) return redirect("/sign-in?notice=password-changed");
  const signedIn = await loadUser(request, result.cookieHeader);
  const headers = new Headers();
  for (const cookie of result.setCookies) headers.append("Set-Cookie", cookie);
  return redirect(`${signedIn ? homePathFor(signedIn) : "/"}?notice=password-changed`, { headers });
}

export default function ChooseNewPassword({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state !== "idle";
  const [shown, setShown] = useState(false);
  const result = actionData as ActionData | undefined;
  const form = useFocusFirstProblem(result);

  if (!loaderData.valid || result?.spent) {
    return (
      <div className="mx-auto max-w-xl px-5 py-12">
        <h1 className="mb-4 text-[length:var(--text-step-3)]">This link no longer works</h1>
        <p className="mb-6 text-ink-soft">
          Links to choose a new password work once, for a short while. Ask for a new one and use the newest e-mail.
        </p>
        <Link to="/reset-password" className="btn">
          Ask for a new link
        </Link>
      </div>
    );
  }

  return (
    <div className="mx-auto max-w-xl px-5 py-12">
      <h1 className="mb-2 text-[length:var(--text-step-3)]">Choose a new password</h1>
      <p className="mb-6 text-ink-soft">
        For <strong>{loaderData.email}</strong>. Use at least {loaderData.minLength} characters; a few ordinary words in a row are
        easy to remember and hard to guess. No special characters needed.
      </p>
      <div className="card">
        <Form method="post" noValidate ref={form}>
          <Field
            label="New password"
            name="password"
            type={shown ? "text" : "password"}
            autoComplete="new-password"
            minLength={loaderData.minLength}
            required
            error={result?.error}
          />
          <label className="mb-5 flex items-center gap-2">
            <input type="checkbox" checked={shown} onChange={(e) => setShown(e.target.checked)} />
            Show the password while I type
          </label>
          <SendButton className="btn" busy={busy}>
            {busy ? "Saving…" : "Save and sign in"}
          </SendButton>
        </Form>
      </div>
      <p className="mt-4 text-[length:var(--text-step--1)] text-ink-soft">Saving signs you out of Bendwise on every other device.</p>
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Choose a new password — Bendwise" }, { name: "referrer", content: "no-referrer" }];
