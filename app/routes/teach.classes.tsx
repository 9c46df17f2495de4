// /teach/classes: every class of the teacher with how it is doing, a form to make a new class, and the
// archived classes. The summaries come from the gradebooks of all the classes at once (six queries).
import { Form, Link, data, useActionData, useNavigation } from "react-router";
import { useEffect, useState } from "react";
import { z } from "zod";
import type { Route } from "./+types/teach.classes";
import { db } from "~/db/client.server";
import { assertSameOrigin, requireRole } from "~/lib/auth.server";
import { purchasableSchoolYears, schoolYearOf } from "~/lib/school-year";
import { classHeading, createClass, listTeacherClasses, spacedCode } from "~/lib/teaching/classes.server";
import { loadGradebooks } from "~/lib/teaching/gradebook.server";
import { teacherScope } from "~/lib/teaching/guard.server";
import { CLASS_NAME_MAX, classNameProblem } from "~/lib/teaching/shared";
import { Notice, Percent, SelectField, TextField } from "~/components/teaching/ui";
import { SendButton } from "~/components/send-button";

const createSchema = z.object({
  intent: z.literal("create"),
  name: z.string().superRefine((name, ctx) => {
    const problem = classNameProblem(name, "Give the class a name, such as “Grade 7 Science, period 2”.");
    if (problem) ctx.addIssue({ code: "custom", message: problem });
  }),
  schoolYear: z.string(),
  organisationId: z.uuid("Choose a school."),
  timeZone: z.string().max(64).default("UTC"),
});

export async function loader({ request }: Route.LoaderArgs) {
  const { user } = await requireRole(request, ["teacher"]);
  const scope = teacherScope(user);
  const [active, archived] = await Promise.all([
    listTeacherClasses({ db }, scope, "active"),
    listTeacherClasses({ db }, scope, "archived"),
  ]);
  const books = await loadGradebooks({ db }, active.map((c) => c.id));
  return {
    schools: user.memberships.filter((m) => m.role === "teacher").map((m) => ({ id: m.organisationId, name: m.organisationName })),
    schoolYears: purchasableSchoolYears(),
    currentYear: schoolYearOf(),
    active: active.map((c) => ({ ...classHeading(c), summary: books.get(c.id)!.summary })),
    archived: archived.map((c) => ({ id: c.id, name: c.name, schoolYear: c.schoolYear, schoolName: c.schoolName, code: spacedCode(c.signInCode) })),
  };
}

export async function action({ request }: Route.ActionArgs) {
  assertSameOrigin(request);
  const { user } = await requireRole(request, ["teacher"]);
  const form = Object.fromEntries(await request.formData());
  const parsed = createSchema.safeParse(form);
  const values = { name: String(form.name ?? ""), schoolYear: String(form.schoolYear ?? "") };
  if (!parsed.success) {
    const errors = Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0] ?? "form"), i.message]));
    return data({ errors, values }, { status: 400 });
  }
  const school = teacherScope(user).schoolIds.find((id) => id === parsed.data.organisationId);
  if (!school) return data({ errors: { organisationId: "You do not teach at that school." }, values }, { status: 403 });
  const years = purchasableSchoolYears();
  if (!years.includes(parsed.data.schoolYear as (typeof years)[number])) {
    return data({ errors: { schoolYear: `Choose ${years.join(" or ")}.` }, values }, { status: 400 });
  }
  const made = await createClass({ db }, { organisationId: school, teacherId: user.id, name: parsed.data.name, schoolYear: parsed.data.schoolYear, timeZone: parsed.data.timeZone });
  if (!made.ok) return data({ errors: { [made.field]: made.message }, values }, { status: 400 });
  return { created: made.id, errors: {} as Record<string, string>, values: { name: "", schoolYear: parsed.data.schoolYear } };
}

