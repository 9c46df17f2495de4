// The course model: a student's exercise instances, attempts, predictions, own readings, written
// answers, photos and progress. Functions take `{ db }` so tests can call them directly.
import { and, eq, inArray, sql, type Placeholder, type SQL } from "drizzle-orm";
import type { AnyPgColumn } from "drizzle-orm/pg-core";
import type { Database } from "~/db/client.server";
import { preparedOnce } from "~/db/prepared.server";
import {
  exerciseAttempts,
  lessonVisits,
  photos,
  predictions,
  readingSets,
  writtenAnswers,
} from "~/db/schema.server";
import { checkAnswer, checkTableAnswers, NO_TRY_OUTCOMES, type CheckResult } from "./answer-checker";
import {
  ownAttempts,
  promptOf,
  type AttemptsOf,
  type ExerciseDefinition,
  type ExerciseInstance,
  type ExercisePrompt,
  type GeneratorContext,
} from "./exercises";
import { lessonExercises, listLessons } from "./lessons.server";
import { analyseReadings, type Mode } from "./science";
import { exerciseSeed, seededRandom } from "./seeded-random";
import { closedForAnswers, closedMessage, lessonPolicies, policiesOf, policyRowsJson, type LessonPolicy } from "./teaching/policy.server";
import { DAY_MS, formatDue } from "./teaching/time";

type Db = { db: Database };

export type ExerciseStatus = "open" | "right" | "used-up";

/** What the student's page gets for one exercise: never the expected answer while attempts remain. */
export interface ExerciseState {
  id: string;
  kind: ExerciseDefinition["kind"];
  title: string;
  required: boolean;
  prompt: ExercisePrompt;
  attemptsUsed: number;
  attemptsAllowed: number;
  status: ExerciseStatus;
  lastAnswer: string | null;
  lastFeedback: Feedback | null;
  /** the worked solution, once the exercise is right or out of attempts */
  solution: string | null;
}

export interface Feedback {
  outcome: CheckResult["outcome"];
  right: boolean;
  message: string;
  /** the exercise's hint, after a wrong answer */
  hint: string | null;
  slipCode: string | null;
  /** tables: the empty cells (0-based, in reading order) that were wrong or could not be read */
  wrongCells: number[];
  /** a wrong answer that used the last try: the page says so rather than "not yet" */
  noTriesLeft: boolean;
}

export interface SavedReadings {
  readingsId: string;
  mode: Mode;
  material: string;
  unloadedCm: number | null;
  resolutionCm: number;
  points: { forceN: number; readingCm?: number; returnReadingCm?: number; broke?: boolean }[];
}

// ───────────────────────────── Exercise instances ─────────────────────────────

export function findExercise(slug: string, exerciseId: string): ExerciseDefinition | undefined {
  return lessonExercises(slug).exercises.find((e) => e.id === exerciseId);
}

/** The student's own numbers for an exercise: the same on every visit, seeded by (student, lesson, exercise, variant). */
export function exerciseInstance(
  studentId: string,
  slug: string,
  definition: ExerciseDefinition,
  readings: SavedReadings[],
  variant = 0,
): ExerciseInstance {
  const random = seededRandom(exerciseSeed(studentId, slug, definition.id, variant));
  return definition.generate(random, generatorContext(definition, readings));
}

/**
 * What a student's stored answers mean to someone reading them later (their teacher or parent): the
 * labels of the options the student saw for each choice exercise, by value. Labels can carry the
 * student's own numbers ("2 times as wide"), so they come from the student's instance, made once per
 * (student, lesson, exercise) for the life of the reader.
 */
export function choiceLabelReader(): (studentId: string, slug: string, exerciseId: string) => Map<string, string> | null {
  const made = new Map<string, Map<string, string> | null>();
  return (studentId, slug, exerciseId) => {
    const key = `${studentId}|${slug}|${exerciseId}`;
    if (!made.has(key)) {
      const definition = findExercise(slug, exerciseId);
      const choices = definition?.kind === "choice" ? exerciseInstance(studentId, slug, definition, []).choices : undefined;
      made.set(key, choices ? new Map(choices.map((c) => [c.value, c.label])) : null);
    }
    return made.get(key)!;
  };
}

