// /sign-out: POST ends the session in this browser; with intent=everywhere it also ends every other
// session of this person (users.session_version + 1, checked by getUser on every request).
// GET shows both choices, for people who arrive by link or without JavaScript.
import { Form, Link, redirect } from "react-router";
import { eq, sql } from "drizzle-orm";
import { z } from "zod";
import type { Route } from "./+types/sign-out";
import { db } from "~/db/client.server";
import { users } from "~/db/schema.server";
import { getUser, homePathFor } from "~/lib/auth.server";
import { signOutCookies } from "~/lib/auth/auth-config.server";
import { assertSameOrigin } from "~/lib/auth/same-origin.server";

// Anything but "everywhere" signs out here only: signing out never fails for a malformed form.
const formSchema = z.object({ intent: z.enum(["here", "everywhere"]).catch("here") });

export async function loader({ request }: Route.LoaderArgs) {
  const user = await getUser(request);
  const signedOut = new URL(request.url).searchParams.get("done");
  return {
    user: user ? { displayName: user.displayName, home: homePathFor(user) } : null,
    done: signedOut === "everywhere" ? ("everywhere" as const) : signedOut ? ("here" as const) : null,
  };
}

export async function action({ request }: Route.ActionArgs) {
  assertSameOrigin(request);
  const { intent } = formSchema.parse(Object.fromEntries(await request.formData()));
  const everywhere = intent === "everywhere";
  if (everywhere) {
    const user = await getUser(request);
    if (user) {
      await db.update(users).set({ sessionVersion: sql`${users.sessionVersion} + 1` }).where(eq(users.id, user.id));
    }
  }
  const headers = new Headers();
  for (const cookie of await signOutCookies(request)) headers.append("Set-Cookie", cookie);
  return redirect(`/sign-out?done=${everywhere ? "everywhere" : "here"}`, { headers });
}

export default function SignOut({ loaderData }: Route.ComponentProps) {
  const { user, done } = loaderData;
  return (
    <div className="mx-auto max-w-xl px-5 py-12">
      {user ? (
        <>
          <h1 className="mb-2 text-[length:var(--text-step-3)]">Sign out</h1>
          <p className="mb-6 text-ink-soft">You are signed in as {user.displayName}.</p>
          <div className="card space-y-5">
            <Form method="post">
              <input type="hidden" name="intent" value="here" />
              <button type="submit" className="btn">
                Sign out on this device
              </button>
            </Form>
            <Form method="post">
              <input type="hidden" name="intent" value="everywhere" />
              <button type="submit" className="btn btn-quiet">
                Sign out on every device
              </button>
              <p className="mt-2 text-[length:var(--text-step--1)] text-ink-soft">
                For a lost phone or a shared computer you cannot get back to: every browser signed in as you is signed out.
              </p>
            </Form>
          </div>
          <p className="mt-5">
            <Link to={user.home}>Back to your page</Link>
          </p>
        </>
      ) : (
        <>
          <h1 className="mb-2 text-[length:var(--text-step-3)]">You are signed out</h1>
          <p className="mb-6 text-ink-soft">
            {done === "everywhere"
              ? "Every browser that was signed in as you is now signed out."
              : "Nobody can use Bendwise as you from this browser until you sign in again."}
          </p>
          <Link to="/sign-in" className="btn">
            Sign in again
          </Link>
        </>
      )}
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Sign out — Bendwise" }];
