// A class's roster: students added one by one or from a CSV file, moved between the teacher's
// classes, taken out of a class, given a new password. A child's account holds only a display name,
// a username, a grade band and (optionally) the school's own student number.
//
// A CSV file is checked in full first (every problem named by row and column) and saved only when it
// has none, all rows in one transaction: a file with one bad row saves nothing. Each student takes a
// seat of the school through the seat rules (enrollStudentUsingSeat); a refused seat undoes the file.
import { randomInt } from "node:crypto";
import Papa from "papaparse";
import { and, asc, eq, inArray, isNull, ne } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { classes, enrollments, memberships, users } from "~/db/schema.server";
import { resetChildPassword } from "~/lib/auth.server";
import { checkNewPassword } from "~/lib/auth/password-rules.server";
import { hashPassword } from "~/lib/passwords.server";
import { enrollStudentUsingSeat, releaseSeat, seatLedgerForYear, type SeatRefusal } from "~/lib/seats.server";
import type { TeacherClass } from "./classes.server";
import { USERNAME_CHARACTERS, USERNAME_ENDS, USERNAME_MAX, USERNAME_MIN, USERNAME_PATTERN, USERNAME_RULE, byStudentName, withoutControlCharacters, type RosterProblem } from "./shared";

export { problemPlace, type RosterProblem } from "./shared";

type Db = { db: Database };
type Tx = Parameters<Parameters<Database["transaction"]>[0]>[0];
export type GradeBand = "6-8" | "9-10";

export const MAX_ROSTER_ROWS = 300;
export const MAX_ROSTER_BYTES = 200_000;

// ───────────────────────────── Names, usernames, numbers ─────────────────────────────


/** The message for a display name, or null when it is fine. */
export function displayNameProblem(name: string): string | null {
  if (!name) return "The display name is missing.";
  if ([...name].length > 60) return "The display name is longer than 60 characters.";
  if (/[\u0000-\u001f<>]/.test(name)) return "The display name has characters we cannot keep (such as < or >).";
  return null;
}

/** The message for a (lower-cased) username, or null when it is fine. */
export function usernameProblem(username: string): string | null {
  if (!username) return "The username is missing.";
  if (username.length < USERNAME_MIN) return `The username “${username}” is shorter than ${USERNAME_MIN} characters.`;
  if (username.length > USERNAME_MAX) return `The username is longer than ${USERNAME_MAX} characters.`;
  if (!USERNAME_PATTERN.test(username)) return `The username “${username}” may use only ${USERNAME_CHARACTERS}, ${USERNAME_ENDS}.`;
  return null;
}

export function studentNumberProblem(value: string): string | null {
  if (value.length > 30) return "The student number is longer than 30 characters.";
  if (!/^[A-Za-z0-9._/-]*$/.test(value)) return `The student number “${value}” may use only letters, digits and . _ / -`;
  return null;
}

// Our own short words, for first passwords a child can type: "cedar-brook-47".
const WORDS = [
  "amber", "birch", "brook", "cedar", "cliff", "cloud", "coral", "crane", "delta", "dune", "ember", "fern",
  "field", "flint", "frost", "grove", "harbor", "hazel", "heron", "island", "jade", "kelp", "lake", "lark",
  "maple", "marsh", "meadow", "moss", "north", "oak", "orbit", "otter", "pebble", "pine", "plain", "quartz",
  "rain", "reed", "ridge", "river", "robin", "sage", "shore", "slate", "spruce", "stone", "storm", "summit",
  "thistle", "tide", "timber", "valley", "willow", "wren",
];

/** A first password a child can read and type; shown to the teacher once, never stored in plain text. */
export function newStudentPassword(): string {
  const word = () => WORDS[randomInt(WORDS.length)];
  let password = "";
  do password = `${word()}-${word()}-${randomInt(10, 100)}`;
  while (checkNewPassword(password) !== null);
  return password;
}

// ───────────────────────────── Reading a roster file ─────────────────────────────

export interface RosterRow {
  /** the line of the file (1 is the header) */
  row: number;
  displayName: string;
  username: string;
  studentNumber: string;
}

