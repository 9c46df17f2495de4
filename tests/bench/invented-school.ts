// A large INVENTED school for `npm run bench`: "Northfield Hollow Secondary (invented, for the
// benchmark)", with 50 classes of 30 students and one class of 35 (the gradebook the bench reads), all
// eight lessons assigned two weeks apart, and a term's worth of invented work: eleven weeks in, lessons
// 1–5 past their due dates, lesson 6 open this week, lessons 7 and 8 still to come. Every name, code,
// answer and date here is made up. Rows go in with multi-row INSERTs of a few thousand rows each.
//
// The work follows the demo seed's patterns (drizzle/scripts/seed-teaching.ts): each answer is worked
// out from the student's own exercise numbers (the lesson's generators and the answer checker), right
// answers in a form the checker accepts, wrong ones as the usual slips (a factor of 10, the loaded
// reading for a deformation), so lesson pages and the gradebook show what they would for real work.
import { randomUUID } from "node:crypto";
import type { PostgresJsDatabase } from "drizzle-orm/postgres-js";
import type { PgTable } from "drizzle-orm/pg-core";
import * as schema from "~/db/schema.server";
import {
  accommodations,
  assignments,
  classes,
  enrollments,
  exerciseAttempts,
  lessonVisits,
  memberships,
  organisations,
  seatAssignments,
  seatPurchases,
  users,
  writtenAnswers,
} from "~/db/schema.server";
import { checkAnswer, type ExpectedAnswer } from "~/lib/answer-checker";
import type { ExerciseDefinition, ExerciseInstance, LessonExercises } from "~/lib/exercises";
import { hashPassword } from "~/lib/passwords.server";
import { formatForStudent } from "~/lib/science";
import { exerciseSeed, seededRandom } from "~/lib/seeded-random";
import { lesson as lesson1 } from "../../lessons/01-measuring-deformation/exercises.server";
import { lesson as lesson2 } from "../../lessons/02-force-and-deformation/exercises.server";
import { lesson as lesson3 } from "../../lessons/03-proportional-or-not/exercises.server";
import { lesson as lesson4 } from "../../lessons/04-bundles/exercises.server";
import { lesson as lesson5 } from "../../lessons/05-elastic-permanent-broken/exercises.server";
import { lesson as lesson6 } from "../../lessons/06-width-thickness-span/exercises.server";
import { lesson as lesson7 } from "../../lessons/07-home-lab/exercises.server";
import { lesson as lesson8 } from "../../lessons/08-design-challenge/exercises.server";

type Db = PostgresJsDatabase<typeof schema>;

export const BENCH_SCHOOL_SLUG = "bench-northfield-hollow";
export const BENCH_SCHOOL_YEAR = "2026-27";
export const BENCH_PASSWORD = "bendwise-bench-invented";

export const COURSE: { slug: string; lesson: LessonExercises }[] = [
  { slug: "01-measuring-deformation", lesson: lesson1 },
  { slug: "02-force-and-deformation", lesson: lesson2 },
  { slug: "03-proportional-or-not", lesson: lesson3 },
  { slug: "04-bundles", lesson: lesson4 },
  { slug: "05-elastic-permanent-broken", lesson: lesson5 },
  { slug: "06-width-thickness-span", lesson: lesson6 },
  { slug: "07-home-lab", lesson: lesson7 },
  { slug: "08-design-challenge", lesson: lesson8 },
];

/** The lesson that is open this week: the bench answers its exercises. */
export const CURRENT_LESSON = "06-width-thickness-span";

const DAY = 24 * 60 * 60 * 1000;
const WEEK = 7 * DAY;

// Invented first names; a student is "<first name> <initial>." with a number to keep usernames unique.
const FIRST = [
  "Ada", "Bram", "Cleo", "Dario", "Esme", "Faris", "Gwen", "Hadi", "Iris", "Jovan", "Kaia", "Luca", "Mira", "Nico",
  "Oona", "Pavel", "Rhea", "Soren", "Talia", "Ugo", "Vida", "Wren", "Yara", "Zane", "Anouk", "Basil", "Cyra", "Dov",
  "Elin", "Fenn", "Greta", "Hollis", "Ilse", "Jude", "Kenji", "Lior", "Maren", "Noor", "Otto", "Pia",
];
const INITIALS = "ABCDEFGHJKLMNPRSTVWZ";