function generatorContext(definition: ExerciseDefinition, readings: SavedReadings[]): GeneratorContext {
  if (definition.kind !== "own-data") return { ownData: null };
  // Only the set the exercise names: another material's readings would check the wrong numbers.
  const set = definition.readingsId ? readings.find((r) => r.readingsId === definition.readingsId) : readings[0];
  if (!set) return { ownData: null };
  const analysis = analyseReadings({
    mode: set.mode,
    unloadedCm: set.unloadedCm ?? undefined,
    resolutionCm: set.resolutionCm,
    points: set.points,
  });
  return { ownData: { ...analysis, mode: set.mode, unloadedCm: set.unloadedCm } };
}

/**
 * How many tries a student has at an exercise: the exercise's own number (ownAttempts in exercises.ts:
 * DEFAULT_ATTEMPTS unless its definition says `attempts`, and for a choice at most one fewer than its
 * options), plus the extra tries of the student's accommodation for this lesson. The lesson page, the
 * answer check, the course path and the gradebook all count with this one function. The policy
 * (student × lesson) comes from policyRowsJson/lessonPolicies, loaded alongside the other rows, so
 * this stays a pure function and the lesson page's query count stays fixed.
 */
export function attemptsAllowed(policy?: Pick<LessonPolicy, "extraAttempts"> | null, exercise?: AttemptsOf): number {
  return ownAttempts(exercise) + Math.max(0, policy?.extraAttempts ?? 0);
}

/** What the student's page says about the lesson's assignment: the due date is their own (with any extra days). */
export interface AssignmentNotice {
  dueAt: string;
  /** the due date written in the class's time zone, e.g. "Fri 11 Dec, 5:00 pm" */
  dueText: string;
  opensAt: string;
  timeZone: string;
  latePolicy: LessonPolicy["latePolicy"];
  latePenaltyPercent: number;
  /** closed at the due date and past it: answers are refused */
  closed: boolean;
}

function assignmentNotice(policy: LessonPolicy | null): AssignmentNotice | null {
  if (!policy) return null;
  return {
    dueAt: policy.dueAt.toISOString(),
    dueText: formatDue(policy.dueAt, policy.timeZone),
    opensAt: policy.opensAt.toISOString(),
    timeZone: policy.timeZone,
    latePolicy: policy.latePolicy,
    latePenaltyPercent: policy.latePenaltyPercent,
    closed: closedForAnswers(policy),
  };
}

// ───────────────────────────── Checking an answer ─────────────────────────────

export type Submission =
  | { kind: "text"; answer: string }
  | { kind: "choice"; choice: string; reason: string }
  | { kind: "cells"; cells: string[] };

/** Checks a submission against the instance; the outcome of a table is right only when every cell is. */
export function judge(instance: ExerciseInstance, definition: ExerciseDefinition, submission: Submission): {
  result: CheckResult;
  raw: string;
} {
  if (definition.kind === "choice") {
    const choice = submission.kind === "choice" ? submission.choice : "";
    const reason = submission.kind === "choice" ? submission.reason : "";
    const right = choice === instance.correctChoice;
    const known = instance.choices?.some((c) => c.value === choice);
    return {
      raw: JSON.stringify({ choice, reason }),
      result: known
        ? { outcome: right ? "correct" : "incorrect", parsed: null, message: right ? "Right." : "That is not the best choice." }
        : { outcome: "unreadable", parsed: null, message: "Pick one of the options." },
    };
  }
  if (definition.kind === "table") {
    const cells = submission.kind === "cells" ? submission.cells : [];
    return { raw: JSON.stringify(cells), result: checkTableAnswers(cells, instance.cells ?? [], instance.table) };
  }
  const answer = submission.kind === "text" ? submission.answer : "";
  if (!instance.expected) {
    return { raw: answer, result: { outcome: "unreadable", parsed: null, message: "Save your readings first; this question uses them." } };
  }
  return { raw: answer, result: checkAnswer(answer, instance.expected) };
}