export interface RosterPreview {
  rows: RosterRow[];
  problems: RosterProblem[];
  /** columns the file has that we do not keep (children's data: only what is needed) */
  ignoredColumns: string[];
  /** the column names as the file writes them */
  columns: { displayName: string; username: string; studentNumber: string };
  seats: { schoolYear: string; free: number };
  /** set when the file has more students than the school has free seats */
  seatShortage: SeatRefusal | null;
}

const COLUMN_NAMES: Record<"displayName" | "username" | "studentNumber", string[]> = {
  displayName: ["displayname", "name", "studentname", "fullname"],
  username: ["username", "user", "login"],
  studentNumber: ["studentnumber", "number", "studentid", "studentno", "id"],
};

const squash = (header: string) => header.toLowerCase().replace(/[^a-z0-9]/g, "");

/**
 * Reads a roster CSV (a header row, then one student a row) and names every problem by row and
 * column, including usernames already taken at the school and a shortage of seats. Saves nothing.
 */
export async function previewRoster({ db }: Db, klass: Pick<TeacherClass, "id" | "organisationId" | "schoolYear">, text: string): Promise<RosterPreview> {
  const { rows, problems, ignoredColumns, columns } = parseRosterCsv(text);
  const usernames = [...new Set(rows.map((r) => r.username).filter((u) => u && !usernameProblem(u)))];
  const [taken, ledger] = await Promise.all([
    usernames.length === 0
      ? Promise.resolve([])
      : db
          .select({ username: users.username })
          .from(users)
          .where(and(eq(users.homeOrganisationId, klass.organisationId), inArray(users.username, usernames))),
    seatLedgerForYear({ db }, klass.organisationId, klass.schoolYear),
  ]);
  const takenSet = new Set(taken.map((t) => t.username));
  const usernameColumn = columns.username;
  for (const row of rows) {
    if (takenSet.has(row.username)) {
      problems.push({
        row: row.row,
        column: usernameColumn,
        message: `The username “${row.username}” is already used by a student at your school. Choose another (for example “${row.username}2”), or add that student from their account.`,
      });
    }
  }
  let seatShortage: SeatRefusal | null = null;
  if (rows.length > 0 && problems.length === 0 && rows.length > ledger.free) {
    const problem: RosterProblem = {
      row: null,
      column: null,
      message:
        ledger.free === 0
          ? `Your school has no free seats for ${ledger.schoolYear}, so these ${rows.length} students cannot be added. Seats need to be bought first.`
          : `This file has ${rows.length} students, but your school has only ${ledger.free} free seats for ${ledger.schoolYear}. Nothing was saved. More seats need to be bought first, or upload fewer students.`,
    };
    problems.push(problem);
    seatShortage = { ok: false, reason: "no-free-seat", message: problem.message, ledger };
  }
  problems.sort((a, b) => (a.row ?? 0) - (b.row ?? 0));
  return { rows, problems, ignoredColumns, columns, seats: { schoolYear: ledger.schoolYear, free: ledger.free }, seatShortage };
}

const stripBom = (text: string) => text.replace(/^\uFEFF/, "");

/** Commas, or the semicolons and tabs that some spreadsheet programs write instead, judged by the header row. */
function delimiterOf(text: string): string {
  const header = text.split(/\r?\n/).find((line) => line.trim() !== "") ?? "";
  const counts = [",", ";", "\t"].map((d) => ({ d, n: header.split(d).length - 1 }));
  return counts.sort((a, b) => b.n - a.n)[0].n > 0 ? counts[0].d : ",";
}

