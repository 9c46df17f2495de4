// /learn: a student's home — the course as a path with their progress, a "continue" that goes back
// to exactly where they stopped, and their classes (or household).
import { and, asc, eq } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import type { Route } from "./+types/learn";
import { db } from "~/db/client.server";
import { classes, enrollments, users } from "~/db/schema.server";
import { ContinueCard, CoursePath } from "~/components/course-path";
import { requireRole } from "~/lib/auth.server";
import { continueTarget, courseProgress } from "~/lib/course.server";
import { assignedLessonsFor } from "~/lib/teaching/assignments.server";
import { AssignedLessons } from "~/components/teaching/assigned-lessons";

export async function loader({ request }: Route.LoaderArgs) {
  const { user, membership } = await requireRole(request, ["student"]);
  const teacher = alias(users, "teacher");
  const [myClasses, lessons, assigned] = await Promise.all([
    db
      .select({ id: classes.id, name: classes.name, schoolYear: classes.schoolYear, teacherName: teacher.displayName })
      .from(enrollments)
      .innerJoin(classes, eq(classes.id, enrollments.classId))
      .innerJoin(teacher, eq(teacher.id, classes.teacherId))
      .where(and(eq(enrollments.studentId, user.id), eq(classes.organisationId, membership.organisationId)))
      .orderBy(asc(classes.name)),
    courseProgress({ db }, user.id),
    assignedLessonsFor({ db }, user.id),
  ]);
  return {
    displayName: user.displayName,
    organisationName: membership.organisationName,
    atHome: membership.organisationKind === "household",
    classes: myClasses,
    lessons,
    continueAt: continueTarget(lessons, assigned),
    assigned,
  };
}

export default function Learn({ loaderData }: Route.ComponentProps) {
  const { displayName, organisationName, atHome, classes: myClasses, lessons, continueAt, assigned } = loaderData;
  const finished = lessons.filter((l) => l.complete).length;
  return (
    <div className="mx-auto max-w-4xl px-5 py-12">
      <p className="mb-1 text-ink-soft">{atHome ? `Learning at home · ${organisationName}` : organisationName}</p>
      <h1 className="mb-2 text-[length:var(--text-step-3)]">Hello, {displayName}</h1>
      <p className="mb-6 text-ink-soft">
        {finished} of {lessons.length} lessons finished. Predict first, then load, read the ruler, and check each calculation as you go.
      </p>
      <ContinueCard target={continueAt} lessons={lessons} />
      <AssignedLessons lessons={assigned} done={Object.fromEntries(lessons.map((l) => [l.slug, l.complete]))} by={atHome ? "parent" : "teacher"} />
      <section aria-labelledby="path-heading" className="mb-10">
        <h2 id="path-heading" className="mb-4 text-[length:var(--text-step-2)]">
          Your course
        </h2>
        <CoursePath lessons={lessons} />
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
