// How a compiled lesson runs in the browser — the decision, written down:
//
// mdx-bundler's usual client, getMDXComponent, evaluates the compiled code with `new Function`, which a
// content-security policy can only allow with 'unsafe-eval'. We keep eval out of the browser instead:
// the server wraps the compiled code in a plain script, `window.__bendwiseLessons[hash] = function (…) {…}`,
// served from our own origin at /lesson-code/<slug>.<hash>.js with a long cache lifetime. The page
// loads it with a normal <script src> before hydration (and the route's clientLoader loads it on
// client-side navigation), so script-src stays 'self' plus a nonce, with no 'unsafe-eval'.
// On the server, the same code is turned into a component with `new Function`, which CSP does not govern.
// The bundle holds only the lesson's prose, data sets and component calls: generators and expected
// answers live in exercises.server.ts and never enter it.
import type { CompiledLesson } from "./lessons.server";
import { LESSON_SCOPE_NAMES, registerLessonFactory, type LessonFactory } from "./lesson-scope";

export function lessonCodeUrl(lesson: Pick<CompiledLesson, "slug" | "hash">): string {
  return `/lesson-code/${lesson.slug}.${lesson.hash}.js`;
}

/** The compiled code as a script that registers itself under the lesson's hash. */
export function lessonScript(lesson: CompiledLesson): string {
  return (
    `(window.__bendwiseLessons = window.__bendwiseLessons || {})[${JSON.stringify(lesson.hash)}] = ` +
    `function (${LESSON_SCOPE_NAMES.join(", ")}) {\n${lesson.code}\n};\n`
  );
}

/** Registers the server's copy of the same function, so the lesson renders on the server too. */
export function registerLessonOnServer(lesson: CompiledLesson) {
  if (globalThis.__bendwiseLessons?.[lesson.hash]) return;
  // eslint-disable-next-line no-new-func
  registerLessonFactory(lesson.hash, new Function(...LESSON_SCOPE_NAMES, lesson.code) as LessonFactory);
}
