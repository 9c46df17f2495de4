// /sign-in/link: adults ask for a sign-in link by e-mail, and come back here to use it.
// Opening the link only shows a button; the token is used up when the button is pressed (a POST),
// because mail scanners open links on their own and would otherwise spend it.
import { Form, Link, data, redirect, useNavigation } from "react-router";
import { eq } from "drizzle-orm";
import { z } from "zod";
import type { Route } from "./+types/sign-in.link";
import { Field, Notice, useFocusFirstProblem } from "~/components/auth-forms";
import { db } from "~/db/client.server";
import { users } from "~/db/schema.server";
import { homePathFor } from "~/lib/auth.server";
import { signInThroughAuth } from "~/lib/auth/auth-config.server";
import { sendEmailLink } from "~/lib/auth/email-links.server";
import { EMAIL_TOKEN_MINUTES, peekEmailToken } from "~/lib/auth/email-tokens.server";
import { assertSameOrigin } from "~/lib/auth/same-origin.server";
import { loadUser } from "~/lib/auth/session.server";
import { SendButton } from "~/components/send-button";

const askSchema = z.object({
  email: z
    .string()
    .trim()
    .toLowerCase()
    .pipe(z.email({ error: "Enter the e-mail address you use for Bendwise, like name@school.org." }).max(254)),
});
const useSchema = z.object({ token: z.string().min(1).max(200) });

type ActionData =
  | { intent: "send"; email: string; sent?: true; error?: string; problem?: string }
  | { intent: "use"; problem: string };

export async function loader({ request }: Route.LoaderArgs) {
  const token = new URL(request.url).searchParams.get("token");
  if (!token) return { mode: "ask" as const, minutes: EMAIL_TOKEN_MINUTES["sign-in"] };
  const userId = await peekEmailToken({ db }, token, "sign-in");
  if (!userId) return { mode: "spent" as const, minutes: EMAIL_TOKEN_MINUTES["sign-in"] };
  const [user] = await db.select({ email: users.email }).from(users).where(eq(users.id, userId));
  return { mode: "use" as const, token, email: user?.email ?? "", minutes: EMAIL_TOKEN_MINUTES["sign-in"] };
}

export async function action({ request }: Route.ActionArgs) {
  assertSameOrigin(request);
  const form = Object.fromEntries(await request.formData());
  if (form.intent === "use") {
    const parsed = useSchema.safeParse(form);
    const result = parsed.success ? await signInThroughAuth(request, "email-link", { token: parsed.data.token }) : null;
    if (!result?.ok) {
      return data<ActionData>(
        { intent: "use", problem: "That sign-in link has been used or has run out. Ask for a new one below." },
        { status: 400 },
      );
    }
    const user = await loadUser(request, result.cookieHeader);
    const headers = new Headers();
    for (const cookie of result.setCookies) headers.append("Set-Cookie", cookie);
    return redirect(user ? homePathFor(user) : "/", { headers });
  }

  const typed = typeof form.email === "string" ? form.email.trim() : "";
  const parsed = askSchema.safeParse(form);
  if (!parsed.success) {
    return data<ActionData>({ intent: "send", email: typed, error: parsed.error.issues[0]?.message }, { status: 400 });
  }
  try {
    await sendEmailLink({ db }, parsed.data.email, "sign-in");
  } catch (error) {
    console.error("sign-in link: the mail server refused:", (error as Error).message);
    return data<ActionData>(
      { intent: "send", email: typed, problem: "We could not send the e-mail just now. Please try again in a few minutes." },
      { status: 503 },
    );
  }
  return { intent: "send", email: parsed.data.email, sent: true } satisfies ActionData;
}

export default function SignInLink({ loaderData, actionData }: Route.ComponentProps) {
  const navigation = useNavigation();
  const busy = navigation.state !== "idle";
  const result = actionData as ActionData | undefined;
  const form = useFocusFirstProblem(result);

  if (loaderData.mode === "use" && result?.intent !== "use") {
    return (
      <div className="mx-auto max-w-xl px-5 py-12">
        <h1 className="mb-4 text-[length:var(--text-step-3)]">Sign in with your link</h1>
        <div className="card">
          <p className="mb-5">
            Sign in as <strong>{loaderData.email}</strong>? The link works once.
          </p>
          <Form method="post">
            <input type="hidden" name="intent" value="use" />
            <input type="hidden" name="token" value={loaderData.token} />
            <SendButton className="btn" busy={busy}>
              {busy ? "Signing in…" : "Sign in to Bendwise"}
            </SendButton>
          </Form>
        </div>
      </div>
    );
  }

  const send = result?.intent === "send" ? result : undefined;
  const spent = loaderData.mode === "spent" || result?.intent === "use";
  return (
    <div className="mx-auto max-w-xl px-5 py-12">
      <h1 className="mb-2 text-[length:var(--text-step-3)]">Get a sign-in link by e-mail</h1>
      <p className="mb-6 text-ink-soft">
        For adults with a Bendwise account. We send a link that signs you in without your password; it works once, within{" "}
        {loaderData.minutes} minutes.
      </p>
      {spent ? (
        <Notice tone="problem">That sign-in link has been used or has run out. Ask for a new one below.</Notice>
      ) : null}
      {send?.sent ? (
        <Notice tone="done">
          If <strong>{send.email}</strong> belongs to a Bendwise account, a sign-in link is on its way. Check your inbox (and the
          spam folder) in a minute or two.
        </Notice>
      ) : null}
      {send?.problem ? <Notice tone="problem">{send.problem}</Notice> : null}
      <div className="card">
        <Form method="post" noValidate ref={form}>
          <input type="hidden" name="intent" value="send" />
          <Field
            label="E-mail address"
            name="email"
            type="email"
            autoComplete="email"
            inputMode="email"
            spellCheck={false}
            required
            defaultValue={send?.email ?? ""}
            error={send?.error}
          />
          <SendButton className="btn" busy={busy}>
            {busy ? "Sending…" : "E-mail me a link"}
          </SendButton>
        </Form>
      </div>
      <p className="mt-5">
        <Link to="/sign-in">Back to sign-in</Link>
      </p>
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Sign-in link — Bendwise" }];