/** The pure part of reading a roster: columns, each row's fields and their problems. */
export function parseRosterCsv(text: string): {
  rows: RosterRow[];
  problems: RosterProblem[];
  ignoredColumns: string[];
  /** the column names as the file writes them */
  columns: Record<keyof typeof COLUMN_NAMES, string>;
} {
  const columns = { displayName: "display name", username: "username", studentNumber: "student number" };
  const problems: RosterProblem[] = [];
  // Blank lines are kept (and skipped below) so that row numbers match the rows of the spreadsheet.
  const source = stripBom(text);
  const parsed = Papa.parse<string[]>(source, { skipEmptyLines: false, delimiter: delimiterOf(source) });
  const isBlank = (line: string[]) => line.every((c) => String(c ?? "").trim() === "");
  const lines = parsed.data;
  const headerAt = lines.findIndex((line) => !isBlank(line));
  if (headerAt < 0) {
    return { rows: [], ignoredColumns: [], columns, problems: [{ row: null, column: null, message: "The file is empty. Put a header row (display name, username, student number) and one student on each row after it." }] };
  }
  const header = lines[headerAt].map((h) => h.trim());
  const index = (key: keyof typeof COLUMN_NAMES) => header.findIndex((h) => COLUMN_NAMES[key].includes(squash(h)));
  const at = { displayName: index("displayName"), username: index("username"), studentNumber: index("studentNumber") };
  const known = new Set(Object.values(at).filter((i) => i >= 0));
  const ignoredColumns = header.filter((h, i) => !known.has(i) && h !== "");
  if (at.displayName < 0 || at.username < 0) {
    const missing = [at.displayName < 0 ? "“display name”" : null, at.username < 0 ? "“username”" : null].filter(Boolean).join(" and ");
    problems.push({
      row: headerAt + 1,
      column: null,
      message: `The first row must name the columns. ${missing} ${missing.includes(" and ") ? "are" : "is"} missing; found ${header.map((h) => `“${h}”`).join(", ") || "nothing"}. Example: display name,username,student number`,
    });
    return { rows: [], problems, ignoredColumns: [], columns };
  }
  const names = { displayName: header[at.displayName], username: header[at.username], studentNumber: at.studentNumber >= 0 ? header[at.studentNumber] : columns.studentNumber };

  // papaparse's own complaints (an unclosed quote, a row of the wrong length) come with a row index.
  for (const error of parsed.errors) {
    if (error.row === undefined) problems.push({ row: null, column: null, message: `The file cannot be read as CSV: ${error.message}.` });
  }
  const byRow = new Map(parsed.errors.filter((e) => e.row !== undefined).map((e) => [e.row!, e]));

  const rows: RosterRow[] = [];
  const firstRowOf = new Map<string, number>();
  for (let i = headerAt + 1; i < lines.length; i++) {
    const line = lines[i];
    if (isBlank(line)) continue;
    const rowNumber = i + 1;
    const error = byRow.get(i);
    if (error) problems.push({ row: rowNumber, column: null, message: `This row cannot be read: ${error.message}.` });
    const extra = line.slice(header.length).filter((c) => String(c ?? "").trim() !== "");
    if (extra.length > 0) {
      problems.push({ row: rowNumber, column: null, message: `This row has ${line.length} cells but the header names ${header.length} columns; is there a comma inside a name? Put such a name in double quotes.` });
    }
    const cell = (j: number) => (j >= 0 ? String(line[j] ?? "").trim() : "");
    const row: RosterRow = {
      row: rowNumber,
      displayName: cell(at.displayName).replace(/\s+/g, " "),
      username: cell(at.username).toLowerCase(),
      studentNumber: cell(at.studentNumber),
    };
    rows.push(row);
    const nameProblem = displayNameProblem(row.displayName);
    if (nameProblem) problems.push({ row: rowNumber, column: names.displayName, message: nameProblem });
    const userProblem = usernameProblem(row.username);
    if (userProblem) problems.push({ row: rowNumber, column: names.username, message: userProblem });
    else {
      const first = firstRowOf.get(row.username);
      if (first) problems.push({ row: rowNumber, column: names.username, message: `The username “${row.username}” is also on row ${first}; each student needs their own.` });
      else firstRowOf.set(row.username, rowNumber);
    }
    const numberProblem = row.studentNumber ? studentNumberProblem(row.studentNumber) : null;
    if (numberProblem) problems.push({ row: rowNumber, column: names.studentNumber, message: numberProblem });
  }
  if (rows.length === 0) problems.push({ row: null, column: null, message: "The file has a header row but no students under it." });
  if (rows.length > MAX_ROSTER_ROWS) {
    problems.push({ row: null, column: null, message: `The file has ${rows.length} students; upload at most ${MAX_ROSTER_ROWS} at a time.` });
  }
  return { rows, problems, ignoredColumns, columns: names };
}

// ───────────────────────────── Saving students ─────────────────────────────