export interface InventedSchool {
  organisationId: string;
  teachers: { id: string; email: string }[];
  /** the 35-student class whose gradebook the bench reads, and its teacher */
  gradebookClass: { id: string; teacherId: string; students: number };
  students: { id: string; classId: string }[];
  counts: Record<string, number>;
}

/** A small deterministic random source for the invented work (the same school on every run). */
function mulberry32(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

async function insertInBatches<T extends PgTable>(db: Db, table: T, rows: T["$inferInsert"][], batch = 2000) {
  for (let i = 0; i < rows.length; i += batch) await db.insert(table).values(rows.slice(i, i + batch) as never);
}

function instanceFor(studentId: string, slug: string, definition: ExerciseDefinition): ExerciseInstance {
  return definition.generate(seededRandom(exerciseSeed(studentId, slug, definition.id, 0)), { ownData: null });
}

/** A way of writing the expected value that the checker accepts (as the demo seed does). */
function rightText(expected: ExpectedAnswer): string {
  const candidates = [3, 2, 4, 5, 6].map((sig) => formatForStudent(expected.value, expected.unit, sig)).concat(`${expected.value} ${expected.unit}`.trim());
  return candidates.find((c) => checkAnswer(c, expected).outcome === "correct") ?? candidates[0];
}

function rightRaw(definition: ExerciseDefinition, instance: ExerciseInstance): string {
  if (definition.kind === "choice") return JSON.stringify({ choice: instance.correctChoice, reason: "The numbers in my table show it." });
  if (definition.kind === "table") return JSON.stringify((instance.cells ?? []).map(rightText));
  return rightText(instance.expected!);
}

/** A usual slip: ten times the answer, or the loaded reading where a deformation was asked for. */
export function slipRaw(definition: ExerciseDefinition, instance: ExerciseInstance, which: number): string {
  if (definition.kind === "choice") {
    const wrong = instance.choices?.find((c) => c.value !== instance.correctChoice)?.value ?? "";
    return JSON.stringify({ choice: wrong, reason: "It looked that way." });
  }
  if (definition.kind === "table") return JSON.stringify((instance.cells ?? []).map((c) => formatForStudent(c.value * 10, c.unit, 3)));
  const expected = instance.expected!;
  if (which % 2 === 1 && expected.context?.loadedReadingCm !== undefined) return `${expected.context.loadedReadingCm} cm`;
  return formatForStudent(expected.value * 10, expected.unit, 3);
}

export async function seedInventedSchool(db: Db, options: { classes?: number; perClass?: number; gradebookClassSize?: number; now?: number } = {}): Promise<InventedSchool> {
  const classCount = options.classes ?? 50;
  const perClass = options.perClass ?? 30;
  const bigClass = options.gradebookClassSize ?? 35;
  const now = options.now ?? Date.now();
  const random = mulberry32(20261201);
  const pick = <T>(list: readonly T[]) => list[Math.floor(random() * list.length)];

  const [school] = await db
    .insert(organisations)
    .values({ kind: "school", name: "Northfield Hollow Secondary (invented, for the benchmark)", slug: BENCH_SCHOOL_SLUG })
    .returning();
  const adultHash = await hashPassword(BENCH_PASSWORD);

  // Ten invented teachers, five classes each (the first also has the 35-student class).
  const teacherRows = await db
    .insert(users)
    .values(Array.from({ length: 10 }, (_, i) => ({ email: `teacher${String(i + 1).padStart(2, "0")}@northfield-hollow.example`, displayName: `${pick(FIRST)} ${INITIALS[i]}. (invented)`, passwordHash: adultHash, emailVerifiedAt: new Date(now) })))
    .returning({ id: users.id, email: users.email });
  const teachers = teacherRows.map((t) => ({ id: t.id, email: t.email! }));
  await db.insert(memberships).values(teachers.map((t) => ({ userId: t.id, organisationId: school.id, role: "teacher" as const })));

  const classSpecs = Array.from({ length: classCount + 1 }, (_, i) => ({
    size: i === classCount ? bigClass : perClass,
    teacherId: i === classCount ? teachers[0].id : teachers[i % teachers.length].id,
    name: i === classCount ? `Materials Lab, ${bigClass} students (invented)` : `Grade ${6 + (i % 5)} Science ${String(i + 1).padStart(2, "0")} (invented)`,
    signInCode: `NHB${String(i + 1).padStart(2, "0")}`,
  }));
  const classRows = await db
    .insert(classes)
    .values(classSpecs.map((c) => ({ organisationId: school.id, teacherId: c.teacherId, name: c.name, schoolYear: BENCH_SCHOOL_YEAR, signInCode: c.signInCode, timeZone: "America/Chicago" })))
    .returning({ id: classes.id, teacherId: classes.teacherId });

  // Students: one user, membership, enrollment and seat each.
  const studentRows: (typeof users.$inferInsert & { classIndex: number })[] = [];
  classSpecs.forEach((spec, classIndex) => {
    for (let s = 0; s < spec.size; s++) {
      const n = studentRows.length + 1;
      studentRows.push({
        id: randomUUID(),
        homeOrganisationId: school.id,
        username: `nh${String(n).padStart(4, "0")}`,
        displayName: `${pick(FIRST)} ${pick(INITIALS.split(""))}. ${n}`,
        gradeBand: classIndex % 5 >= 3 ? "9-10" : "6-8",
        passwordHash: adultHash,
        classIndex,
      });
    }
  });
  await insertInBatches(db, users, studentRows.map(({ classIndex: _c, ...u }) => u));
  const students = studentRows.map((s) => ({ id: s.id!, classId: classRows[s.classIndex].id }));
  await insertInBatches(db, memberships, students.map((s) => ({ userId: s.id, organisationId: school.id, role: "student" as const })));
  await insertInBatches(db, enrollments, students.map((s) => ({ classId: s.classId, studentId: s.id })));
  await insertInBatches(db, seatAssignments, students.map((s) => ({ organisationId: school.id, schoolYear: BENCH_SCHOOL_YEAR, studentId: s.id })));
  await db.insert(seatPurchases).values({
    organisationId: school.id, schoolYear: BENCH_SCHOOL_YEAR, seats: students.length + 40, amountCents: (students.length + 40) * 900,
    method: "demo", status: "paid", providerRef: `bench-${BENCH_SCHOOL_SLUG}`, paidAt: new Date(now - 12 * WEEK),
  });

  // Every lesson assigned to every class, two weeks apart, due two weeks after opening.
  const termStart = now - 11 * WEEK;
  const opens = (lessonIndex: number) => termStart + lessonIndex * 2 * WEEK;
  const assignmentRows = await db
    .insert(assignments)
    .values(
      classRows.flatMap((c, ci) =>
        COURSE.map((l, li) => ({
          classId: c.id,
          lessonSlug: l.slug,
          opensAt: new Date(opens(li)),
          dueAt: new Date(opens(li) + 2 * WEEK),
          latePolicy: ci % 4 === 3 ? ("penalty" as const) : ("accept" as const),
          latePenaltyPercent: ci % 4 === 3 ? 10 : 0,
        })),
      ),
    )
    .returning({ id: assignments.id, classId: assignments.classId, lessonSlug: assignments.lessonSlug });

  // A few students with more time or more tries (as a teacher would set for an accommodation).
  const accommodationRows = students
    .filter(() => random() < 0.03)
    .map((s) => ({ classId: s.classId, studentId: s.id, assignmentId: null, extraAttempts: 2, extraDays: 3 }));
  const oneLesson = assignmentRows.filter(() => random() < 0.004).map((a) => {
    const student = students.find((s) => s.classId === a.classId)!;
    return { classId: a.classId, studentId: student.id, assignmentId: a.id, extraAttempts: 1, extraDays: 2 };
  });
  await insertInBatches(db, accommodations, [...accommodationRows, ...oneLesson.filter((o) => !accommodationRows.some((a) => a.studentId === o.studentId))]);

  // The term's work. Each student has a diligence; older lessons are further along.
  const attempts: (typeof exerciseAttempts.$inferInsert)[] = [];
  const answers: (typeof writtenAnswers.$inferInsert)[] = [];
  const visits: (typeof lessonVisits.$inferInsert)[] = [];
  for (const student of students) {
    const diligence = 0.55 + random() * 0.45;
    COURSE.forEach(({ slug, lesson }, li) => {
      const openedAt = opens(li);
      if (openedAt > now) return;
      const share = li <= 4 ? diligence : diligence * 0.35; // the current lesson is about a third done
      if (random() > share + 0.1) return; // not started
      let at = openedAt + random() * 4 * DAY;
      const next = () => new Date(Math.min(now - 60_000, (at += (2 + random() * 9) * 60_000)));
      let lastPlace = "";
      for (const definition of lesson.exercises) {
        if (definition.kind === "own-data") continue; // no invented readings: these wait for the student's own
        if (random() > share) continue;
        const instance = instanceFor(student.id, slug, definition);
        const wrong = random() < 0.55 ? 0 : random() < 0.7 ? 1 : random() < 0.7 ? 2 : 3;
        for (let w = 0; w < wrong; w++) {
          const raw = slipRaw(definition, instance, w);
          const checked = definition.kind === "choice" || definition.kind === "table" ? null : checkAnswer(raw, instance.expected!);
          attempts.push({
            studentId: student.id, lessonSlug: slug, exerciseId: definition.id, rawAnswer: raw,
            parsedValue: checked?.parsed && Number.isFinite(checked.parsed.value) ? checked.parsed.value : null,
            parsedUnit: checked?.parsed?.unit ?? null,
            outcome: checked?.outcome === "correct" ? "incorrect" : checked?.outcome ?? "incorrect",
            correct: 0, slipCode: checked?.slip?.code ?? null, createdAt: next(),
          });
        }
        lastPlace = `exercise-${definition.id}`;
        if (wrong === 3) continue; // out of tries
        const raw = rightRaw(definition, instance);
        const parsed = definition.kind === "choice" || definition.kind === "table" ? null : checkAnswer(raw, instance.expected!).parsed;
        attempts.push({
          studentId: student.id, lessonSlug: slug, exerciseId: definition.id, rawAnswer: raw,
          parsedValue: parsed && Number.isFinite(parsed.value) ? parsed.value : null, parsedUnit: parsed?.unit ?? null,
          outcome: "correct", correct: 1, createdAt: next(),
        });
      }
      for (const answerId of lesson.writtenAnswers ?? []) {
        if (random() > share) continue;
        const handedIn = random() < 0.85;
        const reviewed = handedIn && li <= 3 && random() < 0.6;
        const handedAt = next();
        answers.push({
          studentId: student.id, lessonSlug: slug, answerId,
          claim: "The thicker strip is the stiffer one (invented answer).",
          evidence: "At 4 N the thin strip bent 2.0 cm and the thick one 0.3 cm (invented readings).",
          reasoning: "Stiffness is force divided by deformation, so less deformation at the same force means stiffer.",
          handedInAt: handedIn ? handedAt : null, updatedAt: handedAt,
          reviewScores: reviewed ? { claim: 2, evidence: 1 + Math.floor(random() * 2), reasoning: Math.floor(random() * 3) } : null,
          reviewComment: reviewed ? "Good use of your own numbers (invented comment)." : null,
          reviewedAt: reviewed ? new Date(handedAt.getTime() + DAY) : null,
        });
        lastPlace = `answer-${answerId}`;
      }
      visits.push({ studentId: student.id, lessonSlug: slug, lastPlace: lastPlace || null, updatedAt: new Date(at) });
    });
  }
  await insertInBatches(db, exerciseAttempts, attempts);
  await insertInBatches(db, writtenAnswers, answers);
  await insertInBatches(db, lessonVisits, visits);

  const gradebookClass = classRows[classCount];
  return {
    organisationId: school.id,
    teachers,
    gradebookClass: { id: gradebookClass.id, teacherId: gradebookClass.teacherId, students: bigClass },
    students,
    counts: {
      classes: classRows.length,
      students: students.length,
      teachers: teachers.length,
      assignments: assignmentRows.length,
      accommodations: accommodationRows.length + oneLesson.length,
      attempts: attempts.length,
      writtenAnswers: answers.length,
      lessonVisits: visits.length,
    },
  };
}
