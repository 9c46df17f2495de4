// A lesson page: the compiled MDX with this student's exercises, predictions, readings, written
// answers and photos. The action checks answers and saves each part (sent with fetchers, no reload).
import "katex/dist/katex.min.css";
import { data, Link } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/learn.lesson";
import { DATABASE_UNAVAILABLE_MESSAGE, db, isDatabaseUnavailable } from "~/db/client.server";
import { assertSameOrigin, homePathFor, requireRole, requireUser } from "~/lib/auth.server";
import { lessonComponents } from "~/components/lesson";
import { LessonContext } from "~/components/lesson/lesson-context";
import { checkReadingsForm } from "~/lib/analysis-request";
import {
  findExercise,
  loadLessonState,
  recordAttempt,
  savePrediction,
  saveReadings,
  saveWrittenAnswer,
  touchVisit,
  type Submission,
} from "~/lib/course.server";
import { lessonCodeUrl, registerLessonOnServer } from "~/lib/lesson-code.server";
import { lessonProgressWords } from "~/lib/lesson-progress";
import { lessonComponent, loadLessonScript } from "~/lib/lesson-scope";
import { compiledLesson, findLesson, listLessons } from "~/lib/lessons.server";
import { closedForAnswers, closedMessage, lessonPolicies } from "~/lib/teaching/policy.server";
import { photoStorage, readPhotoForm, recordPhoto, removePhoto } from "~/lib/photo-store.server";
import type { Mode } from "~/lib/science";

const idSchema = z.string().min(1).max(80).regex(/^[a-z0-9-]+$/);

const intentSchema = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("answer"), exerciseId: idSchema }),
  z.object({ intent: z.literal("predict"), predictionId: idSchema, choice: z.string().min(1, "Pick one of the options.").max(80) }),
  z.object({ intent: z.literal("save-readings"), readingsId: idSchema }),
  z.object({ intent: z.literal("remove-photo"), photoId: idSchema, photo: z.string().uuid("That photo was not found.") }),
  z.object({
    intent: z.literal("written-answer"),
    answerId: idSchema,
    // A draft that saves itself sends only the parts typed in since its last save (so two tabs do not
    // wipe each other's other parts); a hand-in and a "Save a draft" send all three.
    claim: z.string().max(4000, "Keep it under 4000 characters.").optional(),
    evidence: z.string().max(4000, "Keep it under 4000 characters.").optional(),
    reasoning: z.string().max(4000, "Keep it under 4000 characters.").optional(),
    handIn: z.enum(["0", "1"]),
  }),
]);

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const lesson = findLesson(params.slug);
  if (!lesson) throw data("There is no lesson at this address.", { status: 404 });
  const compiled = await compiledLesson(lesson.slug);
  registerLessonOnServer(compiled);
  const isStudent = user.memberships.some((m) => m.role === "student");
  // Adults see the lesson with numbers of their own, and nothing they type is saved.
  const state = await loadLessonState({ db }, user.id, lesson.slug);
  const lessons = listLessons();
  const index = lessons.findIndex((l) => l.slug === lesson.slug);
  return {
    lesson,
    hash: compiled.hash,
    codeUrl: lessonCodeUrl(compiled),
    state,
    // A lesson closed at its due date shows the student's work read-only (the action refuses too).
    canAnswer: isStudent && !state.assignment?.closed,
    asAdult: !isStudent,
    reader: readerOf(user),
    // An adult looking at the lesson goes back to their own page: /learn is for students only.
    back: isStudent ? { to: "/learn", label: "Your course" } : { to: homePathFor(user), label: "Your page" },
    previous: index > 0 ? { slug: lessons[index - 1].slug, title: lessons[index - 1].title } : null,
    next: index < lessons.length - 1 ? { slug: lessons[index + 1].slug, title: lessons[index + 1].title } : null,
  };
}

