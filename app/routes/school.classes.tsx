// /school/classes: for a school administrator, every class and teacher of their school with progress
// summaries. Rows are scoped to the administrator's own schools in the WHERE clause; teachers have
// their own classes on /teach and are refused here.
import { Link } from "react-router";
import type { Route } from "./+types/school.classes";
import { db } from "~/db/client.server";
import { requireRole } from "~/lib/auth.server";
import { schoolTeaching } from "~/lib/teaching/school.server";
import { SchoolTeachingSection } from "~/components/teaching/school-teaching";

export async function loader({ request }: Route.LoaderArgs) {
  const { user } = await requireRole(request, ["school_admin"]);
  const schools = user.memberships.filter((m) => m.role === "school_admin" && m.organisationKind === "school");
  const teaching = await schoolTeaching({ db }, schools.map((s) => s.organisationId));
  return { schools: teaching.map((t) => ({ ...t, name: schools.find((s) => s.organisationId === t.id)?.organisationName ?? t.name })) };
}

export default function SchoolClasses({ loaderData }: Route.ComponentProps) {
  return (
    <div className="mx-auto max-w-6xl px-5 py-10">
      <p className="mb-1 text-[length:var(--text-step--1)]">
        <Link to="/school">School</Link>
      </p>
      <h1 className="mb-2 text-[length:var(--text-step-3)]">Classes and teachers</h1>
      <p className="mb-8 text-ink-soft">
        How each class is doing with its assigned lessons. Lesson work done: the share of assigned lessons the students have finished. Stuck: students with
        two or more wrong answers to an exercise and none right yet. Late: students past a due date without finishing, or who finished after it.
      </p>
      {loaderData.schools.map((school) => (
        <SchoolTeachingSection key={school.id} school={school} />
      ))}
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Classes and teachers — Bendwise" }];
