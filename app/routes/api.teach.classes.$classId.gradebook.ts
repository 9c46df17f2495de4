// GET /api/teach/classes/:classId/gradebook: the gradebook as JSON, for the page's fetcher to refresh
// it without a reload. The same door as the page: a teacher, and a class of theirs (else 404).
// Every open gradebook tab asks every 30 s, and most answers are the same as the last one: the body
// is the kept gradebook's, already serialized and compressed (loadGradebookJson), so it is sent with
// its Content-Encoding and the server's compression leaves it alone.
import Negotiator from "negotiator";
import type { Route } from "./+types/api.teach.classes.$classId.gradebook";
import { db } from "~/db/client.server";
import { loadGradebookJson, type BodyEncoding } from "~/lib/teaching/gradebook.server";
import { requireTeacherClass } from "~/lib/teaching/guard.server";

const ENCODINGS: BodyEncoding[] = ["br", "gzip", "identity"];

/** The browser's best encoding of ours; ours in our order where it likes several equally ("gzip, deflate, br" → br). */
function bestEncoding(acceptEncoding: string | null): string | undefined {
  const negotiator = new Negotiator({ headers: { "accept-encoding": acceptEncoding ?? undefined } });
  // negotiator 1.x takes the tie-break order as a second argument; @types/negotiator (0.6) does not know it yet.
  return (negotiator.encoding as (available: string[], options: { preferred: string[] }) => string | undefined).call(negotiator, ENCODINGS, { preferred: ENCODINGS });
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { klass } = await requireTeacherClass(request, params.classId);
  const asked = bestEncoding(request.headers.get("accept-encoding"));
  const encoding: BodyEncoding = ENCODINGS.includes(asked as BodyEncoding) ? (asked as BodyEncoding) : "identity";
  const body = await loadGradebookJson({ db }, klass.id, klass.timeZone, encoding);
  return new Response(body, {
    headers: {
      "Content-Type": "application/json; charset=utf-8",
      "Cache-Control": "private, no-store",
      Vary: "Accept-Encoding",
      ...(encoding === "identity" ? {} : { "Content-Encoding": encoding }),
    },
  });
}