export interface NewStudent {
  displayName: string;
  username: string;
  studentNumber: string;
  gradeBand: GradeBand;
  /** the first password; made up when empty */
  password?: string;
}

export type AddResult =
  | { ok: true; added: { id: string; displayName: string; username: string; password: string }[] }
  | { ok: false; message: string; row?: number; refusal?: SeatRefusal };

class Undo extends Error {
  constructor(readonly result: { ok: false; message: string; row?: number; refusal?: SeatRefusal }) {
    super(result.message);
  }
}

/**
 * Makes the accounts and enrolls them into the class, each through the seat rules, all in one
 * transaction: any refusal (a seat, a username taken meanwhile) undoes every row.
 */
export async function addStudents({ db }: Db, klass: TeacherClass, students: (NewStudent & { row?: number })[]): Promise<AddResult> {
  if (klass.archivedAt) return { ok: false, message: "This class is archived. Restore it before adding students." };
  // Hash before the transaction: Argon2 is slow on purpose, and the seat lock should be held briefly.
  const prepared = await Promise.all(
    students.map(async (s) => {
      const password = s.password || newStudentPassword();
      return { ...s, username: s.username.trim().toLowerCase(), password, passwordHash: await hashPassword(password) };
    }),
  );
  try {
    const added = await db.transaction(async (tx) => {
      const out: { id: string; displayName: string; username: string; password: string }[] = [];
      for (const s of prepared) {
        const [user] = await tx
          .insert(users)
          .values({
            homeOrganisationId: klass.organisationId,
            username: s.username,
            displayName: s.displayName.trim(),
            gradeBand: s.gradeBand,
            studentNumber: s.studentNumber.trim() || null,
            passwordHash: s.passwordHash,
          })
          .onConflictDoNothing({ target: [users.homeOrganisationId, users.username] })
          .returning({ id: users.id });
        if (!user) {
          throw new Undo({ ok: false, row: s.row, message: `The username “${s.username}” is already used by a student at your school. Choose another.` });
        }
        await tx.insert(memberships).values({ userId: user.id, organisationId: klass.organisationId, role: "student" });
        await enrollInside(tx, klass.id, user.id, s.row);
        out.push({ id: user.id, displayName: s.displayName.trim(), username: s.username, password: s.password });
      }
      return out;
    });
    return { ok: true, added };
  } catch (error) {
    if (error instanceof Undo) return error.result;
    throw error;
  }
}

/** The seat rules, run inside our transaction (their own transaction becomes a savepoint in ours). */
async function enrollInside(tx: Tx, classId: string, studentId: string, row?: number) {
  const result = await enrollStudentUsingSeat({ db: tx as unknown as Database }, { classId, studentId });
  if (!result.ok) throw new Undo({ ok: false, row, message: result.message, refusal: result.reason === "no-free-seat" ? result : undefined });
}

/** Every roster row checked again (the file comes back with the confirm) and saved, or nothing. */
export async function importRoster(
  { db }: Db,
  klass: TeacherClass,
  text: string,
  gradeBand: GradeBand,
): Promise<
  | { ok: true; added: { id: string; displayName: string; username: string; password: string }[] }
  | { ok: false; preview: RosterPreview; message?: string; refusal?: SeatRefusal }
> {
  const preview = await previewRoster({ db }, klass, text);
  if (preview.problems.length > 0) return { ok: false, preview };
  const result = await addStudents({ db }, klass, preview.rows.map((r) => ({ ...r, gradeBand })));
  if (!result.ok) {
    const where = result.row ? `Row ${result.row}: ` : "";
    return {
      ok: false,
      preview: { ...preview, problems: [{ row: result.row ?? null, column: null, message: result.message }] },
      message: `${where}${result.message} Nothing was saved.`,
      refusal: result.refusal,
    };
  }
  return result;
}

