// A written claim–evidence–reasoning answer: saved as a draft, then handed in; the teacher's comment shows here.
import { useState } from "react";
import { useFetcher } from "react-router";
import { useLesson } from "./lesson-context";
import { SendButton } from "~/components/send-button";
import { isRubricScores, RUBRIC, rubricTotal, type RubricScores } from "~/lib/teaching/shared";

/** Each part's limit (the action's too). The browser stops typing and cuts a paste there without a word, so the count shows near it. */
const MAX_CHARACTERS = 4000;
const SHOW_COUNT_FROM = 3500;

export function WrittenAnswer({ id, prompt }: { id: string; prompt: string }) {
  const { state, canAnswer, reader } = useLesson();
  const saved = state.writtenAnswers[id];
  const fetcher = useFetcher<{ answerId?: string; errors?: Record<string, string>; error?: string; saved?: "draft" | "handed-in" }>();
  const mine = fetcher.data?.answerId === id ? fetcher.data : undefined;
  const handedIn = saved?.handedIn || mine?.saved === "handed-in";
  const [lengths, setLengths] = useState<Record<string, number>>({});
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
        maxLength={MAX_CHARACTERS}
        className="field"
        defaultValue={saved?.[name] ?? ""}
        disabled={!canAnswer}
        onInput={(e) => {
          // Read now: the event's currentTarget is gone by the time React runs the state update.
          const length = e.currentTarget.value.length;
          setLengths((l) => ({ ...l, [name]: length }));
        }}
        aria-describedby={`${id}-${name}-help ${id}-${name}-count`}
        aria-invalid={Boolean(mine?.errors?.[name])}
      />
      <CharactersLeft id={`${id}-${name}-count`} length={lengths[name] ?? (saved?.[name] ?? "").length} />
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
      {(saved?.reviewComment || isRubricScores(saved?.reviewScores)) && (
        <div className="mt-3 rounded bg-spruce-wash p-3" data-testid="review-comment">
          <p className="font-bold">Your {reader}'s review</p>
          {isRubricScores(saved?.reviewScores) && <RubricLevels scores={saved.reviewScores} />}
          {saved?.reviewComment && <p className="whitespace-pre-wrap wrap-anywhere">{saved.reviewComment}</p>}
        </div>
      )}
    </section>
  );
}

/** The rubric's level for each part, in its own words, with the total (the teacher's scores). */
function RubricLevels({ scores }: { scores: RubricScores }) {
  return (
    <ul className="mb-2" data-testid="review-scores">
      {RUBRIC.map((r) => (
        <li key={r.key}>
          <span className="font-bold">{r.label}:</span> {r.levels[scores[r.key]]} ({scores[r.key]} of 2)
        </li>
      ))}
      <li>
        <span className="font-bold">In all:</span> {rubricTotal(scores)} of {RUBRIC.length * 2}
      </li>
    </ul>
  );
}

function CharactersLeft({ id, length }: { id: string; length: number }) {
  if (length < SHOW_COUNT_FROM) return <span id={id} hidden />;
  const left = MAX_CHARACTERS - length;
  return (
    <p id={id} className={`text-[length:var(--text-step--1)] ${left === 0 ? "font-bold text-danger" : "text-ink-soft"}`} data-testid="characters-left">
      {left === 0
        ? `This part is full: ${MAX_CHARACTERS.toLocaleString("en-US")} characters at most. Anything past that was not added.`
        : `${left.toLocaleString("en-US")} of ${MAX_CHARACTERS.toLocaleString("en-US")} characters left.`}
    </p>
  );
}
