// The question a page asks when a link would leave behind something kept nowhere else (a handed-in
// answer's changes, new students' first passwords): stay (the default, focused) or leave anyway.
import { useEffect, useId } from "react";
import { useBlocker, type Blocker } from "react-router";

/**
 * While the calling component is shown, leaving its page asks first: a link to another page is held
 * (the answer is `LeavingQuestion`'s), a reload or a closed tab gets the browser's own question. Forms
 * posting back to the same page go through.
 */
export function useAskBeforeLeaving(): Blocker {
  const leaving = useBlocker(({ currentLocation, nextLocation }) => currentLocation.pathname !== nextLocation.pathname);
  useEffect(() => {
    const ask = (event: BeforeUnloadEvent) => event.preventDefault();
    window.addEventListener("beforeunload", ask);
    return () => window.removeEventListener("beforeunload", ask);
  }, []);
  return leaving;
}

export function LeavingQuestion({ leaving, question, stay, leave, className = "" }: { leaving: Blocker; question: string; stay: string; leave: string; className?: string }) {
  const id = useId();
  if (leaving.state !== "blocked") return null;
  return (
    <div className={`rounded bg-ember-wash p-3 ${className}`} role="alertdialog" aria-labelledby={id}>
      <p id={id} className="mb-2 font-bold">
        {question}
      </p>
      <div className="flex flex-wrap gap-3">
        <button type="button" className="btn" onClick={() => leaving.reset()} autoFocus>
          {stay}
        </button>
        <button type="button" className="btn btn-quiet" onClick={() => leaving.proceed()}>
          {leave}
        </button>
      </div>
    </div>
  );
}
