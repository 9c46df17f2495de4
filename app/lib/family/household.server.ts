// A household as the teaching model sees it. The parent is the teacher of the household: lessons
// assigned with due dates, the gradebook, the item-level view and the review of written answers all
// come from app/lib/teaching/, which works on classes. So each household has one class of its own
// (the "family lessons" class) that every child of the household is in, with the parent as its
// teacher and the household's code as its code. That class is the whole adapter: nothing in
// app/lib/teaching/ knows about households.
//
// Seats stay with the household, per school year (createChildUsingSeat takes one when a child is
// made); the family class itself takes no seat, which is why its enrollments are written here and
// not through enrollStudentUsingSeat (that one takes a school's seat for the class's school year).
import { and, asc, eq, inArray, sql } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { classes, enrollments, memberships, organisations, users } from "~/db/schema.server";
import type { SessionUser } from "~/lib/auth.server";
import { schoolYearOf } from "~/lib/school-year";
import { newClassCode, type TeacherClass } from "~/lib/teaching/classes.server";
import { isTimeZone } from "~/lib/teaching/time";

type Db = { db: Database };

export const FAMILY_CLASS_NAME = "Family lessons";

export interface Household {
  id: string;
  name: string;
  signInCode: string | null;
}

/** The households where this user is a parent (usually one). */
export async function householdsOf({ db }: Db, user: SessionUser): Promise<Household[]> {
  const ids = user.memberships.filter((m) => m.role === "parent" && m.organisationKind === "household").map((m) => m.organisationId);
  if (ids.length === 0) return [];
  return db
    .select({ id: organisations.id, name: organisations.name, signInCode: organisations.signInCode })
    .from(organisations)
    .where(and(inArray(organisations.id, ids), eq(organisations.kind, "household")))
    .orderBy(asc(organisations.name));
}

const classColumns = {
  id: classes.id,
  name: classes.name,
  schoolYear: classes.schoolYear,
  signInCode: classes.signInCode,
  timeZone: classes.timeZone,
  organisationId: classes.organisationId,
  schoolName: organisations.name,
  archivedAt: classes.archivedAt,
};

/** The household's class if it has one yet (read only, for loaders). */
export async function findHouseholdClass({ db }: Db, householdId: string): Promise<TeacherClass | null> {
  const [klass] = await db
    .select(classColumns)
    .from(classes)
    .innerJoin(organisations, eq(organisations.id, classes.organisationId))
    .where(eq(classes.organisationId, householdId))
    .orderBy(asc(classes.createdAt))
    .limit(1);
  return klass ?? null;
}

/**
 * The household's class (made on first use, by the parent asking), with every child of the household
 * in it. Children made before the class existed, or added in another tab, are put in each time.
 */
export async function householdClass({ db }: Db, household: Household, parentId: string, timeZone?: string): Promise<TeacherClass> {
  const find = () => findHouseholdClass({ db }, household.id);
  let klass = await find();
  if (!klass) {
    await db
      .insert(classes)
      .values({
        organisationId: household.id,
        teacherId: parentId,
        name: FAMILY_CLASS_NAME,
        schoolYear: schoolYearOf(),
        // The children already know the household's code; the class answers to the same one.
        signInCode: household.signInCode ?? newClassCode(),
        timeZone: timeZone && isTimeZone(timeZone) ? timeZone : "UTC",
      })
      .onConflictDoNothing();
    klass = await find();
    if (!klass) throw new Error(`could not make the family class of household ${household.id}`);
  }
  await db.execute(sql`
    insert into ${enrollments} (class_id, student_id)
    select ${klass.id}, ${users.id} from ${users}
      join ${memberships} on ${memberships.userId} = ${users.id} and ${memberships.organisationId} = ${household.id} and ${memberships.role} = 'student'
    where ${users.homeOrganisationId} = ${household.id}
    on conflict do nothing`);
  return klass;
}

export interface Child {
  id: string;
  householdId: string;
  displayName: string;
  username: string | null;
  gradeBand: "6-8" | "9-10" | null;
}

/** The children of these households, by name. */
export async function childrenOf({ db }: Db, householdIds: string[]): Promise<Child[]> {
  if (householdIds.length === 0) return [];
  const rows = await db
    .select({ id: users.id, householdId: memberships.organisationId, displayName: users.displayName, username: users.username, gradeBand: users.gradeBand })
    .from(users)
    .innerJoin(memberships, and(eq(memberships.userId, users.id), eq(memberships.organisationId, users.homeOrganisationId), eq(memberships.role, "student")))
    .where(inArray(users.homeOrganisationId, householdIds))
    .orderBy(asc(users.displayName), asc(users.username));
  return rows;
}

/** One child of one of this parent's households, or null (another family's child is simply not found). */
export async function findChild({ db }: Db, user: SessionUser, childId: string): Promise<Child | null> {
  const households = user.memberships.filter((m) => m.role === "parent" && m.organisationKind === "household").map((m) => m.organisationId);
  if (households.length === 0 || !/^[0-9a-f-]{36}$/i.test(childId)) return null;
  const [row] = (await childrenOf({ db }, households)).filter((c) => c.id === childId);
  return row ?? null;
}

/** Puts one new child into the household's class, when the household has one already. */
export async function joinFamilyClass({ db }: Db, householdId: string, childId: string): Promise<void> {
  const [klass] = await db.select({ id: classes.id }).from(classes).where(eq(classes.organisationId, householdId)).orderBy(asc(classes.createdAt)).limit(1);
  if (klass) await db.insert(enrollments).values({ classId: klass.id, studentId: childId }).onConflictDoNothing();
}
