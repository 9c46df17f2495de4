// Auth.js (@auth/core) set up for Bendwise: three Credentials providers, JWT sessions in an httpOnly,
// SameSite=Lax cookie (Secure and "__Secure-" prefixed when APP_URL is https), and small helpers that
// let our own pages talk to Auth without going through the browser.
//
// Decisions
// - Sessions are JWTs holding only the user id, the user's session version and an absolute end time.
//   getUser() checks the version against users.session_version on every request, so "sign out
//   everywhere" and a password change end every older session at once.
// - Session length: students 8 hours (one school day; a child who forgets to sign out of a shared
//   laptop is signed out by the next morning), adults 12 hours (a teacher's day including evening
//   marking, one sign-in a day). The end is absolute: reading the session never extends it.
// - E-mailed sign-in links do not use an Auth.js adapter. Our own page /sign-in/link checks nothing
//   on GET (mail scanners open links), and on POST hands the token to the "email-link" Credentials
//   provider, whose authorize() uses the token up (hashed, one use, 15 minutes). That keeps one kind
//   of session (JWT) and one token table without Auth's adapter schema.
// - Our pages post to their own actions, which call Auth with `raw` and `skipCSRFCheck` after
//   assertSameOrigin(); Auth's own /auth/* endpoints keep Auth's double-submit CSRF token.
import { Auth, raw, setEnvDefaults, skipCSRFCheck, type AuthConfig } from "@auth/core";
import { CredentialsSignin } from "@auth/core/errors";
import Credentials from "@auth/core/providers/credentials";
import { and, eq, isNull, sql } from "drizzle-orm";
import { z } from "zod";
import { db } from "~/db/client.server";
import { classes, enrollments, memberships, organisations, users } from "~/db/schema.server";
import { serverEnv, type ServerEnv } from "~/env.server";
import { hashPassword, verifyPassword } from "~/lib/passwords.server";
import { consumeEmailToken } from "./email-tokens.server";
import { bucketsFor, clearAccountFailures, clientAddress, currentWait, recordFailure, type Wait } from "./throttle.server";
import { compactSignInCode } from "~/lib/teaching/classes.server";

declare module "@auth/core/types" {
  interface User {
    sessionVersion?: number;
    kind?: "adult" | "student";
  }
  interface Session {
    userId?: string;
    sessionVersion?: number;
  }
}
declare module "@auth/core/jwt" {
  interface JWT {
    /** users.session_version when the session began. */
    sv?: number;
    /** When the session ends, in ms since 1970; never moved later. */
    until?: number;
  }
}

export const SESSION_HOURS = { student: 8, adult: 12 } as const;

// --- Why a sign-in was refused. Codes end up in Auth's redirect URL for its own endpoints, so they say little.

export class WrongSignInDetails extends CredentialsSignin {
  code = "wrong-details";
}
export class SignInPaused extends CredentialsSignin {
  code = "paused";
  constructor(readonly wait: Wait) {
    super();
  }
}
export class LinkNotValid extends CredentialsSignin {
  code = "link-not-valid";
}

// --- What each door accepts.

export const adultCredentials = z.object({
  email: z
    .string()
    .trim()
    .toLowerCase()
    .pipe(z.email({ error: "Enter the e-mail address you use for Bendwise, like name@school.org." }).max(254)),
  password: z.string().min(1, "Enter your password.").max(1024, "That password is too long."),
});

export const studentCredentials = z.object({
  code: z
    .string()
    .transform(compactSignInCode)
    .pipe(z.string().min(3, "Enter the code your teacher or parent gave you.").max(40, "That code is too long.")),
  username: z
    .string()
    .trim()
    .toLowerCase()
    .pipe(z.string().min(1, "Enter your username.").max(60, "That username is too long.")),
  password: z.string().min(1, "Enter your password.").max(1024, "That password is too long."),
});

type Candidate = { id: string; displayName: string; email: string | null; passwordHash: string | null; sessionVersion: number };
const candidateColumns = {
  id: users.id,
  displayName: users.displayName,
  email: users.email,
  passwordHash: users.passwordHash,
  sessionVersion: users.sessionVersion,
};

