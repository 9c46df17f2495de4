// What a teacher's assignment means for one student in one lesson: when it is due (with their own
// extra days), how late work counts, and how many extra tries they have. The student's lesson page,
// the answer check and /learn read it in one query, whatever the number of classes; nothing on the
// student's page says that an accommodation exists, it simply applies.
import { and, eq, inArray, isNull, sql, type Placeholder, type SQL } from "drizzle-orm";
import { alias, type AnyPgColumn } from "drizzle-orm/pg-core";
import type { Database } from "~/db/client.server";
import { accommodations, assignments, classes, enrollments, type LatePolicy } from "~/db/schema.server";
import { DAY_MS, formatDue } from "./time";

export interface LessonPolicy {
  assignmentId: string;
  classId: string;
  className: string;
  lessonSlug: string;
  opensAt: Date;
  /** the class's due date */
  classDueAt: Date;
  /** the due date for this student: the class's plus their extra days */
  dueAt: Date;
  latePolicy: LatePolicy;
  latePenaltyPercent: number;
  extraAttempts: number;
  timeZone: string;
}

type Queryable = Pick<Database, "select">;

/** A value or the placeholder of a prepared statement. */
type Param = string | Placeholder;

/** One row behind the policies, as the JSON of policyRowsJson has it (dates as ISO text). */
interface PolicyRow {
  assignmentId: string;
  classId: string;
  className: string;
  lessonSlug: string;
  opensAt: string;
  dueAt: string;
  latePolicy: LatePolicy;
  latePenaltyPercent: number;
  timeZone: string;
  generalAttempts: number | null;
  generalDays: number | null;
  specificAttempts: number | null;
  specificDays: number | null;
}

/**
 * The rows behind the policies as one JSON array: the student's assignments (in classes not archived)
 * with their accommodations. A sub-select, so that the lesson page and the answer check carry it as
 * one more column of the statement that reads the student's rows (one round trip, not two).
 */
export function policyRowsJson(db: Queryable, studentId: Param, where: (lessonSlug: typeof assignments.lessonSlug) => SQL | undefined): SQL {
  const general = alias(accommodations, "general_accommodation");
  const specific = alias(accommodations, "specific_accommodation");
  // Each column named, so that the JSON object of a row has one key per field (two tables have an "id").
  const field = (column: AnyPgColumn, name: keyof PolicyRow) => sql`${column}`.as(name);
  const rows = db
    .select({
      assignmentId: field(assignments.id, "assignmentId"),
      classId: field(classes.id, "classId"),
      className: field(classes.name, "className"),
      lessonSlug: field(assignments.lessonSlug, "lessonSlug"),
      opensAt: field(assignments.opensAt, "opensAt"),
      dueAt: field(assignments.dueAt, "dueAt"),
      latePolicy: field(assignments.latePolicy, "latePolicy"),
      latePenaltyPercent: field(assignments.latePenaltyPercent, "latePenaltyPercent"),
      timeZone: field(classes.timeZone, "timeZone"),
      generalAttempts: field(general.extraAttempts, "generalAttempts"),
      generalDays: field(general.extraDays, "generalDays"),
      specificAttempts: field(specific.extraAttempts, "specificAttempts"),
      specificDays: field(specific.extraDays, "specificDays"),
    })
    .from(enrollments)
    .innerJoin(classes, and(eq(classes.id, enrollments.classId), isNull(classes.archivedAt)))
    .innerJoin(assignments, eq(assignments.classId, classes.id))
    .leftJoin(
      general,
      and(eq(general.classId, classes.id), eq(general.studentId, enrollments.studentId), isNull(general.assignmentId)),
    )
    .leftJoin(
      specific,
      and(eq(specific.classId, classes.id), eq(specific.studentId, enrollments.studentId), eq(specific.assignmentId, assignments.id)),
    )
    .where(and(eq(enrollments.studentId, studentId), where(assignments.lessonSlug)));
  return sql`coalesce((select json_agg(policy_row) from ${rows} as policy_row), '[]'::json)`;
}

/**
 * The policies, by lesson, from the rows of policyRowsJson. When two of the student's classes assign
 * the same lesson, the more generous one holds (the later due date, the more tries).
 */
export function policiesOf(rows: unknown): Map<string, LessonPolicy> {
  const policies = new Map<string, LessonPolicy>();
  for (const row of rows as PolicyRow[]) {
    const policy = toPolicy(row);
    const held = policies.get(row.lessonSlug);
    if (!held) {
      policies.set(row.lessonSlug, policy);
      continue;
    }
    const later = policy.dueAt > held.dueAt ? policy : held;
    policies.set(row.lessonSlug, { ...later, extraAttempts: Math.max(policy.extraAttempts, held.extraAttempts) });
  }
  return policies;
}

/** The policy of every assigned lesson for a student (or only `slugs`), one query. */
export async function lessonPolicies({ db }: { db: Queryable }, studentId: string, slugs?: string[]): Promise<Map<string, LessonPolicy>> {
  if (slugs && slugs.length === 0) return new Map();
  const [row] = await db
    .select({ rows: policyRowsJson(db, studentId, (lessonSlug) => (slugs ? inArray(lessonSlug, slugs) : undefined)) })
    .from(sql`(select 1) as one`);
  return policiesOf(row.rows);
}

/** An accommodation for one assignment replaces the class-wide one for that lesson. */
export function effectiveAccommodation(
  general: { extraAttempts: number; extraDays: number } | null | undefined,
  specific: { extraAttempts: number; extraDays: number } | null | undefined,
): { extraAttempts: number; extraDays: number } {
  const chosen = specific ?? general;
  return { extraAttempts: chosen?.extraAttempts ?? 0, extraDays: chosen?.extraDays ?? 0 };
}

function toPolicy(row: PolicyRow): LessonPolicy {
  const extra = effectiveAccommodation(
    row.generalAttempts === null ? null : { extraAttempts: row.generalAttempts, extraDays: row.generalDays ?? 0 },
    row.specificAttempts === null ? null : { extraAttempts: row.specificAttempts, extraDays: row.specificDays ?? 0 },
  );
  return {
    assignmentId: row.assignmentId,
    classId: row.classId,
    className: row.className,
    lessonSlug: row.lessonSlug,
    opensAt: new Date(row.opensAt),
    classDueAt: new Date(row.dueAt),
    dueAt: new Date(Date.parse(row.dueAt) + extra.extraDays * DAY_MS),
    latePolicy: row.latePolicy,
    latePenaltyPercent: row.latePenaltyPercent,
    extraAttempts: extra.extraAttempts,
    timeZone: row.timeZone,
  };
}

/** True once a lesson that is closed at its due date is past this student's due date. */
export function closedForAnswers(policy: Pick<LessonPolicy, "latePolicy" | "dueAt"> | null | undefined, now: Date = new Date()): boolean {
  return Boolean(policy && policy.latePolicy === "closed" && now.getTime() > policy.dueAt.getTime());
}

/** The sentence a student gets when answers are refused after the due date. */
export function closedMessage(policy: LessonPolicy, reader: "teacher" | "parent" = "teacher"): string {
  return `This lesson closed at its due date (${formatDue(policy.dueAt, policy.timeZone)}), so answers are no longer taken. Ask your ${reader} if you need more time.`;
}
