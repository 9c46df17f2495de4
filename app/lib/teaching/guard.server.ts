// The door to every /teach/classes/:classId page, action and JSON route: a teacher, and a class of
// theirs in a school where they teach. Anything else is the same 404, so a stranger learns nothing
// about whether the class exists.
import { z } from "zod";
import { db } from "~/db/client.server";
import { requireRole, type SessionUser } from "~/lib/auth.server";
import { findTeacherClass, type TeacherClass } from "./classes.server";

export const CLASS_NOT_FOUND = "There is no class of yours at this address. Open your classes from your teaching page.";

export function notFound(message: string): never {
  throw new Response(message, { status: 404, headers: { "Content-Type": "text/plain; charset=utf-8" } });
}

export function teacherScope(user: SessionUser) {
  return { id: user.id, schoolIds: user.memberships.filter((m) => m.role === "teacher").map((m) => m.organisationId) };
}

export async function requireTeacherClass(request: Request, classId: string | undefined): Promise<{ user: SessionUser; klass: TeacherClass }> {
  const { user } = await requireRole(request, ["teacher"]);
  const id = z.uuid().safeParse(classId);
  if (!id.success) notFound(CLASS_NOT_FOUND);
  const klass = await findTeacherClass({ db }, teacherScope(user), id.data);
  if (!klass) notFound(CLASS_NOT_FOUND);
  return { user, klass };
}
