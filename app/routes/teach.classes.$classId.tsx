// /teach/classes/:classId: one class at a glance, for the teacher of that class only: how its students
// sign in, and who is in it, each name opening that student's work. The same header and tabs as every
// other page of the class. The class is looked up scoped to the teacher (requireTeacherClass), so
// another teacher's class, or another school's, is simply not found (404).
import { asc, eq } from "drizzle-orm";
import { Link } from "react-router";
import type { Route } from "./+types/teach.classes.$classId";
import { ClassHeader } from "~/components/teaching/ui";
import { db } from "~/db/client.server";
import { enrollments, users } from "~/db/schema.server";
import { classHeading } from "~/lib/teaching/classes.server";
import { requireTeacherClass } from "~/lib/teaching/guard.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  const { klass } = await requireTeacherClass(request, params.classId);
  const students = await db
    .select({ id: users.id, displayName: users.displayName, username: users.username, gradeBand: users.gradeBand })
    .from(enrollments)
    .innerJoin(users, eq(users.id, enrollments.studentId))
    .where(eq(enrollments.classId, klass.id))
    .orderBy(asc(users.displayName));
  return { klass: classHeading(klass), students };
}

export default function ClassOverview({ loaderData }: Route.ComponentProps) {
  const { klass, students } = loaderData;
  return (
    <div className="mx-auto max-w-5xl px-5 py-10">
      <ClassHeader klass={klass} />
      <p className="mb-6">
        Students sign in with the class code <strong className="font-mono">{klass.code}</strong>, their username and their password.{" "}
        {students.length === 0 ? <Link to={`/teach/classes/${klass.id}/roster`}>Add the first students</Link> : null}
      </p>
      {students.length === 0 ? null : (
        <table className="w-full border-collapse text-left">
          <caption className="sr-only">Students in {klass.name}</caption>
          <thead>
            <tr className="border-b-2 border-rule">
              <th scope="col" className="py-2 pr-4">Student</th>
              <th scope="col" className="py-2 pr-4">Username</th>
              <th scope="col" className="py-2 pr-4">Grades</th>
            </tr>
          </thead>
          <tbody>
            {students.map((s) => (
              <tr key={s.id} className="border-b border-rule">
                <td className="py-2 pr-4">
                  <Link to={`/teach/classes/${klass.id}/students/${s.id}`}>{s.displayName}</Link>
                </td>
                <td className="py-2 pr-4 font-mono">{s.username}</td>
                <td className="py-2 pr-4">{s.gradeBand ?? "—"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.klass.name ?? "Class"} — Bendwise` }];
