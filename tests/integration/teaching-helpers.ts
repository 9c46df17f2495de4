// Helpers for the teaching tests: demo ids, sign-in of a made-up teacher (through Auth's own endpoints,
// as auth-helpers does for the demo people), multipart posts, and recorded attempts. Invented data only.
import { randomBytes } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { classes, enrollments, exerciseAttempts, memberships, organisations, users } from "~/db/schema.server";
import { hashPassword } from "~/lib/passwords.server";
import * as authRoute from "~/routes/auth.$";
import { appUrl, cookieHeaderFrom, get, post, runRoute } from "./auth-helpers";

export async function demoIds() {
  const [maplebrook] = await db.select().from(organisations).where(eq(organisations.slug, "maplebrook"));
  const [harborside] = await db.select().from(organisations).where(eq(organisations.slug, "harborside"));
  const classByCode = async (code: string) => (await db.select().from(classes).where(eq(classes.signInCode, code)))[0];
  const userByEmail = async (email: string) => (await db.select().from(users).where(eq(users.email, email)))[0];
  const student = async (username: string) =>
    (await db.select().from(users).where(and(eq(users.homeOrganisationId, maplebrook.id), eq(users.username, username))))[0];
  return {
    maplebrook,
    harborside,
    mapleA: await classByCode("MAPLE7A"),
    mapleB: await classByCode("MAPLE7B"),
    mapleE: await classByCode("MAPLE8E"),
    harbor: await classByCode("HARBOR8"),
    oduya: await userByEmail("r.oduya@maplebrook.example"),
    fenwick: await userByEmail("l.fenwick@maplebrook.example"),
    amira: await student("amira.k"),
    ben: await student("ben.t"),
  };
}

/** A made-up teacher with a password, at one school. */
export async function createTeacher(organisationId: string, name = `Teacher ${randomBytes(3).toString("hex")}`) {
  const password = `invented-pass-${randomBytes(4).toString("hex")}`;
  const [user] = await db
    .insert(users)
    .values({ email: `${name.toLowerCase().replace(/[^a-z0-9]+/g, ".")}.${randomBytes(3).toString("hex")}@test.example`, displayName: name, passwordHash: await hashPassword(password), emailVerifiedAt: new Date() })
    .returning();
  await db.insert(memberships).values({ userId: user.id, organisationId, role: "teacher" });
  return { user, password };
}

/** Signs an adult in through Auth's /auth endpoints and returns the Cookie header. */
export async function signInAdult(email: string, password: string): Promise<string> {
  const csrf = await runRoute(authRoute.loader as never, get("/auth/csrf"));
  const csrfCookie = cookieHeaderFrom(csrf.setCookies);
  const { csrfToken } = csrf.body as { csrfToken: string };
  const signedIn = await runRoute(authRoute.action as never, post("/auth/callback/adult-password", { csrfToken, email, password }, { cookie: csrfCookie }));
  const cookie = cookieHeaderFrom(signedIn.setCookies, csrfCookie);
  if (!cookie.includes("authjs.session-token")) throw new Error(`${email} could not sign in`);
  return cookie;
}

/** A multipart form post from one of our own pages (a file upload). */
export function postMultipart(path: string, form: FormData, cookie: string): Request {
  return new Request(`${appUrl}${path}`, {
    method: "POST",
    headers: { origin: appUrl, "sec-fetch-site": "same-origin", cookie },
    body: form,
  });
}

/** Students made straight in the database (no seats), enrolled in a class: for size and query-count tests. */
export async function enrollInventedStudents(organisationId: string, classId: string, count: number) {
  const tag = randomBytes(3).toString("hex");
  const rows = await db
    .insert(users)
    .values(Array.from({ length: count }, (_, i) => ({ homeOrganisationId: organisationId, username: `inv${i}.${tag}`, displayName: `Invented ${String(i).padStart(2, "0")} ${tag}`, gradeBand: "6-8" as const })))
    .returning();
  await db.insert(memberships).values(rows.map((r) => ({ userId: r.id, organisationId, role: "student" as const })));
  await db.insert(enrollments).values(rows.map((r) => ({ classId, studentId: r.id })));
  return rows;
}

export async function recordTry(
  studentId: string,
  slug: string,
  exerciseId: string,
  options: { right?: boolean; outcome?: string; slipCode?: string | null; raw?: string; at?: Date } = {},
) {
  const right = options.right ?? false;
  await db.insert(exerciseAttempts).values({
    studentId,
    lessonSlug: slug,
    exerciseId,
    rawAnswer: options.raw ?? (right ? "right answer" : "wrong answer"),
    outcome: options.outcome ?? (right ? "correct" : "incorrect"),
    correct: right ? 1 : 0,
    slipCode: options.slipCode ?? null,
    createdAt: options.at ?? new Date(),
  });
}
