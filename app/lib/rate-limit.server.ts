// Request limits for public endpoints, counted in PostgreSQL so they hold across app processes.
// A fixed one-minute window per bucket: one upsert per request.
import { lt, sql } from "drizzle-orm";
import { rethrowAsUnavailable, type Database } from "~/db/client.server";
import { rateLimits } from "~/db/schema.server";

export interface RateLimitDecision {
  allowed: boolean;
  limit: number;
  remaining: number;
  /** seconds until the window resets */
  retryAfter: number;
}

export async function hitRateLimit(
  { db }: { db: Database },
  bucket: string,
  limitPerMinute: number,
): Promise<RateLimitDecision> {
  const [row] = await db
    .insert(rateLimits)
    .values({ bucket: bucket.slice(0, 200), windowStart: sql`date_trunc('minute', now())`, hits: 1 })
    .onConflictDoUpdate({ target: [rateLimits.bucket, rateLimits.windowStart], set: { hits: sql`${rateLimits.hits} + 1` } })
    .returning({ hits: rateLimits.hits, retryAfter: sql<number>`60 - extract(second from now())::int` })
    .catch(rethrowAsUnavailable);
  // Old windows are cleared now and then, not on every request.
  if (Math.random() < 0.01) await db.delete(rateLimits).where(lt(rateLimits.windowStart, sql`now() - interval '1 hour'`));
  return {
    allowed: row.hits <= limitPerMinute,
    limit: limitPerMinute,
    remaining: Math.max(0, limitPerMinute - row.hits),
    retryAfter: Math.max(1, Number(row.retryAfter)),
  };
}
