// /family/children/:childId/delete: a parent deletes a child's account and everything recorded for it
// (answers, readings, written work, photos, progress), for good, and the seat is freed. The page says
// what goes, and the parent types the child's name to confirm.
import { Link, data, useNavigation, type ShouldRevalidateFunctionArgs } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/family.children.$childId.delete";
import { DeleteStudentForm } from "~/components/delete-student";
import { Notice } from "~/components/auth-forms";
import { db } from "~/db/client.server";
import { assertSameOrigin, requireRole } from "~/lib/auth.server";
import { findChild } from "~/lib/family/household.server";
import { confirmationMatches, deleteStudentData } from "~/lib/student-deletion.server";

const NOT_FOUND = "There is no child of yours at this address. Open your children from your family page.";
const confirmSchema = z.object({ confirmName: z.string().max(200) });

async function childFor(request: Request, childId: string | undefined) {
  const { user } = await requireRole(request, ["parent"]);
  const child = childId ? await findChild({ db }, user, childId) : null;
  if (!child) throw new Response(NOT_FOUND, { status: 404, headers: { "Content-Type": "text/plain; charset=utf-8" } });
  return child;
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const child = await childFor(request, params.childId);
  return { child: { id: child.id, displayName: child.displayName, username: child.username } };
}

export async function action({ request, params }: Route.ActionArgs) {
  assertSameOrigin(request);
  const child = await childFor(request, params.childId);
  const parsed = confirmSchema.safeParse(Object.fromEntries(await request.formData()));
  const typed = parsed.success ? parsed.data.confirmName : "";
  if (!confirmationMatches(typed, child.displayName)) {
    return data({ typed, error: `Type ${child.displayName}'s name exactly as it is shown, to confirm. Nothing was deleted.` }, { status: 400 });
  }
  const deleted = await deleteStudentData({ db }, child.householdId, child.id);
  if (!deleted) throw new Response(NOT_FOUND, { status: 404 });
  return { deleted: deleted.displayName, seatsFreed: deleted.seatsFreed };
}

// Once the account is gone this page's loader can only answer 404, so it is not asked again after a
// deletion: the page shows the action's "Deleted" answer instead of "Page not found".
export function shouldRevalidate({ actionResult, defaultShouldRevalidate }: ShouldRevalidateFunctionArgs) {
  if ((actionResult as { deleted?: string } | undefined)?.deleted) return false;
  return defaultShouldRevalidate;
}

export default function DeleteChild({ loaderData, actionData }: Route.ComponentProps) {
  const { child } = loaderData;
  const busy = useNavigation().state !== "idle";
  const answer = actionData as { deleted?: string; seatsFreed?: number; typed?: string; error?: string } | undefined;
  if (answer?.deleted) {
    return (
      <div className="mx-auto max-w-2xl px-5 py-10">
        <h1 className="mb-4 text-[length:var(--text-step-3)]">Deleted</h1>
        <Notice tone="done">
          {answer.deleted}'s account and everything recorded for it are gone.
          {answer.seatsFreed ? ` Their seat is free for another child.` : ""}
        </Notice>
        <Link to="/family" className="btn">
          Back to your family page
        </Link>
      </div>
    );
  }
  return (
    <div className="mx-auto max-w-2xl px-5 py-10">
      <p className="mb-1">
        <Link to={`/family/children/${child.id}`}>{child.displayName}</Link>
      </p>
      <DeleteStudentForm name={child.displayName} username={child.username} who="your child" busy={busy} typed={answer?.typed} error={answer?.error} back={`/family/children/${child.id}`} />
    </div>
  );
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Delete ${data?.child.displayName ?? "a child"}'s account — Bendwise` }];
