// Serves a compiled lesson's code as a script from our own origin (see app/lib/lesson-code.server.ts).
// The file name carries the content hash, so it can be cached for a year.
import { data } from "react-router";
import type { Route } from "./+types/lesson-code";
import { lessonScript } from "~/lib/lesson-code.server";
import { compiledLesson, findLesson } from "~/lib/lessons.server";

export async function loader({ params }: Route.LoaderArgs) {
  const match = /^([0-9]{2}-[a-z0-9-]+)\.([0-9a-f]{20})\.js$/.exec(params.file);
  const lesson = match ? findLesson(match[1]) : undefined;
  if (!match || !lesson) throw data("Not found", { status: 404 });
  const compiled = await compiledLesson(lesson.slug);
  if (compiled.hash !== match[2]) throw data("This lesson has changed; reload the page.", { status: 404 });
  return new Response(lessonScript(compiled), {
    headers: {
      "Content-Type": "text/javascript; charset=utf-8",
      "Cache-Control": "public, max-age=31536000, immutable",
      "X-Content-Type-Options": "nosniff",
    },
  });
}
