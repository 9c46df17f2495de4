// The progress line under a lesson's title: saved readings are not a counted part, so the line says
// they are saved (or which questions wait for them) instead of a bare "0 of 8 parts done".
import { describe, expect, it } from "vitest";
import { lessonProgressWords, type ProgressState } from "~/lib/lesson-progress";

const exercise = (waitingForReadings = false) => ({ prompt: { waitingForReadings } });
const homeLab = (over: Partial<ProgressState>): ProgressState => ({
  requiredDone: 0,
  requiredTotal: 8,
  complete: false,
  // lesson 7: two questions on water, five on the student's own readings (three on the ruler, two on the stirrer)
  exercises: { a: exercise(), b: exercise(), r1: exercise(true), r2: exercise(true), r3: exercise(true), s1: exercise(true), s2: exercise(true) },
  readings: {},
  ...over,
});

describe("the lesson's progress line", () => {
  it("before any readings: the questions that wait for them", () => {
    expect(lessonProgressWords(homeLab({}))).toBe("0 of 8 parts done · 5 questions wait for your readings");
  });

  it("with one table saved: what still waits, and that a table is saved", () => {
    const state = homeLab({ readings: { "ruler-readings": {} }, exercises: { a: exercise(), r1: exercise(), s1: exercise(true), s2: exercise(true) } });
    expect(lessonProgressWords(state)).toBe("0 of 8 parts done · 2 questions wait for your readings (1 table saved so far)");
  });

  it("with both tables saved and nothing answered yet: the readings are saved, and what the parts are", () => {
    const state = homeLab({ readings: { "ruler-readings": {}, "stirrer-readings": {} }, exercises: { a: exercise(), r1: exercise() } });
    expect(lessonProgressWords(state)).toBe("0 of 8 parts done · your readings are saved (2 tables); the parts are the questions on them and the write-up");
  });

  it("a lesson closed at its due date takes no readings, so the line does not ask for them", () => {
    expect(lessonProgressWords(homeLab({ assignment: { closed: true } }))).toBe("0 of 8 parts done");
    expect(lessonProgressWords(homeLab({ assignment: { closed: false } }))).toBe("0 of 8 parts done · 5 questions wait for your readings");
  });

  it("a lesson without readings, and a finished one, read as before", () => {
    expect(lessonProgressWords({ requiredDone: 3, requiredTotal: 8, complete: false, exercises: { a: exercise() }, readings: {} })).toBe("3 of 8 parts done");
    expect(lessonProgressWords(homeLab({ requiredDone: 8, complete: true, readings: { x: {} } }))).toBe("8 of 8 parts done · lesson complete");
  });
});
