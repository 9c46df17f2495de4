// /family: a parent's home. Each child with their place on the course path, the family's code, the
// seats of this school year, and what to do next (buy seats, add a child, assign lessons). The weekly
// summary by e-mail is switched on and off here too.
import { Form, Link, data, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/family";
import { Notice } from "~/components/auth-forms";
import { db } from "~/db/client.server";
import { assertSameOrigin, requireRole } from "~/lib/auth.server";
import { courseProgress } from "~/lib/course.server";
import { childrenOf, householdsOf } from "~/lib/family/household.server";
import { setWeeklySummary, weeklySummaryWanted } from "~/lib/mail/preferences.server";
import { schoolYearOf } from "~/lib/school-year";
import { seatLedgerForYear } from "~/lib/seats.server";
import { SendButton } from "~/components/send-button";

const intentSchema = z.discriminatedUnion("intent", [z.object({ intent: z.literal("weekly"), on: z.enum(["yes", "no"]) })]);

export async function loader({ request }: Route.LoaderArgs) {
  const { user } = await requireRole(request, ["parent"]);
  const households = await householdsOf({ db }, user);
  const year = schoolYearOf();
  const [children, ledgers, weekly] = await Promise.all([
    childrenOf({ db }, households.map((h) => h.id)),
    Promise.all(households.map((h) => seatLedgerForYear({ db }, h.id, year))),
    weeklySummaryWanted({ db }, user.id),
  ]);
  const progress = await Promise.all(children.map((c) => courseProgress({ db }, c.id)));
  return {
    displayName: user.displayName,
    email: user.email,
    welcome: new URL(request.url).searchParams.get("welcome") === "1",
    schoolYear: year,
    weekly,
    households: households.map((h, i) => ({
      ...h,
      ledger: ledgers[i],
      // Each child: only what the account holds (name, username, grade band); their progress beside it, by id.
      children: children.filter((c) => c.householdId === h.id).map((c) => ({ id: c.id, displayName: c.displayName, username: c.username, gradeBand: c.gradeBand })),
      progress: Object.fromEntries(
        children
          .map((c, j) => [c, progress[j]] as const)
          .filter(([c]) => c.householdId === h.id)
          .map(([c, lessons]) => {
            const next = lessons.find((l) => !l.complete);
            return [
              c.id,
              {
                lessonsComplete: lessons.filter((l) => l.complete).length,
                lessons: lessons.length,
                started: lessons.filter((l) => l.started).length,
                path: lessons.map((l) => ({ number: l.number, title: l.title, complete: l.complete, started: l.started, done: l.requiredDone, total: l.requiredTotal })),
                next: next ? { number: next.number, title: next.title, done: next.requiredDone, total: next.requiredTotal } : null,
              },
            ];
          }),
      ),
    })),
  };
}

export async function action({ request }: Route.ActionArgs) {
  assertSameOrigin(request);
  const { user } = await requireRole(request, ["parent"]);
  const parsed = intentSchema.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) return data({ problem: "That request was not understood. Reload the page and try again." }, { status: 400 });
  await setWeeklySummary({ db }, user.id, parsed.data.on === "yes");
  return { done: parsed.data.on === "yes" ? "The weekly summary is on: it comes on Fridays." : "The weekly summary is off. You can turn it on again here." };
}

