// Who is asking, and may they? Loaders and actions call these at the top, every time: a check that
// lives only in a parent layout is the usual hole. A refusal is a 403 with a sentence saying why,
// shown by the root error page; a signed-out visitor is sent to sign in and brought back.
import { eq, sql } from "drizzle-orm";
import { redirect } from "react-router";
import { db, rethrowAsUnavailable } from "~/db/client.server";
import { users, type Role } from "~/db/schema.server";
import { readSession } from "./auth-config.server";

export type { Role };

export interface Membership {
  organisationId: string;
  organisationKind: "school" | "household";
  organisationName: string;
  role: Role;
}

export interface SessionUser {
  id: string;
  displayName: string;
  email: string | null;
  memberships: Membership[];
}

/** The order in which homes are chosen and listed: the broadest job first. */
export const ROLE_ORDER: readonly Role[] = ["school_admin", "teacher", "parent", "student"];

export const HOMES: Record<Role, { path: string; label: string; people: string }> = {
  school_admin: { path: "/school", label: "School", people: "school administrators" },
  teacher: { path: "/teach", label: "Teaching", people: "teachers" },
  parent: { path: "/family", label: "Family", people: "parents" },
  student: { path: "/learn", label: "My lessons", people: "students" },
};

export const ROLE_NAMES: Record<Role, string> = {
  school_admin: "school administrator",
  teacher: "teacher",
  parent: "parent",
  student: "student",
};

// One look-up per request, however many loaders ask.
const perRequest = new WeakMap<Request, Promise<SessionUser | null>>();

/** The signed-in user, or null. A session whose version is behind users.session_version is not a session. */
export function getUser(request: Request): Promise<SessionUser | null> {
  let pending = perRequest.get(request);
  if (!pending) {
    pending = loadUser(request);
    perRequest.set(request, pending);
  }
  return pending;
}

// One statement: the user and their memberships (as JSON, by organisation name). Built once and
// prepared: it runs on every signed-in request.
const userWithMemberships = db
  .select({
    id: users.id,
    displayName: users.displayName,
    email: users.email,
    sessionVersion: users.sessionVersion,
    // Plain SQL names: inside a select list drizzle writes columns without their table.
    memberships: sql<Membership[]>`coalesce((
      select json_agg(json_build_object('organisationId', m.organisation_id, 'organisationKind', o.kind,
        'organisationName', o.name, 'role', m.role) order by o.name)
      from memberships m join organisations o on o.id = m.organisation_id
      where m.user_id = users.id), '[]'::json)`,
  })
  .from(users)
  .where(eq(users.id, sql.placeholder("userId")))
  .prepare("user_with_memberships");

/** Looks up the user of a session cookie (used right after sign-in, before the browser has the cookie). */
export async function loadUser(request: Request, cookieHeader?: string): Promise<SessionUser | null> {
  const session = await readSession(request, cookieHeader);
  if (!session) return null;
  // The first statement of nearly every request: if PostgreSQL cannot be reached, the request ends
  // here as a 503 with Retry-After (see client.server.ts), whatever page or route asked.
  const [user] = await userWithMemberships.execute({ userId: session.userId }).catch(rethrowAsUnavailable);
  if (!user || user.sessionVersion !== session.sessionVersion) return null;
  const rows = [...user.memberships];
  rows.sort((a, b) => ROLE_ORDER.indexOf(a.role) - ROLE_ORDER.indexOf(b.role));
  return { id: user.id, displayName: user.displayName, email: user.email, memberships: rows };
}

/** /sign-in with a way back to the page that asked. */
export function signInPath(request: Request): string {
  const url = new URL(request.url);
  const back = `${url.pathname}${url.search}`;
  return back === "/" ? "/sign-in" : `/sign-in?${new URLSearchParams({ redirectTo: back })}`;
}

/** The signed-in user; a signed-out visitor is redirected to sign in and comes back here afterwards. */
export async function requireUser(request: Request): Promise<SessionUser> {
  const user = await getUser(request);
  if (!user) throw redirect(signInPath(request));
  return user;
}

/** A 403 whose text the root error page shows as it is. */
export function forbiddenResponse(message: string): Response {
  return new Response(message, { status: 403, headers: { "Content-Type": "text/plain; charset=utf-8" } });
}

function forbidden(message: string): never {
  throw forbiddenResponse(message);
}

function describeUser(user: SessionUser): string {
  const first = user.memberships[0];
  if (!first) return `You are signed in as ${user.displayName}, with no school or family yet.`;
  return `You are signed in as ${user.displayName} (${ROLE_NAMES[first.role]}, ${first.organisationName}).`;
}

const listPeople = (roles: readonly Role[]) => {
  const names = roles.map((r) => HOMES[r].people);
  return names.length <= 1 ? names.join("") : `${names.slice(0, -1).join(", ")} and ${names.at(-1)}`;
};

/**
 * The signed-in user and their first membership holding one of `roles` (in ROLE_ORDER, so a person
 * who is both school administrator and teacher gets the administrator's membership first).
 * Signed-out → redirect to sign in; signed in without such a role anywhere → 403.
 */
export async function requireRole(
  request: Request,
  roles: readonly Role[],
): Promise<{ user: SessionUser; membership: Membership }> {
  const user = await requireUser(request);
  const membership = user.memberships.find((m) => roles.includes(m.role));
  if (!membership) forbidden(`This page is for ${listPeople(roles)}. ${describeUser(user)}`);
  return { user, membership };
}

/**
 * The user's membership in one organisation with one of `roles`, or a 403. Use it for every record
 * that belongs to an organisation (a class, a purchase, a child): a teacher at one school is nobody
 * at another. Better still, scope the query itself by the user so a stranger's row is simply not found (404).
 */
export function requireMembership(user: SessionUser, organisationId: string, roles: readonly Role[]): Membership {
  const membership = user.memberships.find((m) => m.organisationId === organisationId && roles.includes(m.role));
  if (!membership) {
    forbidden(`This belongs to a school or family where you are not one of its ${listPeople(roles)}. ${describeUser(user)}`);
  }
  return membership;
}

/** Every home this user has, in ROLE_ORDER, each once. */
export function homesFor(user: SessionUser): { path: string; label: string }[] {
  const roles = ROLE_ORDER.filter((r) => user.memberships.some((m) => m.role === r));
  return roles.map((r) => ({ path: HOMES[r].path, label: HOMES[r].label }));
}

/** Where a user lands after sign-in: the first of school_admin, teacher, parent, student they hold. */
export function homePathFor(user: SessionUser): string {
  return homesFor(user)[0]?.path ?? "/";
}
