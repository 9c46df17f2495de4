// A written claim–evidence–reasoning answer: saved as a draft, then handed in; the teacher's comment shows here.
import { useFetcher } from "react-router";
import { useLesson } from "./lesson-context";
import { SendButton } from "~/components/send-button";

export function WrittenAnswer({ id, prompt }: { id: string; prompt: string }) {
  const { state, canAnswer, reader } = useLesson();
  const saved = state.writtenAnswers[id];
  const fetcher = useFetcher<{ answerId?: string; errors?: Record<string, string>; error?: string; saved?: "draft" | "handed-in" }>();
  const mine = fetcher.data?.answerId === id ? fetcher.data : undefined;
  const handedIn = saved?.handedIn || mine?.saved === "handed-in";
  const field = (name: "claim" | "evidence" | "reasoning", label: string, help: string) => (
    <div className="mb-3">
      <label htmlFor={`${id}-${name}`} className="block font-bold">
        {label}
      </label>
      <p id={`${id}-${name}-help`} className="mb-1 text-[length:var(--text-step--1)] text-ink-soft">
        {help}
      </p>
      <textarea
        id={`${id}-${name}`}
        name={name}
        rows={3}
        maxLength={4000}
        className="field"
        defaultValue={saved?.[name] ?? ""}
        disabled={!canAnswer}
        aria-describedby={`${id}-${name}-help`}
        aria-invalid={Boolean(mine?.errors?.[name])}
      />
      {mine?.errors?.[name] && <p className="text-danger">{mine.errors[name]}</p>}
    </div>
  );
  return (
    <section id={`answer-${id}`} className="card my-8 scroll-mt-6 font-ui" aria-labelledby={`answer-${id}-title`}>
      <h3 id={`answer-${id}-title`} className="mb-2 font-reading text-[length:var(--text-step-1)]">
        Claim, evidence, reasoning
      </h3>
      <p className="mb-4 font-reading">{prompt}</p>
      <fetcher.Form method="post">
        <input type="hidden" name="intent" value="written-answer" />
        <input type="hidden" name="answerId" value={id} />
        {field("claim", "Claim", "One sentence that answers the question.")}
        {field("evidence", "Evidence", "Numbers from your data that support the claim.")}
        {field("reasoning", "Reasoning", "Why the evidence supports the claim: the science that links them.")}
        {canAnswer && (
          // The result is said beside the buttons, where the eye and the keyboard focus already are.
          <div className="flex flex-wrap items-center gap-3">
            {!handedIn && (
              <SendButton name="handIn" value="0" className="btn btn-quiet" busy={fetcher.state !== "idle"}>
                Save a draft
              </SendButton>
            )}
            <SendButton name="handIn" value="1" className="btn" busy={fetcher.state !== "idle"}>
              {handedIn ? "Hand in again" : "Hand in"}
            </SendButton>
            <p aria-live="polite" className="font-bold text-ok">
              {mine?.saved === "draft" ? "Draft saved." : handedIn ? `Handed in. Your ${reader} can read it now.` : ""}
            </p>
          </div>
        )}
      </fetcher.Form>
      {mine?.error && (
        <p className="mt-2 rounded bg-ember-wash p-3 text-danger" role="alert">
          {mine.error}
        </p>
      )}
      {saved?.reviewComment && (
        <div className="mt-3 rounded bg-spruce-wash p-3" data-testid="review-comment">
          <p className="font-bold">Your {reader}'s comment</p>
          <p className="whitespace-pre-wrap wrap-anywhere">{saved.reviewComment}</p>
        </div>
      )}
    </section>
  );
}
