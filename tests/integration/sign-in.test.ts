// Signing in through /sign-in (both doors), the session cookie, where people land, the throttle on
// wrong passwords, sign-out and "sign out everywhere", session lengths, and Auth's own CSRF token.
import { Auth, raw, skipCSRFCheck } from "@auth/core";
import { eq, sql } from "drizzle-orm";
import { afterEach, describe, expect, it, vi } from "vitest";
import { db } from "~/db/client.server";
import { signInFailures, users } from "~/db/schema.server";
import { getUser } from "~/lib/auth.server";
import { buildAuthConfig, SESSION_HOURS } from "~/lib/auth/auth-config.server";
import { THROTTLE_POLICY } from "~/lib/auth/throttle.server";
import * as authRoute from "~/routes/auth.$";
import * as signIn from "~/routes/sign-in";
import * as signOut from "~/routes/sign-out";
import { demoSignIns } from "../../drizzle/scripts/seed";
import { cookieHeaderFrom, get, post, runRoute, sessionCookieFor, userIdOf } from "./auth-helpers";

type SignInData = { door: string; values: Record<string, string>; fieldErrors: Record<string, string>; problem?: string; waitUntil?: string };

const s = demoSignIns;
const adult = (email: string, password: string, extra: Record<string, string> = {}, headers: Record<string, string> = {}) =>
  runRoute(signIn.action as never, post("/sign-in", { door: "adult", email, password, redirectTo: "", ...extra }, { headers }));
const student = (code: string, username: string, password: string) =>
  runRoute(signIn.action as never, post("/sign-in", { door: "student", code, username, password }));
const userFor = async (setCookies: string[]) => getUser(get("/", { cookie: cookieHeaderFrom(setCookies) }));

afterEach(() => {
  vi.useRealTimers();
});

