// Who may see a student's work: the student, a teacher of one of their classes, an administrator of
// their school, or the parent of their household. One query; the WHERE clause does the checking.
import { and, eq, exists, or, sql } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { classes, enrollments, memberships, users } from "~/db/schema.server";

export async function canSeeStudentWork({ db }: { db: Database }, viewerId: string, studentId: string): Promise<boolean> {
  if (viewerId === studentId) return true;
  const [row] = await db
    .select({ ok: sql<number>`1` })
    .from(users)
    .where(
      and(
        eq(users.id, studentId),
        or(
          // a teacher of one of the student's classes
          exists(
            db
              .select({ one: sql`1` })
              .from(enrollments)
              .innerJoin(classes, eq(classes.id, enrollments.classId))
              .where(and(eq(enrollments.studentId, studentId), eq(classes.teacherId, viewerId))),
          ),
          // an administrator of the student's school, or the parent of the student's household
          exists(
            db
              .select({ one: sql`1` })
              .from(memberships)
              .where(
                and(
                  eq(memberships.userId, viewerId),
                  eq(memberships.organisationId, users.homeOrganisationId),
                  or(eq(memberships.role, "school_admin"), eq(memberships.role, "parent")),
                ),
              ),
          ),
        ),
      ),
    );
  return Boolean(row);
}
