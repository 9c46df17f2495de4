// /school: a school administrator's home: seats bought, in use and free per school year (free is what
// decides whether a teacher can add a student), the school's teachers and classes.
import { and, asc, count, eq, inArray } from "drizzle-orm";
import { Link } from "react-router";
import type { Route } from "./+types/school";
import { db } from "~/db/client.server";
import { classes, memberships, users } from "~/db/schema.server";
import { requireRole } from "~/lib/auth.server";
import { seatLedger } from "~/lib/seats.server";

export async function loader({ request }: Route.LoaderArgs) {
  const { user } = await requireRole(request, ["school_admin"]);
  const schools = user.memberships.filter((m) => m.role === "school_admin");
  const ids = schools.map((m) => m.organisationId);
  const [ledgers, students, teachers, classCounts] = await Promise.all([
    Promise.all(ids.map((id) => seatLedger({ db }, id))),
    db
      .select({ organisationId: memberships.organisationId, n: count() })
      .from(memberships)
      .where(and(inArray(memberships.organisationId, ids), eq(memberships.role, "student")))
      .groupBy(memberships.organisationId),
    db
      .select({ organisationId: memberships.organisationId, name: users.displayName, email: users.email })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(and(inArray(memberships.organisationId, ids), eq(memberships.role, "teacher")))
      .orderBy(asc(users.displayName)),
    db
      .select({ organisationId: classes.organisationId, n: count() })
      .from(classes)
      .where(inArray(classes.organisationId, ids))
      .groupBy(classes.organisationId),
  ]);
  return {
    displayName: user.displayName,
    schools: schools.map((s) => ({
      id: s.organisationId,
      name: s.organisationName,
      seats: ledgers[ids.indexOf(s.organisationId)].toReversed(),
      students: students.find((r) => r.organisationId === s.organisationId)?.n ?? 0,
      classes: classCounts.find((r) => r.organisationId === s.organisationId)?.n ?? 0,
      teachers: teachers.filter((t) => t.organisationId === s.organisationId).map(({ name, email }) => ({ name, email })),
    })),
  };
}

export default function School({ loaderData }: Route.ComponentProps) {
  const { displayName, schools } = loaderData;
  return (
    <div className="mx-auto max-w-5xl px-5 py-12">
      <p className="mb-1 text-ink-soft">School administrator · {displayName}</p>
      {schools.map((school) => (
        <section key={school.id} aria-labelledby={`school-${school.id}`} className="mb-10">
          <h1 id={`school-${school.id}`} className="mb-6 text-[length:var(--text-step-3)]">
            {school.name}
          </h1>
          <div className="card mb-6">
            <h2 className="mb-2 text-[length:var(--text-step-1)]">What you can do here</h2>
            <ul className="list-disc space-y-1 pl-5">
              <li>See how many student seats your school has bought for each school year, and how many are in use.</li>
              <li>
                <Link to="/school/seats">Buy seats by card or ask for an invoice, and keep every receipt</Link>.
              </li>
              <li>
                <Link to="/school/teachers">Invite teachers by e-mail</Link>.
              </li>
              <li>
                <Link to="/school/students">See the student accounts, and delete one with everything recorded for it</Link>.
              </li>
            </ul>
          </div>
          <div className="grid gap-5 md:grid-cols-3">
            <div className="card">
              <h2 className="mb-2 text-[length:var(--text-step-1)]">Seats</h2>
              {school.seats.length === 0 ? (
                <p className="text-ink-soft">No seats bought yet.</p>
              ) : (
                <ul className="space-y-1">
                  {school.seats.map((s) => (
                    <li key={s.schoolYear} data-year={s.schoolYear}>
                      <strong>{s.schoolYear}</strong>: {s.bought} bought, {s.inUse} in use,{" "}
                      <strong className={s.free === 0 ? "text-danger" : "text-ok"}>{s.free} free</strong>
                    </li>
                  ))}
                </ul>
              )}
              <p className="mt-2 text-ink-soft">
                <Link to="/school/students">{school.students === 1 ? "1 student has an account" : `${school.students} students have accounts`}</Link>.
              </p>
              <p className="mt-2">
                <Link to="/school/seats">Seat ledger, purchases and receipts</Link>
              </p>
            </div>
            <div className="card">
              <h2 className="mb-2 text-[length:var(--text-step-1)]">Teachers</h2>
              {school.teachers.length === 0 ? (
                <p className="text-ink-soft">No teachers yet.</p>
              ) : (
                <ul>
                  {school.teachers.map((t) => (
                    <li key={t.email ?? t.name}>{t.name}</li>
                  ))}
                </ul>
              )}
              <p className="mt-2">
                <Link to="/school/teachers">Invite a teacher</Link>
              </p>
            </div>
            <div className="card">
              <h2 className="mb-2 text-[length:var(--text-step-1)]">Classes</h2>
              <p>
                <strong>{school.classes}</strong> {school.classes === 1 ? "class" : "classes"}
              </p>
              <p className="mt-2">
                <Link to="/school/classes">Every class and teacher, with how the students are doing</Link>
              </p>
            </div>
          </div>
        </section>
      ))}
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "School — Bendwise" }];
