// What a parent sees of one child: the course path (courseProgress, the same as the child's /learn),
// a score for each lesson, each exercise's tries, written answers with the review, their own readings
// with the analysis behind the charts, and photos. Assigned lessons carry the household gradebook's
// cell (due date, late, stuck), from the teaching model's own gradebook.
import type { Database } from "~/db/client.server";
import { choiceLabelReader, courseProgress } from "~/lib/course.server";
import { lessonExercises } from "~/lib/lessons.server";
import { analyseReadings, type AnalysisResult } from "~/lib/science";
import { gradebookView, loadGradebook } from "~/lib/teaching/gradebook.server";
import type { GradebookCell, RubricScores } from "~/lib/teaching/shared";
import { loadStudentWork } from "~/lib/teaching/student-work.server";
import { formatMoment } from "~/lib/teaching/time";
import { triesAsRead, type TryAsRead } from "~/lib/teaching/words";
import type { TeacherClass } from "~/lib/teaching/classes.server";
import { hasWriting, writtenAnswerView } from "~/lib/teaching/review.server";

export interface ChildLesson {
  slug: string;
  number: number;
  title: string;
  minutes: number;
  requiredDone: number;
  requiredTotal: number;
  complete: boolean;
  started: boolean;
  /**
   * share of the lesson's required exercises answered right, 0–100; null before any try. For an
   * assigned lesson, the gradebook's score: answers after the due date count as its late-work rule says.
   */
  score: number | null;
  assignment: { assignmentId: string; dueText: string; cell: GradebookCell | null } | null;
  exercises: {
    id: string;
    title: string;
    right: boolean;
    tries: TryAsRead[];
  }[];
  answers: {
    answerId: string;
    claim: string;
    evidence: string;
    reasoning: string;
    handedIn: boolean;
    handedInText: string | null;
    scores: RubricScores | null;
    comment: string | null;
  }[];
  readings: { id: string; material: string; mode: string; resolutionCm: number; points: number; analysis: AnalysisResult | null }[];
  photos: { id: string; photoId: string; at: string }[];
}

export async function childReport({ db }: { db: Database }, childId: string, klass: TeacherClass | null): Promise<ChildLesson[]> {
  const tz = klass?.timeZone ?? "UTC";
  const [progress, work, book] = await Promise.all([
    courseProgress({ db }, childId),
    loadStudentWork({ db }, childId),
    klass ? loadGradebook({ db }, klass.id) : Promise.resolve(null),
  ]);
  const view = book ? gradebookView(book, tz) : null;
  const labelsOf = choiceLabelReader();
  const row = view?.rows.find((r) => r.student.id === childId);
  return progress.map((p) => {
    const { exercises } = lessonExercises(p.slug);
    const required = exercises.filter((e) => e.required ?? true);
    const attempts = work.attempts.filter((a) => a.lessonSlug === p.slug);
    const rightIds = new Set(attempts.filter((a) => a.correct === 1).map((a) => a.exerciseId));
    const assigned = view?.lessons.find((l) => l.slug === p.slug);
    const cell = assigned ? (row?.cells[assigned.assignmentId] ?? null) : null;
    const rawScore = attempts.length > 0 && required.length > 0 ? Math.round((100 * required.filter((e) => rightIds.has(e.id)).length) / required.length) : null;
    return {
      slug: p.slug,
      number: p.number,
      title: p.title,
      minutes: p.minutes,
      requiredDone: p.requiredDone,
      requiredTotal: p.requiredTotal,
      complete: p.complete,
      started: p.started,
      // The same figure as "Assigned lessons at a glance" for an assigned lesson, so the two pages agree.
      score: cell ? cell.score : rawScore,
      assignment: assigned ? { assignmentId: assigned.assignmentId, dueText: assigned.dueText, cell } : null,
      exercises: exercises
        .map((e) => ({
          id: e.id,
          title: e.title,
          right: rightIds.has(e.id),
          tries: triesAsRead(
            attempts.filter((a) => a.exerciseId === e.id).map((a) => ({ ...a, at: formatMoment(a.createdAt, tz) })),
            labelsOf(childId, p.slug, e.id),
          ),
        }))
        .filter((e) => e.tries.length > 0),
      answers: work.answers
        .filter((a) => a.lessonSlug === p.slug && hasWriting(a))
        .map((a) => writtenAnswerView(a, tz)),
      readings: work.readings
        .filter((r) => r.lessonSlug === p.slug)
        .map((r) => {
          const points = r.points as { forceN: number; readingCm?: number; returnReadingCm?: number; broke?: boolean }[];
          let analysis: AnalysisResult | null = null;
          try {
            analysis = analyseReadings({ mode: r.mode, unloadedCm: r.unloadedCm ?? undefined, resolutionCm: r.resolutionCm, points });
          } catch {
            // A half-filled table has nothing to draw yet.
          }
          return { id: r.readingsId, material: r.material, mode: r.mode, resolutionCm: r.resolutionCm, points: points.length, analysis };
        }),
      photos: work.photos.filter((ph) => ph.lessonSlug === p.slug).map((ph) => ({ id: ph.id, photoId: ph.photoId, at: formatMoment(ph.createdAt, tz) })),
    };
  });
}
