// /teach/classes/:classId/settings: rename the class, its time zone, a new sign-in code, archive or restore.
import { Form, data, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/teach.classes.$classId.settings";
import { db } from "~/db/client.server";
import { assertSameOrigin } from "~/lib/auth.server";
import { classHeading, renameClass, renewClassCode, setArchived, setClassTimeZone, spacedCode, tidyClassName } from "~/lib/teaching/classes.server";
import { CLASS_NAME_MAX, classNameProblem } from "~/lib/teaching/shared";
import { requireTeacherClass } from "~/lib/teaching/guard.server";
import { classAssignments, timeZoneChangedMessage } from "~/lib/teaching/assignments.server";
import { timeZoneMenu } from "~/lib/teaching/time";
import { ClassHeader, Notice, SelectField, TextField } from "~/components/teaching/ui";
import { SendButton } from "~/components/send-button";

const intentSchema = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("rename"), name: z.string() }),
  z.object({ intent: z.literal("time-zone"), timeZone: z.string().max(64) }),
  z.object({ intent: z.literal("renew-code") }),
  z.object({ intent: z.literal("archive") }),
  z.object({ intent: z.literal("restore") }),
]);

export async function loader({ request, params }: Route.LoaderArgs) {
  const { klass } = await requireTeacherClass(request, params.classId);
  return { klass: classHeading(klass), timeZone: klass.timeZone, timeZones: timeZoneMenu() };
}

export async function action({ request, params }: Route.ActionArgs) {
  assertSameOrigin(request);
  const { klass } = await requireTeacherClass(request, params.classId);
  const parsed = intentSchema.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    return data({ intent: "", field: String(issue?.path[0] ?? "form"), message: issue?.message ?? "That request was not understood." }, { status: 400 });
  }
  const input = parsed.data;
  switch (input.intent) {
    case "rename": {
      const problem = classNameProblem(input.name, "Give the class a name.");
      if (problem) return data({ intent: input.intent, field: "name", message: problem }, { status: 400 });
      const done = await renameClass({ db }, klass, input.name);
      return done.ok ? { intent: input.intent, done: `The class is now called “${tidyClassName(input.name)}”.` } : data({ intent: input.intent, field: done.field, message: done.message }, { status: 400 });
    }
    case "time-zone": {
      const done = await setClassTimeZone({ db }, klass, input.timeZone);
      if (!done.ok) return data({ intent: input.intent, field: done.field, message: done.message }, { status: 400 });
      return { intent: input.intent, done: timeZoneChangedMessage(await classAssignments({ db }, klass.id), klass.timeZone, input.timeZone) };
    }
    case "renew-code": {
      const code = await renewClassCode({ db }, klass);
      return { intent: input.intent, done: `The new class code is ${spacedCode(code)}. The old code no longer signs anyone in.` };
    }
    case "archive":
      await setArchived({ db }, klass, true);
      return { intent: input.intent, done: "The class is archived. Its code no longer signs anyone in; the students' work is kept." };
    case "restore":
      await setArchived({ db }, klass, false);
      return { intent: input.intent, done: "The class is back in your list, and its code works again." };
  }
}

export default function ClassSettings({ loaderData, actionData }: Route.ComponentProps) {
  const { klass, timeZone, timeZones } = loaderData;
  const busy = useNavigation().state === "submitting";
  const message = (intent: string) =>
    actionData?.intent === intent ? (
      "done" in actionData ? (
        <Notice tone="done">{actionData.done}</Notice>
      ) : null
    ) : null;
  const error = (intent: string) => (actionData && actionData.intent === intent && "message" in actionData ? actionData.message : undefined);
  return (
    <div className="mx-auto max-w-6xl px-5 py-10">
      <ClassHeader klass={klass} />
      {actionData && actionData.intent === "" && "message" in actionData ? <Notice tone="problem">{actionData.message}</Notice> : null}
      <div className="grid gap-6 md:grid-cols-2">
        <section className="card" aria-labelledby="rename">
          <h2 id="rename" className="mb-3 text-[length:var(--text-step-1)]">Name</h2>
          {message("rename")}
          <Form method="post" preventScrollReset noValidate key={klass.name}>
            <input type="hidden" name="intent" value="rename" />
            <TextField label="Class name" hint={`Up to ${CLASS_NAME_MAX} characters.`} name="name" defaultValue={klass.name} required error={error("rename")} />
            <SendButton className="btn" busy={busy}>Rename</SendButton>
          </Form>
        </section>

        <section className="card" aria-labelledby="code">
          <h2 id="code" className="mb-3 text-[length:var(--text-step-1)]">Sign-in code</h2>
          {message("renew-code")}
          {klass.archived ? (
            <p className="mb-2" data-testid="archived-code">
              While the class is archived, its code <strong className="font-mono">{klass.code}</strong> signs nobody in. Restore the class (below) to use it again.
            </p>
          ) : (
            <>
              <p className="mb-2">
                Students sign in with <strong className="font-mono">{klass.code}</strong>, their username and their password. Spaces, hyphens and capitals do not
                matter.
              </p>
              <p className="mb-4 text-ink-soft">
                If the code has been shared outside the class, make a new one. The old code stops working at once; students who are signed in stay signed in.
              </p>
              <Form method="post" preventScrollReset onSubmit={(e) => confirmOr(e, "Make a new code? The old code stops working at once; tell your students the new one.")}>
                <input type="hidden" name="intent" value="renew-code" />
                <SendButton className="btn btn-quiet" busy={busy}>Make a new code</SendButton>
              </Form>
            </>
          )}
        </section>

        <section className="card" aria-labelledby="zone">
          <h2 id="zone" className="mb-3 text-[length:var(--text-step-1)]">Time zone for due dates</h2>
          {message("time-zone")}
          <Form method="post" preventScrollReset key={timeZone}>
            <input type="hidden" name="intent" value="time-zone" />
            <SelectField label="Time zone" name="timeZone" defaultValue={timeZone} options={timeZones} error={error("time-zone")} />
            <SendButton className="btn" busy={busy}>Save the time zone</SendButton>
          </Form>
        </section>

        <section className="card" aria-labelledby="archive">
          <h2 id="archive" className="mb-3 text-[length:var(--text-step-1)]">{klass.archived ? "Restore" : "Archive"}</h2>
          {message("archive")}
          {message("restore")}
          {klass.archived ? (
            <>
              <p className="mb-4">This class is archived: it is listed under "Archived classes" on your classes page, and its code signs nobody in. Restore it to use it again.</p>
              <Form method="post" preventScrollReset>
                <input type="hidden" name="intent" value="restore" />
                <SendButton className="btn" busy={busy}>Restore the class</SendButton>
              </Form>
            </>
          ) : (
            <>
              <p className="mb-4">
                At the end of the year, archive the class: it leaves your list and its code stops signing students in. Their accounts and work are kept, and
                you can restore it.
              </p>
              <Form method="post" preventScrollReset onSubmit={(e) => confirmOr(e, "Archive this class? Its code stops signing students in until you restore it.")}>
                <input type="hidden" name="intent" value="archive" />
                <SendButton className="btn btn-quiet" busy={busy}>Archive the class</SendButton>
              </Form>
            </>
          )}
        </section>
      </div>
    </div>
  );
}

/** Asks before a change that students notice at once; without JavaScript the form simply posts. */
function confirmOr(event: React.FormEvent, question: string) {
  if (!window.confirm(question)) event.preventDefault();
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Settings · ${data?.klass.name ?? "Class"} — Bendwise` }];
