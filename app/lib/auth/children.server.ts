// A child's password is set by a grown-up who answers for them: the teacher of one of the child's
// classes, or a parent in the child's household. Pages for this come in later issues; they call this.
import { and, eq, sql } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { classes, enrollments, memberships, organisations, signInFailures, users } from "~/db/schema.server";
import { hashPassword } from "~/lib/passwords.server";
import { checkNewPassword } from "./password-rules.server";
import { bucketsFor } from "./throttle.server";

export type ResetChildPasswordResult =
  | { ok: true }
  | { ok: false; status: 403 | 404; message: string }
  | { ok: false; status: 400; message: string; field: "password" };

/** May this adult set this child's password? True for a teacher of one of the child's classes or a parent of the child's household. */
export async function mayManageChild({ db }: { db: Database }, actorUserId: string, childId: string): Promise<boolean> {
  const [asTeacher] = await db
    .select({ one: sql<number>`1` })
    .from(enrollments)
    .innerJoin(classes, eq(classes.id, enrollments.classId))
    .where(and(eq(enrollments.studentId, childId), eq(classes.teacherId, actorUserId)))
    .limit(1);
  if (asTeacher) return true;
  const [asParent] = await db
    .select({ one: sql<number>`1` })
    .from(users)
    .innerJoin(organisations, and(eq(organisations.id, users.homeOrganisationId), eq(organisations.kind, "household")))
    .innerJoin(
      memberships,
      and(eq(memberships.organisationId, organisations.id), eq(memberships.userId, actorUserId), eq(memberships.role, "parent")),
    )
    .where(eq(users.id, childId))
    .limit(1);
  return Boolean(asParent);
}

/**
 * Sets a child's new password. The child's other sessions end (their session version goes up) and
 * any sign-in wait on the child's account is lifted, since a grown-up has just vouched for them.
 */
export async function resetChildPassword(
  { db }: { db: Database },
  actorUserId: string,
  childId: string,
  newPassword: string,
): Promise<ResetChildPasswordResult> {
  const [child] = await db
    .select({ id: users.id, username: users.username, homeOrganisationId: users.homeOrganisationId })
    .from(users)
    .where(eq(users.id, childId));
  if (!child || !child.homeOrganisationId) return { ok: false, status: 404, message: "There is no such student." };
  if (!(await mayManageChild({ db }, actorUserId, childId))) {
    return {
      ok: false,
      status: 403,
      message: "Only a teacher of one of this student's classes, or a parent in their family, can set their password.",
    };
  }
  const problem = checkNewPassword(newPassword, { username: child.username });
  if (problem) return { ok: false, status: 400, message: problem, field: "password" };
  await db
    .update(users)
    .set({ passwordHash: await hashPassword(newPassword), sessionVersion: sql`${users.sessionVersion} + 1` })
    .where(eq(users.id, childId));
  await db.delete(signInFailures).where(eq(signInFailures.bucket, bucketsFor(childId, "").account));
  return { ok: true };
}
