// The "review" intent, shared by the student's page and the lesson page of a class: parse, check that
// the student is in this class, save.
import { data } from "react-router";
import { z } from "zod";
import { db } from "~/db/client.server";
import type { TeacherClass } from "./classes.server";
import { saveReview } from "./review.server";
import { findClassStudent } from "./roster.server";

const points = z.coerce.number({ error: "Give 0, 1 or 2 points." }).int().min(0, "Give 0, 1 or 2 points.").max(2, "Give 0, 1 or 2 points.");

export const reviewSchema = z.object({
  intent: z.literal("review"),
  studentId: z.uuid(),
  slug: z.string().min(1).max(80),
  answerId: z.string().min(1).max(80),
  claim: points,
  evidence: points,
  reasoning: points,
  comment: z.string().max(2000, "Keep the comment under 2000 characters.").default(""),
});

export async function reviewAction(klass: TeacherClass, reviewerId: string, form: Record<string, FormDataEntryValue>) {
  const parsed = reviewSchema.safeParse(form);
  if (!parsed.success) return data({ error: `${String(parsed.error.issues[0]?.path[0] ?? "review")}: ${parsed.error.issues[0]?.message ?? "not understood"}` }, { status: 400 });
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
