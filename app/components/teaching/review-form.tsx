// Scoring one written answer on the claim / evidence / reasoning rubric (0–2 each) with a comment the
// student reads on their lesson page. Sent with a fetcher, so the page stays where the teacher is.
// A review begun and not saved is kept nowhere: while one is open, leaving the page asks first.
import { useEffect, useId, useSyncExternalStore } from "react";
import { useFetcher } from "react-router";
import { LeavingQuestion, useAskBeforeLeaving } from "~/components/leaving-question";
import { REVIEW_COMMENT_MAX, RUBRIC, type RubricScores } from "~/lib/teaching/shared";
import { SendButton } from "~/components/send-button";

export interface ReviewedAnswer {
  studentId: string;
  slug: string;
  answerId: string;
  handedIn: boolean;
  scores: RubricScores | null;
  comment: string | null;
}

/** `of`: whose answer, or which, as the page tells them apart ("Amira K.'s answer"): the form is named by it. */
export function ReviewForm({ answer, action, of }: { answer: ReviewedAnswer; action: string; of: string }) {
  const fetcher = useFetcher<{ reviewed?: string; error?: string; field?: string }>();
  const id = useId();
  const key = `${answer.studentId}/${answer.slug}/${answer.answerId}`;
  const saved = fetcher.data?.reviewed === key;
  const wrong = (field: string) => (fetcher.data?.field === field ? true : undefined);
  const firstUnsaved = useSyncExternalStore(unsaved.subscribe, unsaved.first, () => null);
  useEffect(() => () => unsaved.mark(key, false), [key]);
  useEffect(() => {
    if (saved && fetcher.state === "idle") unsaved.mark(key, false);
  }, [saved, fetcher.state, key]);
  if (!answer.handedIn) return <p className="text-ink-soft">This answer is still a draft; you can review it once it is handed in.</p>;
  return (
    <fetcher.Form method="post" action={action} noValidate className="mt-3 rounded-lg bg-paper p-3" aria-labelledby={`${id}-title`} onChange={() => unsaved.mark(key, true)}>
      {/* One question for the page: the first unsaved review asks it. */}
      {firstUnsaved === key ? <LeavingWithUnsavedReviews /> : null}
      <h4 id={`${id}-title`} className="mb-2 font-bold">Your review of {of}</h4>
      <input type="hidden" name="intent" value="review" />
      <input type="hidden" name="studentId" value={answer.studentId} />
      <input type="hidden" name="slug" value={answer.slug} />
      <input type="hidden" name="answerId" value={answer.answerId} />
      <div className="grid gap-3 md:grid-cols-3">
        {RUBRIC.map((criterion) => (
          <fieldset key={criterion.key} className="rounded border border-rule bg-card p-2" aria-invalid={wrong(criterion.key)} aria-describedby={wrong(criterion.key) && `${id}-problem`}>
            <legend className="px-1 font-bold">{criterion.label}</legend>
            {criterion.levels.map((words, points) => (
              <label key={points} className="flex items-start gap-2 py-0.5">
                <input type="radio" name={criterion.key} value={points} defaultChecked={answer.scores?.[criterion.key] === points} className="mt-1.5" />
                <span>
                  <strong>{points}</strong> — {words}
                </span>
              </label>
            ))}
          </fieldset>
        ))}
      </div>
      <label htmlFor={`${id}-comment`} className="mt-3 mb-1 block font-bold">
        Comment for the student
      </label>
      <p id={`${id}-comment-hint`} className="mb-1 text-[length:var(--text-step--1)] text-ink-soft">
        Up to {REVIEW_COMMENT_MAX.toLocaleString("en-US")} characters.
      </p>
      <textarea
        id={`${id}-comment`}
        name="comment"
        rows={3}
        className="field"
        defaultValue={answer.comment ?? ""}
        aria-invalid={wrong("comment")}
        aria-describedby={wrong("comment") ? `${id}-comment-hint ${id}-problem` : `${id}-comment-hint`}
      />
      <div className="mt-2 flex flex-wrap items-center gap-3">
        <SendButton className="btn" busy={fetcher.state !== "idle"}>
          Save the review
        </SendButton>
        <span id={`${id}-problem`} aria-live="polite" className={fetcher.data?.error ? "font-bold text-danger" : "font-bold text-ok"}>
          {fetcher.data?.error ?? (saved ? "Saved. The student sees your comment on their lesson page." : "")}
        </span>
      </div>
    </fetcher.Form>
  );
}

/** The reviews of this page begun and not saved yet (by answer), in the order they were begun. */
const unsaved = (() => {
  const keys = new Set<string>();
  const listeners = new Set<() => void>();
  return {
    subscribe(listener: () => void) {
      listeners.add(listener);
      return () => void listeners.delete(listener);
    },
    first: () => keys.values().next().value ?? null,
    count: () => keys.size,
    mark(key: string, open: boolean) {
      if (keys.has(key) === open) return;
      if (open) keys.add(key);
      else keys.delete(key);
      for (const listener of listeners) listener();
    },
  };
})();

function LeavingWithUnsavedReviews() {
  const count = useSyncExternalStore(unsaved.subscribe, unsaved.count, () => 0);
  const leaving = useAskBeforeLeaving();
  return (
    <LeavingQuestion
      leaving={leaving}
      className="fixed inset-x-3 bottom-3 z-30 mx-auto max-w-xl shadow-lg"
      question={`${count === 1 ? "A review you began is" : `${count} reviews you began are`} not saved yet. Leave the page without ${count === 1 ? "it" : "them"}?`}
      stay={count === 1 ? "Stay and save it" : "Stay and save them"}
      leave={count === 1 ? "Leave without it" : "Leave without them"}
    />
  );
}