/** Outcomes that do not use up an attempt: we could not read it, or the exercise itself is at fault. */
/** The outcomes that use no try, as an SQL list for `not in` (the answer checker's NO_TRY_OUTCOMES). */
export const NO_TRY_OUTCOMES_SQL = sql.raw(`(${[...NO_TRY_OUTCOMES].map((outcome) => `'${outcome}'`).join(", ")})`);

export async function recordAttempt(
  { db }: Db,
  input: {
    studentId: string;
    slug: string;
    definition: ExerciseDefinition;
    submission: Submission;
    /** who set the lesson, named when answers are refused after it closed */
    reader?: "teacher" | "parent";
  },
): Promise<{ feedback: Feedback; counted: boolean } | { refused: string }> {
  const { studentId, slug, definition } = input;
  // Two statements: the readings, this exercise's earlier tries and the policy together, then the
  // attempt and the visit written together.
  const { readings, past, policy } = await exerciseContext({ db }, studentId, slug, definition.id);
  if (closedForAnswers(policy)) return { refused: closedMessage(policy!, input.reader) };
  const instance = exerciseInstance(studentId, slug, definition, readings);
  if (instance.waitingForReadings) return { refused: "Save your readings first; this question uses them." };

  const used = past.filter((a) => !NO_TRY_OUTCOMES.has(a.outcome)).length;
  const allowed = attemptsAllowed(policy, definition);
  if (past.some((a) => a.correct === 1)) return { refused: "You already have this one right." };
  if (used >= allowed) return { refused: "You have used every attempt at this exercise." };

  const { result, raw } = judge(instance, definition, input.submission);
  const right = result.outcome === "correct";
  const counted = !NO_TRY_OUTCOMES.has(result.outcome);
  // One statement, so the attempt and the place to continue from are saved together or not at all.
  await attemptWithVisitStatement(db).execute({
    studentId,
    slug,
    exerciseId: definition.id,
    rawAnswer: raw.slice(0, 2000),
    parsedValue: result.parsed && Number.isFinite(result.parsed.value) ? result.parsed.value : null,
    parsedUnit: result.parsed?.unit ?? null,
    outcome: result.outcome,
    correct: right ? 1 : 0,
    slipCode: result.slip?.code ?? null,
    place: `exercise-${definition.id}`,
  });
  return { counted, feedback: feedbackOf(result, instance, right, !right && counted && used + 1 >= allowed) };
}

/** What the student is told about a checked answer (just now, or again after a reload). */
function feedbackOf(result: CheckResult, instance: ExerciseInstance, right: boolean, noTriesLeft: boolean): Feedback {
  return {
    outcome: result.outcome,
    right,
    message: result.message,
    hint: right ? null : instance.hint,
    slipCode: result.slip?.code ?? null,
    wrongCells: right ? [] : result.wrongCells ?? [],
    noTriesLeft,
  };
}

// ───────────────────────────── The lesson page's state ─────────────────────────────

export async function loadReadings({ db }: Db, studentId: string, slug: string): Promise<SavedReadings[]> {
  const rows = await db
    .select()
    .from(readingSets)
    .where(and(eq(readingSets.studentId, studentId), eq(readingSets.lessonSlug, slug)));
  return rows.map(toSavedReadings);
}

function toSavedReadings(r: Pick<typeof readingSets.$inferSelect, "readingsId" | "mode" | "material" | "unloadedCm" | "resolutionCm" | "points">): SavedReadings {
  return {
    readingsId: r.readingsId,
    mode: r.mode,
    material: r.material,
    unloadedCm: r.unloadedCm,
    resolutionCm: r.resolutionCm,
    points: r.points as SavedReadings["points"],
  };
}