export async function clientLoader({ serverLoader }: Route.ClientLoaderArgs) {
  const loaded = await serverLoader();
  // On client-side navigation the lesson's script is not in the page yet.
  await loadLessonScript(loaded.codeUrl, loaded.hash);
  return loaded;
}

export async function action({ request, params }: Route.ActionArgs) {
  assertSameOrigin(request);
  // The form is read here, once, so that during a database outage the message can be shown beside the
  // part that was sent. A photo's form is read by the photo action with its size limits; the outage
  // reply reads a copy of that request (photos are rare, so only they pay for the copy).
  const multipart = (request.headers.get("content-type") ?? "").startsWith("multipart/form-data");
  const sentPhoto = multipart ? request.clone() : null;
  const form = multipart ? null : await request.formData();
  try {
    return await lessonAction(request, form, params.slug);
  } catch (error) {
    if (!isDatabaseUnavailable(error)) throw error;
    return outageReply(form ?? (await sentPhoto!.formData().catch(() => null)));
  }
}

/** Who reads the student's written work and set the lesson: a child learning at home has a parent for a teacher. */
function readerOf(user: { memberships: { role: string; organisationKind: string }[] }): "teacher" | "parent" {
  return user.memberships.some((m) => m.role === "student" && m.organisationKind === "household") ? "parent" : "teacher";
}

/**
 * PostgreSQL could not be reached: the same 503 the rest of the app answers, as data for the part of
 * the lesson that was sent (an exercise, a prediction, readings, a written answer, a photo), so the
 * student reads why next to it and what they typed stays on the page to send again.
 */
function outageReply(form: FormData | null) {
  return partRefused(form, DATABASE_UNAVAILABLE_MESSAGE, { status: 503, headers: { "Retry-After": "5" } });
}

/** A refusal shown beside the part of the lesson that was sent (whichever kind it is), with `message`. */
function partRefused(form: FormData | null, message: string, init: ResponseInit) {
  const id = (name: string) => {
    const value = form?.get(name);
    return typeof value === "string" && idSchema.safeParse(value).success ? value : undefined;
  };
  return data(
    {
      exerciseId: id("exerciseId"),
      predictionId: id("predictionId"),
      readingsId: id("readingsId"),
      answerId: id("answerId"),
      photoId: id("photoId"),
      error: message,
      errors: [message],
    },
    init,
  );
}

