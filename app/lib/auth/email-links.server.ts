// E-mailed links for adults: a sign-in link, and a link to choose a new password. The page that asks
// always answers the same way whether or not the address has an account, so it cannot be used to
// find out who uses Bendwise; at most five such e-mails go to one person per hour.
import { and, eq, isNull, sql } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { users } from "~/db/schema.server";
import { serverEnv } from "~/env.server";
import { renderEmail, sendMail } from "~/lib/mailer.server";
import { createEmailToken, EMAIL_TOKEN_MINUTES, type EmailTokenPurpose } from "./email-tokens.server";

export const EMAILS_PER_PERSON_PER_HOUR = 5;

/** Counts one e-mail to this person in the current hour (rate_limits table); false once over the limit. */
async function allowAnotherEmail(db: Database, userId: string): Promise<boolean> {
  const rows = await db.execute<{ hits: number }>(sql`
    insert into rate_limits as r (bucket, window_start, hits)
    values (${`auth-mail:${userId}`}, date_trunc('hour', now()), 1)
    on conflict (bucket, window_start) do update set hits = r.hits + 1
    returning hits`);
  return Number(rows[0]?.hits ?? 0) <= EMAILS_PER_PERSON_PER_HOUR;
}

type LinkPurpose = Extract<EmailTokenPurpose, "sign-in" | "reset-password">;

function compose(purpose: LinkPurpose, displayName: string, url: string) {
  const minutes = EMAIL_TOKEN_MINUTES[purpose];
  if (purpose === "sign-in") {
    return {
      subject: "Your Bendwise sign-in link",
      ...renderEmail({
        heading: "Sign in to Bendwise",
        paragraphs: [
          `Hello ${displayName},`,
          `here is the sign-in link you asked for. It works once, within the next ${minutes} minutes.`,
        ],
        button: { label: "Sign in to Bendwise", url },
        footnote: "Did not ask for this? Ignore this e-mail: nobody can sign in without opening the link, and it stops working on its own.",
      }),
    };
  }
  return {
    subject: "Choose a new Bendwise password",
    ...renderEmail({
      heading: "Choose a new password",
      paragraphs: [
        `Hello ${displayName},`,
        `someone (we hope you) asked to set a new password for your Bendwise account. The link works once, within the next ${minutes} minutes.`,
        "Once you choose a new password, Bendwise signs you out everywhere else.",
      ],
      button: { label: "Choose a new password", url },
      footnote: "Did not ask for this? Ignore this e-mail: your password stays as it is.",
    }),
  };
}

export type EmailLinkOutcome = "sent" | "no-account" | "too-many";

/**
 * Sends a sign-in or new-password link to an adult's address. The caller shows the same words for
 * every outcome; the outcome is returned for tests and logs. Throws when the mail server refuses.
 */
export async function sendEmailLink({ db }: { db: Database }, email: string, purpose: LinkPurpose): Promise<EmailLinkOutcome> {
  const [user] = await db
    .select({ id: users.id, displayName: users.displayName, email: users.email })
    .from(users)
    .where(and(eq(users.email, email.trim().toLowerCase()), isNull(users.homeOrganisationId)));
  if (!user?.email) return "no-account";
  if (!(await allowAnotherEmail(db, user.id))) return "too-many";
  const token = await createEmailToken({ db }, user.id, purpose);
  const base = serverEnv().APP_URL.replace(/\/$/, "");
  const url = purpose === "sign-in" ? `${base}/sign-in/link?token=${token}` : `${base}/reset-password/${token}`;
  await sendMail({ to: user.email, ...compose(purpose, user.displayName, url) });
  return "sent";
}
