// /join/family/confirm?token=…: the link in the "confirm your address" e-mail. Opening it only shows a
// button (mail scanners open links on their own); pressing it uses the link up, makes the account,
// the household with its code and the parent's membership, signs the parent in and opens /family.
import { Form, Link, data, redirect, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/join.family.confirm";
import { Notice } from "~/components/auth-forms";
import { db } from "~/db/client.server";
import { assertSameOrigin } from "~/lib/auth.server";
import { signInThroughAuth } from "~/lib/auth/auth-config.server";
import { createEmailToken } from "~/lib/auth/email-tokens.server";
import { confirmFamilySignUp, peekFamilySignUp } from "~/lib/family/sign-up.server";
import { SendButton } from "~/components/send-button";

const confirmSchema = z.object({ token: z.string().min(1).max(200) });

const SPENT = "This link has been used already or has run out (links work for 24 hours). If your account was made, sign in; if not, fill in the form again for a new link.";

export async function loader({ request }: Route.LoaderArgs) {
  const token = new URL(request.url).searchParams.get("token") ?? "";
  const pending = token ? await peekFamilySignUp({ db }, token) : null;
  return pending ? { mode: "confirm" as const, token, ...pending } : { mode: "spent" as const };
}

export async function action({ request }: Route.ActionArgs) {
  assertSameOrigin(request);
  const parsed = confirmSchema.safeParse(Object.fromEntries(await request.formData()));
  const result = parsed.success ? await confirmFamilySignUp({ db }, parsed.data.token) : null;
  if (!result?.ok) {
    const problem = result?.reason === "account-exists" ? "This address already has a Bendwise account, so no second one was made. Sign in with it." : SPENT;
    return data({ problem }, { status: 400 });
  }
  // The confirmed address signs the parent in straight away, through the same one-time link door as e-mailed sign-in links.
  const signIn = await signInThroughAuth(request, "email-link", { token: await createEmailToken({ db }, result.userId, "sign-in") });
  if (!signIn.ok) return redirect("/sign-in");
  const headers = new Headers();
  for (const cookie of signIn.setCookies) headers.append("Set-Cookie", cookie);
  return redirect("/family?welcome=1", { headers });
}

export default function ConfirmFamily({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state !== "idle";
  const problem = (actionData as { problem?: string } | undefined)?.problem;
  if (problem || loaderData.mode === "spent") {
    return (
      <div className="mx-auto max-w-xl px-5 py-12">
        <h1 className="mb-4 text-[length:var(--text-step-3)]">This link does not work any more</h1>
        <Notice tone="problem">{problem ?? SPENT}</Notice>
        <p className="flex flex-wrap gap-3">
          <Link to="/sign-in" className="btn">
            Sign in
          </Link>
          <Link to="/join/family" className="btn btn-quiet">
            Make a family account
          </Link>
        </p>
      </div>
    );
  }
  return (
    <div className="mx-auto max-w-xl px-5 py-12">
      <h1 className="mb-4 text-[length:var(--text-step-3)]">Confirm your address</h1>
      <div className="card">
        <p className="mb-5">
          Make the family account for <strong>{loaderData.householdName}</strong> with the address <strong>{loaderData.email}</strong>?
        </p>
        <Form method="post">
          <input type="hidden" name="token" value={loaderData.token} />
          <SendButton className="btn" busy={busy}>
            {busy ? "Making your account…" : "Confirm and open my family page"}
          </SendButton>
        </Form>
      </div>
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Confirm your address — Bendwise" }];
