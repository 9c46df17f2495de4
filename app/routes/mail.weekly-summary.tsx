// /mail/weekly-summary?token=…: the link at the foot of every weekly summary. Opening it stops the
// summary at once, without signing in (the token is the user id signed with our secret; see
// mail/preferences.server.ts); the page offers to turn it back on. Mail programs that offer their own
// "unsubscribe" button post here (RFC 8058 one-click, List-Unsubscribe-Post), which does the same.
import { eq } from "drizzle-orm";
import { Form, data, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/mail.weekly-summary";
import { Notice } from "~/components/auth-forms";
import { db } from "~/db/client.server";
import { users } from "~/db/schema.server";
import { readWeeklySummaryToken, setWeeklySummary } from "~/lib/mail/preferences.server";
import { SendButton } from "~/components/send-button";

const NOT_VALID = "This link is not one of ours, or it was cut short when copied. Open it again from the e-mail, or sign in and switch the summary off on your family page.";
const postSchema = z.object({ intent: z.enum(["resume", "stop"]).default("stop") });

/** The account a link stands for, or null. */
async function userFor(request: Request) {
  const token = new URL(request.url).searchParams.get("token") ?? "";
  const userId = readWeeklySummaryToken(token);
  if (!userId) return null;
  const [user] = await db.select({ id: users.id, email: users.email }).from(users).where(eq(users.id, userId));
  return user ?? null;
}

export async function loader({ request }: Route.LoaderArgs) {
  const user = await userFor(request);
  if (!user) return data({ ok: false as const, message: NOT_VALID }, { status: 404 });
  await setWeeklySummary({ db }, user.id, false);
  return { ok: true as const, on: false, email: user.email };
}

// No assertSameOrigin: the signed token in the address is the permission (no cookie is read), and mail
// programs post their one-click "unsubscribe" from their own servers (see the access matrix).
export async function action({ request }: Route.ActionArgs) {
  const user = await userFor(request);
  if (!user) return data({ ok: false as const, message: NOT_VALID }, { status: 404 });
  const form = Object.fromEntries(await request.formData());
  // RFC 8058 one-click posts "List-Unsubscribe=One-Click" and no intent: that means stop.
  const parsed = postSchema.safeParse(form);
  const on = parsed.success && parsed.data.intent === "resume";
  await setWeeklySummary({ db }, user.id, on);
  return { ok: true as const, on, email: user.email };
}

export default function WeeklySummary({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state !== "idle";
  const state = actionData ?? loaderData;
  if (!state.ok) {
    return (
      <div className="mx-auto max-w-xl px-5 py-12">
        <h1 className="mb-4 text-[length:var(--text-step-3)]">The weekly summary</h1>
        <Notice tone="problem">{state.message}</Notice>
      </div>
    );
  }
  return (
    <div className="mx-auto max-w-xl px-5 py-12">
      <h1 className="mb-4 text-[length:var(--text-step-3)]">The weekly summary</h1>
      {state.on ? (
        <Notice tone="done">The weekly summary is on again for {state.email}. It comes on Fridays.</Notice>
      ) : (
        <Notice tone="done">
          Done: no more weekly summaries go to <strong>{state.email}</strong>. Receipts, sign-in links and other e-mails you ask for still come.
        </Notice>
      )}
      <Form method="post">
        <input type="hidden" name="intent" value={state.on ? "stop" : "resume"} />
        <SendButton className="btn btn-quiet" busy={busy}>
          {state.on ? "Stop it again" : "Oops — turn it back on"}
        </SendButton>
      </Form>
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "The weekly summary — Bendwise" }, { name: "robots", content: "noindex" }];