// The lesson page and the answer check read several small sets of one student's rows in one lesson.
// Each set comes back as a JSON array from a sub-select of one statement: one round trip instead of
// one per table, with each sub-select on its table's (student, lesson) key. Each sub-select reads one
// table only: inside a select list drizzle writes column names without their table.
const jsonRows = (select: SQL) => sql`coalesce((${select}), '[]'::json)`;

/** A value or the placeholder of a prepared statement. */
type Param = string | Placeholder;
const P = { studentId: sql.placeholder("studentId"), slug: sql.placeholder("slug"), exerciseId: sql.placeholder("exerciseId") };

const readingsJson = (studentId: Param, slug: Param) =>
  jsonRows(sql`select json_agg(json_build_object('readingsId', ${readingSets.readingsId}, 'mode', ${readingSets.mode}, 'material', ${readingSets.material},
    'unloadedCm', ${readingSets.unloadedCm}, 'resolutionCm', ${readingSets.resolutionCm}, 'points', ${readingSets.points}) order by ${readingSets.readingsId})
    from ${readingSets} where ${readingSets.studentId} = ${studentId} and ${readingSets.lessonSlug} = ${slug}`);

type AttemptRow = Pick<typeof exerciseAttempts.$inferSelect, "exerciseId" | "rawAnswer" | "outcome" | "correct" | "slipCode">;

const attemptsJson = (studentId: Param, slug: Param, exerciseId?: Param) =>
  jsonRows(sql`select json_agg(json_build_object('exerciseId', ${exerciseAttempts.exerciseId}, 'rawAnswer', ${exerciseAttempts.rawAnswer},
    'outcome', ${exerciseAttempts.outcome}, 'correct', ${exerciseAttempts.correct}, 'slipCode', ${exerciseAttempts.slipCode}) order by ${exerciseAttempts.createdAt})
    from ${exerciseAttempts} where ${exerciseAttempts.studentId} = ${studentId} and ${exerciseAttempts.lessonSlug} = ${slug}
    ${exerciseId === undefined ? sql`` : sql`and ${exerciseAttempts.exerciseId} = ${exerciseId}`}`);

/** The student's policy for this lesson (assignment, accommodation), as JSON rows (see policy.server.ts). */
const lessonPolicyJson = (db: Database) => policyRowsJson(db, P.studentId, (lessonSlug) => eq(lessonSlug, P.slug));

const exerciseContextStatement = preparedOnce((db) =>
  db
    .select({ readings: readingsJson(P.studentId, P.slug), past: attemptsJson(P.studentId, P.slug, P.exerciseId), policies: lessonPolicyJson(db) })
    .from(sql`(select 1) as one`)
    .prepare("exercise_context"),
);

/** An attempt and the student's place to continue from (the lesson visit), written by one statement, built once. */
const attemptWithVisitStatement = preparedOnce((db) => {
  const p = sql.placeholder;
  const attempt = db.$with("attempt", { saved: sql<number>`1` }).as(
    sql`${db
      .insert(exerciseAttempts)
      .values({
        studentId: P.studentId,
        lessonSlug: P.slug,
        exerciseId: P.exerciseId,
        rawAnswer: p("rawAnswer"),
        parsedValue: p("parsedValue"),
        parsedUnit: p("parsedUnit"),
        outcome: p("outcome"),
        correct: p("correct"),
        slipCode: p("slipCode"),
      })
      .getSQL()} returning 1`,
  );
  return db
    .with(attempt)
    .insert(lessonVisits)
    .values({ studentId: P.studentId, lessonSlug: P.slug, lastPlace: p("place") })
    .onConflictDoUpdate({ target: [lessonVisits.studentId, lessonVisits.lessonSlug], set: { lastPlace: sql`excluded.last_place`, updatedAt: sql`now()` } })
    .prepare("attempt_with_visit");
});

