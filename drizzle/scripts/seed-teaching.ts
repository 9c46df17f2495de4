// The teaching part of the INVENTED demo: the demo teacher's class "Grade 7 Physical Science A" has
// lesson 2 assigned (due a week after the demo was first set up; late work counts in full), and a few
// of its students have invented work in it, so the gradebook, the item analysis and the review list
// are not empty. Running it again adds nothing twice.
//
// The invented answers are worked out from each student's own exercise numbers (the lesson's own
// generators and the answer checker), so a student's lesson page shows the same result as the
// gradebook. Only hugo.m, ines.r and jonah.b get invented work: the other demos and tests start the
// remaining students of the class from nothing.
import { and, count, eq, inArray } from "drizzle-orm";
import type { PostgresJsDatabase } from "drizzle-orm/postgres-js";
import * as schema from "~/db/schema.server";
import { assignments, classes, exerciseAttempts, lessonVisits, users, writtenAnswers } from "~/db/schema.server";
import { checkAnswer, type ExpectedAnswer } from "~/lib/answer-checker";
import type { ExerciseDefinition, ExerciseInstance } from "~/lib/exercises";
import { exerciseSeed, seededRandom } from "~/lib/seeded-random";
import { lesson as lessonTwo } from "../../lessons/02-force-and-deformation/exercises.server";

type Db = PostgresJsDatabase<typeof schema>;

const LESSON = "02-force-and-deformation";
const DAY = 24 * 60 * 60 * 1000;
export const DEMO_TIME_ZONE = "America/Chicago";

/** Who did what (invented): "right" answers right at the first try; slips are wrong tries before. */
const WORK: Record<string, { right: string[]; slips?: Record<string, ("loaded-reading" | "factor-10")[]>; handIn?: boolean }> = {
  "hugo.m": {
    right: ["deformation-from-readings", "stiffness-one-reading", "complete-the-table", "force-for-deformation", "stiffness-in-n-per-m", "same-stiffness-choice"],
    slips: { "stiffness-in-n-per-m": ["factor-10"] },
    handIn: true,
  },
  "ines.r": { right: ["stiffness-one-reading", "force-for-deformation"], slips: { "deformation-from-readings": ["loaded-reading", "factor-10"] } },
  "jonah.b": { right: ["deformation-from-readings", "stiffness-one-reading"], slips: { "deformation-from-readings": ["loaded-reading"] } },
};

function instanceFor(studentId: string, definition: ExerciseDefinition): ExerciseInstance {
  return definition.generate(seededRandom(exerciseSeed(studentId, LESSON, definition.id, 0)), { ownData: null });
}

/** A way of writing the expected value that the checker accepts. */
function rightText(expected: ExpectedAnswer): string {
  const candidates = [2, 3, 4, 5, 6].map((sig) => `${Number(expected.value.toPrecision(sig))} ${expected.unit}`.trim());
  return candidates.find((c) => checkAnswer(c, expected).outcome === "correct") ?? candidates[1];
}

function rightRaw(definition: ExerciseDefinition, instance: ExerciseInstance): string {
  if (definition.kind === "choice") return JSON.stringify({ choice: instance.correctChoice, reason: "I worked out force ÷ deformation for each reading." });
  if (definition.kind === "table") return JSON.stringify((instance.cells ?? []).map(rightText));
  return rightText(instance.expected!);
}

function slipRaw(slip: "loaded-reading" | "factor-10", instance: ExerciseInstance): string | null {
  const expected = instance.expected;
  if (!expected) return null;
  if (slip === "loaded-reading" && expected.context?.loadedReadingCm !== undefined) return `${expected.context.loadedReadingCm} cm`;
  return `${Number((expected.value * 10).toPrecision(3))} ${expected.unit}`.trim();
}

export async function seedTeachingDemo(db: Db) {
  const [klass] = await db.select().from(classes).where(eq(classes.signInCode, "MAPLE7A"));
  if (!klass) return;
  // The invented school keeps its due dates in one time zone (set once; a teacher may change it).
  await db
    .update(classes)
    .set({ timeZone: DEMO_TIME_ZONE })
    .where(and(eq(classes.organisationId, klass.organisationId), eq(classes.timeZone, "UTC")));

  const now = Date.now();
  const dueDay = new Date(now + 7 * DAY);
  dueDay.setUTCHours(23, 0, 0, 0); // 5 pm in Chicago in winter, 6 pm in summer
  await db
    .insert(assignments)
    .values({ classId: klass.id, lessonSlug: LESSON, opensAt: new Date(now - 3 * DAY), dueAt: dueDay, latePolicy: "accept" })
    .onConflictDoNothing({ target: [assignments.classId, assignments.lessonSlug] });

  const students = await db
    .select({ id: users.id, username: users.username })
    .from(users)
    .where(and(eq(users.homeOrganisationId, klass.organisationId), inArray(users.username, Object.keys(WORK))));
  for (const student of students) {
    const [{ n }] = await db
      .select({ n: count() })
      .from(exerciseAttempts)
      .where(and(eq(exerciseAttempts.studentId, student.id), eq(exerciseAttempts.lessonSlug, LESSON)));
    const [{ v }] = await db
      .select({ v: count() })
      .from(lessonVisits)
      .where(and(eq(lessonVisits.studentId, student.id), eq(lessonVisits.lessonSlug, LESSON)));
    if (n > 0 || v > 0) continue; // already seeded, or the student has worked on it themselves
    const work = WORK[student.username!];
    let at = now - 2 * DAY;
    const next = () => new Date((at += 7 * 60 * 1000));
    for (const definition of lessonTwo.exercises) {
      const instance = instanceFor(student.id, definition);
      for (const slip of work.slips?.[definition.id] ?? []) {
        const raw = slipRaw(slip, instance);
        if (!raw) continue;
        const result = checkAnswer(raw, instance.expected!);
        await db.insert(exerciseAttempts).values({
          studentId: student.id,
          lessonSlug: LESSON,
          exerciseId: definition.id,
          rawAnswer: raw,
          parsedValue: result.parsed?.value ?? null,
          parsedUnit: result.parsed?.unit ?? null,
          outcome: result.outcome,
          correct: result.outcome === "correct" ? 1 : 0,
          slipCode: result.slip?.code ?? null,
          createdAt: next(),
        });
      }
      if (!work.right.includes(definition.id)) continue;
      const raw = rightRaw(definition, instance);
      const parsed = definition.kind === "number" ? checkAnswer(raw, instance.expected!).parsed : null;
      await db.insert(exerciseAttempts).values({
        studentId: student.id,
        lessonSlug: LESSON,
        exerciseId: definition.id,
        rawAnswer: raw,
        parsedValue: parsed?.value ?? null,
        parsedUnit: parsed?.unit ?? null,
        outcome: "correct",
        correct: 1,
        createdAt: next(),
      });
    }
    if (work.handIn) {
      await db
        .insert(writtenAnswers)
        .values({
          studentId: student.id,
          lessonSlug: LESSON,
          answerId: "cer-stiffness",
          claim: "The strip has about the same stiffness at every load.",
          evidence: "2 N bent it 0.8 cm, 4 N bent it 1.6 cm and 6 N bent it 2.4 cm: 2.5 N/cm each time.",
          reasoning: "Stiffness is force divided by deformation. When doubling the force doubles the deformation, that ratio stays the same.",
          handedInAt: next(),
        })
        .onConflictDoNothing();
    }
    await db
      .insert(lessonVisits)
      .values({ studentId: student.id, lessonSlug: LESSON, lastPlace: "exercise-deformation-from-readings", updatedAt: next() })
      .onConflictDoNothing();
  }
}
