// /family/children/:childId: one child's work as their parent reads it — the course path with each
// lesson's score and due date, every try at each exercise, written answers (with the parent's review,
// as a teacher would give it), their own readings drawn as charts, and photos of their set-ups.
// The parent can set a new password here, and go on to delete the account.
import { useEffect } from "react";
import { Form, Link, data, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/family.children.$childId";
import { Field, Notice } from "~/components/auth-forms";
import { ReadingsAnalysis } from "~/components/lesson/readings-entry";
import { EachReadingTable } from "~/components/analysis-report";
import type { AnalysisResult } from "~/lib/science";
import { ClaimEvidenceReasoning } from "~/components/teaching/claim-evidence-reasoning";
import { ReviewForm } from "~/components/teaching/review-form";
import { db } from "~/db/client.server";
import { assertSameOrigin, requireRole, resetChildPassword } from "~/lib/auth.server";
import { clearChildDrafts } from "~/lib/family/child-draft";
import { findChild, householdClass, householdsOf } from "~/lib/family/household.server";
import { childReport } from "~/lib/family/progress.server";
import { reviewAction } from "~/lib/teaching/review-action.server";
import { rubricTotal } from "~/lib/teaching/shared";
import { SendButton } from "~/components/send-button";

const NOT_FOUND = "There is no child of yours at this address. Open your children from your family page.";
const passwordSchema = z.object({ intent: z.literal("password"), password: z.string().max(1024) });

async function childFor(request: Request, childId: string | undefined) {
  const { user } = await requireRole(request, ["parent"]);
  const child = childId ? await findChild({ db }, user, childId) : null;
  if (!child) throw new Response(NOT_FOUND, { status: 404, headers: { "Content-Type": "text/plain; charset=utf-8" } });
  const household = (await householdsOf({ db }, user)).find((h) => h.id === child.householdId)!;
  return { user, child, household };
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { user, child, household } = await childFor(request, params.childId);
  // The family's class is the adapter to the teaching model; it is made (once) on first need.
  const klass = await householdClass({ db }, household, user.id);
  const lessons = await childReport({ db }, child.id, klass);
  return {
    child: { id: child.id, displayName: child.displayName, username: child.username, gradeBand: child.gradeBand },
    household: { name: household.name, code: household.signInCode },
    made: new URL(request.url).searchParams.get("made") === "1",
    lessons,
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  assertSameOrigin(request);
  const { user, child, household } = await childFor(request, params.childId);
  const form = Object.fromEntries(await request.formData());
  if (form.intent === "review") {
    // The parent is the teacher of the family's class; the teaching model checks the child is in it.
    return reviewAction(await householdClass({ db }, household, user.id), user.id, { ...form, studentId: child.id });
  }
  const parsed = passwordSchema.safeParse(form);
  if (!parsed.success) return data({ intent: "password", error: "That request was not understood. Reload the page and try again." }, { status: 400 });
  const result = await resetChildPassword({ db }, user.id, child.id, parsed.data.password);
  if (!result.ok) return data({ intent: "password", error: result.message }, { status: result.status });
  return { intent: "password", done: `${child.displayName}'s new password is set. They are signed out everywhere and sign in with it from now on.` };
}

export default function ChildPage({ loaderData, actionData }: Route.ComponentProps) {
  const { child, household, made, lessons } = loaderData;
  const busy = useNavigation().state !== "idle";
  const answer = actionData as { intent?: string; error?: string; done?: string } | undefined;
  // The account is made: what "Add a child" kept in this tab has done its work.
  useEffect(() => {
    if (made) clearChildDrafts();
  }, [made]);
  const complete = lessons.filter((l) => l.complete).length;
  const worked = lessons.filter((l) => l.started || l.exercises.length > 0 || l.answers.length > 0 || l.readings.length > 0);
  return (
    <div className="mx-auto max-w-5xl px-5 py-10">
      <p className="mb-1">
        <Link to="/family">{household.name}</Link>
      </p>
      <h1 className="mb-1 text-[length:var(--text-step-3)]">{child.displayName}</h1>
      <p className="mb-6 text-ink-soft">
        Family code <span className="font-mono text-ink">{household.code}</span> · username <span className="font-mono text-ink">{child.username}</span> ·
        grades {child.gradeBand ?? "—"}
      </p>
      {made ? (
        <Notice tone="done">
          {child.displayName}'s account is ready. They sign in on the sign-in page under “Students” with the family code{" "}
          <strong className="font-mono">{household.code}</strong>, the username <strong className="font-mono">{child.username}</strong> and the password you
          chose.
          <span className="mt-2 flex flex-wrap gap-3">
            <Link to="/family/children/new">Add another child</Link>
            <Link to="/family">Back to your family page</Link>
          </span>
        </Notice>
      ) : null}

      <section aria-labelledby="path-heading" className="mb-10">
        <h2 id="path-heading" className="mb-1 text-[length:var(--text-step-2)]">
          The course path
        </h2>
        <p className="mb-3" data-testid="child-summary">
          {complete} of {lessons.length} lessons complete.
        </p>
        <div className="overflow-x-auto rounded-lg border border-rule bg-card">
          <table className="w-full border-collapse text-left text-[length:var(--text-step--1)]" data-testid="child-path">
            <caption className="sr-only">{child.displayName}'s progress, lesson by lesson</caption>
            <thead>
              <tr className="border-b-2 border-rule">
                <th scope="col" className="px-3 py-2">Lesson</th>
                <th scope="col" className="px-3 py-2">Progress</th>
                <th scope="col" className="px-3 py-2">Score</th>
                <th scope="col" className="px-3 py-2">Due</th>
              </tr>
            </thead>
            <tbody>
              {lessons.map((l) => (
                <tr key={l.slug} className="border-b border-rule align-top" data-lesson={l.slug}>
                  <th scope="row" className="px-3 py-2 font-normal">
                    {l.started || l.exercises.length > 0 ? <a href={`#lesson-${l.slug}`}>{`${l.number}. ${l.title}`}</a> : `${l.number}. ${l.title}`}
                  </th>
                  <td className="px-3 py-2" data-testid="lesson-progress">
                    {l.complete ? <strong className="text-ok">Complete</strong> : l.started ? `${l.requiredDone} of ${l.requiredTotal} parts done` : <span className="text-ink-soft">Not started</span>}
                  </td>
                  <td className="px-3 py-2">{l.score === null ? "—" : `${l.score}%`}</td>
                  <td className="px-3 py-2">
                    {l.assignment ? (
                      <>
                        {l.assignment.dueText}
                        {l.assignment.cell?.overdue ? <strong className="ml-1 text-danger">overdue</strong> : l.assignment.cell?.finishedLate ? <strong className="ml-1 text-danger">finished late</strong> : null}
                      </>
                    ) : (
                      <span className="text-ink-soft">not assigned</span>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        <p className="mt-2 text-[length:var(--text-step--1)] text-ink-soft">
          The score is the share of a lesson's required exercises answered right; in an assigned lesson, answers after the due date count as
          its late-work rule says. <Link to="/family/lessons">Assign lessons and due dates</Link>.
        </p>
      </section>

      <section aria-labelledby="work-heading" className="mb-10">
        <h2 id="work-heading" className="mb-3 text-[length:var(--text-step-2)]">
          {child.displayName}'s work
        </h2>
        {worked.length === 0 ? <p>Nothing yet. Work appears here as soon as {child.displayName} starts a lesson.</p> : null}
        {worked.map((l) => (
          <article key={l.slug} id={`lesson-${l.slug}`} className="card mb-5" aria-labelledby={`h-${l.slug}`}>
            <h3 id={`h-${l.slug}`} className="mb-2 text-[length:var(--text-step-1)]">
              Lesson {l.number}: {l.title}
            </h3>
            {l.exercises.length > 0 ? (
              <>
                <h4 className="mb-1 font-bold">Exercises</h4>
                <ul className="mb-4 space-y-2">
                  {l.exercises.map((e) => (
                    <li key={e.id}>
                      <span className="font-bold">{e.title}</span> — {e.right ? <strong className="text-ok">right</strong> : <span>not right yet</span>}
                      <ul className="mt-1 space-y-0.5 pl-5 text-[length:var(--text-step--1)]">
                        {e.tries.map((t) => (
                          <li key={t.id}>
                            {t.label}: <span className="font-mono wrap-anywhere">{t.answer || "(empty)"}</span> —{" "}
                            {t.right ? <strong className="text-ok">right</strong> : <span className="text-danger">{t.what}</span>} <span className="text-ink-soft">· {t.at}</span>
                          </li>
                        ))}
                      </ul>
                    </li>
                  ))}
                </ul>
              </>
            ) : null}
            {l.readings.map((r) =>
              r.analysis ? (
                <OwnReadings key={r.id} analysis={r.analysis} resolutionCm={r.resolutionCm} childName={child.displayName} material={r.material} />
              ) : (
                <p key={r.id} className="mb-3 text-ink-soft">
                  Own readings{r.material ? ` (${r.material})` : ""}: {r.points} rows saved, not enough to draw yet.
                </p>
              ),
            )}
            {l.photos.length > 0 ? (
              <div className="mb-4 flex flex-wrap gap-3">
                {l.photos.map((p) => (
                  <figure key={p.id}>
                    {/* The thumbnail opens the photo at full size: a set-up is read in its details. */}
                    <a href={`/photos/${p.id}`} target="_blank" rel="noreferrer" className="block">
                      <img src={`/photos/${p.id}`} alt={`${child.displayName}'s photo of the set-up (${p.photoId}), opens at full size`} className="h-40 rounded border border-rule object-cover" loading="lazy" />
                    </a>
                    <figcaption className="text-[length:var(--text-step--1)] text-ink-soft">{p.at}</figcaption>
                  </figure>
                ))}
              </div>
            ) : null}
            {l.answers.map((a) => (
              <div key={a.answerId} className="mb-4 rounded-lg border border-rule p-3">
                <h4 className="mb-1 font-bold">
                  Written answer{" "}
                  <span className="font-normal text-ink-soft">
                    {a.handedIn ? `handed in ${a.handedInText}` : "draft"}
                    {a.scores ? ` · reviewed: ${rubricTotal(a.scores)} of 6` : ""}
                  </span>
                </h4>
                <ClaimEvidenceReasoning answer={a} />
                {a.comment ? (
                  <p className="mt-2">
                    <span className="font-bold">Feedback:</span> {a.comment}
                  </p>
                ) : null}
                <ReviewForm of={`the answer in “${l.title}”`} action={`/family/children/${child.id}`} answer={{ studentId: child.id, slug: l.slug, answerId: a.answerId, handedIn: a.handedIn, scores: a.scores, comment: a.comment }} />
              </div>
            ))}
          </article>
        ))}
      </section>

      <section aria-labelledby="password-heading" className="card mb-6">
        <h2 id="password-heading" className="mb-1 text-[length:var(--text-step-1)]">
          Set a new password
        </h2>
        <p className="mb-3 text-ink-soft">For when {child.displayName} has forgotten theirs. They are signed out everywhere and use the new one.</p>
        {answer?.intent === "password" && answer.error ? <Notice tone="problem">{answer.error}</Notice> : null}
        {answer?.intent === "password" && answer.done ? <Notice tone="done">{answer.done}</Notice> : null}
        <Form method="post" noValidate>
          <input type="hidden" name="intent" value="password" />
          <Field label="New password" hint="At least 8 characters." name="password" type="text" autoComplete="off" autoCapitalize="none" spellCheck={false} required />
          <SendButton className="btn" busy={busy}>
            Set the new password
          </SendButton>
        </Form>
      </section>

      <section aria-labelledby="delete-heading" className="rounded-lg border-2 border-danger bg-card p-5">
        <h2 id="delete-heading" className="mb-1 text-[length:var(--text-step-1)]">
          Delete {child.displayName}'s account
        </h2>
        <p className="mb-3">Deletes the account and everything recorded for it, for good, and frees the seat.</p>
        <Link to={`/family/children/${child.id}/delete`} className="font-bold text-danger">
          Delete {child.displayName}'s account and data…
        </Link>
      </section>
    </div>
  );
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.child.displayName ?? "Child"} — Bendwise` }];

/** The child's own readings as the parent reads them: each reading worked out, then what they say (as the child sees it). */
function OwnReadings({ analysis, resolutionCm, childName, material }: { analysis: AnalysisResult; resolutionCm: number; childName: string; material: string }) {
  const title = `${childName}'s own readings${material ? `: ${material}` : ""}`;
  return (
    <section className="mb-4" aria-label={title} data-testid="own-readings">
      <EachReadingTable analysis={analysis} resolutionCm={resolutionCm} caption={title} />
      <ReadingsAnalysis analysis={analysis} title={title} whose={`${childName}'s`} />
    </section>
  );
}
