// GET /api/teach/classes/:classId/gradebook: the gradebook as JSON, for the page's fetcher to refresh
// it without a reload. The same door as the page: a teacher, and a class of theirs (else 404).
import { data } from "react-router";
import type { Route } from "./+types/api.teach.classes.$classId.gradebook";
import { db } from "~/db/client.server";
import { gradebookView, loadGradebook } from "~/lib/teaching/gradebook.server";
import { requireTeacherClass } from "~/lib/teaching/guard.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  const { klass } = await requireTeacherClass(request, params.classId);
  const book = await loadGradebook({ db }, klass.id);
  return data({ gradebook: gradebookView(book, klass.timeZone) }, { headers: { "Cache-Control": "private, no-store" } });
}
