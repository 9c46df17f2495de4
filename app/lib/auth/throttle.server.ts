// Slows down password guessing. Failed sign-ins are counted per account and per network address in
// PostgreSQL (one upsert per failure), so every app process sees the same counts. After a bucket's
// free failures each further failure makes it wait 2^(n − free) seconds, capped at 15 minutes: a
// guesser gets a handful of tries an hour, the owner is never locked out for good, and a success
// clears the account's count. Counts are forgotten after a quiet spell.
import { sql } from "drizzle-orm";
import { db } from "~/db/client.server";

export type BucketKind = "account" | "address";

export const THROTTLE_POLICY: Record<BucketKind, { free: number; capSeconds: number; forgetAfter: string }> = {
  // One person's account: five slips are normal, the sixth starts the waits (2 s, 4 s, 8 s … 15 min).
  account: { free: 5, capSeconds: 15 * 60, forgetAfter: "24 hours" },
  // A whole school often shares one address, so it gets far more room before anyone waits.
  address: { free: 200, capSeconds: 15 * 60, forgetAfter: "1 hour" },
};

export interface SignInBuckets {
  account: string;
  address: string;
}

export interface Wait {
  scope: BucketKind;
  seconds: number;
  until: Date;
}

/** The bucket names for one attempt. `accountKey` is the user id, or what was typed when no account matched. */
export function bucketsFor(accountKey: string, address: string): SignInBuckets {
  return { account: `account:${accountKey.slice(0, 300)}`, address: `address:${address.slice(0, 100)}` };
}

/**
 * The client's address. Bendwise listens on loopback only, so outside callers come through a reverse
 * proxy, which appends the address it saw to X-Forwarded-For: the last entry is the one we trust.
 * Without a proxy (the local demo) every request counts as "direct".
 */
export function clientAddress(request: Request): string {
  const forwarded = request.headers.get("x-forwarded-for");
  const last = forwarded?.split(",").map((s) => s.trim()).filter(Boolean).at(-1);
  return last || "direct";
}

type WaitRow = { bucket: string; wait_seconds: number; until_ms: number | null } & Record<string, unknown>;

function toWait(rows: WaitRow[], buckets: SignInBuckets): Wait | null {
  const longest = rows.filter((r) => r.wait_seconds > 0).sort((a, b) => b.wait_seconds - a.wait_seconds)[0];
  if (!longest) return null;
  return {
    scope: longest.bucket === buckets.account ? "account" : "address",
    seconds: longest.wait_seconds,
    until: new Date(Number(longest.until_ms)),
  };
}

/** The wait still running for either bucket, if any (the longer one). */
export async function currentWait(buckets: SignInBuckets): Promise<Wait | null> {
  const rows = await db.execute<WaitRow>(sql`
    select bucket, (extract(epoch from blocked_until) * 1000)::float8 as until_ms, ceil(extract(epoch from (blocked_until - now())))::int as wait_seconds
    from sign_in_failures
    where bucket in (${buckets.account}, ${buckets.address}) and blocked_until > now()`);
  return toWait([...rows], buckets);
}

function failureUpsert(bucket: string, kind: BucketKind) {
  const { free, capSeconds, forgetAfter } = THROTTLE_POLICY[kind];
  // The new count: restart at 1 after a quiet spell, else add one.
  const next = sql`(case when f.last_failure_at < now() - ${forgetAfter}::interval then 1 else f.failures + 1 end)`;
  const waitFor = (n: ReturnType<typeof sql>) =>
    sql`(case when ${n} > ${free}
          then now() + make_interval(secs => least(power(2, least(${n} - ${free}, 30)), ${capSeconds}))
          else null end)`;
  return sql`
    insert into sign_in_failures as f (bucket, failures, last_failure_at, blocked_until)
    values (${bucket}, 1, now(), ${waitFor(sql`1`)})
    on conflict (bucket) do update set
      failures = ${next},
      last_failure_at = now(),
      blocked_until = ${waitFor(next)}
    returning bucket, failures, (extract(epoch from blocked_until) * 1000)::float8 as until_ms, coalesce(ceil(extract(epoch from (blocked_until - now()))), 0)::int as wait_seconds`;
}

/** Counts one failure in both buckets; returns the wait it started, if it started one. */
export async function recordFailure(buckets: SignInBuckets): Promise<Wait | null> {
  const rows: WaitRow[] = [];
  for (const kind of ["account", "address"] as const) {
    rows.push(...(await db.execute<WaitRow>(failureUpsert(buckets[kind], kind))));
  }
  // Now and then, drop buckets nobody has touched for two days (typed-in names that never existed pile up).
  if (Math.random() < 0.01) {
    await db.execute(sql`delete from sign_in_failures where last_failure_at < now() - interval '2 days'`);
  }
  return toWait(rows, buckets);
}

/** A good sign-in forgets the account's failures (not the address's: one success must not unlock a guesser). */
export async function clearAccountFailures(buckets: SignInBuckets): Promise<void> {
  await db.execute(sql`delete from sign_in_failures where bucket = ${buckets.account}`);
}

/** "2 minutes", "45 seconds", "1 minute": rounded up, so the person never comes back too early. */
export function describeWait(seconds: number): string {
  if (seconds < 60) return seconds === 1 ? "1 second" : `${seconds} seconds`;
  const minutes = Math.ceil(seconds / 60);
  return minutes === 1 ? "1 minute" : `${minutes} minutes`;
}

/** The sentence shown while a wait runs, e.g. "Too many wrong tries for this account. Try again in 2 minutes." */
export function waitMessage(wait: Wait): string {
  const who = wait.scope === "account" ? "for this account" : "from your network";
  return `Too many wrong tries ${who}. Try again in ${describeWait(wait.seconds)}.`;
}
