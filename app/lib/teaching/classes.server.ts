// A teacher's classes: made, renamed, archived and restored, each with a sign-in code its students
// type (renewable). Every look-up is scoped to the teacher in the WHERE clause, so another teacher's
// class, or another school's, is simply not found.
import { randomInt } from "node:crypto";
import { and, asc, eq, inArray, isNotNull, isNull, ne, sql } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { preparedOnce } from "~/db/prepared.server";
import { classes, organisations } from "~/db/schema.server";
import { isSchoolYear } from "~/lib/school-year";
import { tidyClassName } from "./shared";
import { isTimeZone } from "./time";

type Db = { db: Database };

/**
 * Class codes are read aloud in a classroom and typed by 11-year-olds: eight characters from an
 * alphabet without look-alikes or sound-alikes (no 0/O, 1/I/L, 2/Z, 5/S, 8/B), shown as two groups
 * of four. 25^8 ≈ 1.5 × 10^11 codes: far too many to guess, and a student also needs a username and
 * a password. Sign-in ignores case and separators (compactSignInCode).
 */
export const CLASS_CODE_ALPHABET = "ACDEFGHJKMNPQRTUVWXY34679";
export const CLASS_CODE_LENGTH = 8;

/**
 * A sign-in code as typed, made comparable: capitals, and only letters and digits, so the spaces,
 * hyphens, dots and other separators people type between the groups do not matter
 * ("nnxw-uchq", "NNXW UCHQ" and "nnxw.uchq" are all "NNXWUCHQ"). Class codes are stored this way;
 * household codes ("HOME-4KTX9M") are compared compacted too (auth-config.server.ts).
 */
export function compactSignInCode(typed: string): string {
  return typed.toUpperCase().replace(/[^A-Z0-9]/g, "");
}

export function newClassCode(): string {
  let code = "";
  for (let i = 0; i < CLASS_CODE_LENGTH; i++) code += CLASS_CODE_ALPHABET[randomInt(CLASS_CODE_ALPHABET.length)];
  return code;
}

/** "KTXQ9MWE" → "KTXQ 9MWE" for reading aloud; older short codes stay as they are. */
export function spacedCode(code: string): string {
  return code.length === CLASS_CODE_LENGTH ? `${code.slice(0, 4)} ${code.slice(4)}` : code;
}

