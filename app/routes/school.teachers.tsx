// /school/teachers: a school administrator's teachers, and invitations by e-mail. An invitation's link
// works for a week; it can be sent again (a new link; the old one stops working) or withdrawn.
import { useEffect, useRef } from "react";
import { Form, Link, data, useNavigation } from "react-router";
import { and, asc, eq, inArray } from "drizzle-orm";
import { z } from "zod";
import type { Route } from "./+types/school.teachers";
import { Field, Notice, useFocusFirstProblem } from "~/components/auth-forms";
import { db } from "~/db/client.server";
import { memberships, users } from "~/db/schema.server";
import { serverEnv } from "~/env.server";
import { assertSameOrigin, requireRole } from "~/lib/auth.server";
import { INVITATION_DAYS, inviteSchema, inviteTeacher, openInvitations, resendInvitation, withdrawInvitation } from "~/lib/invitations.server";
import { formatLongDate } from "~/lib/teaching/time";
import { SendButton } from "~/components/send-button";

const intentSchema = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("invite"), displayName: z.string(), email: z.string() }),
  z.object({ intent: z.literal("resend"), invitationId: z.uuid() }),
  z.object({ intent: z.literal("withdraw"), invitationId: z.uuid() }),
]);


export async function loader({ request }: Route.LoaderArgs) {
  const { membership } = await requireRole(request, ["school_admin"]);
  const schoolId = membership.organisationId;
  const [teachers, invitations] = await Promise.all([
    db
      .select({ id: users.id, displayName: users.displayName, email: users.email })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(and(inArray(memberships.organisationId, [schoolId]), eq(memberships.role, "teacher")))
      .orderBy(asc(users.displayName)),
    openInvitations({ db }, [schoolId]),
  ]);
  return {
    school: membership.organisationName,
    days: INVITATION_DAYS,
    teachers,
    invitations: invitations.map((i) => ({ id: i.id, email: i.email, displayName: i.displayName, expired: i.expired, untilText: formatLongDate(i.expiresAt), invitedText: formatLongDate(i.invitedOn) })),
  };
}

export async function action({ request }: Route.ActionArgs) {
  assertSameOrigin(request);
  const { user, membership } = await requireRole(request, ["school_admin"]);
  const schoolId = membership.organisationId;
  const parsed = intentSchema.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) return data({ intent: "", problem: "That request was not understood. Reload the page and try again." }, { status: 400 });
  const input = parsed.data;
  const appUrl = serverEnv().APP_URL;
  if (input.intent === "resend") {
    const until = await resendInvitation({ db }, schoolId, input.invitationId, appUrl);
    if (!until) return data({ intent: "resend", problem: "That invitation is no longer open." }, { status: 404 });
    return { intent: "resend", done: `Sent again, with a new link that works until ${formatLongDate(until)}. The earlier link no longer works.` };
  }
  if (input.intent === "withdraw") {
    const gone = await withdrawInvitation({ db }, schoolId, input.invitationId);
    if (!gone) return data({ intent: "withdraw", problem: "That invitation is no longer open." }, { status: 404 });
    return { intent: "withdraw", done: "Withdrawn. Its link no longer works." };
  }
  const values = { displayName: input.displayName, email: input.email.trim() };
  const checked = inviteSchema.safeParse(values);
  if (!checked.success) {
    const fieldErrors: Record<string, string> = {};
    for (const issue of checked.error.issues) fieldErrors[String(issue.path[0])] ??= issue.message;
    return data({ intent: "invite", values, fieldErrors }, { status: 400 });
  }
  const result = await inviteTeacher({ db }, { organisationId: schoolId, invitedBy: user.id, appUrl, ...checked.data });
  if (!result.ok) return data({ intent: "invite", values, fieldErrors: { [result.field]: result.message } }, { status: 409 });
  return { intent: "invite", done: `Invitation sent to ${checked.data.email}. The link works until ${formatLongDate(result.expiresAt)}.` };
}

type Answer = { intent: string; done?: string; problem?: string; values?: { displayName: string; email: string }; fieldErrors?: Record<string, string> };

