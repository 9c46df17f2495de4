// One-time tokens for e-mailed links (sign-in links, password resets, a new family's address check and
// teacher invitations). The link carries 32 random bytes; the database keeps only their SHA-256, so
// a copy of the table opens nothing. A token is used up by a single DELETE … RETURNING, so two
// clicks racing each other cannot both succeed.
import { createHash, randomBytes } from "node:crypto";
import { and, eq, gt, sql } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { verificationTokens } from "~/db/schema.server";

export type EmailTokenPurpose = "sign-in" | "reset-password" | "verify-email" | "teacher-invite" | "teacher-invite-accepted";

/** How long a link works: short, because an inbox is not a safe. */
export const EMAIL_TOKEN_MINUTES: Record<EmailTokenPurpose, number> = {
  "sign-in": 15,
  "reset-password": 30,
  // A new parent's "confirm your address" link: a day, since it may be opened after work.
  "verify-email": 24 * 60,
  // A school's invitation to a teacher: a week, then the administrator sends a new one.
  "teacher-invite": 7 * 24 * 60,
  // Not a link that opens anything: the receipt of an accepted invitation's used-up link (keepTokenReceipt),
  // so opening it again can say whose it was, for a month.
  "teacher-invite-accepted": 30 * 24 * 60,
};

const hashToken = (token: string) => createHash("sha256").update(token).digest("hex");

/** Makes a new token for a user; older unused tokens of the same purpose stop working. Returns the raw token for the link. */
export async function createEmailToken({ db }: { db: Database }, userId: string, purpose: EmailTokenPurpose): Promise<string> {
  const token = randomBytes(32).toString("base64url");
  const expires = new Date(Date.now() + EMAIL_TOKEN_MINUTES[purpose] * 60_000);
  await db.transaction(async (tx) => {
    await tx
      .delete(verificationTokens)
      .where(and(eq(verificationTokens.identifier, userId), eq(verificationTokens.purpose, purpose)));
    await tx.insert(verificationTokens).values({ identifier: userId, token: hashToken(token), expires, purpose });
  });
  return token;
}

/** The user a token belongs to, without using it up (to show the "set a new password" form). */
export async function peekEmailToken({ db }: { db: Database }, token: string, purpose: EmailTokenPurpose): Promise<string | null> {
  if (!/^[A-Za-z0-9_-]{20,100}$/.test(token)) return null;
  const [row] = await db
    .select({ userId: verificationTokens.identifier })
    .from(verificationTokens)
    .where(
      and(
        eq(verificationTokens.token, hashToken(token)),
        eq(verificationTokens.purpose, purpose),
        gt(verificationTokens.expires, sql`now()`),
      ),
    );
  return row?.userId ?? null;
}

/** Uses a token up: returns its user once, then never again; null for unknown, used or expired tokens. */
export async function consumeEmailToken({ db }: { db: Database }, token: string, purpose: EmailTokenPurpose): Promise<string | null> {
  if (!/^[A-Za-z0-9_-]{20,100}$/.test(token)) return null;
  const rows = await db
    .delete(verificationTokens)
    .where(and(eq(verificationTokens.token, hashToken(token)), eq(verificationTokens.purpose, purpose)))
    .returning({ userId: verificationTokens.identifier, expires: verificationTokens.expires });
  const row = rows[0];
  if (!row || row.expires.getTime() <= Date.now()) return null;
  return row.userId;
}

/**
 * After a link is used up: keeps its hash as a receipt under `purpose` for `identifier`, so opening
 * the link again can say what it was used for (peekEmailToken with that purpose) instead of only
 * that it does not work. A receipt signs nobody in and opens nothing by itself.
 */
export async function keepTokenReceipt({ db }: { db: Database }, token: string, identifier: string, purpose: "teacher-invite-accepted"): Promise<void> {
  const expires = new Date(Date.now() + EMAIL_TOKEN_MINUTES[purpose] * 60_000);
  await db.insert(verificationTokens).values({ identifier, token: hashToken(token), expires, purpose }).onConflictDoNothing();
}