export default function TeachClasses({ loaderData }: Route.ComponentProps) {
  const { schools, schoolYears, currentYear, active, archived } = loaderData;
  const result = useActionData<typeof action>();
  const navigation = useNavigation();
  const errors: Record<string, string> = result?.errors ?? {};
  const created = result && "created" in result ? active.find((c) => c.id === result.created) : undefined;
  // Due dates are shown in the class's time zone; a new class takes this computer's.
  const [timeZone, setTimeZone] = useState("UTC");
  useEffect(() => setTimeZone(Intl.DateTimeFormat().resolvedOptions().timeZone || "UTC"), []);

  return (
    <div className="mx-auto max-w-5xl px-5 py-10">
      <p className="mb-1 text-[length:var(--text-step--1)]">
        <Link to="/teach">Teaching</Link>
      </p>
      <h1 className="mb-6 text-[length:var(--text-step-3)]">Your classes</h1>

      {created ? (
        <Notice tone="done">
          <p>
            <strong>{created.name}</strong> is ready. Its students sign in with the code{" "}
            <strong className="font-mono">{created.code}</strong>. Next: <Link to={`/teach/classes/${created.id}/roster`}>add students</Link>.
          </p>
        </Notice>
      ) : null}

      {active.length === 0 ? (
        <p className="mb-8 text-ink-soft">You have no classes yet. Make your first one below.</p>
      ) : (
        <ul className="mb-10 grid gap-4 md:grid-cols-2" aria-label="Your classes">
          {active.map((c) => (
            <li key={c.id} className="card min-w-0">
              <h2 className="mb-1 text-[length:var(--text-step-1)] [overflow-wrap:anywhere]">
                <Link to={`/teach/classes/${c.id}/gradebook`}>{c.name}</Link>
              </h2>
              <p className="mb-3 text-[length:var(--text-step--1)] text-ink-soft">
                {c.schoolYear}
                {schools.length > 1 ? ` · ${c.schoolName}` : ""} · code <span className="font-mono text-ink">{c.code}</span>
              </p>
              <dl className="grid grid-cols-2 gap-x-4 gap-y-1 text-[length:var(--text-step--1)]">
                <dt className="text-ink-soft">Students</dt>
                <dd>{c.summary.students}</dd>
                <dt className="text-ink-soft">Lessons assigned</dt>
                <dd>{c.summary.lessons}</dd>
                <dt className="text-ink-soft">Lesson work done</dt>
                <dd>
                  <Percent value={c.summary.completePercent} />
                </dd>
                <dt className="text-ink-soft">Stuck · late</dt>
                <dd>
                  {c.summary.stuck} · {c.summary.late}
                </dd>
                <dt className="text-ink-soft">Answers to review</dt>
                <dd>{c.summary.toReview}</dd>
              </dl>
              <p className="mt-3 flex flex-wrap gap-x-4 gap-y-1 text-[length:var(--text-step--1)]">
                <Link to={`/teach/classes/${c.id}/gradebook`}>Gradebook</Link>
                <Link to={`/teach/classes/${c.id}/roster`}>Students</Link>
                <Link to={`/teach/classes/${c.id}/assignments`}>Lessons assigned</Link>
                <Link to={`/teach/classes/${c.id}/settings`}>Settings</Link>
              </p>
            </li>
          ))}
        </ul>
      )}

      <section aria-labelledby="new-class" className="card mb-10 max-w-xl">
        <h2 id="new-class" className="mb-3 text-[length:var(--text-step-1)]">
          Make a class
        </h2>
        <Form method="post" preventScrollReset noValidate key={created?.id ?? "new"}>
          <input type="hidden" name="intent" value="create" />
          <input type="hidden" name="timeZone" value={timeZone} />
          <TextField label="Class name" hint={`Up to ${CLASS_NAME_MAX} characters; different from your school's other classes of that year.`} name="name" required defaultValue={result?.values.name ?? ""} error={errors.name} autoComplete="off" />
          <SelectField
            label="School year"
            name="schoolYear"
            defaultValue={result?.values.schoolYear || currentYear}
            options={schoolYears.map((y) => ({ value: y, label: y }))}
            error={errors.schoolYear}
          />
          {schools.length > 1 ? (
            <SelectField label="School" name="organisationId" options={schools.map((s) => ({ value: s.id, label: s.name }))} error={errors.organisationId} />
          ) : (
            <input type="hidden" name="organisationId" value={schools[0]?.id ?? ""} />
          )}
          <p className="mb-4 text-[length:var(--text-step--1)] text-ink-soft">
            Due dates use the time zone <span className="font-mono">{timeZone}</span> (this computer's); you can change it in the class settings.
          </p>
          {errors.form ? <Notice tone="problem">{errors.form}</Notice> : null}
          <SendButton className="btn" busy={navigation.state === "submitting"}>
            Make the class
          </SendButton>
        </Form>
      </section>

      {archived.length > 0 ? (
        <section aria-labelledby="archived">
          <h2 id="archived" className="mb-2 text-[length:var(--text-step-1)]">
            Archived classes
          </h2>
          <p className="mb-3 text-ink-soft">Their students' work is kept; their codes no longer sign anyone in.</p>
          <ul className="space-y-1">
            {archived.map((c) => (
              <li key={c.id}>
                <Link to={`/teach/classes/${c.id}/settings`}>{c.name}</Link> <span className="text-ink-soft">· {c.schoolYear}</span>
              </li>
            ))}
          </ul>
        </section>
      ) : null}
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Your classes — Bendwise" }];
