// Lessons assigned to a class (opening, due date, late policy) and the quiet per-student
// accommodations (more tries, more days). The student's side reads them through policy.server.ts.
import { and, asc, eq, isNull } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { accommodations, assignments, type LatePolicy } from "~/db/schema.server";
import { findLesson, listLessons } from "~/lib/lessons.server";
import type { TeacherClass } from "./classes.server";
import { lessonPolicies } from "./policy.server";
import { MAX_PENALTY_PERCENT } from "./shared";
import { DAY_MS, formatDue } from "./time";

export { LATE_POLICY_WORDS } from "./shared";

type Db = { db: Database };

export { MAX_EXTRA_ATTEMPTS, MAX_EXTRA_DAYS, MAX_PENALTY_PERCENT } from "./shared";

export interface ClassAssignment {
  id: string;
  lessonSlug: string;
  opensAt: Date;
  dueAt: Date;
  latePolicy: LatePolicy;
  latePenaltyPercent: number;
}

export async function classAssignments({ db }: Db, classId: string): Promise<ClassAssignment[]> {
  return db
    .select({
      id: assignments.id,
      lessonSlug: assignments.lessonSlug,
      opensAt: assignments.opensAt,
      dueAt: assignments.dueAt,
      latePolicy: assignments.latePolicy,
      latePenaltyPercent: assignments.latePenaltyPercent,
    })
    .from(assignments)
    .where(eq(assignments.classId, classId))
    .orderBy(asc(assignments.dueAt), asc(assignments.lessonSlug));
}

export type AssignInput = { slug: string; opensAt: Date; dueAt: Date; latePolicy: LatePolicy; latePenaltyPercent: number };

/**
 * What the teacher (or parent) reads once a lesson is assigned: its due date, and a caution when that
 * date has already passed, since the students then meet the lesson late or closed from the start.
 * The assignment is saved either way (a past date can be on purpose, such as for work done on paper).
 */
export function assignedMessage(input: Pick<AssignInput, "dueAt" | "latePolicy" | "latePenaltyPercent">, timeZone: string, now: Date = new Date()): { done: string; caution?: string } {
  const done = `Assigned, due ${formatDue(input.dueAt, timeZone, now)}.`;
  if (input.dueAt.getTime() > now.getTime()) return { done };
  const consequence = {
    accept: "work done after it is late (late work counts in full)",
    penalty: `work done after it is late and loses ${input.latePenaltyPercent}% of its credit for each day late`,
    closed: "the lesson is closed: it can be read, but no answers are taken",
  }[input.latePolicy];
  return { done, caution: `That due date has already passed, so ${consequence}. If that is not what you meant, choose a later due date.` };
}

/**
 * What the teacher reads after changing the class's time zone. Assigned lessons keep their moment, so
 * their due dates now read another time of day: each is named with its time in the new zone, so a
 * "5:00 pm" that became "11:00 am" is seen, not found out later.
 */
export function timeZoneChangedMessage(assigned: Pick<ClassAssignment, "lessonSlug" | "dueAt">[], from: string, to: string, now: Date = new Date()): string {
  const done = `Due dates now use ${to}.`;
  if (from === to || assigned.length === 0) return done;
  const lessons = listLessons();
  const dues = assigned.map((a) => {
    const lesson = lessons.find((l) => l.slug === a.lessonSlug);
    return `${lesson ? `lesson ${lesson.number}` : a.lessonSlug} is now due ${formatDue(a.dueAt, to, now)} (it read ${formatDue(a.dueAt, from, now)} in ${from})`;
  });
  return `${done} Lessons already assigned keep the same moment, so their times read differently: ${dues.join("; ")}. If you meant the times as typed, change them under Lessons assigned.`;
}

/** How far from today an opening or a due date may be (a school year and a summer, either way). */
export const DATE_RANGE_DAYS = 500;

/** Assigns a lesson, or changes its dates and policy when it is already assigned. */
export async function assignLesson({ db }: Db, klass: TeacherClass, input: AssignInput): Promise<{ ok: true; id: string } | { ok: false; field: string; message: string }> {
  if (!findLesson(input.slug)) return { ok: false, field: "slug", message: "That lesson is not part of the course." };
  // Dates a school year can hold, with room: a typo such as 1900 or 9999 is named, not saved.
  const now = Date.now();
  if (Math.abs(input.opensAt.getTime() - now) > DATE_RANGE_DAYS * DAY_MS) {
    return { ok: false, field: "opensAt", message: `Give an opening within ${DATE_RANGE_DAYS} days of today.` };
  }
  if (Math.abs(input.dueAt.getTime() - now) > DATE_RANGE_DAYS * DAY_MS) {
    return { ok: false, field: "dueAt", message: `Give a due date within ${DATE_RANGE_DAYS} days of today.` };
  }
  if (input.dueAt.getTime() <= input.opensAt.getTime()) return { ok: false, field: "dueAt", message: "The due date must come after the opening." };
  const penalty = input.latePolicy === "penalty" ? input.latePenaltyPercent : 0;
  if (input.latePolicy === "penalty" && (penalty < 1 || penalty > MAX_PENALTY_PERCENT)) {
    return { ok: false, field: "latePenaltyPercent", message: "Give the credit lost per day late, in percent from 1 to 100." };
  }
  const values = { opensAt: input.opensAt, dueAt: input.dueAt, latePolicy: input.latePolicy, latePenaltyPercent: penalty };
  const [row] = await db
    .insert(assignments)
    .values({ classId: klass.id, lessonSlug: input.slug, ...values })
    .onConflictDoUpdate({ target: [assignments.classId, assignments.lessonSlug], set: { ...values, updatedAt: new Date() } })
    .returning({ id: assignments.id });
  return { ok: true, id: row.id };
}