/** `form` is the request's form, or null for a photo (multipart, read by the photo action). */
async function lessonAction(request: Request, form: FormData | null, slugParam: string) {
  const { user } = await requireRole(request, ["student"]);
  const lesson = findLesson(slugParam);
  if (!lesson) throw data("There is no lesson at this address.", { status: 404 });
  const slug = lesson.slug;
  const reader = readerOf(user);

  // A lesson closed at its due date takes nothing new: no readings, predictions, written answers or
  // photos (an answer to an exercise is refused by recordAttempt, in the statements it runs anyway).
  // Removing one's own photo stays possible: a picture sent by mistake should not have to stay.
  if (form?.get("intent") !== "answer" && form?.get("intent") !== "remove-photo") {
    const policy = (await lessonPolicies({ db }, user.id, [slug])).get(slug);
    if (closedForAnswers(policy)) return partRefused(form, closedMessage(policy!, reader), { status: 409 });
  }

  if (!form) return photoAction(request, user.id, slug);
  const parsed = intentSchema.safeParse(Object.fromEntries(form));
  if (!parsed.success) {
    return data({ error: parsed.error.issues[0]?.message ?? "That request was not understood." }, { status: 400 });
  }
  const input = parsed.data;

  switch (input.intent) {
    case "answer": {
      const definition = findExercise(slug, input.exerciseId);
      if (!definition) return data({ exerciseId: input.exerciseId, error: "This exercise is not part of the lesson." }, { status: 404 });
      const submission: Submission =
        definition.kind === "choice"
          ? { kind: "choice", choice: String(form.get("choice") ?? ""), reason: String(form.get("reason") ?? "").slice(0, 1000) }
          : definition.kind === "table"
            ? { kind: "cells", cells: form.getAll("cell").map((c) => String(c).slice(0, 200)).slice(0, 50) }
            : { kind: "text", answer: String(form.get("answer") ?? "") };
      const outcome = await recordAttempt({ db }, { studentId: user.id, slug, definition, submission, reader });
      if ("refused" in outcome) return data({ exerciseId: input.exerciseId, error: outcome.refused }, { status: 409 });
      return { exerciseId: input.exerciseId, feedback: outcome.feedback };
    }
    case "predict": {
      await savePrediction({ db }, user.id, slug, input.predictionId, input.choice);
      return { predictionId: input.predictionId };
    }
    case "save-readings":
      return saveReadingsAction(form, user.id, slug, input.readingsId);
    case "remove-photo": {
      if (!(await removePhoto({ db }, user.id, input.photo))) return data({ photoId: input.photoId, error: "That photo was not found." }, { status: 404 });
      return { photoId: input.photoId, removed: true };
    }
    case "written-answer": {
      const handIn = input.handIn === "1";
      const sent = { claim: input.claim?.trim(), evidence: input.evidence?.trim(), reasoning: input.reasoning?.trim() };
      const text = { claim: sent.claim ?? "", evidence: sent.evidence ?? "", reasoning: sent.reasoning ?? "" };
      if (handIn) {
        const errors: Record<string, string> = {};
        if (!text.claim) errors.claim = "Write your claim before handing in.";
        if (!text.evidence) errors.evidence = "Give your evidence before handing in.";
        if (!text.reasoning) errors.reasoning = "Explain your reasoning before handing in.";
        if (Object.keys(errors).length > 0) {
          // Keep what was written as a draft, so nothing is lost.
          await saveWrittenAnswer({ db }, user.id, slug, input.answerId, text, false);
          return data({ answerId: input.answerId, errors }, { status: 400 });
        }
      }
      const outcome = await saveWrittenAnswer({ db }, user.id, slug, input.answerId, handIn ? text : sent, handIn);
      if (outcome === "already-handed-in") {
        return data(
          { answerId: input.answerId, errors: { claim: `This answer is handed in. To change it, use “Hand in again”; your ${reader} then reads the new version.` } },
          { status: 409 },
        );
      }
      return { answerId: input.answerId, saved: handIn ? ("handed-in" as const) : ("draft" as const) };
    }
  }
}

/**
 * Rows left entirely empty are skipped; every other problem of every row is named by row and column
 * in one answer (checkReadingsForm), so a student fixes them all in one go.
 */
async function saveReadingsAction(form: FormData, studentId: string, slug: string, readingsId: string) {
  const column = (name: string) => form.getAll(name).map((v) => String(v));
  const mode: Mode = form.get("mode") === "stretch" ? "stretch" : "bend";
  const checked = checkReadingsForm({
    mode,
    resolutionCm: Number(form.get("resolutionCm") ?? 0.1) || 0.1,
    unloaded: String(form.get("unloadedCm") ?? ""),
    forces: column("forceN"),
    readings: column("readingCm"),
    returns: column("returnReadingCm"),
    broke: column("broke").map((b) => b === "1"),
  });
  if (!checked.ok) return data({ readingsId, errors: checked.errors, cells: checked.cells }, { status: 400 });
  await saveReadings({ db }, studentId, slug, {
    readingsId,
    mode,
    material: String(form.get("material") ?? "").trim().slice(0, 80),
    unloadedCm: checked.data.unloadedCm,
    resolutionCm: checked.data.resolutionCm,
    points: checked.data.points,
  });
  return { readingsId, saved: true };
}

