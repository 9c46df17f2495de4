// Deleting a student's account and everything recorded for it: asked for by a parent (their child)
// or a school administrator (a student of the school). Really gone, not hidden:
// - the users row, and with it, by the foreign keys' ON DELETE CASCADE, every row that names the
//   student: memberships, enrollments, seat assignments (so the seat is free again), attempts,
//   predictions, readings, written answers, photos' rows, lesson visits, accommodations, mail preferences;
// - rows that name the student only inside text: their sign-in throttle counts ("account:<id>") and
//   any e-mail rate counter or one-time token with their id;
// - the photo files in the photo store, after the rows are gone (a file without a row is never served).
// tests/integration/family-delete.test.ts checks every table of the database for the id afterwards.
// The organisation's row is locked first, as every seat change does (seats.server.ts).
import { and, eq, inArray, sql } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { memberships, organisations, photos, rateLimits, seatAssignments, signInFailures, users, verificationTokens } from "~/db/schema.server";
import { photoStorage } from "~/lib/photo-store.server";

export interface DeletedStudent {
  displayName: string;
  seatsFreed: number;
  photosRemoved: number;
}

/** A student whose home is this organisation (school or household), or null. */
export async function studentOf({ db }: { db: Database }, organisationIds: string[], studentId: string) {
  if (organisationIds.length === 0 || !/^[0-9a-f-]{36}$/i.test(studentId)) return null;
  const [row] = await db
    .select({ id: users.id, displayName: users.displayName, username: users.username, organisationId: users.homeOrganisationId })
    .from(users)
    .innerJoin(memberships, and(eq(memberships.userId, users.id), eq(memberships.organisationId, users.homeOrganisationId), eq(memberships.role, "student")))
    .where(and(eq(users.id, studentId), inArray(users.homeOrganisationId, organisationIds)));
  return row ?? null;
}

/** Deletes the student of this organisation and everything recorded for them; null when there is no such student. */
export async function deleteStudentData(
  { db, removeFile = async (key: string) => void (await photoStorage().remove(key)) }: { db: Database; removeFile?: (key: string) => Promise<void> },
  organisationId: string,
  studentId: string,
): Promise<DeletedStudent | null> {
  const result = await db.transaction(async (tx) => {
    await tx.select({ id: organisations.id }).from(organisations).where(eq(organisations.id, organisationId)).for("update");
    const [student] = await tx
      .select({ id: users.id, displayName: users.displayName })
      .from(users)
      .innerJoin(memberships, and(eq(memberships.userId, users.id), eq(memberships.organisationId, organisationId), eq(memberships.role, "student")))
      .where(and(eq(users.id, studentId), eq(users.homeOrganisationId, organisationId)))
      .for("update", { of: users });
    if (!student) return null;
    const files = await tx.select({ key: photos.storageKey }).from(photos).where(eq(photos.studentId, studentId));
    const [{ seats }] = await tx.select({ seats: sql<number>`count(*)::int` }).from(seatAssignments).where(eq(seatAssignments.studentId, studentId));
    await tx.delete(signInFailures).where(eq(signInFailures.bucket, `account:${studentId}`));
    await tx.delete(rateLimits).where(sql`${rateLimits.bucket} like ${`%:${studentId}`}`);
    await tx.delete(verificationTokens).where(eq(verificationTokens.identifier, studentId));
    await tx.delete(users).where(eq(users.id, studentId));
    return { displayName: student.displayName, seatsFreed: seats, files: files.map((f) => f.key) };
  });
  if (!result) return null;
  let photosRemoved = 0;
  for (const key of result.files) {
    try {
      await removeFile(key);
      photosRemoved++;
    } catch (error) {
      // The row is gone, so nobody can be shown the file; log it so it can be removed by hand.
      console.error(`photo file ${key} of a deleted student could not be removed: ${(error as Error).message}`);
    }
  }
  return { displayName: result.displayName, seatsFreed: result.seatsFreed, photosRemoved };
}

/** Whether what was typed matches the name. Spaces, capitals and accents do not matter: "theo" confirms "Théo". */
export function confirmationMatches(typed: string, expected: string): boolean {
  const norm = (s: string) =>
    s.normalize("NFKD").replace(/\p{M}/gu, "").trim().replace(/\s+/g, " ").toLowerCase();
  return norm(typed) !== "" && norm(typed) === norm(expected);
}
