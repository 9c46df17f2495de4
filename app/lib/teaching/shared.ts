// The parts of the teaching model that pages render in the browser too: the gradebook's shapes and
// filters, the late-work rules' names, the review rubric and how roster problems are placed.
// No database here (the *.server.ts modules hold that).
/** The same values as the late_policy enum in the schema. */
export type LatePolicy = "accept" | "penalty" | "closed";

export interface GradebookLesson {
  assignmentId: string;
  slug: string;
  number: number | null;
  title: string;
  opensAt: string;
  dueAt: string;
  latePolicy: LatePolicy;
  latePenaltyPercent: number;
  opened: boolean;
  exercises: { id: string; title: string; required: boolean }[];
  /** false for a lesson that has left the course since it was assigned */
  inCourse: boolean;
}

export type CellStatus = "not-started" | "working" | "complete";

export interface GradebookCell {
  status: CellStatus;
  requiredDone: number;
  requiredTotal: number;
  /** 0–100, or null before the student starts */
  score: number | null;
  /** the student's own due date */
  dueAt: string;
  /** the student has an accommodation for this lesson (shown to the teacher only) */
  accommodated: boolean;
  /** the lesson counts in the student's average (AVERAGE_RULE): open, and started or past the student's due date */
  counted: boolean;
  overdue: boolean;
  finishedLate: boolean;
  /** ids of exercises the student is stuck on */
  stuckOn: string[];
  /** written answers handed in and not yet reviewed (or handed in again since) */
  toReview: number;
  lastActivity: string | null;
}

export interface GradebookStudent {
  id: string;
  displayName: string;
  username: string | null;
  studentNumber: string | null;
}

export interface GradebookRow {
  student: GradebookStudent;
  cells: Record<string, GradebookCell>;
  lessonsComplete: number;
  /** the mean of the counted cells' scores (AVERAGE_RULE); null while no lesson counts yet */
  averageScore: number | null;
  notStarted: boolean;
  late: boolean;
  stuck: boolean;
}

export interface ClassSummary {
  students: number;
  lessons: number;
  /** complete cells ÷ (students × lessons), 0–100 */
  completePercent: number | null;
  /** the mean of the students' averages, of those with an average (AVERAGE_RULE) */
  averageScore: number | null;
  /** how many students have an average, i.e. at least one lesson that counts */
  averagedStudents: number;
  notStarted: number;
  late: number;
  stuck: number;
  toReview: number;
}

export interface Gradebook {
  classId: string;
  lessons: GradebookLesson[];
  rows: GradebookRow[];
  summary: ClassSummary;
  generatedAt: string;
  /** Which computation of a kept gradebook this is: the page's refresh sends it back, and hears "unchanged" while it still holds. */
  revision?: string;
}

/**
 * Which lessons a student's average counts, in words: the gradebook's legend and its CSV export say
 * this, and `counted` on each cell (gradebook.server.ts) applies it.
 */
export const AVERAGE_RULE =
  "A lesson counts in a student's average once they have started it, or once its due date for them has passed (not started by then, it counts as 0). A lesson not started and not yet due does not count yet.";

/** The score a cell adds to averages: its score (0 when not started), or null while it does not count. */
export function countedScore(cell: GradebookCell | undefined): number | null {
  return cell?.counted ? (cell.score ?? 0) : null;
}

/** The rounded mean of the numbers given, leaving out nulls; null when there are none. */
export function meanOf(values: (number | null)[]): number | null {
  const present = values.filter((v): v is number => v !== null);
  return present.length > 0 ? Math.round(present.reduce((a, b) => a + b, 0) / present.length) : null;
}

/** The class's average for one lesson: the mean of the students' counted scores for it. */
export function lessonAverage(rows: GradebookRow[], assignmentId: string): number | null {
  return meanOf(rows.map((r) => countedScore(r.cells[assignmentId])));
}

export type GradebookFilter = "everyone" | "not-started" | "late" | "stuck";
/** Wrong answers to one exercise, with no right one yet, after which a student shows as stuck. */
export const STUCK_AFTER_WRONG = 2;

/** The gradebook's filters; `means` says whom each one shows (under the filters, and on hover). */
export const GRADEBOOK_FILTERS: { value: GradebookFilter; label: string; means: string }[] = [
  { value: "everyone", label: "Everyone", means: "Every student in the class." },
  { value: "not-started", label: "Not started", means: "Students who have not started at least one lesson that is open to them." },
  { value: "late", label: "Late", means: "Students with a lesson past its due date and not finished, or finished after it." },
  { value: "stuck", label: "Stuck", means: `Students with ${STUCK_AFTER_WRONG} or more wrong answers to one exercise and no right one yet.` },
];

export function filterRows(rows: GradebookRow[], filter: GradebookFilter): GradebookRow[] {
  if (filter === "not-started") return rows.filter((r) => r.notStarted);
  if (filter === "late") return rows.filter((r) => r.late);
  if (filter === "stuck") return rows.filter((r) => r.stuck);
  return rows;
}

/** The most a teacher can add for one student: tries per exercise, and days. */
export const MAX_EXTRA_ATTEMPTS = 20;
export const MAX_EXTRA_DAYS = 60;
/** The most credit a late answer can lose per day, in percent (lateCredit). */
export const MAX_PENALTY_PERCENT = 100;

/** The longest class name, counted after trimming and joining runs of spaces. */
export const CLASS_NAME_MAX = 80;

/**
 * Text without the invisible control characters a paste can carry (NUL, backspace, escape…), which
 * PostgreSQL refuses to store and nobody can see or mean; tabs and line ends stay.
 */
