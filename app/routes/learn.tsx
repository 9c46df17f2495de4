// /learn: a student's home. First version: who they are, their classes (or family), what comes here.
import { and, asc, eq } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import type { Route } from "./+types/learn";
import { db } from "~/db/client.server";
import { classes, enrollments, users } from "~/db/schema.server";
import { requireRole } from "~/lib/auth.server";

export async function loader({ request }: Route.LoaderArgs) {
  const { user, membership } = await requireRole(request, ["student"]);
  const teacher = alias(users, "teacher");
  const myClasses = await db
    .select({ id: classes.id, name: classes.name, schoolYear: classes.schoolYear, teacherName: teacher.displayName })
    .from(enrollments)
    .innerJoin(classes, eq(classes.id, enrollments.classId))
    .innerJoin(teacher, eq(teacher.id, classes.teacherId))
    .where(and(eq(enrollments.studentId, user.id), eq(classes.organisationId, membership.organisationId)))
    .orderBy(asc(classes.name));
  return {
    displayName: user.displayName,
    organisationName: membership.organisationName,
    atHome: membership.organisationKind === "household",
    classes: myClasses,
  };
}

export default function Learn({ loaderData }: Route.ComponentProps) {
  const { displayName, organisationName, atHome, classes: myClasses } = loaderData;
  return (
    <div className="mx-auto max-w-4xl px-5 py-12">
      <p className="mb-1 text-ink-soft">{atHome ? `Learning at home · ${organisationName}` : organisationName}</p>
      <h1 className="mb-6 text-[length:var(--text-step-3)]">Hello, {displayName}</h1>
      <section className="card mb-6" aria-labelledby="here-heading">
        <h2 id="here-heading" className="mb-2 text-[length:var(--text-step-1)]">
          What you can do here
        </h2>
        <ul className="list-disc space-y-1 pl-5">
          <li>Work through the Bendwise lessons at your own pace, and pick up where you left off.</li>
          <li>Predict first, then load your strips, read the ruler and type in your own readings.</li>
          <li>Get every calculation checked straight away, with a hint when something slipped.</li>
        </ul>
      </section>
      {atHome ? null : (
        <section aria-labelledby="classes-heading">
          <h2 id="classes-heading" className="mb-3 text-[length:var(--text-step-1)]">
            Your classes
          </h2>
          {myClasses.length === 0 ? (
            <p className="text-ink-soft">You are not in a class yet. Your teacher adds you.</p>
          ) : (
            <ul className="space-y-2">
              {myClasses.map((c) => (
                <li key={c.id} className="card">
                  <strong>{c.name}</strong> <span className="text-ink-soft">· {c.schoolYear} · with {c.teacherName}</span>
                </li>
              ))}
            </ul>
          )}
        </section>
      )}
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "My lessons — Bendwise" }];