/** Takes the lesson off the class's list (the students' work stays; only the due date goes). */
export async function unassignLesson({ db }: Db, klass: TeacherClass, assignmentId: string): Promise<boolean> {
  const gone = await db
    .delete(assignments)
    .where(and(eq(assignments.id, assignmentId), eq(assignments.classId, klass.id)))
    .returning({ id: assignments.id });
  return gone.length > 0;
}

export interface Accommodation {
  studentId: string;
  assignmentId: string | null;
  extraAttempts: number;
  extraDays: number;
}

export async function classAccommodations({ db }: Db, classId: string): Promise<Accommodation[]> {
  return db
    .select({
      studentId: accommodations.studentId,
      assignmentId: accommodations.assignmentId,
      extraAttempts: accommodations.extraAttempts,
      extraDays: accommodations.extraDays,
    })
    .from(accommodations)
    .where(eq(accommodations.classId, classId));
}

/**
 * Sets a student's accommodation for every lesson of the class (assignmentId null) or for one
 * assigned lesson. Zero extra tries and zero extra days removes it. The caller has checked that the
 * student is in the class; the assignment is checked here to belong to the class.
 */
export async function setAccommodation(
  { db }: Db,
  klass: TeacherClass,
  input: { studentId: string; assignmentId: string | null; extraAttempts: number; extraDays: number },
): Promise<{ ok: true } | { ok: false; message: string }> {
  if (input.assignmentId) {
    const [own] = await db
      .select({ id: assignments.id })
      .from(assignments)
      .where(and(eq(assignments.id, input.assignmentId), eq(assignments.classId, klass.id)));
    if (!own) return { ok: false, message: "That lesson is not assigned to this class." };
  }
  const scope = and(
    eq(accommodations.classId, klass.id),
    eq(accommodations.studentId, input.studentId),
    input.assignmentId ? eq(accommodations.assignmentId, input.assignmentId) : isNull(accommodations.assignmentId),
  );
  if (input.extraAttempts === 0 && input.extraDays === 0) {
    await db.delete(accommodations).where(scope);
    return { ok: true };
  }
  const values = { extraAttempts: input.extraAttempts, extraDays: input.extraDays };
  await db
    .insert(accommodations)
    .values({ classId: klass.id, studentId: input.studentId, assignmentId: input.assignmentId, ...values })
    .onConflictDoUpdate({
      target: [accommodations.classId, accommodations.studentId, accommodations.assignmentId],
      set: { ...values, updatedAt: new Date() },
    });
  return { ok: true };
}

export interface AssignedLesson {
  slug: string;
  number: number;
  title: string;
  className: string;
  opensAt: string;
  /** when the lesson is assigned from, written in the class's time zone */
  opensText: string;
  /** the student's own due date (with any extra days) */
  dueAt: string;
  /** the same, written in the class's time zone */
  dueText: string;
  timeZone: string;
  latePolicy: LatePolicy;
  latePenaltyPercent: number;
  opened: boolean;
}

/** What a student's teachers have assigned, soonest due first: one query. */
export async function assignedLessonsFor({ db }: Db, studentId: string, now: Date = new Date()): Promise<AssignedLesson[]> {
  const policies = await lessonPolicies({ db }, studentId);
  const lessons = listLessons();
  return [...policies.values()]
    .flatMap((p) => {
      const lesson = lessons.find((l) => l.slug === p.lessonSlug);
      if (!lesson) return [];
      return [
        {
          slug: lesson.slug,
          number: lesson.number,
          title: lesson.title,
          className: p.className,
          opensAt: p.opensAt.toISOString(),
          opensText: formatDue(p.opensAt, p.timeZone, now),
          dueAt: p.dueAt.toISOString(),
          dueText: formatDue(p.dueAt, p.timeZone, now),
          timeZone: p.timeZone,
          latePolicy: p.latePolicy,
          latePenaltyPercent: p.latePenaltyPercent,
          opened: p.opensAt.getTime() <= now.getTime(),
        },
      ];
    })
    .sort((a, b) => a.dueAt.localeCompare(b.dueAt));
}
