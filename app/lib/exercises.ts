// What a lesson's exercise generators produce, and how an instance is shown to a student.
// A generator runs on the server only (lessons/<NN>-<slug>/exercises.server.ts); the expected answer
// and the worked solution never leave the server until the student has used every attempt.
import type { ExpectedAnswer } from "./answer-checker";
import type { AnalysisResult, Mode } from "./science";
import { seededRandom, type SeededRandom } from "./seeded-random";

/**
 * The kinds of exercise:
 * - "number": a number with a unit;
 * - "ratio": a plain number (no unit), such as how many times stiffer;
 * - "choice": pick one option and give a reason (the choice is checked, the reason kept for the teacher);
 * - "table": fill in the empty cells of a table, each a number with a unit;
 * - "own-data": a number checked against the student's own saved readings.
 */
export type ExerciseKind = "number" | "ratio" | "choice" | "table" | "own-data";

export interface ChoiceOption {
  value: string;
  label: string;
}

/** A table to complete: `null` cells are the ones the student fills in. */
export interface TableTemplate {
  columns: string[];
  rows: (string | null)[][];
}

/** What the student sees of an instance. */
export interface ExercisePrompt {
  /** the question, with this student's numbers; plain text, one paragraph per line */
  prompt: string;
  /** shown after a wrong answer */
  hint: string;
  choices?: ChoiceOption[];
  table?: TableTemplate;
  /** own-data exercises before the readings are saved */
  waitingForReadings?: boolean;
}

/** What the server keeps to itself until the attempts are used up. */
export interface ExerciseKey {
  /** number, ratio and own-data exercises */
  expected?: ExpectedAnswer;
  /** choice exercises: the right option's value */
  correctChoice?: string;
  /** table exercises: the expected answer of each empty cell, in reading order */
  cells?: ExpectedAnswer[];
  /** the worked solution with this student's numbers */
  solution: string;
}

export type ExerciseInstance = ExercisePrompt & ExerciseKey;

/** What a generator gets besides its seeded random numbers. */
export interface GeneratorContext {
  /** the analysis of the student's saved readings, for own-data exercises (null before they save any) */
  ownData: (AnalysisResult & { mode: Mode; unloadedCm: number | null }) | null;
}

export interface ExerciseDefinition {
  /** unique within the lesson; used in the MDX as <Exercise id="…" /> */
  id: string;
  kind: ExerciseKind;
  /** a short name for the teacher's gradebook */
  title: string;
  /** counts toward finishing the lesson (default true) */
  required?: boolean;
  /** how many tries a student has (default DEFAULT_ATTEMPTS); a choice allows at most one fewer than its options */
  attempts?: number;
  /** own-data exercises: the readings set they read (the id of a <ReadingsEntry />) */
  readingsId?: string;
  generate(random: SeededRandom, context: GeneratorContext): ExerciseInstance;
}

/** What a lesson's exercises.server.ts exports. */
export interface LessonExercises {
  exercises: ExerciseDefinition[];
  /** ids of the written claim–evidence–reasoning answers the lesson asks for (each must be handed in) */
  writtenAnswers?: string[];
}

export const DEFAULT_ATTEMPTS = 3;

/** What ownAttempts needs of an exercise (tests may give a bare `{ id, attempts }`). */
export type AttemptsOf = Pick<ExerciseDefinition, "id"> & Partial<Pick<ExerciseDefinition, "attempts" | "kind" | "generate">>;

const optionCounts = new WeakMap<object, number>();

/**
 * How many options a choice exercise offers. The options' labels may carry a student's numbers, but
 * not their number (tests/unit/exercises-tries.test.ts checks every lesson over many seeds), so one
 * instance made with a fixed seed tells, once per definition.
 */
function optionCount(exercise: AttemptsOf): number | null {
  if (exercise.kind !== "choice" || !exercise.generate) return null;
  let count = optionCounts.get(exercise);
  if (count === undefined) {
    count = exercise.generate(seededRandom("count the options"), { ownData: null }).choices?.length ?? 0;
    optionCounts.set(exercise, count);
  }
  return count;
}

/**
 * The tries an exercise allows before any accommodation: its own `attempts` (DEFAULT_ATTEMPTS when it
 * gives none), and for a choice at most one fewer than its options, never fewer than 1, so that
 * trying every option in turn cannot end "right" (two options: one try). Every place that counts
 * tries goes through attemptsAllowed in course.server.ts, which adds the accommodation's extra tries.
 */
export function ownAttempts(exercise?: AttemptsOf): number {
  const own = exercise?.attempts ?? DEFAULT_ATTEMPTS;
  const options = exercise ? optionCount(exercise) : null;
  return options === null ? own : Math.max(1, Math.min(own, options - 1));
}

/** Only the part of an instance a student may see. */
export function promptOf(instance: ExerciseInstance): ExercisePrompt {
  const { prompt, hint, choices, table, waitingForReadings } = instance;
  return { prompt, hint, choices, table, waitingForReadings };
}
