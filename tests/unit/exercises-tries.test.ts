/**
 * How many tries an exercise allows before any accommodation (ownAttempts in app/lib/exercises.ts):
 * a choice exercise allows at most one fewer than its options, so trying every option cannot end
 * "right". Common practice, no source: the rule is ours. Exercise numbers are invented.
 */
import { describe, expect, it } from "vitest";
import { DEFAULT_ATTEMPTS, ownAttempts, type ExerciseDefinition, type LessonExercises } from "~/lib/exercises";
import { exerciseSeed, seededRandom } from "~/lib/seeded-random";

const modules = import.meta.glob<{ lesson: LessonExercises }>("../../lessons/*/exercises.server.ts", { eager: true });
const definitions = Object.entries(modules).flatMap(([file, m]) => m.lesson.exercises.map((definition) => ({ file, definition })));

/** An invented choice exercise with `options` options. */
function choiceWith(options: number, attempts?: number): ExerciseDefinition {
  return {
    id: `choose-of-${options}`,
    kind: "choice",
    title: "Pick one",
    attempts,
    generate: () => ({
      prompt: "Which?",
      hint: "Think.",
      choices: Array.from({ length: options }, (_, i) => ({ value: `o${i}`, label: `Option ${i + 1}` })),
      correctChoice: "o0",
      solution: "The first.",
    }),
  };
}

describe("tries an exercise allows", () => {
  it("is DEFAULT_ATTEMPTS, or the exercise's own number, for anything but a choice", () => {
    expect(ownAttempts()).toBe(DEFAULT_ATTEMPTS);
    expect(ownAttempts({ id: "x" })).toBe(3);
    expect(ownAttempts({ id: "x", attempts: 5 })).toBe(5);
    expect(ownAttempts({ id: "x", kind: "number" })).toBe(3);
  });

  it("is at most one fewer than a choice's options, after its own setting, and never fewer than 1", () => {
    expect(ownAttempts(choiceWith(2))).toBe(1);
    expect(ownAttempts(choiceWith(3))).toBe(2);
    expect(ownAttempts(choiceWith(4))).toBe(3);
    expect(ownAttempts(choiceWith(8))).toBe(3);
    expect(ownAttempts(choiceWith(8, 5))).toBe(5);
    expect(ownAttempts(choiceWith(8, 9))).toBe(7);
    expect(ownAttempts(choiceWith(3, 1))).toBe(1);
    expect(ownAttempts(choiceWith(1))).toBe(1);
    expect(ownAttempts(choiceWith(0))).toBe(1);
  });

  it("cannot be passed by trying every option in turn, in any lesson", () => {
    const choices = definitions.filter(({ definition }) => definition.kind === "choice");
    expect(choices.length).toBeGreaterThan(0);
    for (const { file, definition } of choices) {
      const options = definition.generate(seededRandom("any"), { ownData: null }).choices!.length;
      expect(ownAttempts(definition), `${file} ${definition.id}`).toBeLessThan(options);
    }
  });

  // The count is taken from one instance per definition: it must not depend on the student.
  it("counts options that are the same for every student, in every lesson's choice exercises", () => {
    for (const { file, definition } of definitions.filter(({ definition }) => definition.kind === "choice")) {
      const counts = new Set<number>();
      for (let student = 0; student < 200; student++) {
        const instance = definition.generate(seededRandom(exerciseSeed(`student-${student}`, file, definition.id, 0)), { ownData: null });
        counts.add(instance.choices?.length ?? 0);
      }
      expect(counts.size, `${file} ${definition.id}`).toBe(1);
    }
  });
});
