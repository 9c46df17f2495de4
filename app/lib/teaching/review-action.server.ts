// The "review" intent, shared by the student's page and the lesson page of a class: parse, check that
// the student is in this class, save.
import { data } from "react-router";
import { z } from "zod";
import { db } from "~/db/client.server";
import type { TeacherClass } from "./classes.server";
import { REVIEW_COMMENT_MAX, RUBRIC, withoutControlCharacters } from "./shared";
import { saveReview } from "./review.server";
import { findClassStudent } from "./roster.server";

const points = z.enum(["0", "1", "2"], { error: "Give 0, 1 or 2 points." }).transform(Number);

/** The words the form shows for each field, so a message names it as the teacher sees it. */
const FIELD_LABELS: Record<string, string> = { ...Object.fromEntries(RUBRIC.map((r) => [r.key, r.label])), comment: "Comment for the student" };

export const reviewSchema = z.object({
  intent: z.literal("review"),
  studentId: z.uuid(),
  slug: z.string().min(1).max(80),
  answerId: z.string().min(1).max(80),
  claim: points,
  evidence: points,
  reasoning: points,
  comment: z
    .string()
    .transform(withoutControlCharacters)
    .refine((c) => c.length <= REVIEW_COMMENT_MAX, {
      error: (issue) =>
        `It can be at most ${REVIEW_COMMENT_MAX.toLocaleString("en-US")} characters; this one has ${String(issue.input).length.toLocaleString("en-US")}. Nothing was saved, and your text is still in the box to shorten.`,
    })
    .default(""),
});

export async function reviewAction(klass: TeacherClass, reviewerId: string, form: Record<string, FormDataEntryValue>) {
  const parsed = reviewSchema.safeParse(form);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const field = String(issue?.path[0] ?? "");
    const label = FIELD_LABELS[field];
    const message = issue?.message ?? "That review was not understood.";
    return data({ error: label ? `${label}: ${message}` : "That review was not understood; reload the page and try again.", field }, { status: 400 });
  }
  const input = parsed.data;
  if (!(await findClassStudent({ db }, klass.id, input.studentId))) return data({ error: "That student is not in this class." }, { status: 404 });
  const saved = await saveReview({ db }, {
    reviewerId,
    studentId: input.studentId,
    slug: input.slug,
    answerId: input.answerId,
    scores: { claim: input.claim, evidence: input.evidence, reasoning: input.reasoning },
    comment: input.comment,
  });
  if (!saved.ok) return data({ error: saved.message }, { status: 409 });
  return { reviewed: `${input.studentId}/${input.slug}/${input.answerId}` };
}