export const withoutControlCharacters = (text: string) => text.replace(/[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/g, "");

/** A class name as it is kept and compared: no control characters, trimmed, each run of spaces one space. */
export const tidyClassName = (name: string) => withoutControlCharacters(name).trim().replace(/\s+/g, " ");

/** What is wrong with a typed class name, for beside the field, or null; nothing is cut. */
export function classNameProblem(typed: string, empty: string): string | null {
  const length = [...tidyClassName(typed)].length;
  if (length === 0) return empty;
  if (length > CLASS_NAME_MAX) return `A class name can be at most ${CLASS_NAME_MAX} characters; this one has ${length.toLocaleString("en-US")}.`;
  return null;
}

/** "from 1 to 5,000": the range of a number field, as its hint and its messages say it. */
export const rangeWords = (min: number, max: number) => `from ${min.toLocaleString("en-US")} to ${max.toLocaleString("en-US")}`;

/**
 * A whole number typed into a form field: digits only (spaces, thin spaces or commas between groups of
 * three are fine), from `min` to `max`. "1e3", "2.5", "-5" and an empty field are refused with a
 * sentence for beside the field; nothing is rounded or cut.
 */
export function readWholeNumber(raw: unknown, min: number, max: number, unit?: string): { ok: true; value: number } | { ok: false; message: string } {
  const spaced = typeof raw === "string" ? raw.replace(/[\s\u2009\u202f]/g, "") : "";
  const text = /^\d{1,3}(,\d{3})+$/.test(spaced) ? spaced.replaceAll(",", "") : spaced; // "5,000"; never "2,5"
  const wanted = `a whole number${unit ? ` of ${unit}` : ""} ${rangeWords(min, max)}`;
  if (text === "") return { ok: false, message: `Enter ${wanted}.` };
  if (!/^\d+$/.test(text)) return { ok: false, message: `Use digits only: ${wanted}.` };
  const value = Number(text);
  if (value < min || value > max) return { ok: false, message: `That is outside the range: enter ${wanted}.` };
  return { ok: true, value };
}

export const LATE_POLICY_WORDS: Record<LatePolicy, string> = {
  accept: "Late work counts in full",
  penalty: "Late work loses credit each day",
  closed: "Closed at the due date",
};

/** The late-work rule in plain words, for the summary of an assigned lesson: "late answers lose 5% of their credit a day" (lateCredit). */
export function lateRuleInWords(policy: LatePolicy, penaltyPercent: number): string {
  if (policy === "closed") return "closes at the due date";
  if (policy === "penalty" && penaltyPercent > 0) return `late answers lose ${penaltyPercent}% of their credit a day`;
  return "late answers count in full";
}

/**
 * The username rule, in one place: the pattern the roster checks (roster.server.ts, usernameProblem)
 * and the words the roster form's hint and the error for a username that breaks it both say.
 */
export const USERNAME_MIN = 3;
export const USERNAME_MAX = 40;
export const USERNAME_PATTERN = new RegExp(`^[a-z0-9][a-z0-9._-]{${USERNAME_MIN - 2},${USERNAME_MAX - 2}}[a-z0-9]$`);
export const USERNAME_CHARACTERS = "letters a–z, digits, dots, hyphens and underscores";
export const USERNAME_ENDS = "starting and ending with a letter or digit";
/** "3 to 40 letters a–z, digits, dots, hyphens and underscores, starting and ending with a letter or digit" */
export const USERNAME_RULE = `${USERNAME_MIN} to ${USERNAME_MAX} ${USERNAME_CHARACTERS}, ${USERNAME_ENDS}`;

export const RUBRIC = [
  { key: "claim", label: "Claim", levels: ["Missing or off the question", "Answers the question, but vaguely", "A clear, precise answer to the question"] },
  { key: "evidence", label: "Evidence", levels: ["No data", "Some data, not all of it fits", "The right numbers from the data, with units"] },
  { key: "reasoning", label: "Reasoning", levels: ["No link to the science", "A link, partly explained", "Explains why the evidence supports the claim"] },
] as const;

/** The longest comment on a written answer; a longer one is refused whole, never cut. */
export const REVIEW_COMMENT_MAX = 2000;

export type RubricScores = { claim: number; evidence: number; reasoning: number };

export function isRubricScores(value: unknown): value is RubricScores {
  if (!value || typeof value !== "object") return false;
  const v = value as Record<string, unknown>;
  return RUBRIC.every((r) => Number.isInteger(v[r.key]) && (v[r.key] as number) >= 0 && (v[r.key] as number) <= 2);
}

export const rubricTotal = (s: RubricScores) => s.claim + s.evidence + s.reasoning;

export interface RosterProblem {
  /** the file's row (1 is the header), or null for the file as a whole */
  row: number | null;
  /** the column's name as the file has it, or null */
  column: string | null;
  message: string;
}

/** Where a problem is: "Row 4, column “username”" or "The file". */
export function problemPlace(problem: RosterProblem): string {
  if (problem.row === null) return problem.column ? `Column “${problem.column}”` : "The file";
  return problem.column ? `Row ${problem.row}, column “${problem.column}”` : `Row ${problem.row}`;
}


/** Students in the order teachers read a list of names: by name as people read it (Émile among the E's, not after Z), then username. */
export const byStudentName = (a: { displayName: string; username: string | null }, b: { displayName: string; username: string | null }) =>
  a.displayName.localeCompare(b.displayName) || (a.username ?? "").localeCompare(b.username ?? "");