/** What the answer check needs: the student's readings, their earlier tries at this exercise and the lesson's policy, in one statement. */
async function exerciseContext(
  { db }: Db,
  studentId: string,
  slug: string,
  exerciseId: string,
): Promise<{ readings: SavedReadings[]; past: AttemptRow[]; policy: LessonPolicy | null }> {
  const [row] = await exerciseContextStatement(db).execute({ studentId, slug, exerciseId });
  return {
    readings: (row.readings as Parameters<typeof toSavedReadings>[0][]).map(toSavedReadings),
    past: row.past as AttemptRow[],
    policy: policiesOf(row.policies).get(slug) ?? null,
  };
}

export interface LessonState {
  exercises: Record<string, ExerciseState>;
  predictions: Record<string, string>;
  readings: Record<string, SavedReadings>;
  writtenAnswers: Record<string, { claim: string; evidence: string; reasoning: string; handedIn: boolean; reviewComment: string | null; reviewScores: unknown }>;
  photos: Record<string, { id: string; contentType: string; bytes: number }[]>;
  lastPlace: string | null;
  /** the parts that count for finishing the lesson (its required exercises and written answers), and how many are done: as /learn counts them */
  requiredDone: number;
  requiredTotal: number;
  complete: boolean;
  /** the teacher's assignment of this lesson to the student, or null when it is not assigned */
  assignment: AssignmentNotice | null;
}

const lessonRowsStatement = preparedOnce((db) => {
  const mine = (t: { studentId: AnyPgColumn; lessonSlug: AnyPgColumn }) => sql`${t.studentId} = ${P.studentId} and ${t.lessonSlug} = ${P.slug}`;
  return db
    .select({
      attempts: attemptsJson(P.studentId, P.slug),
      predictions: jsonRows(sql`select json_agg(json_build_object('predictionId', ${predictions.predictionId}, 'choice', ${predictions.choice}))
        from ${predictions} where ${mine(predictions)}`),
      readings: readingsJson(P.studentId, P.slug),
      answers: jsonRows(sql`select json_agg(json_build_object('answerId', ${writtenAnswers.answerId}, 'claim', ${writtenAnswers.claim},
        'evidence', ${writtenAnswers.evidence}, 'reasoning', ${writtenAnswers.reasoning}, 'handedIn', ${writtenAnswers.handedInAt} is not null,
        'reviewComment', ${writtenAnswers.reviewComment}, 'reviewScores', ${writtenAnswers.reviewScores}))
        from ${writtenAnswers} where ${mine(writtenAnswers)}`),
      photos: jsonRows(sql`select json_agg(json_build_object('photoId', ${photos.photoId}, 'id', ${photos.id}, 'contentType', ${photos.contentType},
        'bytes', ${photos.bytes}) order by ${photos.createdAt}) from ${photos} where ${mine(photos)}`),
      lastPlace: sql<string | null>`(select ${lessonVisits.lastPlace} from ${lessonVisits} where ${mine(lessonVisits)})`,
      policies: lessonPolicyJson(db),
    })
    .from(sql`(select 1) as one`)
    .prepare("lesson_rows");
});

