// /join/teacher?token=…: the link in a school's invitation. Opening it shows the school and, for an
// address without an account, a form to choose a password; accepting uses the link up, makes the
// teacher's account (or adds the school to the existing one), signs them in and opens /teach. Opened
// again by that teacher, signed in, it says so and links to their classes.
import { Form, Link, data, redirect, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/join.teacher";
import { Field, Notice, useFocusFirstProblem } from "~/components/auth-forms";
import { db } from "~/db/client.server";
import { assertSameOrigin, getUser } from "~/lib/auth.server";
import { signInThroughAuth } from "~/lib/auth/auth-config.server";
import { createEmailToken } from "~/lib/auth/email-tokens.server";
import { newPasswordSchema } from "~/lib/auth/password-rules.server";
import { acceptedInvitationForToken, acceptInvitation, invitationForToken } from "~/lib/invitations.server";
import { SendButton } from "~/components/send-button";

const SPENT = "This invitation link has been used, withdrawn or has run out (links work for a week). Ask the school's administrator to send it again.";
const acceptSchema = z.object({ token: z.string().min(1).max(200), displayName: z.string().max(200).default(""), password: z.string().max(1024).default("") });

export async function loader({ request }: Route.LoaderArgs) {
  const token = new URL(request.url).searchParams.get("token") ?? "";
  const invitation = token ? await invitationForToken({ db }, token) : null;
  if (!invitation) {
    // Opened again by the teacher who accepted it, signed in: it is done, and their classes are a click away.
    const accepted = token ? await acceptedInvitationForToken({ db }, token) : null;
    const user = accepted?.acceptedBy ? await getUser(request) : null;
    if (accepted && user && user.id === accepted.acceptedBy) return { mode: "accepted" as const, school: accepted.schoolName, displayName: user.displayName };
    return { mode: "spent" as const };
  }
  return { mode: "accept" as const, token, email: invitation.email, displayName: invitation.displayName, school: invitation.schoolName, hasAccount: invitation.hasAccount };
}

export async function action({ request }: Route.ActionArgs) {
  assertSameOrigin(request);
  const parsed = acceptSchema.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) return data({ problem: SPENT }, { status: 400 });
  const { token, password } = parsed.data;
  const displayName = parsed.data.displayName.trim().replace(/\s+/g, " ");
  const invitation = await invitationForToken({ db }, token);
  if (!invitation) return data({ problem: SPENT }, { status: 400 });

  let newAccount: { displayName: string; password: string } | null = null;
  if (!invitation.hasAccount) {
    const fieldErrors: Record<string, string> = {};
    if (!displayName) fieldErrors.displayName = "Enter your name as students and colleagues should see it.";
    else if (displayName.length > 80 || /[<>]/.test(displayName)) fieldErrors.displayName = "Keep the name under 80 characters, without < or >.";
    const checked = newPasswordSchema({ email: invitation.email }).safeParse(password);
    if (!checked.success) fieldErrors.password = checked.error.issues[0]?.message ?? "Choose another password.";
    if (Object.keys(fieldErrors).length > 0) return data({ displayName, fieldErrors }, { status: 400 });
    newAccount = { displayName, password };
  }
  const accepted = await acceptInvitation({ db }, token, newAccount);
  if (!accepted.ok) return data({ problem: SPENT }, { status: 400 });
  const signIn = accepted.created
    ? await signInThroughAuth(request, "adult-password", { email: accepted.email, password })
    : await signInThroughAuth(request, "email-link", { token: await createEmailToken({ db }, accepted.userId, "sign-in") });
  if (!signIn.ok) return redirect("/sign-in");
  const headers = new Headers();
  for (const cookie of signIn.setCookies) headers.append("Set-Cookie", cookie);
  return redirect("/teach", { headers });
}

export default function JoinTeacher({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state !== "idle";
  const answer = actionData as { problem?: string; displayName?: string; fieldErrors?: Record<string, string> } | undefined;
  const form = useFocusFirstProblem(answer);
  if (loaderData.mode === "accepted") {
    return (
      <div className="mx-auto max-w-xl px-5 py-12">
        <h1 className="mb-4 text-[length:var(--text-step-3)]">You have already joined {loaderData.school}</h1>
        <p className="mb-4">
          You accepted this invitation, and you are signed in as {loaderData.displayName}. There is nothing more to do with this link.
        </p>
        <p>
          <Link className="btn" to="/teach/classes">Open your classes</Link>
        </p>
      </div>
    );
  }
  if (answer?.problem || loaderData.mode === "spent") {
    return (
      <div className="mx-auto max-w-xl px-5 py-12">
        <h1 className="mb-4 text-[length:var(--text-step-3)]">This invitation does not work any more</h1>
        <Notice tone="problem">{answer?.problem ?? SPENT}</Notice>
        <p>
          Already accepted it? <Link to="/sign-in">Sign in</Link>.
        </p>
      </div>
    );
  }
  return (
    <div className="mx-auto max-w-xl px-5 py-12">
      <h1 className="mb-2 text-[length:var(--text-step-3)]">Join {loaderData.school}</h1>
      <p className="mb-6 text-ink-soft">
        You are invited to teach with Bendwise as <strong className="text-ink">{loaderData.email}</strong>.
      </p>
      <Form method="post" noValidate className="card" ref={form}>
        <input type="hidden" name="token" value={loaderData.token} />
        {loaderData.hasAccount ? (
          <p className="mb-5">This address already has a Bendwise account: accepting adds {loaderData.school} to it, and you can use your usual password.</p>
        ) : (
          <>
            <Field
              label="Your name"
              hint="As your students and colleagues will see it."
              name="displayName"
              autoComplete="name"
              required
              defaultValue={answer?.displayName ?? loaderData.displayName}
              error={answer?.fieldErrors?.displayName}
            />
            <Field label="Choose a password" hint="At least 8 characters. A few ordinary words in a row make a good one." name="password" type="password" autoComplete="new-password" required error={answer?.fieldErrors?.password} />
          </>
        )}
        <SendButton className="btn" busy={busy}>
          {busy ? "One moment…" : `Accept and join ${loaderData.school}`}
        </SendButton>
      </Form>
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Join as a teacher — Bendwise" }];