describe("the two doors of /sign-in", () => {
  it.each([
    ["schoolAdmin", "/school"],
    ["teacher", "/teach"],
    ["parent", "/family"],
    ["otherSchoolAdmin", "/school"],
  ] as const)("an adult (%s) signs in with e-mail and password and lands on %s", async (who, home) => {
    const { email, password } = s[who];
    const result = await adult(email.toUpperCase(), password); // e-mail addresses are not case-sensitive
    expect(result.status).toBe(302);
    expect(result.location).toBe(home);
    const user = await userFor(result.setCookies);
    expect(user?.email).toBe(email);
  });

  it.each([
    ["student", "/learn"],
    ["child", "/learn"],
  ] as const)("a %s signs in with a code, a username and a password, and lands on /learn", async (who, home) => {
    const { code, username, password } = s[who];
    const result = await student(` ${code.toLowerCase()} `, username.toUpperCase(), password);
    expect(result.status).toBe(302);
    expect(result.location).toBe(home);
    const user = await userFor(result.setCookies);
    expect(user?.email).toBeNull();
    expect(user?.memberships.map((m) => m.role)).toEqual(["student"]);
  });

  it.each([
    ["student", ["map-le7a", "MAPLE 7A", "maple.7a", " Map-Le 7A "]],
    ["child", ["lindq-home", "LINDQ HOME", "lindqhome", "Lindq.Home"]],
  ] as const)("a %s's code works with the hyphens, spaces and dots people type between its parts", async (who, typings) => {
    const { username, password } = s[who];
    for (const code of typings) {
      const result = await student(code, username, password);
      expect(result.status, code).toBe(302);
      expect(result.location, code).toBe("/learn");
    }
  });

  it("refuses a student with the code of a class they are not in", async () => {
    const result = await student("MAPLE8E", s.student.username, s.student.password);
    expect(result.status).toBe(400);
    expect((result.body as SignInData).problem).toMatch(/do not match a student/);
  });

  it("refuses a student of one school using another school's class code", async () => {
    const result = await student("HARBOR8", s.student.username, s.student.password);
    expect(result.status).toBe(400);
  });

  it("sets an httpOnly, SameSite=Lax session cookie that ends after 12 hours for adults", async () => {
    const result = await adult(s.teacher.email, s.teacher.password);
    const session = result.setCookies.find((c) => c.startsWith("authjs.session-token="));
    expect(session).toBeDefined();
    expect(session).toMatch(/HttpOnly/);
    expect(session).toMatch(/SameSite=Lax/);
    expect(session).not.toMatch(/Secure/); // the test app runs on http://127.0.0.1
    const expires = Date.parse(/Expires=([^;]+)/.exec(session!)![1]);
    expect(expires - Date.now()).toBeGreaterThan((SESSION_HOURS.adult * 3600 - 60) * 1000);
    expect(expires - Date.now()).toBeLessThanOrEqual(SESSION_HOURS.adult * 3600 * 1000);
  });

  it("lets a student's session cookie go after 8 hours", async () => {
    const result = await student(s.student.code, s.student.username, s.student.password);
    const session = result.setCookies.find((c) => c.startsWith("authjs.session-token="))!;
    const expires = Date.parse(/Expires=([^;]+)/.exec(session)![1]);
    expect(expires - Date.now()).toBeGreaterThan((SESSION_HOURS.student * 3600 - 60) * 1000);
    expect(expires - Date.now()).toBeLessThanOrEqual(SESSION_HOURS.student * 3600 * 1000);
  });

  it("marks the cookie Secure, with the __Secure- prefix, when Bendwise is served over https", async () => {
    const config = buildAuthConfig({ AUTH_SECRET: "a".repeat(40), APP_URL: "https://bendwise.example" });
    const response = await Auth(
      new Request("https://bendwise.example/auth/callback/adult-password", {
        method: "POST",
        body: new URLSearchParams({ email: s.parent.email, password: s.parent.password }),
      }),
      { ...config, raw, skipCSRFCheck },
    );
    const session = response.cookies?.find((c) => c.name.includes("session-token"));
    expect(session?.name).toBe("__Secure-authjs.session-token");
    expect(session?.options).toMatchObject({ secure: true, httpOnly: true, sameSite: "lax" });
  });

  it("keeps what was typed and says what is wrong when a field is missing or malformed", async () => {
    const result = await adult("not-an-address", "");
    expect(result.status).toBe(400);
    const body = result.body as SignInData;
    expect(body.values.email).toBe("not-an-address");
    expect(body.fieldErrors.email).toMatch(/e-mail address/);
    expect(body.fieldErrors.password).toMatch(/Enter your password/);
    expect(body.values).not.toHaveProperty("password"); // a password is never sent back to the page

    const kid = await student("", "amira.k", "x");
    expect((kid.body as SignInData).values.username).toBe("amira.k");
    expect((kid.body as SignInData).fieldErrors.code).toMatch(/code your teacher or parent gave you/);

    // A code was typed, just not one: say what is wrong with it and what a code looks like.
    for (const [typed, start] of [
      ["KTXQ9MWE".repeat(940), "That is far longer than a code."],
      ["-".repeat(7500), "That is far longer than a code."],
      ["?!", "That does not look like a code."],
    ]) {
      const odd = await student(typed, "amira.k", "x");
      expect(odd.status).toBe(400);
      expect((odd.body as SignInData).fieldErrors.code).toBe(`${start} A code is short: a few letters and digits, like KTXQ 9MWE for a class or HOME-AB12CD for a family.`);
    }
  });

  it("sends people back to the page that asked them to sign in, but only on this site", async () => {
    const back = await adult(s.teacher.email, s.teacher.password, { redirectTo: "/teach/classes/x?tab=1" });
    expect(back.location).toBe("/teach/classes/x?tab=1");
    const away = await adult(s.teacher.email, s.teacher.password, { redirectTo: "//evil.example/teach" });
    expect(away.location).toBe("/teach");
    const page = await runRoute(signIn.loader as never, get("/sign-in?redirectTo=https://evil.example"));
    expect((page.body as { redirectTo: string }).redirectTo).toBe("");
  });

  it("refuses a post from another site before looking at the password", async () => {
    const result = await runRoute(
      signIn.action as never,
      post("/sign-in", { door: "adult", email: s.teacher.email, password: s.teacher.password }, { origin: "https://evil.example", fetchSite: "cross-site" }),
    );
    expect(result.status).toBe(403);
    expect(result.setCookies).toEqual([]);
  });
});

describe("Auth's own endpoints under /auth", () => {
  it("sign in with its double-submit CSRF token, and refuse a post without it", async () => {
    expect(await sessionCookieFor("teacher")).toMatch(/authjs\.session-token=/);
    const forged = await runRoute(
      authRoute.action as never,
      post("/auth/callback/adult-password", { email: s.teacher.email, password: s.teacher.password }),
    );
    expect(forged.status).toBe(302);
    expect(forged.location).toMatch(/error=MissingCSRF/);
    expect(forged.setCookies.some((c) => c.includes("session-token="))).toBe(false);
  });

  it("send people to our own pages instead of showing Auth's built-in ones", async () => {
    const visit = async (path: string) => (await runRoute(authRoute.loader as never, get(path))).location ?? "";
    expect(await visit("/auth/signin")).toMatch(/^\/sign-in(\?|$)/);
    expect(await visit("/auth/signout")).toBe("/sign-out");
    expect(await visit("/auth/error?error=Configuration")).toMatch(/^\/sign-in\?error=Configuration/);
  });

  it("answer the session with the user id and version only", async () => {
    const cookie = await sessionCookieFor("student");
    const session = await runRoute(authRoute.loader as never, get("/auth/session", { cookie }));
    expect(session.status).toBe(200);
    expect(Object.keys(session.body as object).sort()).toEqual(["expires", "sessionVersion", "userId"]);
  });
});

