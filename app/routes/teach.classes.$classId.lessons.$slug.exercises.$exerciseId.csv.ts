// GET …/exercises/:exerciseId/csv: every try at one exercise by the class's students, as a CSV file.
import type { Route } from "./+types/teach.classes.$classId.lessons.$slug.exercises.$exerciseId.csv";
import { db } from "~/db/client.server";
import { classAttempts } from "~/lib/teaching/analysis.server";
import { attemptsCsv, csvResponse, fileSlug } from "~/lib/teaching/exports.server";
import { requireTeacherClass } from "~/lib/teaching/guard.server";
import { requireExercise, requireLesson } from "~/lib/teaching/lesson-guard.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  const { klass } = await requireTeacherClass(request, params.classId);
  const lesson = requireLesson(params.slug);
  const exercise = requireExercise(lesson.slug, params.exerciseId);
  const attempts = await classAttempts({ db }, klass.id, lesson.slug, exercise.id);
  return csvResponse(attemptsCsv(lesson.slug, attempts, klass.timeZone), `tries-${fileSlug(klass.name)}-lesson-${lesson.number}-${exercise.id}.csv`);
}
