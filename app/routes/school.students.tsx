// /school/students: every student account of the school, with their classes, for the administrator.
// From here an account can be deleted with everything recorded for it (for a family that leaves, or
// at the end of the school's agreement).
import { and, asc, eq } from "drizzle-orm";
import { Link } from "react-router";
import { SlidingBox } from "~/components/sliding-box";
import type { Route } from "./+types/school.students";
import { db } from "~/db/client.server";
import { classes, enrollments, memberships, users } from "~/db/schema.server";
import { requireRole } from "~/lib/auth.server";

export async function loader({ request }: Route.LoaderArgs) {
  const { membership } = await requireRole(request, ["school_admin"]);
  const schoolId = membership.organisationId;
  const [students, places] = await Promise.all([
    db
      .select({ id: users.id, displayName: users.displayName, username: users.username, gradeBand: users.gradeBand, studentNumber: users.studentNumber })
      .from(users)
      .innerJoin(memberships, and(eq(memberships.userId, users.id), eq(memberships.organisationId, schoolId), eq(memberships.role, "student")))
      .where(eq(users.homeOrganisationId, schoolId))
      .orderBy(asc(users.displayName), asc(users.username)),
    db
      .select({ studentId: enrollments.studentId, name: classes.name, schoolYear: classes.schoolYear })
      .from(enrollments)
      .innerJoin(classes, eq(classes.id, enrollments.classId))
      .where(eq(classes.organisationId, schoolId))
      .orderBy(asc(classes.name)),
  ]);
  return {
    school: membership.organisationName,
    students: students.map((s) => ({ ...s, classes: places.filter((p) => p.studentId === s.id).map((p) => `${p.name} (${p.schoolYear})`) })),
  };
}

export default function SchoolStudents({ loaderData }: Route.ComponentProps) {
  const { school, students } = loaderData;
  return (
    <div className="mx-auto max-w-5xl px-5 py-10">
      <p className="mb-1">
        <Link to="/school">{school}</Link>
      </p>
      <h1 className="mb-2 text-[length:var(--text-step-3)]">Student accounts</h1>
      <p className="mb-6 text-ink-soft">
        {students.length} {students.length === 1 ? "student has" : "students have"} an account at {school}. Teachers add students to their classes; here you can
        delete an account with everything recorded for it.
      </p>
      {/* Narrow cells on a phone, and a username may break, so the table fits 375 px with its Delete links whole. */}
      <SlidingBox label={`Student accounts of ${school}`} className="rounded-lg border border-rule bg-card">
        <table className="w-full border-collapse text-left text-[length:var(--text-step--1)]" data-testid="school-students">
          <caption className="sr-only">Student accounts of {school}</caption>
          <thead>
            <tr className="border-b-2 border-rule">
              <th scope="col" className="px-2 py-2 sm:px-3">Name</th>
              <th scope="col" className="px-2 py-2 sm:px-3">Username</th>
              <th scope="col" className="px-2 py-2 sm:px-3">Classes</th>
              <th scope="col" className="px-2 py-2 sm:px-3"><span className="sr-only">Delete</span></th>
            </tr>
          </thead>
          <tbody>
            {students.map((s) => (
              <tr key={s.id} className="border-b border-rule align-top" data-student={s.username ?? s.id}>
                <th scope="row" className="px-2 py-2 sm:px-3 font-normal">
                  {s.displayName}
                  {s.studentNumber ? <span className="block text-ink-soft">no. {s.studentNumber}</span> : null}
                </th>
                <td className="px-2 py-2 sm:px-3 font-mono [overflow-wrap:anywhere]">{s.username}</td>
                <td className="px-2 py-2 sm:px-3">{s.classes.length === 0 ? <span className="text-ink-soft">none</span> : s.classes.join(", ")}</td>
                <td className="px-2 py-2 sm:px-3">
                  <Link to={`/school/students/${s.id}/delete`} className="font-bold text-danger">
                    Delete<span className="sr-only"> {s.displayName}'s account and data</span>
                  </Link>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </SlidingBox>
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Student accounts — Bendwise" }];