/** Everything a student's lesson page shows, in one statement whatever the lesson: the student's rows and the policy. */
export async function loadLessonState({ db }: Db, studentId: string, slug: string): Promise<LessonState> {
  const [row] = await lessonRowsStatement(db).execute({ studentId, slug });
  const policy = policiesOf(row.policies).get(slug) ?? null;
  const attemptRows = row.attempts as AttemptRow[];
  const predictionRows = row.predictions as { predictionId: string; choice: string }[];
  const readings = (row.readings as Parameters<typeof toSavedReadings>[0][]).map(toSavedReadings);
  const answerRows = row.answers as ({ answerId: string } & LessonState["writtenAnswers"][string])[];
  const photoRows = row.photos as { photoId: string; id: string; contentType: string; bytes: number }[];

  const { exercises: definitions, writtenAnswers: requiredAnswers = [] } = lessonExercises(slug);
  const exercises: Record<string, ExerciseState> = {};
  for (const definition of definitions) {
    const instance = exerciseInstance(studentId, slug, definition, readings);
    const mine = attemptRows.filter((a) => a.exerciseId === definition.id);
    exercises[definition.id] = exerciseState(definition, instance, mine, attemptsAllowed(policy, definition));
  }

  const answers: LessonState["writtenAnswers"] = {};
  for (const { answerId, ...answer } of answerRows) answers[answerId] = answer;
  const photoMap: LessonState["photos"] = {};
  for (const p of photoRows) (photoMap[p.photoId] ??= []).push({ id: p.id, contentType: p.contentType, bytes: p.bytes });

  // An exercise is done when it is right or its tries are used up; a written answer when it is handed in.
  const required = Object.values(exercises).filter((e) => e.required);
  const requiredDone = required.filter((e) => e.status !== "open").length + requiredAnswers.filter((id) => answers[id]?.handedIn).length;
  const requiredTotal = required.length + requiredAnswers.length;
  const complete = requiredDone === requiredTotal;

  return {
    exercises,
    predictions: Object.fromEntries(predictionRows.map((p) => [p.predictionId, p.choice])),
    readings: Object.fromEntries(readings.map((r) => [r.readingsId, r])),
    writtenAnswers: answers,
    photos: photoMap,
    lastPlace: row.lastPlace ?? null,
    requiredDone,
    requiredTotal,
    complete,
    assignment: assignmentNotice(policy),
  };
}

function exerciseState(
  definition: ExerciseDefinition,
  instance: ExerciseInstance,
  attempts: AttemptRow[],
  allowed: number,
): ExerciseState {
  const counted = attempts.filter((a) => !NO_TRY_OUTCOMES.has(a.outcome));
  const right = attempts.some((a) => a.correct === 1);
  const status: ExerciseStatus = right ? "right" : counted.length >= allowed ? "used-up" : "open";
  const last = attempts.at(-1);
  let lastFeedback: Feedback | null = null;
  if (last) {
    const again = judge(instance, definition, submissionFromRaw(definition, last.rawAnswer));
    // The stored slip, as it was told when the answer was checked.
    lastFeedback = { ...feedbackOf(again.result, instance, last.correct === 1, status === "used-up"), slipCode: last.slipCode };
  }
  return {
    id: definition.id,
    kind: definition.kind,
    title: definition.title,
    required: definition.required ?? true,
    prompt: promptOf(instance),
    attemptsUsed: counted.length,
    attemptsAllowed: allowed,
    status,
    lastAnswer: last?.rawAnswer ?? null,
    lastFeedback,
    solution: status === "open" ? null : instance.solution,
  };
}

/** Rebuilds a submission from what was stored, to show the last feedback again after a reload. */
function submissionFromRaw(definition: ExerciseDefinition, raw: string): Submission {
  try {
    if (definition.kind === "choice") {
      const { choice, reason } = JSON.parse(raw) as { choice: string; reason: string };
      return { kind: "choice", choice: String(choice), reason: String(reason ?? "") };
    }
    if (definition.kind === "table") return { kind: "cells", cells: (JSON.parse(raw) as unknown[]).map(String) };
  } catch {
    // An unreadable stored answer shows as unreadable feedback.
  }
  return { kind: "text", answer: raw };
}

// ───────────────────────────── Saving the other parts ─────────────────────────────

export async function touchVisit({ db }: Db, studentId: string, slug: string, place: string | null) {
  await visitUpsert({ db }, studentId, slug, place);
}

function visitUpsert({ db }: Db, studentId: string, slug: string, place: string | null) {
  return db
    .insert(lessonVisits)
    .values({ studentId, lessonSlug: slug, lastPlace: place })
    .onConflictDoUpdate({
      target: [lessonVisits.studentId, lessonVisits.lessonSlug],
      set: { lastPlace: place ?? sql`${lessonVisits.lastPlace}`, updatedAt: sql`now()` },
    });
}

export async function savePrediction({ db }: Db, studentId: string, slug: string, predictionId: string, choice: string) {
  // A committed prediction is kept as it was: the first one stands.
  await db.insert(predictions).values({ studentId, lessonSlug: slug, predictionId, choice }).onConflictDoNothing();
  await touchVisit({ db }, studentId, slug, `prediction-${predictionId}`);
}