async function findAdult(email: string): Promise<Candidate | null> {
  const [row] = await db
    .select(candidateColumns)
    .from(users)
    .where(and(eq(users.email, email), isNull(users.homeOrganisationId)));
  return row ?? null;
}

/** A student by the code of one of their classes, or of their household, and their username. */
async function findStudent(code: string, username: string): Promise<Candidate | null> {
  const [viaClass] = await db
    .select(candidateColumns)
    .from(classes)
    .innerJoin(enrollments, eq(enrollments.classId, classes.id))
    .innerJoin(users, eq(users.id, enrollments.studentId))
    .where(and(eq(classes.signInCode, code), isNull(classes.archivedAt), eq(users.username, username), eq(users.homeOrganisationId, classes.organisationId)));
  if (viaClass) return viaClass;
  const [viaHousehold] = await db
    .select(candidateColumns)
    .from(organisations)
    .innerJoin(users, eq(users.homeOrganisationId, organisations.id))
    .innerJoin(memberships, and(eq(memberships.userId, users.id), eq(memberships.organisationId, organisations.id), eq(memberships.role, "student")))
    // Household codes are stored with their hyphen ("HOME-4KTX9M"); the code typed arrives compacted.
    .where(and(sql`regexp_replace(upper(${organisations.signInCode}), '[^A-Z0-9]', '', 'g') = ${code}`, eq(organisations.kind, "household"), eq(users.username, username)));
  return viaHousehold ?? null;
}

// Unknown accounts still cost one Argon2 check, so the time taken does not tell who has an account.
let dummyHash: Promise<string> | undefined;
const spendOneCheck = (password: string) => {
  dummyHash ??= hashPassword("no account has this password, it only burns the same time");
  return dummyHash.then((h) => verifyPassword(h, password));
};

/** The password check shared by both doors, with the throttle around it. */
async function checkPassword(
  request: Request,
  candidate: Candidate | null,
  typed: string,
  password: string,
  kind: "adult" | "student",
) {
  const buckets = bucketsFor(candidate ? candidate.id : `unknown:${kind}:${typed}`, clientAddress(request));
  const running = await currentWait(buckets);
  // While a wait runs the password is not even checked: a guesser learns nothing from trying.
  if (running) throw new SignInPaused(running);
  const ok = candidate?.passwordHash ? await verifyPassword(candidate.passwordHash, password) : (await spendOneCheck(password), false);
  if (!ok || !candidate) {
    const started = await recordFailure(buckets);
    if (started) throw new SignInPaused(started);
    throw new WrongSignInDetails();
  }
  await clearAccountFailures(buckets);
  return { id: candidate.id, name: candidate.displayName, email: candidate.email, sessionVersion: candidate.sessionVersion, kind };
}

const providers = [
  Credentials({
    id: "adult-password",
    name: "E-mail and password",
    credentials: { email: { type: "email" }, password: { type: "password" } },
    async authorize(input, request) {
      const parsed = adultCredentials.safeParse(input);
      if (!parsed.success) throw new WrongSignInDetails();
      const { email, password } = parsed.data;
      return checkPassword(request, await findAdult(email), email, password, "adult");
    },
  }),
  Credentials({
    id: "student-password",
    name: "Code, username and password",
    credentials: { code: {}, username: {}, password: { type: "password" } },
    async authorize(input, request) {
      const parsed = studentCredentials.safeParse(input);
      if (!parsed.success) throw new WrongSignInDetails();
      const { code, username, password } = parsed.data;
      return checkPassword(request, await findStudent(code, username), `${code}/${username}`, password, "student");
    },
  }),
  Credentials({
    id: "email-link",
    name: "Sign-in link",
    credentials: { token: {} },
    async authorize(input) {
      const token = typeof input.token === "string" ? input.token : "";
      const userId = await consumeEmailToken({ db }, token, "sign-in");
      if (!userId) throw new LinkNotValid();
      // Opening the link proves the mailbox is theirs.
      const [user] = await db
        .update(users)
        .set({ emailVerifiedAt: new Date() })
        .where(and(eq(users.id, userId), isNull(users.homeOrganisationId)))
        .returning(candidateColumns);
      if (!user) throw new LinkNotValid();
      return { id: user.id, name: user.displayName, email: user.email, sessionVersion: user.sessionVersion, kind: "adult" as const };
    },
  }),
];

