// GET /api/teach/classes/:classId/gradebook: the gradebook as JSON, for the page's fetcher to refresh
// it without a reload. The same door as the page: a teacher, and a class of theirs (else 404).
//
// Every open gradebook tab asks every 30 s, and most of the time nothing has changed. Both answers
// come from the kept gradebook (loadGradebookForRoute):
// - the page's fetcher sends `?since=<revision>` (the revision it shows) and hears `{ unchanged }`
//   while that still holds, or gets the whole gradebook, which React Router carries in its own format;
// - a plain JSON client gets `{ gradebook }` as bytes already serialized and compressed (brotli or
//   gzip, as it asks), sent with their Content-Encoding.
import { data } from "react-router";
import type { Route } from "./+types/api.teach.classes.$classId.gradebook";
import { db } from "~/db/client.server";
import { bestEncoding, encodingHeaders } from "~/lib/http-encoding.server";
import { loadGradebookForRoute } from "~/lib/teaching/gradebook.server";
import { requireTeacherClass } from "~/lib/teaching/guard.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  const { klass } = await requireTeacherClass(request, params.classId);
  const headers = new Headers({ "Cache-Control": "private, no-store" });
  const gradebook = await loadGradebookForRoute({ db }, klass.id, klass.timeZone);
  const since = new URL(request.url).searchParams.get("since");
  if (since !== null) {
    return data(since === gradebook.revision ? { unchanged: true as const, revision: gradebook.revision } : { gradebook: gradebook.view }, { headers });
  }
  const encoding = bestEncoding(request.headers.get("accept-encoding"));
  const body = await gradebook.bytes(encoding);
  headers.set("Content-Type", "application/json; charset=utf-8");
  encodingHeaders(headers, encoding, body.length);
  return new Response(body, { headers });
}
