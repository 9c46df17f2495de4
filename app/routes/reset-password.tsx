// /reset-password: an adult who forgot their password asks for a link to choose a new one.
// Students ask their teacher or parent instead (they have no e-mail address).
import { Form, Link, data, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/reset-password";
import { Field, Notice, useFocusFirstProblem } from "~/components/auth-forms";
import { db } from "~/db/client.server";
import { sendEmailLink } from "~/lib/auth/email-links.server";
import { EMAIL_TOKEN_MINUTES } from "~/lib/auth/email-tokens.server";
import { assertSameOrigin } from "~/lib/auth/same-origin.server";
import { SendButton } from "~/components/send-button";

const schema = z.object({
  email: z
    .string()
    .trim()
    .toLowerCase()
    .pipe(z.email({ error: "Enter the e-mail address you use for Bendwise, like name@school.org." }).max(254)),
});

type ActionData = { email: string; sent?: true; error?: string; problem?: string };

export function loader() {
  return { minutes: EMAIL_TOKEN_MINUTES["reset-password"] };
}

export async function action({ request }: Route.ActionArgs) {
  assertSameOrigin(request);
  const form = Object.fromEntries(await request.formData());
  const typed = typeof form.email === "string" ? form.email.trim() : "";
  const parsed = schema.safeParse(form);
  if (!parsed.success) {
    return data<ActionData>({ email: typed, error: parsed.error.issues[0]?.message }, { status: 400 });
  }
  try {
    await sendEmailLink({ db }, parsed.data.email, "reset-password");
  } catch (error) {
    console.error("password reset: the mail server refused:", (error as Error).message);
    return data<ActionData>(
      { email: typed, problem: "We could not send the e-mail just now. Please try again in a few minutes." },
      { status: 503 },
    );
  }
  return { email: parsed.data.email, sent: true } satisfies ActionData;
}

export default function ResetPassword({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state !== "idle";
  const result = actionData as ActionData | undefined;
  const form = useFocusFirstProblem(result);
  return (
    <div className="mx-auto max-w-xl px-5 py-12">
      <h1 className="mb-2 text-[length:var(--text-step-3)]">Forgot your password?</h1>
      <p className="mb-6 text-ink-soft">
        Tell us the e-mail address of your Bendwise account. We send a link to choose a new password; it works once, within{" "}
        {loaderData.minutes} minutes.
      </p>
      {result?.sent ? (
        <Notice tone="done">
          If <strong>{result.email}</strong> belongs to a Bendwise account, the link is on its way. Check your inbox (and the spam
          folder) in a minute or two.
        </Notice>
      ) : null}
      {result?.problem ? <Notice tone="problem">{result.problem}</Notice> : null}
      <div className="card">
        <Form method="post" noValidate ref={form}>
          <Field
            label="E-mail address"
            name="email"
            type="email"
            autoComplete="email"
            inputMode="email"
            spellCheck={false}
            required
            defaultValue={result?.email ?? ""}
            error={result?.error}
          />
          <SendButton className="btn" busy={busy}>
            {busy ? "Sending…" : "Send me the link"}
          </SendButton>
        </Form>
      </div>
      <p className="mt-5 text-ink-soft">
        Students: your teacher, or the parent who made your account, can set a new password for you.
      </p>
      <p className="mt-2">
        <Link to="/sign-in">Back to sign-in</Link>
      </p>
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Forgot your password? — Bendwise" }];
