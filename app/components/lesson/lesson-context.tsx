// What the lesson's components read: the student's state for this lesson, from the route's loader.
import { createContext, useContext } from "react";
import type { LessonState } from "~/lib/course.server";

export interface LessonContextValue {
  slug: string;
  /** false for adults looking at a lesson (they see it, but nothing is saved) and once a lesson has closed */
  canAnswer: boolean;
  /** an adult (teacher, parent) looking at the lesson */
  asAdult: boolean;
  /** who reads and reviews the student's written work: their teacher, or the parent at home */
  reader: "teacher" | "parent";
  state: LessonState;
}

export const LessonContext = createContext<LessonContextValue | null>(null);

export function useLesson(): LessonContextValue {
  const value = useContext(LessonContext);
  if (!value) throw new Error("A lesson component was used outside a lesson page.");
  return value;
}
