// GET /teach/classes/:classId/gradebook/csv: the gradebook as a CSV file (one row per student, a
// score column per assigned lesson, totals), for the school's own grade system.
import type { Route } from "./+types/teach.classes.$classId.gradebook.csv";
import { db } from "~/db/client.server";
import { csvResponse, fileSlug, gradebookCsv } from "~/lib/teaching/exports.server";
import { loadGradebook } from "~/lib/teaching/gradebook.server";
import { requireTeacherClass } from "~/lib/teaching/guard.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  const { klass } = await requireTeacherClass(request, params.classId);
  const book = await loadGradebook({ db }, klass.id);
  const day = new Date().toISOString().slice(0, 10);
  return csvResponse(gradebookCsv(book), `gradebook-${fileSlug(klass.name)}-${day}.csv`);
}
