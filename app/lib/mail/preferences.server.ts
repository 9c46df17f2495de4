// The weekly summary's on/off switch, and the signed link in every summary that turns it off without
// signing in. The link carries the user id and an HMAC of it (keyed by AUTH_SECRET): it cannot be
// made for someone else, it needs no table, and it keeps working for as long as the secret is kept.
import { createHmac, timingSafeEqual } from "node:crypto";
import { eq, sql } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { mailPreferences } from "~/db/schema.server";
import { serverEnv } from "~/env.server";

const PURPOSE = "bendwise weekly summary opt-out v1";
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;

function signature(userId: string, secret: string): string {
  return createHmac("sha256", secret).update(`${PURPOSE}:${userId}`).digest("base64url");
}

/** The token for a user's opt-out link: "<user id>.<signature>". */
export function weeklySummaryToken(userId: string, secret = serverEnv().AUTH_SECRET): string {
  return `${userId}.${signature(userId, secret)}`;
}

/** The user a token was made for, or null when it was not made by us. */
export function readWeeklySummaryToken(token: string, secret = serverEnv().AUTH_SECRET): string | null {
  const [userId, given, ...rest] = token.split(".");
  if (rest.length > 0 || !userId || !given || !UUID.test(userId)) return null;
  const expected = Buffer.from(signature(userId, secret));
  const actual = Buffer.from(given);
  return actual.length === expected.length && timingSafeEqual(actual, expected) ? userId : null;
}

/** The opt-out address for a user, as written in the e-mail. */
export function weeklySummaryStopUrl(userId: string, appUrl = serverEnv().APP_URL): string {
  return `${appUrl.replace(/\/$/, "")}/mail/weekly-summary?token=${weeklySummaryToken(userId)}`;
}

export async function weeklySummaryWanted({ db }: { db: Database }, userId: string): Promise<boolean> {
  const [row] = await db.select({ on: mailPreferences.weeklySummary }).from(mailPreferences).where(eq(mailPreferences.userId, userId));
  return row?.on ?? true;
}

export async function setWeeklySummary({ db }: { db: Database }, userId: string, on: boolean): Promise<void> {
  await db
    .insert(mailPreferences)
    .values({ userId, weeklySummary: on })
    .onConflictDoUpdate({ target: mailPreferences.userId, set: { weeklySummary: on, updatedAt: sql`now()` } });
}
