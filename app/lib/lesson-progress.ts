// The progress line under a lesson's title, for the student. Saved readings are not a counted part
// (the questions on them are), so a student who has just saved both tables would read "0 of 8 parts
// done" and think the readings were lost: the line says the readings are saved, or which questions
// still wait for them.
import { plural } from "./plural";

export interface ProgressState {
  requiredDone: number;
  requiredTotal: number;
  complete: boolean;
  exercises: Record<string, { prompt: { waitingForReadings?: boolean } }>;
  readings: Record<string, unknown>;
  /** the lesson closed at its due date: nothing more can be saved, so no hint to save */
  assignment?: { closed: boolean } | null;
}


export function lessonProgressWords(state: ProgressState): string {
  const parts = `${state.requiredDone} of ${state.requiredTotal} parts done`;
  if (state.complete) return `${parts} · lesson complete`;
  if (state.assignment?.closed) return parts;
  const waiting = Object.values(state.exercises).filter((e) => e.prompt.waitingForReadings).length;
  const saved = Object.keys(state.readings).length;
  if (waiting > 0) {
    return `${parts} · ${plural(waiting, "question waits", "questions wait")} for your readings${saved > 0 ? ` (${plural(saved, "table", "tables")} saved so far)` : ""}`;
  }
  if (saved > 0) return `${parts} · your readings are saved (${plural(saved, "table", "tables")}); the parts are the questions on them and the write-up`;
  return parts;
}
