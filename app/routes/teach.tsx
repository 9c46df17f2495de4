// /teach: a teacher's home. First version: their classes in each school where they teach, with the
// code students sign in with and how many students each has.
import { and, asc, count, eq, inArray, isNull } from "drizzle-orm";
import { Link } from "react-router";
import type { Route } from "./+types/teach";
import { db } from "~/db/client.server";
import { classes, enrollments, organisations } from "~/db/schema.server";
import { requireRole } from "~/lib/auth.server";
import { spacedCode } from "~/lib/teaching/classes.server";

export async function loader({ request }: Route.LoaderArgs) {
  const { user } = await requireRole(request, ["teacher"]);
  const schoolIds = user.memberships.filter((m) => m.role === "teacher").map((m) => m.organisationId);
  const rows = await db
    .select({
      id: classes.id,
      name: classes.name,
      schoolYear: classes.schoolYear,
      signInCode: classes.signInCode,
      school: organisations.name,
      students: count(enrollments.studentId),
    })
    .from(classes)
    .innerJoin(organisations, eq(organisations.id, classes.organisationId))
    .leftJoin(enrollments, eq(enrollments.classId, classes.id))
    .where(and(eq(classes.teacherId, user.id), inArray(classes.organisationId, schoolIds), isNull(classes.archivedAt)))
    .groupBy(classes.id, organisations.name)
    .orderBy(asc(organisations.name), asc(classes.name));
  const schools = user.memberships.filter((m) => m.role === "teacher").map((m) => m.organisationName);
  // The code as every other page writes it: in two groups, read aloud more easily.
  return { displayName: user.displayName, schools, classes: rows.map(({ signInCode, ...c }) => ({ ...c, code: spacedCode(signInCode) })) };
}

export default function Teach({ loaderData }: Route.ComponentProps) {
  const { displayName, schools, classes: rows } = loaderData;
  return (
    <div className="mx-auto max-w-5xl px-5 py-12">
      <p className="mb-1 text-ink-soft">Teacher · {schools.join(" · ")}</p>
      <h1 className="mb-6 text-[length:var(--text-step-3)]">{displayName}'s classes</h1>
      <section className="card mb-8" aria-labelledby="here-heading">
        <h2 id="here-heading" className="mb-2 text-[length:var(--text-step-1)]">
          What you can do here
        </h2>
        <ul className="list-disc space-y-1 pl-5">
          <li>See each class with the code its students sign in with; open it for its gradebook, to see who has finished and who is stuck.</li>
          <li>
            <Link to="/teach/classes">Make a class</Link>, add students one by one or from a CSV file, assign lessons with due dates, review
            written answers, give a student more tries or time, and set a new password for a student who forgot theirs.
          </li>
        </ul>
      </section>
      <p className="mb-4">
        <Link to="/teach/classes" className="btn">
          All your classes, and make a new one
        </Link>
      </p>
      {rows.length === 0 ? (
        <p className="text-ink-soft">You have no classes yet.</p>
      ) : (
        <table className="w-full border-collapse text-left">
          <caption className="sr-only">Your classes</caption>
          <thead>
            <tr className="border-b-2 border-rule">
              <th scope="col" className="py-2 pr-4">Class</th>
              <th scope="col" className="py-2 pr-4">School year</th>
              <th scope="col" className="py-2 pr-4">Sign-in code</th>
              <th scope="col" className="py-2 pr-4 text-right">Students</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((c) => (
              <tr key={c.id} className="border-b border-rule">
                <td className="py-2 pr-4">
                  <Link to={`/teach/classes/${c.id}/gradebook`}>{c.name}</Link>
                  {schools.length > 1 ? <span className="block text-[length:var(--text-step--1)] text-ink-soft">{c.school}</span> : null}
                </td>
                <td className="py-2 pr-4">{c.schoolYear}</td>
                <td className="py-2 pr-4 font-mono">{c.code}</td>
                <td className="py-2 pr-4 text-right">{c.students}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Teaching — Bendwise" }];