export function buildAuthConfig(env: Pick<ServerEnv, "AUTH_SECRET" | "APP_URL">): AuthConfig {
  const config: AuthConfig = {
    basePath: "/auth",
    secret: env.AUTH_SECRET,
    // We check the origin of our own posts ourselves; Auth builds its URLs from the request's host.
    trustHost: true,
    useSecureCookies: new URL(env.APP_URL).protocol === "https:",
    session: { strategy: "jwt", maxAge: SESSION_HOURS.adult * 3600 },
    providers,
    pages: { signIn: "/sign-in", signOut: "/sign-out", error: "/sign-in", verifyRequest: "/sign-in/link" },
    callbacks: {
      jwt({ token, user, trigger }) {
        if (trigger === "signIn" && user?.id) {
          const hours = user.kind === "student" ? SESSION_HOURS.student : SESSION_HOURS.adult;
          return { sub: user.id, sv: user.sessionVersion ?? 1, until: Date.now() + hours * 3600_000 };
        }
        if (typeof token.until !== "number" || Date.now() >= token.until) return null;
        return token;
      },
      session({ session, token }) {
        return { expires: new Date(token.until ?? 0).toISOString(), userId: token.sub, sessionVersion: token.sv };
      },
    },
    logger: {
      // A refused sign-in is an everyday event, not a server error; everything else is logged.
      error(error) {
        if (error instanceof CredentialsSignin) return;
        console.error(`[auth] ${error.name}: ${error.message}`);
      },
      warn(code) {
        console.warn(`[auth] warning: ${code}`);
      },
    },
  };
  setEnvDefaults(process.env, config, true);
  return config;
}

let cached: AuthConfig | undefined;
export function authConfig(): AuthConfig {
  cached ??= buildAuthConfig(serverEnv());
  return cached;
}

// --- Cookies, as Auth hands them back in raw mode.

type RawCookie = { name: string; value: string; options?: { path?: string; expires?: Date; maxAge?: number; httpOnly?: boolean; secure?: boolean; sameSite?: string | boolean } };

export function serializeCookie({ name, value, options = {} }: RawCookie): string {
  const parts = [`${name}=${encodeURIComponent(value)}`, `Path=${options.path ?? "/"}`];
  if (options.expires) parts.push(`Expires=${options.expires.toUTCString()}`);
  if (options.maxAge !== undefined) parts.push(`Max-Age=${Math.floor(options.maxAge)}`);
  if (options.httpOnly) parts.push("HttpOnly");
  if (options.secure) parts.push("Secure");
  if (typeof options.sameSite === "string") parts.push(`SameSite=${options.sameSite[0].toUpperCase()}${options.sameSite.slice(1)}`);
  return parts.join("; ");
}

/** The request our pages send to Auth: same cookies and client address as the visitor's request. */
function authRequest(request: Request, path: string, init: { method: "GET" | "POST"; cookie?: string; body?: URLSearchParams }) {
  const headers = new Headers();
  const cookie = init.cookie ?? request.headers.get("cookie");
  if (cookie) headers.set("cookie", cookie);
  for (const name of ["x-forwarded-for", "user-agent"]) {
    const value = request.headers.get(name);
    if (value) headers.set(name, value);
  }
  if (init.body) headers.set("content-type", "application/x-www-form-urlencoded");
  return new Request(new URL(path, request.url), { method: init.method, headers, body: init.body });
}

export type AuthSignInResult =
  | { ok: true; setCookies: string[]; cookieHeader: string }
  | { ok: false; refusal: WrongSignInDetails | SignInPaused | LinkNotValid };

/**
 * Signs in through one of the providers from our own action. Call assertSameOrigin(request) first:
 * Auth's CSRF check is skipped here because our action already checked the origin.
 */
