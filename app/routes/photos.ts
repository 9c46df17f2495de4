// Serves a set-up photo to those who may see the student's work; everyone else gets 404.
import { z } from "zod";
import type { Route } from "./+types/photos";
import { db } from "~/db/client.server";
import { requireUser } from "~/lib/auth.server";
import { findPhoto, photoStorage } from "~/lib/photo-store.server";
import { canSeeStudentWork } from "~/lib/student-access.server";

/** A plain-text 404: this route has no page of its own, so the sentence is the whole answer. */
const notFound = (sentence: string) =>
  new Response(sentence, { status: 404, headers: { "Content-Type": "text/plain; charset=utf-8", "X-Content-Type-Options": "nosniff" } });

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const id = z.string().uuid().safeParse(params.id);
  const photo = id.success ? await findPhoto({ db }, id.data) : null;
  if (!photo || !(await canSeeStudentWork({ db }, user.id, photo.studentId))) {
    throw notFound("There is no photo at this address.");
  }
  const file = await photoStorage().get(photo.storageKey);
  if (!file) throw notFound("The photo file is missing.");
  return new Response(file.stream(), {
    headers: {
      "Content-Type": photo.contentType,
      "Content-Length": String(photo.bytes),
      "Cache-Control": "private, max-age=3600",
      "X-Content-Type-Options": "nosniff",
    },
  });
}