export async function saveReadings({ db }: Db, studentId: string, slug: string, set: SavedReadings) {
  const values = {
    studentId,
    lessonSlug: slug,
    readingsId: set.readingsId,
    mode: set.mode,
    material: set.material,
    unloadedCm: set.unloadedCm,
    resolutionCm: set.resolutionCm,
    points: set.points,
  };
  await db
    .insert(readingSets)
    .values(values)
    .onConflictDoUpdate({
      target: [readingSets.studentId, readingSets.lessonSlug, readingSets.readingsId],
      set: { ...values, updatedAt: sql`now()` },
    });
  await touchVisit({ db }, studentId, slug, `readings-${set.readingsId}`);
}

/**
 * Saves a written answer as a draft or hands it in. A handed-in answer is what the teacher reads, so a
 * draft never overwrites it ("already-handed-in"); handing in again replaces it and stamps the new time,
 * so a late second hand-in counts as late.
 */
export async function saveWrittenAnswer(
  { db }: Db,
  studentId: string,
  slug: string,
  answerId: string,
  /** the parts to save; a part left out of a draft keeps what it has (a hand-in gives all three) */
  parts: { claim?: string; evidence?: string; reasoning?: string },
  handIn: boolean,
): Promise<"saved" | "already-handed-in"> {
  const text = Object.fromEntries(Object.entries(parts).filter(([, value]) => value !== undefined)) as typeof parts;
  const values = { studentId, lessonSlug: slug, answerId, ...text, handedInAt: handIn ? new Date() : null };
  const written = await db
    .insert(writtenAnswers)
    .values(values)
    .onConflictDoUpdate({
      target: [writtenAnswers.studentId, writtenAnswers.lessonSlug, writtenAnswers.answerId],
      set: { ...text, handedInAt: handIn ? sql`now()` : sql`${writtenAnswers.handedInAt}`, updatedAt: sql`now()` },
      ...(handIn ? {} : { setWhere: sql`${writtenAnswers.handedInAt} is null` }),
    })
    .returning({ answerId: writtenAnswers.answerId });
  await touchVisit({ db }, studentId, slug, `answer-${answerId}`);
  return written.length > 0 ? "saved" : "already-handed-in";
}

// ───────────────────────────── The course path ─────────────────────────────

export interface LessonProgress {
  slug: string;
  number: number;
  title: string;
  summary: string;
  minutes: number;
  requiredDone: number;
  requiredTotal: number;
  complete: boolean;
  started: boolean;
  lastPlace: string | null;
  updatedAt: Date | null;
}

