// /teach/classes/:classId: a class's own address. The class's pages are its tabs (gradebook, students,
// lessons assigned, settings), so the address opens its gradebook, as the lists of classes do, for
// the class's teacher only: another teacher's class, or another school's, is not found (404).
import { redirect } from "react-router";
import type { Route } from "./+types/teach.classes.$classId";
import { requireTeacherClass } from "~/lib/teaching/guard.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  const { klass } = await requireTeacherClass(request, params.classId);
  return redirect(`/teach/classes/${klass.id}/gradebook`);
}
