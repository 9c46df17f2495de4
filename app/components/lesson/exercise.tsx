// One auto-checked exercise. The answer goes to the lesson route's action with a fetcher (no page
// reload); the server checks it and answers with feedback. The expected answer never reaches the page.
import { useId } from "react";
import { useFetcher } from "react-router";
import type { ExerciseState, Feedback } from "~/lib/course.server";
import { useLesson } from "./lesson-context";
import { SendButton } from "~/components/send-button";
import { SlidingBox } from "~/components/sliding-box";

export interface AnswerResponse {
  exerciseId?: string;
  feedback?: Feedback;
  error?: string;
}

const STATUS_TEXT: Record<ExerciseState["status"], string> = {
  open: "",
  right: "Right",
  "used-up": "Tries used up",
};

export function Exercise({ id }: { id: string }) {
  const { state, canAnswer, asAdult } = useLesson();
  const exercise = state.exercises[id];
  const fetcher = useFetcher<AnswerResponse>();
  const formId = useId();
  if (!exercise) {
    return <p className="my-4 rounded bg-ember-wash p-3 font-ui text-danger">This exercise ({id}) is missing from the lesson.</p>;
  }
  const busy = fetcher.state !== "idle";
  // The loader's state is revalidated after each answer; the fetcher's feedback shows at once.
  const feedback = fetcher.data?.exerciseId === id && fetcher.data.feedback ? fetcher.data.feedback : exercise.lastFeedback;
  const error = fetcher.data?.exerciseId === id ? fetcher.data.error : undefined;
  const closed = exercise.status !== "open";
  const triesLeft = exercise.attemptsAllowed - exercise.attemptsUsed;

  return (
    <section id={`exercise-${id}`} aria-labelledby={`${formId}-title`} className="card my-8 scroll-mt-6 font-ui" data-exercise={id}>
      <header className="mb-3 flex flex-wrap items-baseline justify-between gap-2">
        <h3 id={`${formId}-title`} className="font-reading text-[length:var(--text-step-1)]">
          {exercise.title}
        </h3>
        <p className="text-[length:var(--text-step--1)] text-ink-soft" data-testid="exercise-status">
          {exercise.status === "open" && !canAnswer && !asAdult
            ? "Closed at the due date"
            : exercise.status === "open"
            ? triesLeft === 1
              ? `Last try (of ${exercise.attemptsAllowed})`
              : `${triesLeft} of ${exercise.attemptsAllowed} tries left`
            : STATUS_TEXT[exercise.status]}
        </p>
      </header>
      {exercise.prompt.prompt.split("\n").map((line, i) => (
        <p key={i} className="mb-2 font-reading" data-testid="exercise-prompt">
          {line}
        </p>
      ))}
      {exercise.prompt.waitingForReadings ? (
        <p className="mt-3 rounded bg-spruce-wash p-3">Save your readings above first: this question uses your own numbers.</p>
      ) : (
        <fetcher.Form method="post" className="mt-4" aria-describedby={`${formId}-feedback`}>
          <input type="hidden" name="intent" value="answer" />
          <input type="hidden" name="exerciseId" value={id} />
          <AnswerFields exercise={exercise} formId={formId} disabled={closed || !canAnswer} wrongCells={feedback?.wrongCells ?? []} />
          {canAnswer && !closed && (
            <SendButton className="btn mt-3" busy={busy}>
              {busy ? "Checking…" : "Check my answer"}
            </SendButton>
          )}
          {asAdult && <p className="mt-3 text-ink-soft">You are looking at this lesson as an adult: answers are not saved.</p>}
        </fetcher.Form>
      )}
      <div id={`${formId}-feedback`} aria-live="polite" className="mt-3">
        {error && <p className="rounded bg-ember-wash p-3 text-danger">{error}</p>}
        {feedback && (
          <div
            className={`rounded p-3 ${feedback.right ? "bg-spruce-wash text-ok" : "bg-ember-wash text-danger"}`}
            data-testid="exercise-feedback"
            data-outcome={feedback.outcome}
          >
            <p className="font-bold">{feedback.right ? "That's right." : feedback.noTriesLeft || closed ? "Not right. That was the last try." : "Not yet."}</p>
            {!feedback.right &&
              // A table's feedback has a line for each cell.
              feedback.message.split("\n").map((line, i) => (
                <p key={i} className="text-ink">
                  {line}
                </p>
              ))}
            {feedback.hint && !closed && (
              <p className="mt-2 text-ink" data-testid="exercise-hint">
                <span className="font-bold">Hint: </span>
                {feedback.hint}
              </p>
            )}
          </div>
        )}
        {exercise.solution && (
          <div className="mt-3 rounded border border-rule p-3" data-testid="exercise-solution">
            <p className="font-bold">Worked solution with your numbers</p>
            {exercise.solution.split("\n").map((line, i) => (
              <p key={i} className="font-reading">
                {line}
              </p>
            ))}
          </div>
        )}
      </div>
    </section>
  );
}