async function photoAction(request: Request, studentId: string, slug: string) {
  const upload = await readPhotoForm(request);
  if (!upload.ok) return data({ photoId: "", error: upload.error }, { status: 400 });
  const photoId = idSchema.safeParse(upload.form.get("photoId"));
  if (!photoId.success || !upload.photo) {
    if (upload.photo) await photoStorage().remove(upload.photo.key);
    return data({ photoId: photoId.success ? photoId.data : "", error: "Choose a photo to upload." }, { status: 400 });
  }
  await recordPhoto({ db }, { studentId, lessonSlug: slug, photoId: photoId.data, ...upload.photo });
  await touchVisit({ db }, studentId, slug, `photo-${photoId.data}`);
  return { photoId: photoId.data, saved: true };
}

export default function LessonPage({ loaderData }: Route.ComponentProps) {
  const { lesson, hash, codeUrl, state, canAnswer, asAdult, reader, back, previous, next } = loaderData;
  const Lesson = lessonComponent(hash);
  return (
    <article className="mx-auto max-w-3xl px-5 py-10">
      {/* The lesson's compiled code, from our own origin; it runs before hydration (see lesson-code.server.ts). */}
      <script src={codeUrl} />
      <nav aria-label="Course" className="mb-6 font-ui text-[length:var(--text-step--1)]">
        <Link to={back.to} className="tap">← {back.label}</Link>
      </nav>
      <header className="mb-8">
        <p className="font-ui font-bold uppercase tracking-wider text-ember text-[length:var(--text-step--1)]">
          Lesson {lesson.number} · about {lesson.minutes} minutes
        </p>
        <h1 className="mt-1 mb-3 text-[length:var(--text-step-3)]">{lesson.title}</h1>
        <p className="prose-reading text-[length:var(--text-step-1)] text-ink-soft">{lesson.summary}</p>
        <p className="mt-3 font-ui text-[length:var(--text-step--1)] text-ink-soft" data-testid="lesson-progress">
          {asAdult ? "You see the lesson as a student does; parts done count for students only" : lessonProgressWords(state)}
          {state.assignment ? <span data-testid="lesson-due"> · due {state.assignment.dueText}</span> : null}
        </p>
        {state.assignment?.closed ? (
          <p className="mt-2 rounded bg-caution-wash p-3 font-ui text-caution" role="status">
            This lesson closed at its due date: you can read it and see your answers, but new answers are not taken. Ask your {reader} if you need more time.
          </p>
        ) : null}
      </header>
      {lesson.materials.length > 0 && (
        <section aria-labelledby="materials" className="card mb-6 font-ui">
          <h2 id="materials" className="mb-2 text-[length:var(--text-step-1)]">You will need</h2>
          <ul className="list-disc pl-5">
            {lesson.materials.map((m) => (
              <li key={m}>{m}</li>
            ))}
          </ul>
        </section>
      )}
      {lesson.safety.length > 0 && (
        <section aria-labelledby="safety" className="mb-8 rounded-lg border-l-8 border-caution bg-caution-wash px-5 py-4 font-ui">
          <h2 id="safety" className="mb-2 text-[length:var(--text-step-1)] text-caution">Safety for this lesson</h2>
          <ul className="list-disc pl-5">
            {lesson.safety.map((s) => (
              <li key={s}>{s}</li>
            ))}
          </ul>
          <p className="mt-2">Your school's lab-safety policy and local rules come first; at home, work with an adult.</p>
        </section>
      )}
      <div className="prose-reading lesson-body">
        <LessonContext.Provider value={{ slug: lesson.slug, canAnswer, asAdult, reader, state }}>
          {Lesson ? <Lesson components={lessonComponents} /> : <p>The lesson is loading…</p>}
        </LessonContext.Provider>
      </div>
      <nav aria-label="Lessons" className="mt-12 flex flex-wrap justify-between gap-4 font-ui">
        {previous ? <Link to={`/learn/${previous.slug}`}>← Lesson: {previous.title}</Link> : <span />}
        {next && <Link to={`/learn/${next.slug}`}>Next lesson: {next.title} →</Link>}
      </nav>
    </article>
  );
}

export const meta: Route.MetaFunction = ({ data: loaded }) => [
  { title: loaded ? `${loaded.lesson.title} — Bendwise` : "Lesson — Bendwise" },
];

