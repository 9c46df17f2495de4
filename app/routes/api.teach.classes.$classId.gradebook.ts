// GET /api/teach/classes/:classId/gradebook: the gradebook as JSON, for the page's fetcher to refresh
// it without a reload. The same door as the page: a teacher, and a class of theirs (else 404).
// The body is `{"gradebook": …}` exactly as data() would write it; it is assembled from the kept
// gradebook's serialized view (loadGradebookJson), because this route is asked every 30 s by every open tab.
import type { Route } from "./+types/api.teach.classes.$classId.gradebook";
import { db } from "~/db/client.server";
import { loadGradebookJson } from "~/lib/teaching/gradebook.server";
import { requireTeacherClass } from "~/lib/teaching/guard.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  const { klass } = await requireTeacherClass(request, params.classId);
  const body = await loadGradebookJson({ db }, klass.id, klass.timeZone);
  return new Response(body, {
    headers: { "Content-Type": "application/json; charset=utf-8", "Cache-Control": "private, no-store" },
  });
}
