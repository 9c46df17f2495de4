/**
 * Content checks for every lesson under lessons/: frontmatter, the MDX compiles, its data sets, the
 * ids that tie the MDX to exercises.server.ts, and every exercise generated for 50 students and
 * answered with its own expected answer through the real answer checker.
 *
 * Pure: no database, no server. Run on its own with
 *   npx vitest run tests/unit/lessons-content.test.ts   (unit tests need no database)
 * Readings used here as a student's "own data" are invented for the test.
 */
import { existsSync, readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { compile } from "@mdx-js/mdx";
import matter from "gray-matter";
import katex from "katex";
import remarkMath from "remark-math";
import { describe, expect, it } from "vitest";
import {
  checkAnswer,
  roundToSignificantFigures,
  validateExpectedAnswer,
  type ExpectedAnswer,
} from "~/lib/answer-checker";
import type { ExerciseDefinition, ExerciseInstance, ExerciseKind, GeneratorContext, LessonExercises } from "~/lib/exercises";
import { analyseReadings, formatForStudent, type Mode, type ReadingPoint } from "~/lib/science";
import { exerciseSeed, seededRandom } from "~/lib/seeded-random";
import { wrongAnswerGroup } from "~/lib/teaching/words";

/** Every slip an exercise names has words in the teacher's lists (app/lib/teaching/words.ts). */
function expectTeacherWordsForSlips(expected: { knownWrongAnswers?: readonly { code: string }[] }, label: string) {
  for (const w of expected.knownWrongAnswers ?? []) {
    expect(wrongAnswerGroup(w.code, "incorrect").label, `${label}: teacher's words for the slip "${w.code}"`).not.toMatch(/^Slip “/);
  }
}

const LESSONS_DIR = fileURLToPath(new URL("../../lessons", import.meta.url));
const STUDENTS = 50;

// ───────────────────────────── loading ─────────────────────────────

const modules = import.meta.glob<{ lesson: LessonExercises }>("../../lessons/*/exercises.server.ts", { eager: true });

interface LessonFolder {
  folder: string;
  dir: string;
  source: string;
  data: Record<string, unknown>;
  content: string;
  exercises: LessonExercises;
}

const folders = readdirSync(LESSONS_DIR, { withFileTypes: true })
  .filter((d) => d.isDirectory() && /^\d\d-/.test(d.name))
  .map((d) => d.name)
  .sort();

const lessons: LessonFolder[] = folders.map((folder) => {
  const dir = path.join(LESSONS_DIR, folder);
  const source = readFileSync(path.join(dir, "index.mdx"), "utf8");
  const parsed = matter(source);
  const mod = modules[`../../lessons/${folder}/exercises.server.ts`];
  return { folder, dir, source, data: parsed.data, content: parsed.content, exercises: mod?.lesson };
});

/** All values of one attribute of one component in the MDX, e.g. ids of <Exercise id="…" />. */
function attributeValues(mdx: string, component: string, attribute: string): string[] {
  const out: string[] = [];
  for (const tag of mdx.matchAll(new RegExp(`<${component}\\b[^>]*>`, "g"))) {
    const m = new RegExp(`\\b${attribute}="([^"]*)"`).exec(tag[0]);
    if (m) out.push(m[1]);
  }
  return out;
}

// ───────────────────────────── students' own data (invented) ─────────────────────────────

type OwnData = NonNullable<GeneratorContext["ownData"]>;

function ownDataFrom(mode: Mode, unloadedCm: number, points: ReadingPoint[]): OwnData {
  return { ...analyseReadings({ mode, unloadedCm, resolutionCm: 0.1, points }), mode, unloadedCm };
}

/** A few invented own-data sets: a soft strip, a stiff strip, one that broke, and one too short to fit. */
const OWN_DATA_SAMPLES: Record<string, OwnData> = {
  soft: ownDataFrom("bend", 25.0, [
    { forceN: 0, readingCm: 25.0 },
    { forceN: 0.98, readingCm: 24.5 },
    { forceN: 1.96, readingCm: 23.9 },
    { forceN: 2.94, readingCm: 23.4 },
    { forceN: 3.92, readingCm: 22.8 },
    { forceN: 4.91, readingCm: 22.3 },
  ]),
  stiff: ownDataFrom("bend", 24.0, [
    { forceN: 0, readingCm: 24.0 },
    { forceN: 1.96, readingCm: 23.8 },
    { forceN: 3.92, readingCm: 23.5 },
    { forceN: 5.89, readingCm: 23.3 },
    { forceN: 7.85, readingCm: 23.0 },
    { forceN: 9.81, readingCm: 22.8 },
  ]),
  broke: ownDataFrom("bend", 20.0, [
    { forceN: 1, readingCm: 19.6 },
    { forceN: 2, readingCm: 19.1 },
    { forceN: 3, readingCm: 18.7 },
    { forceN: 4, readingCm: 18.2, broke: true },
  ]),
  stretch: ownDataFrom("stretch", 10.0, [
    { forceN: 1, readingCm: 10.9 },
    { forceN: 2, readingCm: 11.9 },
    { forceN: 3, readingCm: 12.8 },
  ]),
};
const TOO_FEW_READINGS: OwnData = ownDataFrom("bend", 20.0, [{ forceN: 2, readingCm: 19.4 }]);

// ───────────────────────────── helpers for instances ─────────────────────────────

/** Every problem with values in an instance: non-finite numbers, or text that shows one. */
function badValues(value: unknown, where = "instance"): string[] {
  if (typeof value === "number") return Number.isFinite(value) ? [] : [`${where} is ${value}`];
  if (typeof value === "string") {
    return /NaN|Infinity|undefined|\bnull\b|\[object /.test(value) ? [`${where} reads "${value}"`] : [];
  }
  if (Array.isArray(value)) return value.flatMap((v, i) => badValues(v, `${where}[${i}]`));
  if (value && typeof value === "object") {
    return Object.entries(value).flatMap(([k, v]) => badValues(v, `${where}.${k}`));
  }
  return [];
}

/** What a student would type for an expected answer, in its own unit (to the figures asked for). */
function typedBack(expected: ExpectedAnswer): string {
  const number = expected.sigFigs
    ? roundToSignificantFigures(expected.value, expected.sigFigs.count)!.text
    : String(expected.value);
  return expected.unit ? `${number} ${expected.unit}` : number;
}

/** The answer as a worked solution writes it (3 significant figures), which must be accepted too. */
function typedAsInSolution(expected: ExpectedAnswer): string {
  return formatForStudent(expected.value, expected.unit);
}

function expectAccepted(expected: ExpectedAnswer, label: string): void {
  expect(validateExpectedAnswer(expected), `${label}: expected answer is malformed`).toEqual([]);
  const typed = typedBack(expected);
  expect(checkAnswer(typed, expected).outcome, `${label}: "${typed}" should be correct`).toBe("correct");
  if (!expected.sigFigs) {
    const rounded = typedAsInSolution(expected);
    expect(checkAnswer(rounded, expected).outcome, `${label}: "${rounded}" (3 s.f.) should be correct`).toBe("correct");
  }
}

const escapeRegExp = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
const showUnit = (unit: string) => unit.replace(/\*/g, "·").replace(/\^2/g, "²").replace(/\^4/g, "⁴");

/** Whether the prompt states the expected value, written as the solution would write it. */
function promptGivesAnswerAway(prompt: string, expected: ExpectedAnswer): string | null {
  const v = expected.value;
  if (expected.unit === "" && Math.abs(v - Math.round(v)) < 1e-9) return null; // a whole-number ratio such as 3 appears in any prompt
  const forms = new Set([formatForStudent(v, "", 3), String(Number(v.toPrecision(3)))]);
  for (const form of forms) {
    if (/^0(\.0*)?$/.test(form)) continue;
    // With a unit: the number followed by that unit (not by a longer one: 4 N is not 4 N/cm).
    // A plain number: not followed by more digits or by a unit (1.6 cm is not the ratio 1.6).
    const after = expected.unit
      ? `\\s*${escapeRegExp(showUnit(expected.unit))}(?![A-Za-z/·²³⁴^])`
      : "(?![\\d.])(?!\\s*(?:cm|mm|m|N|kg|g|N/cm|N/m)\\b)";
    const re = new RegExp(`(?<![\\d.])${escapeRegExp(form)}${after}`);
    if (re.test(prompt)) return form;
  }
  return null;
}

/**
 * Exercises whose answer may show in the prompt by design (judged one by one):
 * - the answer is one of the listed values the student must pick out (an elastic limit is one of
 *   the loads listed), or
 * - the prompt shows a calculator's unrounded value and asks for it rounded.
 */
const ANSWER_MAY_APPEAR_IN_PROMPT = new Set([
  "05-elastic-permanent-broken/elastic-limit",
  "01-measuring-deformation/stiffness-sig-figs",
]);

function generate(def: ExerciseDefinition, student: number, ownData: GeneratorContext["ownData"]): ExerciseInstance {
  return def.generate(seededRandom(exerciseSeed(`student-${student}`, def.id, 0)), { ownData });
}

/** What the student sees of an instance (prompt, table, choices), as one string to compare. */
function visible(inst: ExerciseInstance): string {
  return JSON.stringify({ prompt: inst.prompt, table: inst.table, choices: inst.choices });
}

/** The share of students 1…n−1 whose prompt differs from the student before them. */
function neighboursDiffer(prompts: string[]): number {
  let differ = 0;
  for (let s = 1; s < prompts.length; s++) if (prompts[s] !== prompts[s - 1]) differ++;
  return differ / (prompts.length - 1);
}

function ownDataFor(def: ExerciseDefinition, student: number): OwnData {
  const names = Object.keys(OWN_DATA_SAMPLES);
  return OWN_DATA_SAMPLES[names[student % names.length]];
}

// ───────────────────────────── the course as a whole ─────────────────────────────

const REQUIRED_KEYS = ["title", "summary", "minutes", "gradeBand", "ngss", "practices", "materials", "safety"];
/** NGSS performance expectations this course may cite (each checked against the standards by hand). */
const KNOWN_NGSS = new Set([
  "MS-PS2-2",
  "MS-ETS1-1",
  "MS-ETS1-2",
  "MS-ETS1-3",
  "MS-ETS1-4",
  "HS-ETS1-1",
  "HS-ETS1-2",
  "HS-ETS1-3",
  "HS-ETS1-4",
]);
/** The components a lesson's MDX may use (app/components/lesson/index.ts). */
const LESSON_COMPONENTS = new Set(["AfterPrediction", "Caution", "DataTable", "Equation", "Exercise", "ForceChart", "Hint", "PhotoUpload", "Prediction", "ReadingsEntry", "WrittenAnswer"]);
const ALL_KINDS: ExerciseKind[] = ["number", "ratio", "choice", "table", "own-data"];
/** The readings columns the lesson components know (DataTable also shows a mass in grams). */
const CSV_COLUMNS = new Set(["forceN", "readingCm", "deformationCm", "returnReadingCm", "broke", "massG"]);

describe("the course", () => {
  it("has at least 8 lessons, in order, each with an index.mdx and exercises", () => {
    expect(lessons.length).toBeGreaterThanOrEqual(8);
    lessons.forEach((l, i) => {
      expect(l.folder, "folders are numbered 01, 02, … without gaps").toMatch(new RegExp(`^${String(i + 1).padStart(2, "0")}-[a-z0-9-]+$`));
      expect(l.exercises, `${l.folder}/exercises.server.ts exports lesson`).toBeDefined();
    });
  });

  it("has at least 45 auto-checked exercises, at least 5 per lesson, and every kind", () => {
    const all = lessons.flatMap((l) => l.exercises.exercises);
    expect(all.length).toBeGreaterThanOrEqual(45);
    for (const l of lessons) expect(l.exercises.exercises.length, l.folder).toBeGreaterThanOrEqual(5);
    const kinds = new Set(all.map((e) => e.kind));
    for (const kind of ALL_KINDS) expect(kinds.has(kind), `some exercise is of kind "${kind}"`).toBe(true);
  });

  it("gives every exercise a title, and every instance a prompt, a hint and a worked solution", () => {
    for (const l of lessons) {
      for (const def of l.exercises.exercises) {
        expect(def.title.trim(), `${l.folder}/${def.id} title`).not.toBe("");
        for (let s = 0; s < 5; s++) {
          const ownData = def.kind === "own-data" ? ownDataFor(def, s) : null;
          const inst = generate(def, s, ownData);
          expect(inst.prompt.trim(), `${l.folder}/${def.id} prompt`).not.toBe("");
          expect(inst.hint.trim(), `${l.folder}/${def.id} hint`).not.toBe("");
          expect(inst.solution.trim(), `${l.folder}/${def.id} solution`).not.toBe("");
        }
      }
    }
  });

  it("gives two students side by side different numbers in most exercises", () => {
    const rates = lessons.flatMap((l) =>
      l.exercises.exercises
        .filter((def) => def.kind !== "own-data")
        .map((def) => neighboursDiffer(Array.from({ length: STUDENTS }, (_, s) => visible(generate(def, s, null))))),
    );
    const mostlyDifferent = rates.filter((r) => r >= 0.9).length;
    expect(mostlyDifferent / rates.length).toBeGreaterThanOrEqual(0.9);
  });

  it("says its data are invented", () => {
    for (const l of lessons) expect(l.content, `${l.folder} labels its data as invented`).toMatch(/invented/i);
  });
});

// ───────────────────────────── each lesson ─────────────────────────────

for (const l of lessons) {
  describe(l.folder, () => {
    it("has frontmatter with the required keys", () => {
      const d = l.data;
      expect(Object.keys(d).sort()).toEqual([...REQUIRED_KEYS].sort());
      expect(typeof d.title === "string" && d.title.trim() !== "").toBe(true);
      expect(typeof d.summary === "string" && d.summary.trim() !== "").toBe(true);
      expect(Number.isInteger(d.minutes) && (d.minutes as number) >= 10 && (d.minutes as number) <= 120).toBe(true);
      expect(["6-8", "9-10"]).toContain(d.gradeBand);
      for (const key of ["ngss", "practices", "materials", "safety"]) {
        const list = d[key];
        expect(Array.isArray(list) && list.length > 0, `${key} is a non-empty list`).toBe(true);
        for (const item of list as unknown[]) expect(typeof item === "string" && item.trim() !== "", `${key} item`).toBe(true);
      }
      for (const code of d.ngss as string[]) expect(KNOWN_NGSS.has(code), `NGSS code ${code}`).toBe(true);
      expect(d.practices).toContain("Analyzing and interpreting data");
    });

    it("shows a safety caution and defers to the school's lab-safety rules", () => {
      expect(l.content).toMatch(/<Caution>[\s\S]+?<\/Caution>/);
      expect(`${l.content}\n${(l.data.safety as string[]).join("\n")}`).toMatch(/lab-safety/);
    });

    it("compiles as MDX (with the math plugin) and imports only files that exist", async () => {
      await expect(compile(l.content, { remarkPlugins: [remarkMath] })).resolves.toBeDefined();
      for (const m of l.content.matchAll(/^import\s+\w+\s+from\s+"\.\/([^"]+)";?$/gm)) {
        expect(existsSync(path.join(l.dir, m[1])), `${l.folder}/${m[1]} exists`).toBe(true);
      }
    });

    it("uses only the lesson components, with math KaTeX can render", () => {
      for (const m of l.content.matchAll(/<([A-Z][A-Za-z]*)\b/g)) expect(LESSON_COMPONENTS.has(m[1]), `<${m[1]}> is a lesson component`).toBe(true);
      const imported = new Set([...l.content.matchAll(/^import\s+(\w+)\s+from/gm)].map((m) => m[1]));
      for (const m of l.content.matchAll(/\bcsv=\{(\w+)\}/g)) expect(imported.has(m[1]), `csv={${m[1]}} is imported`).toBe(true);
      const tex = [
        ...attributeValues(l.content, "Equation", "tex").map((t) => ({ t, displayMode: true })),
        ...attributeValues(l.content, "Equation", "narrow").map((t) => ({ t, displayMode: true })),
        ...[...l.content.matchAll(/\$([^$\n]+)\$/g)].map((m) => ({ t: m[1], displayMode: false })),
      ];
      for (const { t, displayMode } of tex) {
        expect(() => katex.renderToString(t, { throwOnError: true, displayMode }), `KaTeX renders ${t}`).not.toThrow();
      }
    });

    it("has readings data sets in the documented columns, each used by the MDX", () => {
      const csvs = readdirSync(l.dir).filter((f) => f.endsWith(".csv"));
      for (const file of csvs) {
        expect(l.content, `${file} is imported`).toContain(`"./${file}"`);
        const [header, ...rows] = readFileSync(path.join(l.dir, file), "utf8").trim().split(/\r?\n/);
        const columns = header.split(",");
        expect(columns).toContain("forceN");
        expect(columns.includes("readingCm") || columns.includes("deformationCm")).toBe(true);
        for (const c of columns) expect(CSV_COLUMNS.has(c), `${file}: column ${c}`).toBe(true);
        expect(rows.length).toBeGreaterThanOrEqual(3);
        for (const row of rows) {
          const cells = row.split(",");
          expect(cells.length, `${file}: ${row}`).toBe(columns.length);
          cells.forEach((cell, i) => {
            if (columns[i] === "broke") expect(["true", "false"]).toContain(cell);
            else if (columns[i] === "returnReadingCm" && cell === "") return;
            else expect(Number.isFinite(Number(cell)) && cell.trim() !== "", `${file}: ${columns[i]} = "${cell}"`).toBe(true);
          });
        }
      }
    });

    it("ties the MDX to exercises.server.ts one to one", () => {
      const mdxIds = attributeValues(l.content, "Exercise", "id");
      const defIds = l.exercises.exercises.map((e) => e.id);
      expect(new Set(defIds).size, "generator ids are unique").toBe(defIds.length);
      expect(new Set(mdxIds).size, "each <Exercise> appears once").toBe(mdxIds.length);
      expect([...mdxIds].sort()).toEqual([...defIds].sort());

      const written = attributeValues(l.content, "WrittenAnswer", "id");
      expect([...written].sort()).toEqual([...(l.exercises.writtenAnswers ?? [])].sort());

      const readings = attributeValues(l.content, "ReadingsEntry", "id");
      for (const def of l.exercises.exercises) {
        if (def.kind === "own-data") expect(readings, `${def.id} reads a <ReadingsEntry>`).toContain(def.readingsId);
        else expect(def.readingsId, `${def.id} is not own-data`).toBeUndefined();
      }
      const allIds = [...mdxIds, ...written, ...readings, ...attributeValues(l.content, "Prediction", "id"), ...attributeValues(l.content, "PhotoUpload", "id")];
      expect(new Set(allIds).size, "component ids are unique within the lesson").toBe(allIds.length);
    });

    for (const def of l.exercises?.exercises ?? []) {
      const label = `${l.folder}/${def.id}`;

      it(`${def.id} (${def.kind}): ${STUDENTS} students get checkable, distinct instances`, () => {
        const prompts: string[] = [];
        for (let s = 0; s < STUDENTS; s++) {
          const ownData = def.kind === "own-data" ? ownDataFor(def, s) : null;
          const inst = generate(def, s, ownData);
          const again = generate(def, s, ownData);
          expect(again, `${label}: the same seed gives the same instance`).toEqual(inst);
          expect(badValues(inst), `${label} student ${s}`).toEqual([]);
          expect(inst.prompt.includes(inst.solution), `${label}: prompt contains the solution`).toBe(false);
          expect(inst.waitingForReadings ?? false, `${label}: not waiting once readings exist`).toBe(false);
          prompts.push(visible(inst));

          switch (def.kind) {
            case "number":
            case "ratio":
            case "own-data": {
              expect(inst.expected, `${label}: expected answer`).toBeDefined();
              const e = inst.expected!;
              if (def.kind === "ratio") expect(e.unit, `${label}: a ratio has no unit`).toBe("");
              if (def.kind === "number") expect(e.unit, `${label}: a number has a unit`).not.toBe("");
              expectAccepted(e, `${label} student ${s}`);
              expectTeacherWordsForSlips(e, label);
              if (!ANSWER_MAY_APPEAR_IN_PROMPT.has(label)) {
                const shown = promptGivesAnswerAway(inst.prompt, e);
                expect(shown, `${label} student ${s}: the prompt shows the answer ${shown}\n${inst.prompt}`).toBeNull();
              }
              break;
            }
            case "choice": {
              const values = (inst.choices ?? []).map((c) => c.value);
              expect(values.length, `${label}: at least two choices`).toBeGreaterThanOrEqual(2);
              expect(new Set(values).size, `${label}: choice values are unique`).toBe(values.length);
              expect(values, `${label}: correctChoice is one of the choices`).toContain(inst.correctChoice);
              break;
            }
            case "table": {
              const t = inst.table!;
              expect(t, `${label}: table`).toBeDefined();
              for (const row of t.rows) expect(row.length, `${label}: row width`).toBe(t.columns.length);
              const blanks = t.rows.flat().filter((c) => c === null).length;
              expect(inst.cells?.length, `${label}: one expected answer per empty cell`).toBe(blanks);
              inst.cells!.forEach((cell, i) => expectAccepted(cell, `${label} student ${s} cell ${i}`));
              inst.cells!.forEach((cell) => expectTeacherWordsForSlips(cell, label));
              break;
            }
          }
        }
        if (def.kind !== "own-data") {
          // Real variety, and two students side by side see different numbers most of the time. A
          // choice exercise may have only a few variants (a yes/no case times a few numbers).
          const isChoice = def.kind === "choice";
          expect(new Set(prompts).size, `${label}: distinct prompts among ${STUDENTS} students`).toBeGreaterThanOrEqual(isChoice ? 4 : 8);
          expect(neighboursDiffer(prompts), `${label}: neighbours with different prompts`).toBeGreaterThanOrEqual(isChoice ? 0.6 : 0.8);
        }
      });

      if (def.kind === "own-data") {
        it(`${def.id}: waits for readings, and copes with too few`, () => {
          const waiting = generate(def, 0, null);
          expect(waiting.waitingForReadings).toBe(true);
          expect(waiting.prompt.trim()).not.toBe("");
          expect(waiting.solution.trim()).not.toBe("");
          expect(badValues(waiting)).toEqual([]);
          const few = generate(def, 0, TOO_FEW_READINGS);
          expect(badValues(few)).toEqual([]);
          if (!few.waitingForReadings) expectAccepted(few.expected!, `${label} with one reading`);
        });
      }
    }
  });
}

describe("lesson 1, reading a millimetre ruler", () => {
  // Two slips sit within the answer's tolerance of each other (17.01 cm and 17 cm for 17.1 cm): each
  // student's number below the edge must be named as marks not counted, and the hundredths as hundredths.
  const def = lessons.find((l) => l.folder.startsWith("01-"))!.exercises!.exercises.find((d) => d.id === "read-the-ruler")!;
  it(`tells "marks not counted" from "millimetres as hundredths" for ${STUDENTS} students`, () => {
    for (let s = 0; s < STUDENTS; s++) {
      const e = generate(def, s, null).expected!;
      const whole = Math.floor(e.value);
      const marks = Math.round((e.value - whole) * 10);
      expect(checkAnswer(`${whole} cm`, e).slip?.code, `student ${s}: ${whole} cm for ${e.value} cm`).toBe("marks-not-counted");
      expect(checkAnswer(`${whole}.0 cm`, e).slip?.code).toBe("marks-not-counted");
      expect(checkAnswer(`${(whole + marks / 100).toFixed(2)} cm`, e).slip?.code).toBe("millimetres-as-hundredths");
      expect(checkAnswer(`${e.value.toFixed(1)} cm`, e).outcome).toBe("correct");
    }
  });
});
