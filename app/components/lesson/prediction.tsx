// A prediction the student commits before the data is shown; it is kept as first given. Its children
// (the data) show once it is committed; <AfterPrediction> holds back a later passage that would give
// the answer away (a lesson's explanations often come after the data).
import { useFetcher } from "react-router";
import { useLesson } from "./lesson-context";

export function Prediction({ id, question, options, children }: {
  id: string;
  question: string;
  options: { value: string; label: string }[];
  children: React.ReactNode;
}) {
  const { state, canAnswer } = useLesson();
  const fetcher = useFetcher<{ predictionId?: string; error?: string }>();
  const committed = state.predictions[id] ?? (fetcher.formData?.get("predictionId") === id ? String(fetcher.formData.get("choice")) : undefined);
  const chosen = options.find((o) => o.value === committed);
  if (committed || !canAnswer) {
    return (
      <div id={`prediction-${id}`} className="my-6">
        {chosen && (
          <div className="rounded bg-spruce-wash p-3 font-ui">
            <p className="mb-1">{question}</p>
            <p>
              <span className="font-bold">Your prediction: </span>
              {chosen.label}. Now compare it with what follows.
            </p>
          </div>
        )}
        {children}
      </div>
    );
  }
  return (
    <fetcher.Form
      method="post"
      id={`prediction-${id}`}
      className="card my-6 font-ui"
      // A prediction cannot be changed once committed, so Enter on an option only chooses it; the
      // button commits (a browser would otherwise send the form on Enter in a radio button).
      onKeyDown={(e) => {
        if (e.key === "Enter" && e.target instanceof HTMLInputElement && e.target.type === "radio") e.preventDefault();
      }}
    >
      <input type="hidden" name="intent" value="predict" />
      <input type="hidden" name="predictionId" value={id} />
      <fieldset>
        <legend className="mb-2 font-reading text-[length:var(--text-step-1)] font-semibold">Predict first</legend>
        <p className="mb-3">{question}</p>
        {options.map((o) => (
          <label key={o.value} className="mb-1 flex items-center gap-2">
            <input type="radio" name="choice" value={o.value} required className="h-5 w-5" />
            {o.label}
          </label>
        ))}
      </fieldset>
      {fetcher.data?.error && <p className="mt-2 text-danger">{fetcher.data.error}</p>}
      <button type="submit" className="btn mt-3">
        Commit my prediction and read on
      </button>
    </fetcher.Form>
  );
}

/** A later passage of the lesson that shows only once the prediction `id` is committed (or to an adult, or in a closed lesson). */
export function AfterPrediction({ id, children }: { id: string; children: React.ReactNode }) {
  const { state, canAnswer } = useLesson();
  if (state.predictions[id] || !canAnswer) return <>{children}</>;
  return (
    <p className="my-4 font-ui text-[length:var(--text-step--1)] text-ink-soft" data-testid="after-prediction">
      More about this comes once you have committed your prediction above.
    </p>
  );
}
