// /school/students/:studentId/delete: a school administrator deletes a student's account and
// everything recorded for it, for good; the seat is freed. The administrator types the student's
// name to confirm. Another school's student is simply not found.
import { useEffect, useRef } from "react";
import { Link, data, useNavigation, type ShouldRevalidateFunctionArgs } from "react-router";
import { Notice } from "~/components/auth-forms";
import { z } from "zod";
import type { Route } from "./+types/school.students.$studentId.delete";
import { DeleteStudentForm } from "~/components/delete-student";
import { db } from "~/db/client.server";
import { assertSameOrigin, requireRole } from "~/lib/auth.server";
import { confirmationMatches, deleteStudentData, studentOf } from "~/lib/student-deletion.server";

const NOT_FOUND = "There is no student of your school at this address. Open the student list from your school page.";
const confirmSchema = z.object({ confirmName: z.string().max(200) });

async function studentFor(request: Request, studentId: string | undefined) {
  const { user } = await requireRole(request, ["school_admin"]);
  const schools = user.memberships.filter((m) => m.role === "school_admin" && m.organisationKind === "school").map((m) => m.organisationId);
  const student = studentId ? await studentOf({ db }, schools, studentId) : null;
  if (!student) throw new Response(NOT_FOUND, { status: 404, headers: { "Content-Type": "text/plain; charset=utf-8" } });
  return student;
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const student = await studentFor(request, params.studentId);
  return { student: { id: student.id, displayName: student.displayName, username: student.username } };
}

export async function action({ request, params }: Route.ActionArgs) {
  assertSameOrigin(request);
  const student = await studentFor(request, params.studentId);
  const parsed = confirmSchema.safeParse(Object.fromEntries(await request.formData()));
  const typed = parsed.success ? parsed.data.confirmName : "";
  if (!confirmationMatches(typed, student.displayName)) {
    return data({ typed, error: `Type ${student.displayName}'s name exactly as it is shown, to confirm. Nothing was deleted.` }, { status: 400 });
  }
  const deleted = await deleteStudentData({ db }, student.organisationId!, student.id);
  if (!deleted) throw new Response(NOT_FOUND, { status: 404 });
  return { deleted: deleted.displayName, seatsFreed: deleted.seatsFreed };
}

// Once the account is gone this page's loader can only answer 404, so it is not asked again after a
// deletion: the page shows the action's "Deleted" answer instead of "Page not found".
export function shouldRevalidate({ actionResult, defaultShouldRevalidate }: ShouldRevalidateFunctionArgs) {
  if ((actionResult as { deleted?: string } | undefined)?.deleted) return false;
  return defaultShouldRevalidate;
}

export default function DeleteStudent({ loaderData, actionData }: Route.ComponentProps) {
  const { student } = loaderData;
  const busy = useNavigation().state !== "idle";
  const answer = actionData as { typed?: string; error?: string; deleted?: string; seatsFreed?: number } | undefined;
  if (answer?.deleted) return <Deleted name={answer.deleted} seatFreed={Boolean(answer.seatsFreed)} />;
  return (
    <div className="mx-auto max-w-2xl px-5 py-10">
      <DeleteStudentForm name={student.displayName} username={student.username} who="this student" busy={busy} typed={answer?.typed} error={answer?.error} back="/school/students" />
    </div>
  );
}

/** The answer replaces the form that had the keyboard, so the keyboard goes to its heading and the page is read from there. */
function Deleted({ name, seatFreed }: { name: string; seatFreed: boolean }) {
  const heading = useRef<HTMLHeadingElement>(null);
  useEffect(() => heading.current?.focus(), []);
  return (
    <div className="mx-auto max-w-2xl px-5 py-10">
      <h1 ref={heading} tabIndex={-1} className="mb-4 text-[length:var(--text-step-3)]">
        Deleted
      </h1>
      <Notice tone="done">
        {name}'s account and everything recorded for it are gone.{seatFreed ? " Their seat is free for another student." : ""}
      </Notice>
      <Link to="/school/students" className="btn">
        Back to the student accounts
      </Link>
    </div>
  );
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Delete ${data?.student.displayName ?? "a student"}'s account — Bendwise` }];