function AnswerFields({ exercise, formId, disabled, wrongCells }: { exercise: ExerciseState; formId: string; disabled: boolean; wrongCells: number[] }) {
  const { reader } = useLesson();
  const last = exercise.lastAnswer;
  if (exercise.kind === "choice") {
    let lastChoice = "";
    let lastReason = "";
    try {
      const parsed = last ? (JSON.parse(last) as { choice?: string; reason?: string }) : {};
      lastChoice = parsed.choice ?? "";
      lastReason = parsed.reason ?? "";
    } catch {
      // an old answer we cannot read is simply not filled in
    }
    return (
      <>
        <fieldset disabled={disabled}>
          <legend className="mb-2 font-bold">Your choice</legend>
          {exercise.prompt.choices?.map((c) => {
            // Once answered, the chosen option says so in words and in bold, not only by a pale radio.
            const chosen = disabled && lastChoice === c.value;
            return (
              <label key={c.value} className={`mb-1 flex items-start gap-2 text-ink ${chosen ? "font-bold" : ""}`} data-chosen={chosen || undefined}>
                <input type="radio" name="choice" value={c.value} defaultChecked={lastChoice === c.value} required className="mt-0.5 h-5 w-5 shrink-0" />
                <span>
                  {c.label}
                  {chosen && " "}
                  {chosen && <span className="ml-1 rounded bg-spruce-wash px-1.5 text-[length:var(--text-step--1)] text-ink">your answer</span>}
                </span>
              </label>
            );
          })}
        </fieldset>
        <label htmlFor={`${formId}-reason`} className="mt-3 mb-1 block font-bold">
          Why? (your {reader} reads this)
        </label>
        <textarea id={`${formId}-reason`} name="reason" rows={2} maxLength={1000} className="field" defaultValue={lastReason} disabled={disabled} />
      </>
    );
  }
  if (exercise.kind === "table" && exercise.prompt.table) {
    let lastCells: string[] = [];
    try {
      lastCells = last ? (JSON.parse(last) as string[]) : [];
    } catch {
      lastCells = [];
    }
    return <TableFields table={exercise.prompt.table} lastCells={lastCells} disabled={disabled} wrongCells={wrongCells} feedbackId={`${formId}-feedback`} />;
  }
  return (
    <>
      <label htmlFor={`${formId}-answer`} className="mb-1 block font-bold">
        Your answer{exercise.kind === "ratio" ? " (a number)" : " (a number and its unit)"}
      </label>
      <input
        id={`${formId}-answer`}
        name="answer"
        className="field max-w-xs"
        autoComplete="off"
        inputMode="text"
        maxLength={200}
        defaultValue={last ?? ""}
        disabled={disabled}
        required
      />
    </>
  );
}

/**
 * The empty cells of a table exercise. The cells the last check found wrong or unreadable are marked
 * (aria-invalid, a red dashed border) until the next check. On a narrow screen the inputs are
 * narrower, and a table still wider than its box says that it scrolls sideways.
 */
function TableFields({
  table,
  lastCells,
  disabled,
  wrongCells,
  feedbackId,
}: {
  table: NonNullable<ExerciseState["prompt"]["table"]>;
  lastCells: string[];
  disabled: boolean;
  wrongCells: number[];
  feedbackId: string;
}) {
  const { columns, rows } = table;
  let cell = 0;
  return (
    <>
      <SlidingBox label="The table to fill in" testId="table-box" hintTestId="table-scroll-hint">
        <table className="border-collapse">
          <thead>
            <tr>
              {columns.map((c) => (
                <th key={c} scope="col" className="border-b-2 border-ink-soft px-2 py-1 text-left sm:px-3">
                  {c}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {rows.map((row, r) => (
              <tr key={r}>
                {row.map((value, c) => {
                  if (value !== null) {
                    return (
                      <td key={c} className="border-b border-rule px-2 py-1 tabular-nums sm:px-3">
                        {value}
                      </td>
                    );
                  }
                  const index = cell++;
                  const wrong = wrongCells.includes(index);
                  return (
                    <td key={c} className="border-b border-rule px-1 py-1 sm:px-2">
                      <input
                        name="cell"
                        aria-label={typeof row[0] === "string" && c > 0 ? `${columns[c]}, ${row[0]}` : `${columns[c]}, row ${r + 1}`}
                        aria-invalid={wrong || undefined}
                        aria-describedby={wrong ? feedbackId : undefined}
                        className={`field w-24 sm:w-32 ${wrong ? "border-dashed border-danger bg-ember-wash" : ""}`}
                        autoComplete="off"
                        maxLength={60}
                        defaultValue={lastCells[index] ?? ""}
                        disabled={disabled}
                        required
                      />
                    </td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </SlidingBox>
    </>
  );
}