export default function SchoolTeachers({ loaderData, actionData }: Route.ComponentProps) {
  const { school, days, teachers, invitations } = loaderData;
  const busy = useNavigation().state !== "idle";
  const answer = actionData as Answer | undefined;
  const invite = answer?.intent === "invite" ? answer : undefined;
  const inviteForm = useFocusFirstProblem(invite);
  // A sent invitation empties the form, and a withdrawn one takes its buttons away: the keyboard goes
  // to the answer (read out there), and the next Tab goes on into the form.
  const said = useRef<HTMLDivElement>(null);
  useEffect(() => {
    if (answer?.done || answer?.problem) said.current?.focus();
  }, [answer]);
  return (
    <div className="mx-auto max-w-4xl px-5 py-10">
      <p className="mb-1">
        <Link to="/school">{school}</Link>
      </p>
      <h1 className="mb-6 text-[length:var(--text-step-3)]">Teachers</h1>
      <div ref={said} tabIndex={-1}>
        {answer?.done ? <Notice tone="done">{answer.done}</Notice> : null}
        {answer?.problem ? <Notice tone="problem">{answer.problem}</Notice> : null}
      </div>

      <section aria-labelledby="invite-heading" className="card mb-8">
        <h2 id="invite-heading" className="mb-1 text-[length:var(--text-step-2)]">
          Invite a teacher
        </h2>
        <p className="mb-4 text-ink-soft">
          We e-mail them a link that works for {days} days. New to Bendwise, they choose a password; with an account already, your school is added to it.
        </p>
        {/* A new key after each invitation sent empties the form, ready for the next teacher. */}
        <Form method="post" noValidate key={invite?.done ?? "invite"} ref={inviteForm}>
          <input type="hidden" name="intent" value="invite" />
          <div className="grid gap-x-4 sm:grid-cols-2">
            <Field label="Name" name="displayName" autoComplete="off" required defaultValue={invite?.values?.displayName ?? ""} error={invite?.fieldErrors?.displayName} />
            <Field
              label="E-mail address"
              name="email"
              type="email"
              inputMode="email"
              autoComplete="off"
              spellCheck={false}
              required
              defaultValue={invite?.values?.email ?? ""}
              error={invite?.fieldErrors?.email}
            />
          </div>
          <SendButton className="btn" busy={busy}>
            Send the invitation
          </SendButton>
        </Form>
      </section>

      <section aria-labelledby="open-heading" className="mb-8">
        <h2 id="open-heading" className="mb-3 text-[length:var(--text-step-2)]">
          Invitations not yet accepted
        </h2>
        {invitations.length === 0 ? (
          <p className="text-ink-soft">None.</p>
        ) : (
          <ul className="grid gap-3" data-testid="invitations">
            {invitations.map((i) => (
              <li key={i.id} className="card flex flex-wrap items-center justify-between gap-3">
                <div>
                  <p className="font-bold">
                    {i.displayName} · {i.email}
                  </p>
                  <p className={`text-[length:var(--text-step--1)] ${i.expired ? "font-bold text-danger" : "text-ink-soft"}`}>
                    Invited {i.invitedText} · {i.expired ? `the link ran out on ${i.untilText}` : `the link works until ${i.untilText}`}
                  </p>
                </div>
                <div className="flex flex-wrap gap-2">
                  <Form method="post">
                    <input type="hidden" name="intent" value="resend" />
                    <input type="hidden" name="invitationId" value={i.id} />
                    <SendButton className="btn btn-quiet" busy={busy}>
                      Send again<span className="sr-only"> to {i.email}</span>
                    </SendButton>
                  </Form>
                  <Form method="post">
                    <input type="hidden" name="intent" value="withdraw" />
                    <input type="hidden" name="invitationId" value={i.id} />
                    <SendButton className="btn btn-quiet" busy={busy}>
                      Withdraw<span className="sr-only"> the invitation to {i.email}</span>
                    </SendButton>
                  </Form>
                </div>
              </li>
            ))}
          </ul>
        )}
      </section>

      <section aria-labelledby="teachers-heading">
        <h2 id="teachers-heading" className="mb-3 text-[length:var(--text-step-2)]">
          Teachers at {school}
        </h2>
        {teachers.length === 0 ? (
          <p className="text-ink-soft">No teachers yet.</p>
        ) : (
          <ul className="grid gap-2 sm:grid-cols-2">
            {teachers.map((t) => (
              <li key={t.id} className="card">
                <strong>{t.displayName}</strong>
                <span className="block text-[length:var(--text-step--1)] text-ink-soft">{t.email}</span>
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Teachers — Bendwise" }];
