// A teacher's review of a written claim–evidence–reasoning answer: 0–2 points each, and a comment the
// student reads on their lesson page.
import { and, eq, isNotNull } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { writtenAnswers } from "~/db/schema.server";

type Db = { db: Database };

export const RUBRIC = [
  { key: "claim", label: "Claim", levels: ["Missing or off the question", "Answers the question, but vaguely", "A clear, precise answer to the question"] },
  { key: "evidence", label: "Evidence", levels: ["No data", "Some data, not all of it fits", "The right numbers from the data, with units"] },
  { key: "reasoning", label: "Reasoning", levels: ["No link to the science", "A link, partly explained", "Explains why the evidence supports the claim"] },
] as const;

export type RubricScores = { claim: number; evidence: number; reasoning: number };

export function isRubricScores(value: unknown): value is RubricScores {
  if (!value || typeof value !== "object") return false;
  const v = value as Record<string, unknown>;
  return RUBRIC.every((r) => Number.isInteger(v[r.key]) && (v[r.key] as number) >= 0 && (v[r.key] as number) <= 2);
}

export const rubricTotal = (s: RubricScores) => s.claim + s.evidence + s.reasoning;

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
