// A teacher's review of a written claim–evidence–reasoning answer: 0–2 points each, and a comment the
// student reads on their lesson page.
import { and, eq, isNotNull } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { writtenAnswers } from "~/db/schema.server";

type Db = { db: Database };

import { isRubricScores as isRubricScoresHere, type RubricScores } from "./shared";
import { formatMoment } from "./time";

export { RUBRIC, isRubricScores, rubricTotal, type RubricScores } from "./shared";

/**
 * Saves the review of a handed-in answer. The caller has checked that the student is in one of the
 * teacher's classes. A draft that was never handed in cannot be reviewed.
 */
export async function saveReview(
  { db }: Db,
  input: { reviewerId: string; studentId: string; slug: string; answerId: string; scores: RubricScores; comment: string },
): Promise<{ ok: true } | { ok: false; message: string }> {
  const updated = await db
    .update(writtenAnswers)
    .set({ reviewScores: input.scores, reviewComment: input.comment.trim() || null, reviewedBy: input.reviewerId, reviewedAt: new Date() })
    .where(
      and(
        eq(writtenAnswers.studentId, input.studentId),
        eq(writtenAnswers.lessonSlug, input.slug),
        eq(writtenAnswers.answerId, input.answerId),
        isNotNull(writtenAnswers.handedInAt),
      ),
    )
    .returning({ answerId: writtenAnswers.answerId });
  return updated.length > 0 ? { ok: true } : { ok: false, message: "This answer has not been handed in yet, so it cannot be reviewed." };
}

/** A written answer worth showing an adult: handed in, or a draft with some words in it (an empty draft says nothing). */
export function hasWriting(a: Pick<typeof writtenAnswers.$inferSelect, "claim" | "evidence" | "reasoning" | "handedInAt">): boolean {
  return a.handedInAt !== null || [a.claim, a.evidence, a.reasoning].some((text) => text.trim() !== "");
}

/** A written answer as the teacher's and parent's pages show it, with times in the class's time zone. */
export function writtenAnswerView(
  a: Pick<typeof writtenAnswers.$inferSelect, "answerId" | "claim" | "evidence" | "reasoning" | "handedInAt" | "reviewScores" | "reviewComment">,
  timeZone: string,
) {
  return {
    answerId: a.answerId,
    claim: a.claim,
    evidence: a.evidence,
    reasoning: a.reasoning,
    handedIn: a.handedInAt !== null,
    handedInText: a.handedInAt ? formatMoment(a.handedInAt, timeZone) : null,
    scores: isRubricScoresHere(a.reviewScores) ? a.reviewScores : null,
    comment: a.reviewComment,
  };
}