export interface TeacherClass {
  id: string;
  name: string;
  schoolYear: string;
  signInCode: string;
  timeZone: string;
  organisationId: string;
  schoolName: string;
  archivedAt: Date | null;
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

/** One class of this teacher in one of their schools, or null. */
// Every teacher page asks for its class first: built once, prepared.
const teacherClassStatement = preparedOnce((db) =>
  db
    .select(classColumns)
    .from(classes)
    .innerJoin(organisations, eq(organisations.id, classes.organisationId))
    .where(
      and(
        eq(classes.id, sql.placeholder("classId")),
        eq(classes.teacherId, sql.placeholder("teacherId")),
        sql`${classes.organisationId} = any(${sql.placeholder("schoolIds")}::uuid[])`,
      ),
    )
    .prepare("teacher_class"),
);

export async function findTeacherClass({ db }: Db, teacher: { id: string; schoolIds: string[] }, classId: string): Promise<TeacherClass | null> {
  if (teacher.schoolIds.length === 0) return null;
  const [row] = await teacherClassStatement(db).execute({ classId, teacherId: teacher.id, schoolIds: teacher.schoolIds });
  return row ?? null;
}

/** Every class of this teacher (active first, by school and name). */
export async function listTeacherClasses({ db }: Db, teacher: { id: string; schoolIds: string[] }, which: "active" | "archived"): Promise<TeacherClass[]> {
  if (teacher.schoolIds.length === 0) return [];
  return db
    .select(classColumns)
    .from(classes)
    .innerJoin(organisations, eq(organisations.id, classes.organisationId))
    .where(
      and(
        eq(classes.teacherId, teacher.id),
        inArray(classes.organisationId, teacher.schoolIds),
        which === "active" ? isNull(classes.archivedAt) : isNotNull(classes.archivedAt),
      ),
    )
    .orderBy(asc(organisations.name), asc(classes.schoolYear), asc(classes.name));
}

export type ClassChange = { ok: true; id: string } | { ok: false; field: "name" | "schoolYear" | "timeZone" | "form"; message: string };

function isUniqueViolation(error: unknown, constraint: string): boolean {
  const e = error as { code?: string; constraint_name?: string; cause?: { code?: string; constraint_name?: string } };
  const code = e?.code ?? e?.cause?.code;
  const name = e?.constraint_name ?? e?.cause?.constraint_name ?? "";
  return code === "23505" && name.includes(constraint);
}

/** The class already called so (`archived`: a class put away, which no list of current classes shows). */
const nameTaken = (taken: { name: string; archived: boolean } | string, year: string) => {
  const { name, archived } = typeof taken === "string" ? { name: taken, archived: false } : taken;
  return archived
    ? `An archived class of your school in ${year} is called “${name}”, and capitals and spaces do not tell classes apart. Choose another name, such as one with the period or the room in it.`
    : `Your school already has a class called “${name}” in ${year}, and capitals and spaces do not tell classes apart. Choose another name, such as one with the period or the room in it.`;
};

export { tidyClassName };

type Tx = Parameters<Parameters<Database["transaction"]>[0]>[0];

/**
 * The class of this school and year called the same but for capitals and spaces (other than
 * `exceptId`), or null. It first locks the school's row, as the seat rules do, so two teachers naming
 * classes at the same moment take turns and cannot both pass the check.
 */
async function sameNamedClass(tx: Tx, organisationId: string, schoolYear: string, name: string, exceptId?: string): Promise<{ name: string; archived: boolean } | null> {
  await tx.select({ id: organisations.id }).from(organisations).where(eq(organisations.id, organisationId)).for("update");
  const [row] = await tx
    .select({ name: classes.name, archivedAt: classes.archivedAt })
    .from(classes)
    .where(
      and(
        eq(classes.organisationId, organisationId),
        eq(classes.schoolYear, schoolYear),
        sql`lower(regexp_replace(btrim(${classes.name}), '[[:space:]]+', ' ', 'g')) = lower(${name})`,
        exceptId ? ne(classes.id, exceptId) : undefined,
      ),
    )
    .limit(1);
  return row ? { name: row.name, archived: row.archivedAt !== null } : null;
}

export async function createClass(
  { db }: Db,
  input: { organisationId: string; teacherId: string; name: string; schoolYear: string; timeZone: string },
): Promise<ClassChange> {
  const name = tidyClassName(input.name);
  if (!isSchoolYear(input.schoolYear)) return { ok: false, field: "schoolYear", message: "Choose a school year such as 2026-27." };
  const timeZone = isTimeZone(input.timeZone) ? input.timeZone : "UTC";
  // A fresh code collides about never; try a few times before giving up with a message.
  for (let attempt = 0; attempt < 5; attempt++) {
    try {
      return await db.transaction(async (tx): Promise<ClassChange> => {
        const taken = await sameNamedClass(tx, input.organisationId, input.schoolYear, name);
        if (taken) return { ok: false, field: "name", message: nameTaken(taken, input.schoolYear) };
        const [row] = await tx
          .insert(classes)
          .values({ organisationId: input.organisationId, teacherId: input.teacherId, name, schoolYear: input.schoolYear, timeZone, signInCode: newClassCode() })
          .returning({ id: classes.id });
        return { ok: true, id: row.id };
      });
    } catch (error) {
      if (isUniqueViolation(error, "classes_org_year_name")) return { ok: false, field: "name", message: nameTaken(name, input.schoolYear) };
      if (!isUniqueViolation(error, "sign_in_code")) throw error;
    }
  }
  return { ok: false, field: "form", message: "No free class code was found just now. Please try again." };
}

export async function renameClass({ db }: Db, klass: TeacherClass, newName: string): Promise<ClassChange> {
  const name = tidyClassName(newName);
  try {
    return await db.transaction(async (tx): Promise<ClassChange> => {
      const taken = await sameNamedClass(tx, klass.organisationId, klass.schoolYear, name, klass.id);
      if (taken) return { ok: false, field: "name", message: nameTaken(taken, klass.schoolYear) };
      await tx.update(classes).set({ name }).where(eq(classes.id, klass.id));
      return { ok: true, id: klass.id };
    });
  } catch (error) {
    if (isUniqueViolation(error, "classes_org_year_name")) return { ok: false, field: "name", message: nameTaken(name, klass.schoolYear) };
    throw error;
  }
}

export async function setClassTimeZone({ db }: Db, klass: TeacherClass, timeZone: string): Promise<ClassChange> {
  if (!isTimeZone(timeZone)) return { ok: false, field: "timeZone", message: "Choose a time zone from the list." };
  await db.update(classes).set({ timeZone }).where(eq(classes.id, klass.id));
  return { ok: true, id: klass.id };
}

/** A new code; the old one stops working at once (students already signed in stay signed in). */
export async function renewClassCode({ db }: Db, klass: TeacherClass): Promise<string> {
  for (let attempt = 0; attempt < 5; attempt++) {
    const code = newClassCode();
    try {
      await db.update(classes).set({ signInCode: code }).where(eq(classes.id, klass.id));
      return code;
    } catch (error) {
      if (!isUniqueViolation(error, "sign_in_code")) throw error;
    }
  }
  throw new Error("no free class code after five tries");
}

/** Archived classes keep their students and work, but drop off the lists and their code stops working. */
export async function setArchived({ db }: Db, klass: TeacherClass, archived: boolean) {
  await db.update(classes).set({ archivedAt: archived ? new Date() : null }).where(eq(classes.id, klass.id));
}

/** What the class header shows. */
export function classHeading(klass: TeacherClass) {
  return {
    id: klass.id,
    name: klass.name,
    schoolYear: klass.schoolYear,
    schoolName: klass.schoolName,
    code: spacedCode(klass.signInCode),
    archived: klass.archivedAt !== null,
  };
}
