// /teach/classes/:classId: one class's list of students, for the teacher of that class only.
// The class is looked up scoped to the teacher, so another teacher's class, or another school's,
// is simply not found (404); the membership check below is a second lock on the same door.
import { and, asc, eq } from "drizzle-orm";
import { Link } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/teach.classes.$classId";
import { db } from "~/db/client.server";
import { classes, enrollments, users } from "~/db/schema.server";
import { requireMembership, requireRole } from "~/lib/auth.server";

const NOT_FOUND = "There is no class of yours at this address. Open your classes from your teaching page.";

export async function loader({ request, params }: Route.LoaderArgs) {
  const { user } = await requireRole(request, ["teacher"]);
  const classId = z.uuid().safeParse(params.classId);
  if (!classId.success) throw new Response(NOT_FOUND, { status: 404 });
  const [klass] = await db
    .select({ id: classes.id, name: classes.name, schoolYear: classes.schoolYear, signInCode: classes.signInCode, organisationId: classes.organisationId })
    .from(classes)
    .where(and(eq(classes.id, classId.data), eq(classes.teacherId, user.id)));
  if (!klass) throw new Response(NOT_FOUND, { status: 404 });
  const membership = requireMembership(user, klass.organisationId, ["teacher"]);
  const students = await db
    .select({ id: users.id, displayName: users.displayName, username: users.username, gradeBand: users.gradeBand })
    .from(enrollments)
    .innerJoin(users, eq(users.id, enrollments.studentId))
    .where(eq(enrollments.classId, klass.id))
    .orderBy(asc(users.displayName));
  return { klass: { name: klass.name, schoolYear: klass.schoolYear, signInCode: klass.signInCode }, school: membership.organisationName, students };
}

export default function ClassRoster({ loaderData }: Route.ComponentProps) {
  const { klass, school, students } = loaderData;
  return (
    <div className="mx-auto max-w-4xl px-5 py-12">
      <p className="mb-1">
        <Link to="/teach">Your classes</Link> <span className="text-ink-soft">· {school}</span>
      </p>
      <h1 className="mb-2 text-[length:var(--text-step-3)]">{klass.name}</h1>
      <p className="mb-6 text-ink-soft">
        {klass.schoolYear} · students sign in with the code <strong className="font-mono text-ink">{klass.signInCode}</strong>, their
        username and their password.
      </p>
      <nav aria-label="This class" className="mb-6 flex flex-wrap gap-x-5 gap-y-1 font-bold">
        <Link to="gradebook">Gradebook</Link>
        <Link to="roster">Add students and manage them</Link>
        <Link to="assignments">Lessons assigned</Link>
        <Link to="settings">Class settings</Link>
      </nav>
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
              <td className="py-2 pr-4">{s.displayName}</td>
              <td className="py-2 pr-4 font-mono">{s.username}</td>
              <td className="py-2 pr-4">{s.gradeBand ?? "—"}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.klass.name ?? "Class"} — Bendwise` }];