describe("throttling wrong passwords", () => {
  const teacherBucket = async () => `account:${await userIdOf("teacher")}`;

  it("slows down twenty wrong passwords in a row with a message saying when; after the wait the right password works", async () => {
    const statuses: number[] = [];
    let last: SignInData | undefined;
    let firstSlowed: SignInData | undefined;
    for (let i = 1; i <= 20; i++) {
      const result = await adult(s.teacher.email, `wrong guess ${i}`);
      statuses.push(result.status);
      last = result.body as SignInData;
      if (result.status === 429) {
        firstSlowed ??= last;
        expect(result.headers.get("retry-after")).toMatch(/^\d+$/);
      }
    }
    // Five free slips, then every try is slowed.
    expect(statuses.slice(0, THROTTLE_POLICY.account.free)).toEqual(Array(5).fill(400));
    expect(statuses.slice(THROTTLE_POLICY.account.free)).toEqual(Array(15).fill(429));
    expect(firstSlowed?.problem).toBe("Too many wrong tries for this account. Try again in 2 seconds.");
    expect(last?.problem).toMatch(/^Too many wrong tries for this account\. Try again in \d+ seconds?\.$/);
    expect(Date.parse(last!.waitUntil!)).toBeGreaterThan(Date.now());
    expect(last?.values.email).toBe(s.teacher.email);

    // Even the right password waits while the wait runs (a guesser learns nothing).
    const during = await adult(s.teacher.email, s.teacher.password);
    expect(during.status).toBe(429);

    // The wait passes (simulated in the database, not slept through): the right password works
    // and the account's count is cleared.
    const bucket = await teacherBucket();
    await db.update(signInFailures).set({ blockedUntil: sql`now() - interval '1 second'` }).where(eq(signInFailures.bucket, bucket));
    const after = await adult(s.teacher.email, s.teacher.password);
    expect(after.status).toBe(302);
    expect(after.location).toBe("/teach");
    expect(await db.select().from(signInFailures).where(eq(signInFailures.bucket, bucket))).toEqual([]);
  });

  it("doubles the wait with each further failure, up to 15 minutes and never more", async () => {
    const { email } = s.secondTeacher;
    const bucket = `account:${await userIdOf("secondTeacher")}`;
    const waits: number[] = [];
    for (let failure = 1; failure <= 17; failure++) {
      await adult(email, "not the password");
      const [row] = await db
        .select({ seconds: sql<number>`round(extract(epoch from (${signInFailures.blockedUntil} - now())))::int` })
        .from(signInFailures)
        .where(eq(signInFailures.bucket, bucket));
      waits.push(row.seconds ?? 0);
      // Let the wait pass so the next try is counted.
      await db.update(signInFailures).set({ blockedUntil: sql`now() - interval '1 second'` }).where(eq(signInFailures.bucket, bucket));
    }
    console.log("waits after failures 1–17 (s):", waits.join(", "));
    expect(waits).toEqual([0, 0, 0, 0, 0, 2, 4, 8, 16, 32, 64, 128, 256, 512, 900, 900, 900]);
    const right = await adult(email, s.secondTeacher.password);
    expect(right.status).toBe(302);
  });

  it("says the wait in minutes when it is long", async () => {
    const bucket = await teacherBucket();
    await db
      .insert(signInFailures)
      .values({ bucket, failures: 9, blockedUntil: sql`now() + interval '95 seconds'` })
      .onConflictDoUpdate({ target: signInFailures.bucket, set: { failures: 9, blockedUntil: sql`now() + interval '95 seconds'` } });
    const result = await adult(s.teacher.email, s.teacher.password);
    expect((result.body as SignInData).problem).toBe("Too many wrong tries for this account. Try again in 2 minutes.");
    await db.delete(signInFailures).where(eq(signInFailures.bucket, bucket));
  });

  it("counts unknown accounts the same way, so the throttle does not tell who has an account", async () => {
    const statuses: number[] = [];
    for (let i = 0; i < 7; i++) statuses.push((await adult("nobody@nowhere.example", "guess")).status);
    expect(statuses).toEqual([400, 400, 400, 400, 400, 429, 429]);
  });

  it("forgets old failures after a quiet day", async () => {
    const bucket = `account:${await userIdOf("parent")}`;
    await db.insert(signInFailures).values({ bucket, failures: 12, lastFailureAt: sql`now() - interval '25 hours'` });
    const result = await adult(s.parent.email, "a slip");
    expect(result.status).toBe(400);
    const [row] = await db.select().from(signInFailures).where(eq(signInFailures.bucket, bucket));
    expect(row.failures).toBe(1);
    expect(row.blockedUntil).toBeNull();
  });

  it("slows down one network address that tries many accounts, and only that address", async () => {
    const guesser = { "x-forwarded-for": "198.51.100.7" };
    await db.insert(signInFailures).values({ bucket: "address:198.51.100.7", failures: THROTTLE_POLICY.address.free });
    const result = await adult("someone@maplebrook.example", "guess", {}, guesser);
    expect(result.status).toBe(429);
    expect((result.body as SignInData).problem).toBe("Too many wrong tries from your network. Try again in 2 seconds.");
    // The right password of another account from that address waits too…
    expect((await adult(s.schoolAdmin.email, s.schoolAdmin.password, {}, guesser)).status).toBe(429);
    // …but not from anywhere else.
    expect((await adult(s.schoolAdmin.email, s.schoolAdmin.password, {}, { "x-forwarded-for": "203.0.113.20" })).status).toBe(302);
  });
});