/** A student who already has an account at the school (say, in another teacher's class) joins this class. */
export async function addExistingStudent(
  { db }: Db,
  klass: TeacherClass,
  username: string,
): Promise<{ ok: true; displayName: string } | { ok: false; message: string; refusal?: SeatRefusal }> {
  const name = username.trim().toLowerCase();
  // Not a username at all (a space, an accent, a pasted control character): said as such, never looked up.
  if (!USERNAME_PATTERN.test(name)) return { ok: false, message: `No student can have the username “${withoutControlCharacters(name)}”: a username is ${USERNAME_RULE}.` };
  const [student] = await db
    .select({ id: users.id, displayName: users.displayName })
    .from(users)
    .innerJoin(memberships, and(eq(memberships.userId, users.id), eq(memberships.organisationId, klass.organisationId), eq(memberships.role, "student")))
    .where(and(eq(users.homeOrganisationId, klass.organisationId), eq(users.username, name)));
  if (!student) return { ok: false, message: `No student at your school has the username “${name}”.` };
  const result = await enrollStudentUsingSeat({ db }, { classId: klass.id, studentId: student.id });
  if (!result.ok) return { ok: false, message: result.message, refusal: result.reason === "no-free-seat" ? result : undefined };
  if (result.alreadyEnrolled) return { ok: false, message: `${student.displayName} is already in this class.` };
  return { ok: true, displayName: student.displayName };
}

export interface RosterStudent {
  id: string;
  displayName: string;
  username: string | null;
  gradeBand: GradeBand | null;
  studentNumber: string | null;
}

/** The class's students in the gradebook's order: by name as people read it (Émile among the E's, not after Z). */
export async function classRoster({ db }: Db, classId: string): Promise<RosterStudent[]> {
  const students = await db
    .select({ id: users.id, displayName: users.displayName, username: users.username, gradeBand: users.gradeBand, studentNumber: users.studentNumber })
    .from(enrollments)
    .innerJoin(users, eq(users.id, enrollments.studentId))
    .where(eq(enrollments.classId, classId));
  return students.sort(byStudentName);
}

/** The student, if they are in this class. */
export async function findClassStudent({ db }: Db, classId: string, studentId: string): Promise<RosterStudent | null> {
  const [row] = await db
    .select({ id: users.id, displayName: users.displayName, username: users.username, gradeBand: users.gradeBand, studentNumber: users.studentNumber })
    .from(enrollments)
    .innerJoin(users, eq(users.id, enrollments.studentId))
    .where(and(eq(enrollments.classId, classId), eq(enrollments.studentId, studentId)));
  return row ?? null;
}

/** The teacher's other active classes in the same school: where a student may be moved. */
export async function moveTargets({ db }: Db, klass: TeacherClass, teacherId: string) {
  return db
    .select({ id: classes.id, name: classes.name, schoolYear: classes.schoolYear })
    .from(classes)
    .where(and(eq(classes.teacherId, teacherId), eq(classes.organisationId, klass.organisationId), isNull(classes.archivedAt), ne(classes.id, klass.id)))
    .orderBy(asc(classes.schoolYear), asc(classes.name));
}

/** Into the other class first (through the seat rules), then out of this one: all or nothing. */
export async function moveStudent({ db }: Db, from: TeacherClass, teacherId: string, studentId: string, toClassId: string): Promise<{ ok: true; toName: string } | { ok: false; message: string }> {
  const targets = await moveTargets({ db }, from, teacherId);
  const to = targets.find((t) => t.id === toClassId);
  if (!to) return { ok: false, message: "Choose one of your other classes at this school." };
  if (!(await findClassStudent({ db }, from.id, studentId))) return { ok: false, message: "That student is not in this class." };
  try {
    await db.transaction(async (tx) => {
      await enrollInside(tx, to.id, studentId);
      await releaseSeat({ db: tx as unknown as Database }, { classId: from.id, studentId });
    });
  } catch (error) {
    if (error instanceof Undo) return { ok: false, message: error.result.message };
    throw error;
  }
  return { ok: true, toName: to.name };
}

/** Out of this class; their seat is freed when it was their last class of the year. Their work is kept. */
export async function removeFromClass({ db }: Db, klass: TeacherClass, studentId: string) {
  return releaseSeat({ db }, { classId: klass.id, studentId });
}

/** A new password for a student of this class (typed by the teacher, or made up); their other sessions end. */
export async function setStudentPassword({ db }: Db, teacherId: string, studentId: string, typed: string) {
  const password = typed.trim() ? typed : newStudentPassword();
  const result = await resetChildPassword({ db }, teacherId, studentId, password);
  return result.ok ? { ok: true as const, password } : result;
}