export async function signInThroughAuth(
  request: Request,
  provider: "adult-password" | "student-password" | "email-link",
  credentials: Record<string, string>,
): Promise<AuthSignInResult> {
  try {
    const response = await Auth(
      authRequest(request, `/auth/callback/${provider}`, { method: "POST", body: new URLSearchParams(credentials) }),
      { ...authConfig(), raw, skipCSRFCheck },
    );
    const cookies = (response.cookies ?? []) as RawCookie[];
    const session = cookies.filter((c) => c.name.includes("authjs.session-token") && c.value);
    // Auth gives every session cookie the adults' lifetime; a student's cookie goes when their session ends.
    if (provider === "student-password") {
      const ends = new Date(Date.now() + SESSION_HOURS.student * 3600_000);
      for (const cookie of session) cookie.options = { ...cookie.options, expires: ends };
    }
    if (session.length === 0) throw new Error("Auth answered a sign-in without a session cookie");
    return {
      ok: true,
      setCookies: cookies.map(serializeCookie),
      cookieHeader: session.map((c) => `${c.name}=${encodeURIComponent(c.value)}`).join("; "),
    };
  } catch (error) {
    if (error instanceof WrongSignInDetails || error instanceof SignInPaused || error instanceof LinkNotValid) {
      return { ok: false, refusal: error };
    }
    if (error instanceof CredentialsSignin) return { ok: false, refusal: new WrongSignInDetails() };
    throw error;
  }
}

/** Set-Cookie headers that end the session in this browser. */
export async function signOutCookies(request: Request): Promise<string[]> {
  const response = await Auth(authRequest(request, "/auth/signout", { method: "POST", body: new URLSearchParams() }), {
    ...authConfig(),
    raw,
    skipCSRFCheck,
  });
  return ((response.cookies ?? []) as RawCookie[]).map(serializeCookie);
}

const sessionShape = z.object({ userId: z.string().uuid(), sessionVersion: z.number().int() });

type SessionClaims = z.infer<typeof sessionShape>;

/**
 * Sessions already read, by the exact session cookie: opening the cookie (Auth's session endpoint:
 * key derivation, decryption, and a fresh cookie it builds and we drop) costs milliseconds on every
 * request, and its answer depends only on the cookie and the clock. So the answer is kept until the
 * session's own end. The session version is still checked against the database on every request
 * (getUser), so "sign out everywhere" holds at once. Bounded: the oldest entries go first.
 */
const readSessions = new Map<string, { claims: SessionClaims; until: number }>();
const READ_SESSIONS_KEPT = 10_000;

function sessionCookieKey(cookie: string): string {
  return cookie
    .split(/;\s*/)
    .filter((pair) => pair.split("=", 1)[0].includes("authjs.session-token"))
    .sort()
    .join("; ");
}

/** The session's user id and version from the cookie, through Auth's own session endpoint; null when none. */
export async function readSession(request: Request, cookieHeader?: string): Promise<SessionClaims | null> {
  const cookie = cookieHeader ?? request.headers.get("cookie") ?? "";
  if (!cookie.includes("authjs.session-token")) return null;
  const key = sessionCookieKey(cookie);
  const known = readSessions.get(key);
  if (known && Date.now() < known.until) return known.claims;
  if (known) readSessions.delete(key);
  const response = await Auth(authRequest(request, "/auth/session", { method: "GET", cookie }), authConfig());
  if (!response.ok) return null;
  const body = await response.json().catch(() => null);
  const parsed = sessionShape.safeParse(body);
  if (!parsed.success) return null;
  const until = Date.parse((body as { expires?: string }).expires ?? "");
  if (Number.isFinite(until) && key) {
    if (readSessions.size >= READ_SESSIONS_KEPT) readSessions.delete(readSessions.keys().next().value!);
    readSessions.set(key, { claims: parsed.data, until });
  }
  return parsed.data;
}

/** The /auth/* resource route: Auth's own endpoints (csrf, session, providers, callback, signout). */
export async function handleAuthRoute(request: Request): Promise<Response> {
  const response = await Auth(request, authConfig());
  // Auth's redirects carry immutable headers; hand React Router a copy it may add to.
  return new Response(response.body, { status: response.status, statusText: response.statusText, headers: new Headers(response.headers) });
}
