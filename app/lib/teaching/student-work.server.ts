// A student's work as their teacher reads it: every attempt, their own readings, written answers and
// photos, in four queries. The caller has checked that the student is in one of the teacher's classes.
import { and, asc, eq, inArray } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { enrollments, exerciseAttempts, photos, readingSets, users, writtenAnswers } from "~/db/schema.server";

type Db = { db: Database };

export async function loadStudentWork({ db }: Db, studentId: string) {
  const [attempts, readings, answers, pictures] = await Promise.all([
    db
      .select({
        id: exerciseAttempts.id,
        lessonSlug: exerciseAttempts.lessonSlug,
        exerciseId: exerciseAttempts.exerciseId,
        rawAnswer: exerciseAttempts.rawAnswer,
        outcome: exerciseAttempts.outcome,
        correct: exerciseAttempts.correct,
        slipCode: exerciseAttempts.slipCode,
        createdAt: exerciseAttempts.createdAt,
      })
      .from(exerciseAttempts)
      .where(eq(exerciseAttempts.studentId, studentId))
      .orderBy(asc(exerciseAttempts.lessonSlug), asc(exerciseAttempts.exerciseId), asc(exerciseAttempts.createdAt)),
    db.select().from(readingSets).where(eq(readingSets.studentId, studentId)).orderBy(asc(readingSets.lessonSlug), asc(readingSets.readingsId)),
    db.select().from(writtenAnswers).where(eq(writtenAnswers.studentId, studentId)).orderBy(asc(writtenAnswers.lessonSlug), asc(writtenAnswers.answerId)),
    db
      .select({ id: photos.id, lessonSlug: photos.lessonSlug, photoId: photos.photoId, createdAt: photos.createdAt })
      .from(photos)
      .where(eq(photos.studentId, studentId))
      .orderBy(asc(photos.lessonSlug), asc(photos.createdAt)),
  ]);
  return { attempts, readings, answers, photos: pictures };
}

/** The written answers of a class's students in one lesson, with names: the review list. One query. */
export async function lessonAnswersForClass({ db }: Db, classId: string, slug: string) {
  return db
    .select({
      studentId: writtenAnswers.studentId,
      displayName: users.displayName,
      username: users.username,
      answerId: writtenAnswers.answerId,
      claim: writtenAnswers.claim,
      evidence: writtenAnswers.evidence,
      reasoning: writtenAnswers.reasoning,
      handedInAt: writtenAnswers.handedInAt,
      reviewScores: writtenAnswers.reviewScores,
      reviewComment: writtenAnswers.reviewComment,
      reviewedAt: writtenAnswers.reviewedAt,
    })
    .from(writtenAnswers)
    .innerJoin(users, eq(users.id, writtenAnswers.studentId))
    .where(
      and(
        eq(writtenAnswers.lessonSlug, slug),
        inArray(writtenAnswers.studentId, db.select({ id: enrollments.studentId }).from(enrollments).where(eq(enrollments.classId, classId))),
      ),
    )
    .orderBy(asc(users.displayName), asc(writtenAnswers.answerId));
}
