// The school administrator's view of teaching: every class and teacher of their school(s) with a
// progress summary, in a fixed number of queries (two here, six in the gradebooks), whatever the size.
// Scoped in the WHERE clause to the administrator's own schools.
import { and, asc, eq, inArray, isNull } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { classes, memberships, organisations, users } from "~/db/schema.server";
import { loadGradebooks, type ClassSummary } from "./gradebook.server";

type Db = { db: Database };

export interface SchoolClass {
  id: string;
  name: string;
  schoolYear: string;
  teacherId: string;
  teacherName: string;
  summary: ClassSummary;
}

export interface SchoolTeaching {
  id: string;
  name: string;
  classes: SchoolClass[];
  teachers: { id: string; name: string; classes: number; students: number; completePercent: number | null; stuck: number }[];
}

export async function schoolTeaching({ db }: Db, schoolIds: string[], now: Date = new Date()): Promise<SchoolTeaching[]> {
  if (schoolIds.length === 0) return [];
  const [classRows, teacherRows] = await Promise.all([
    db
      .select({
        id: classes.id,
        organisationId: classes.organisationId,
        schoolName: organisations.name,
        name: classes.name,
        schoolYear: classes.schoolYear,
        teacherId: classes.teacherId,
        teacherName: users.displayName,
      })
      .from(classes)
      .innerJoin(organisations, eq(organisations.id, classes.organisationId))
      .innerJoin(users, eq(users.id, classes.teacherId))
      .where(and(inArray(classes.organisationId, schoolIds), isNull(classes.archivedAt)))
      .orderBy(asc(classes.schoolYear), asc(users.displayName), asc(classes.name)),
    db
      .select({ organisationId: memberships.organisationId, schoolName: organisations.name, id: users.id, name: users.displayName })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .innerJoin(organisations, eq(organisations.id, memberships.organisationId))
      .where(and(inArray(memberships.organisationId, schoolIds), eq(memberships.role, "teacher")))
      .orderBy(asc(users.displayName)),
  ]);
  const books = await loadGradebooks({ db }, classRows.map((c) => c.id), now);
  return schoolIds.map((schoolId) => {
    const mine = classRows
      .filter((c) => c.organisationId === schoolId)
      .map((c) => ({ id: c.id, name: c.name, schoolYear: c.schoolYear, teacherId: c.teacherId, teacherName: c.teacherName, summary: books.get(c.id)!.summary }));
    const name = classRows.find((c) => c.organisationId === schoolId)?.schoolName ?? teacherRows.find((t) => t.organisationId === schoolId)?.schoolName ?? "";
    const teachers = teacherRows
      .filter((t) => t.organisationId === schoolId)
      .map((t) => {
        const theirs = mine.filter((c) => c.teacherId === t.id);
        const cells = theirs.reduce((sum, c) => sum + c.summary.students * c.summary.lessons, 0);
        const complete = theirs.reduce((sum, c) => sum + ((c.summary.completePercent ?? 0) / 100) * c.summary.students * c.summary.lessons, 0);
        return {
          id: t.id,
          name: t.name,
          classes: theirs.length,
          students: theirs.reduce((sum, c) => sum + c.summary.students, 0),
          completePercent: cells > 0 ? Math.round((100 * complete) / cells) : null,
          stuck: theirs.reduce((sum, c) => sum + c.summary.stuck, 0),
        };
      });
    return { id: schoolId, name, classes: mine, teachers };
  });
}
