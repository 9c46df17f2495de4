// A lesson (and exercise) address inside a teacher's class: a lesson of the course, or one still
// assigned to the class after leaving the course; anything else is 404.
import { findLesson, lessonExercises } from "~/lib/lessons.server";
import { notFound } from "./guard.server";

export const LESSON_NOT_FOUND = "There is no such lesson in the course.";
export const EXERCISE_NOT_FOUND = "There is no such exercise in this lesson.";

export function requireLesson(slug: string | undefined) {
  const lesson = slug ? findLesson(slug) : undefined;
  if (!lesson) notFound(LESSON_NOT_FOUND);
  return lesson;
}

export function requireExercise(slug: string, exerciseId: string | undefined) {
  const exercise = lessonExercises(slug).exercises.find((e) => e.id === exerciseId);
  if (!exercise) notFound(EXERCISE_NOT_FOUND);
  return exercise;
}