describe("signing out", () => {
  it("ends the session in this browser", async () => {
    const cookie = await sessionCookieFor("teacher");
    const result = await runRoute(signOut.action as never, post("/sign-out", { intent: "here" }, { cookie }));
    expect(result.status).toBe(302);
    expect(result.location).toBe("/sign-out?done=here");
    const after = cookieHeaderFrom(result.setCookies, cookie);
    expect(after).not.toContain("session-token");
    expect(await getUser(get("/teach", { cookie: after }))).toBeNull();
  });

  it("everywhere: every other browser's session stops working, and signing in again works", async () => {
    const laptop = await sessionCookieFor("parent");
    const phone = await sessionCookieFor("parent");
    expect(await getUser(get("/family", { cookie: phone }))).not.toBeNull();

    const result = await runRoute(signOut.action as never, post("/sign-out", { intent: "everywhere" }, { cookie: laptop }));
    expect(result.location).toBe("/sign-out?done=everywhere");
    // The phone still holds its cookie, but the session version it carries is behind.
    expect(await getUser(get("/family", { cookie: phone }))).toBeNull();
    expect(await getUser(get("/family", { cookie: laptop }))).toBeNull();

    const again = await adult(s.parent.email, s.parent.password);
    expect(await userFor(again.setCookies)).not.toBeNull();
  });

  it("a password change elsewhere ends the session too", async () => {
    const cookie = await sessionCookieFor("otherSchoolAdmin");
    await db.update(users).set({ sessionVersion: sql`${users.sessionVersion} + 1` }).where(eq(users.email, s.otherSchoolAdmin.email));
    expect(await getUser(get("/school", { cookie }))).toBeNull();
  });
});

describe("session lengths", () => {
  const hours = (h: number) => h * 3600_000;

  it(`a student's session ends after ${SESSION_HOURS.student} hours`, async () => {
    const cookie = await sessionCookieFor("child");
    vi.useFakeTimers({ toFake: ["Date"] });
    vi.setSystemTime(Date.now() + hours(SESSION_HOURS.student) - 60_000);
    expect(await getUser(get("/learn", { cookie }))).not.toBeNull();
    vi.setSystemTime(Date.now() + 120_000);
    expect(await getUser(get("/learn", { cookie }))).toBeNull();
  });

  it(`an adult's session ends after ${SESSION_HOURS.adult} hours`, async () => {
    const cookie = await sessionCookieFor("secondTeacher");
    vi.useFakeTimers({ toFake: ["Date"] });
    vi.setSystemTime(Date.now() + hours(SESSION_HOURS.adult) - 60_000);
    expect(await getUser(get("/teach", { cookie }))).not.toBeNull();
    vi.setSystemTime(Date.now() + 120_000);
    expect(await getUser(get("/teach", { cookie }))).toBeNull();
  });
});
