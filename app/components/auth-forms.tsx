// Small pieces shared by the sign-in, sign-in link and password pages.
import { useEffect, useId, useRef, useState } from "react";

/** A labelled input with its error message tied to it for screen readers. */
export function Field({
  label,
  hint,
  error,
  ...input
}: { label: string; hint?: string; error?: string } & React.InputHTMLAttributes<HTMLInputElement> & { name: string }) {
  const id = useId();
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  const describedBy = [hint ? hintId : null, error ? errorId : null].filter(Boolean).join(" ") || undefined;
  return (
    <div className="mb-4">
      <label htmlFor={id} className="mb-1 block font-bold">
        {label}
      </label>
      {hint ? (
        <p id={hintId} className="mb-1 text-[length:var(--text-step--1)] text-ink-soft">
          {hint}
        </p>
      ) : null}
      <input id={id} className="field" aria-invalid={error ? true : undefined} aria-describedby={describedBy} {...input} />
      {error ? (
        <p id={errorId} className="mt-1 text-[length:var(--text-step--1)] font-bold text-danger">
          {error}
        </p>
      ) : null}
    </div>
  );
}

/**
 * When a form comes back with problems, the keyboard goes to its first field marked wrong, so a screen
 * reader reads that field's label and message and the fix is typed there (the send button that had the
 * keyboard says nothing). Give it the action's answer: each new answer moves the keyboard again.
 */
export function useFocusFirstProblem<T extends HTMLElement = HTMLFormElement>(answer: unknown) {
  const ref = useRef<T>(null);
  useEffect(() => {
    if (answer) ref.current?.querySelector<HTMLElement>('[aria-invalid="true"]')?.focus();
  }, [answer]);
  return ref;
}

/** The box of a message in its tone: its border and wash (the payment page's live region takes the same look). */
export function noticeBox(tone: "problem" | "done" | "info"): string {
  const wash = { problem: "border-danger bg-[#fdecee]", done: "border-ok bg-[#e7f3ea]", info: "border-spruce bg-spruce-wash" }[tone];
  return `rounded-lg border-l-4 px-4 py-3 text-ink ${wash}`;
}

/** A message box: "problem" for refusals, "done" for confirmations, "info" for the rest. */
export function Notice({ tone, children, id }: { tone: "problem" | "done" | "info"; children: React.ReactNode; id?: string }) {
  return (
    <div id={id} role={tone === "problem" ? "alert" : "status"} className={`mb-4 ${noticeBox(tone)}`}>
      {children}
    </div>
  );
}

/** A clock time: UTC from the server, the reader's own time zone once the page is live. */
export function ClockTime({ iso }: { iso: string }) {
  const [text, setText] = useState(() => `${new Date(iso).toISOString().slice(11, 16)} UTC`);
  useEffect(() => {
    setText(new Date(iso).toLocaleTimeString([], { hour: "2-digit", minute: "2-digit", second: "2-digit" }));
  }, [iso]);
  return <time dateTime={iso}>{text}</time>;
}