/** Progress through every lesson for one student, in four queries whatever the course size. */
export async function courseProgress({ db }: Db, studentId: string): Promise<LessonProgress[]> {
  const lessons = listLessons();
  const slugs = lessons.map((l) => l.slug);
  if (slugs.length === 0) return [];
  const [attemptRows, answerRows, visitRows, policies] = await Promise.all([
    db
      .select({
        lessonSlug: exerciseAttempts.lessonSlug,
        exerciseId: exerciseAttempts.exerciseId,
        right: sql<number>`max(${exerciseAttempts.correct})`,
        counted: sql<number>`count(*) filter (where ${exerciseAttempts.outcome} not in ${NO_TRY_OUTCOMES_SQL})`,
      })
      .from(exerciseAttempts)
      .where(and(eq(exerciseAttempts.studentId, studentId), inArray(exerciseAttempts.lessonSlug, slugs)))
      .groupBy(exerciseAttempts.lessonSlug, exerciseAttempts.exerciseId),
    db
      .select({ lessonSlug: writtenAnswers.lessonSlug, answerId: writtenAnswers.answerId, handedInAt: writtenAnswers.handedInAt })
      .from(writtenAnswers)
      .where(eq(writtenAnswers.studentId, studentId)),
    db.select().from(lessonVisits).where(eq(lessonVisits.studentId, studentId)),
    lessonPolicies({ db }, studentId, slugs),
  ]);
  return lessons.map((lesson) => {
    const policy = policies.get(lesson.slug) ?? null;
    const { exercises, writtenAnswers: required = [] } = lessonExercises(lesson.slug);
    const requiredExercises = exercises.filter((e) => e.required ?? true);
    const done = requiredExercises.filter((e) => {
      const row = attemptRows.find((a) => a.lessonSlug === lesson.slug && a.exerciseId === e.id);
      return row && (Number(row.right) === 1 || Number(row.counted) >= attemptsAllowed(policy, e));
    }).length;
    const handedIn = required.filter((id) =>
      answerRows.some((a) => a.lessonSlug === lesson.slug && a.answerId === id && a.handedInAt),
    ).length;
    const visit = visitRows.find((v) => v.lessonSlug === lesson.slug);
    const requiredTotal = requiredExercises.length + required.length;
    const requiredDone = done + handedIn;
    return {
      slug: lesson.slug,
      number: lesson.number,
      title: lesson.title,
      summary: lesson.summary,
      minutes: lesson.minutes,
      requiredDone,
      requiredTotal,
      complete: requiredDone === requiredTotal,
      started: Boolean(visit) || requiredDone > 0,
      lastPlace: visit?.lastPlace ?? null,
      updatedAt: visit?.updatedAt ?? null,
    };
  });
}

/** An assigned lesson as continueTarget needs it (see assignedLessonsFor). */
export interface AssignedForContinue {
  slug: string;
  dueAt: string;
  dueText: string;
  opened: boolean;
  latePolicy: LessonPolicy["latePolicy"];
}

export interface ContinueTarget {
  slug: string;
  place: string | null;
  /** set when the lesson was chosen for its due date: that date, as the student's list shows it */
  due: { text: string; passed: boolean } | null;
  /** the lesson last worked on, when "continue" goes to a lesson that is due instead */
  stoppedAt: { slug: string; place: string | null } | null;
}

/** Assigned work due within this many days comes before the lesson last worked on. */
export const DUE_SOON_DAYS = 7;

/**
 * Where "continue" goes. An assigned lesson that is open, not finished, still takes answers and is due
 * within DUE_SOON_DAYS (or already past due) comes first, soonest due first: that is the work the
 * teacher is waiting for. Otherwise the lesson last worked on that is not finished (or the first not
 * finished), each at its last place.
 */
export function continueTarget(progress: LessonProgress[], assigned: AssignedForContinue[] = [], now: Date = new Date()): ContinueTarget | null {
  const open = progress.filter((p) => !p.complete);
  if (open.length === 0) return null;
  const lastWorked = open
    .filter((p) => p.updatedAt)
    .sort((a, b) => (b.updatedAt?.getTime() ?? 0) - (a.updatedAt?.getTime() ?? 0))[0];
  const soon = now.getTime() + DUE_SOON_DAYS * DAY_MS;
  const due = [...assigned]
    .sort((a, b) => a.dueAt.localeCompare(b.dueAt))
    .find((a) => {
      const dueAt = new Date(a.dueAt);
      const takesAnswers = !closedForAnswers({ latePolicy: a.latePolicy, dueAt }, now);
      return a.opened && takesAnswers && dueAt.getTime() <= soon && open.some((p) => p.slug === a.slug);
    });
  if (due) {
    const lesson = open.find((p) => p.slug === due.slug)!;
    return {
      slug: lesson.slug,
      place: lesson.lastPlace,
      due: { text: due.dueText, passed: Date.parse(due.dueAt) <= now.getTime() },
      stoppedAt: lastWorked && lastWorked.slug !== lesson.slug ? { slug: lastWorked.slug, place: lastWorked.lastPlace } : null,
    };
  }
  const target = lastWorked ?? open[0];
  return { slug: target.slug, place: target.lastPlace, due: null, stoppedAt: null };
}