export default function Family({ loaderData, actionData }: Route.ComponentProps) {
  const { displayName, households, welcome, schoolYear, weekly, email } = loaderData;
  const busy = useNavigation().state !== "idle";
  const answer = actionData as { done?: string; problem?: string } | undefined;
  return (
    <div className="mx-auto max-w-5xl px-5 py-10">
      <p className="mb-1 text-ink-soft">Parent · {displayName}</p>
      {households.map((h) => (
        <section key={h.id} aria-labelledby={`household-${h.id}`} className="mb-10">
          <h1 id={`household-${h.id}`} className="mb-4 text-[length:var(--text-step-3)]">
            {h.name}
          </h1>
          {welcome ? (
            <Notice tone="done">
              Your family account is ready. Your children will sign in with the family code <strong className="font-mono">{h.signInCode}</strong>, a
              username and a password that you choose for them.
            </Notice>
          ) : null}

          <div className="mb-6 grid gap-4 md:grid-cols-3">
            <div className="card">
              <h2 className="mb-1 text-[length:var(--text-step-1)]">Family code</h2>
              <p className="mb-1 font-mono text-[length:var(--text-step-2)] font-bold" data-testid="family-code">
                {h.signInCode ?? "—"}
              </p>
              <p className="text-[length:var(--text-step--1)] text-ink-soft">Children type it on the sign-in page, under “Students”.</p>
            </div>
            <div className="card">
              <h2 className="mb-1 text-[length:var(--text-step-1)]">Seats for {schoolYear}</h2>
              <p className="mb-1" data-testid="family-seats">
                <strong>{h.ledger.bought}</strong> bought · <strong>{h.ledger.inUse}</strong> in use · <strong>{h.ledger.free}</strong> free
              </p>
              <p className="text-[length:var(--text-step--1)]">
                <Link to="/family/seats">{h.ledger.bought === 0 ? "Buy a seat for each child" : "Buy more seats, see receipts"}</Link>
              </p>
            </div>
            <div className="card">
              <h2 className="mb-1 text-[length:var(--text-step-1)]">Lessons and due dates</h2>
              <p className="mb-1 text-[length:var(--text-step--1)] text-ink-soft">Assign lessons with a due date and see how each exercise went.</p>
              <p className="text-[length:var(--text-step--1)]">
                <Link to="/family/lessons">Plan lessons</Link>
              </p>
            </div>
          </div>

          <div className="mb-3 flex flex-wrap items-center justify-between gap-3">
            <h2 className="text-[length:var(--text-step-2)]">Children</h2>
            {h.ledger.free > 0 || h.children.length > 0 ? (
              <Link to="/family/children/new" className="btn">
                Add a child
              </Link>
            ) : null}
          </div>
          {h.children.length === 0 ? (
            <div className="card">
              {h.ledger.free > 0 ? (
                <p>
                  You have {h.ledger.free} free {h.ledger.free === 1 ? "seat" : "seats"}. <Link to="/family/children/new">Add your first child</Link>: a name,
                  a username, a password and a grade band are all we need.
                </p>
              ) : (
                <>
                  <p className="mb-3">No children's accounts yet. Each child needs a seat for {schoolYear}: buy them first, then add your children here.</p>
                  <Link to="/family/seats" className="btn">
                    Buy seats
                  </Link>
                </>
              )}
            </div>
          ) : (
            <ul className="grid gap-4 md:grid-cols-2">
              {h.children.map((child) => ({ ...child, ...h.progress[child.id] })).map((c) => (
                <li key={c.id} className="card" data-child={c.username ?? c.id}>
                  <h3 className="mb-1 text-[length:var(--text-step-1)]">
                    <Link to={`/family/children/${c.id}`}>{c.displayName}</Link>
                  </h3>
                  <p className="mb-3 text-[length:var(--text-step--1)] text-ink-soft">
                    username <span className="font-mono text-ink">{c.username}</span> · grades {c.gradeBand ?? "—"}
                  </p>
                  <p className="mb-2" data-testid="child-progress">
                    <strong>
                      {c.lessonsComplete} of {c.lessons}
                    </strong>{" "}
                    lessons complete{c.started > c.lessonsComplete ? `, ${c.started - c.lessonsComplete} under way` : ""}.
                  </p>
                  <ol className="mb-3 flex gap-1" aria-label={`${c.displayName}'s course path`}>
                    {c.path.map((l) => (
                      <li
                        key={l.number}
                        title={`Lesson ${l.number}: ${l.title}`}
                        className={`flex h-8 w-8 items-center justify-center rounded-full border-2 text-[length:var(--text-step--1)] font-bold ${
                          l.complete ? "border-ok bg-ok text-white" : l.started ? "border-spruce bg-spruce-wash text-spruce-deep" : "border-rule bg-card text-ink-soft"
                        }`}
                      >
                        <span aria-hidden="true">{l.number}</span>
                        <span className="sr-only">
                          Lesson {l.number}, {l.title}: {l.complete ? "complete" : l.started ? `${l.done} of ${l.total} parts done` : "not started"}
                        </span>
                      </li>
                    ))}
                  </ol>
                  <p className="mb-3 text-[length:var(--text-step--1)]">
                    {c.next ? (
                      <>
                        Next: lesson {c.next.number}, {c.next.title}
                        {c.next.done > 0 ? ` (${c.next.done} of ${c.next.total} parts done)` : ""}.
                      </>
                    ) : (
                      "Every lesson is complete."
                    )}
                  </p>
                  <Link to={`/family/children/${c.id}`} className="btn btn-quiet">
                    See {c.displayName}'s work
                  </Link>
                </li>
              ))}
            </ul>
          )}
        </section>
      ))}

      <section aria-labelledby="weekly-heading" className="card">
        <h2 id="weekly-heading" className="mb-1 text-[length:var(--text-step-1)]">
          Weekly summary by e-mail
        </h2>
        {answer?.done ? <Notice tone="done">{answer.done}</Notice> : null}
        {answer?.problem ? <Notice tone="problem">{answer.problem}</Notice> : null}
        <p className="mb-3">
          {weekly ? (
            <>
              On: every Friday a short summary of each child's week goes to <strong>{email}</strong>.
            </>
          ) : (
            "Off: no weekly summary is sent."
          )}
        </p>
        <Form method="post">
          <input type="hidden" name="intent" value="weekly" />
          <input type="hidden" name="on" value={weekly ? "no" : "yes"} />
          <SendButton className="btn btn-quiet" busy={busy}>
            {weekly ? "Stop the weekly summary" : "Send me the weekly summary"}
          </SendButton>
        </Form>
      </section>
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Family — Bendwise" }];
