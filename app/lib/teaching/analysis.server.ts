// Item analysis of a lesson's exercises in one class: how many got it right at the first try, how many
// tries it took on average, and the usual wrong answers grouped by the slip the checker named.
// One query for a whole lesson, whatever the class size.
import { and, asc, eq, inArray } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { enrollments, exerciseAttempts, users } from "~/db/schema.server";
import { NO_TRY_OUTCOMES } from "~/lib/answer-checker";
import { choiceLabelReader } from "~/lib/course.server";
import { lessonExercises } from "~/lib/lessons.server";
import { readableAnswer, wrongAnswerGroup } from "./words";

type Db = { db: Database };

export interface WrongGroup {
  key: string;
  label: string;
  attempts: number;
  students: number;
  /** the most frequent answers in the group, most frequent first */
  examples: { answer: string; count: number }[];
}

export interface ItemAnalysis {
  exerciseId: string;
  title: string;
  kind: string;
  required: boolean;
  studentsInClass: number;
  studentsTried: number;
  rightFirstTry: number;
  /** 0–100 of the students who tried, or null when nobody has */
  rightFirstTryPercent: number | null;
  rightInTheEnd: number;
  /** tries (counted ones) per student who tried, one decimal */
  averageAttempts: number | null;
  wrongGroups: WrongGroup[];
}

export interface ClassAttempt {
  id: string;
  studentId: string;
  displayName: string;
  username: string | null;
  studentNumber: string | null;
  exerciseId: string;
  rawAnswer: string;
  parsedValue: number | null;
  parsedUnit: string | null;
  outcome: string;
  correct: boolean;
  slipCode: string | null;
  createdAt: Date;
}

/** Every attempt of the class's students at this lesson (or one exercise of it), oldest first. */
export async function classAttempts({ db }: Db, classId: string, slug: string, exerciseId?: string): Promise<ClassAttempt[]> {
  const rows = await db
    .select({
      id: exerciseAttempts.id,
      studentId: exerciseAttempts.studentId,
      displayName: users.displayName,
      username: users.username,
      studentNumber: users.studentNumber,
      exerciseId: exerciseAttempts.exerciseId,
      rawAnswer: exerciseAttempts.rawAnswer,
      parsedValue: exerciseAttempts.parsedValue,
      parsedUnit: exerciseAttempts.parsedUnit,
      outcome: exerciseAttempts.outcome,
      correct: exerciseAttempts.correct,
      slipCode: exerciseAttempts.slipCode,
      createdAt: exerciseAttempts.createdAt,
    })
    .from(exerciseAttempts)
    .innerJoin(users, eq(users.id, exerciseAttempts.studentId))
    .where(
      and(
        inArray(exerciseAttempts.studentId, db.select({ id: enrollments.studentId }).from(enrollments).where(eq(enrollments.classId, classId))),
        eq(exerciseAttempts.lessonSlug, slug),
        exerciseId ? eq(exerciseAttempts.exerciseId, exerciseId) : undefined,
      ),
    )
    .orderBy(asc(users.displayName), asc(exerciseAttempts.exerciseId), asc(exerciseAttempts.createdAt));
  return rows.map((r) => ({ ...r, correct: r.correct === 1 }));
}

/** The analysis of each exercise of the lesson, from the class's attempts. Pure apart from the lesson's definitions. */
export function analyseItems(slug: string, attempts: ClassAttempt[], studentsInClass: number): ItemAnalysis[] {
  const labelsOf = choiceLabelReader();
  return lessonExercises(slug).exercises.map((exercise) => {
    const mine = attempts.filter((a) => a.exerciseId === exercise.id && !NO_TRY_OUTCOMES.has(a.outcome));
    const byStudent = new Map<string, ClassAttempt[]>();
    for (const a of mine) byStudent.set(a.studentId, [...(byStudent.get(a.studentId) ?? []), a]);
    const tried = byStudent.size;
    let first = 0;
    let inTheEnd = 0;
    let tries = 0;
    for (const list of byStudent.values()) {
      if (list[0].correct) first++;
      if (list.some((a) => a.correct)) inTheEnd++;
      tries += list.length;
    }
    const groups = new Map<string, { label: string; attempts: number; students: Set<string>; answers: Map<string, number> }>();
    for (const a of mine.filter((x) => !x.correct)) {
      const { key, label } = wrongAnswerGroup(a.slipCode, a.outcome);
      const group = groups.get(key) ?? { label, attempts: 0, students: new Set<string>(), answers: new Map<string, number>() };
      group.attempts++;
      group.students.add(a.studentId);
      const answer = readableAnswer(a.rawAnswer, labelsOf(a.studentId, slug, exercise.id)).trim().replace(/\s+/g, " ").slice(0, 120);
      group.answers.set(answer, (group.answers.get(answer) ?? 0) + 1);
      groups.set(key, group);
    }
    const wrongGroups: WrongGroup[] = [...groups.entries()]
      .map(([key, g]) => ({
        key,
        label: g.label,
        attempts: g.attempts,
        students: g.students.size,
        examples: [...g.answers.entries()]
          .map(([answer, count]) => ({ answer, count }))
          .sort((x, y) => y.count - x.count || x.answer.localeCompare(y.answer))
          .slice(0, 3),
      }))
      .sort((x, y) => y.attempts - x.attempts || x.label.localeCompare(y.label));
    return {
      exerciseId: exercise.id,
      title: exercise.title,
      kind: exercise.kind,
      required: exercise.required ?? true,
      studentsInClass,
      studentsTried: tried,
      rightFirstTry: first,
      rightFirstTryPercent: tried > 0 ? Math.round((100 * first) / tried) : null,
      rightInTheEnd: inTheEnd,
      averageAttempts: tried > 0 ? Math.round((10 * tries) / tried) / 10 : null,
      wrongGroups,
    };
  });
}
