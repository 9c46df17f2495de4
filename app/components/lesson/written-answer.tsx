// A written claim–evidence–reasoning answer: saved as a draft, then handed in; the teacher's comment shows here.
// Nothing typed is lost: a draft saves itself a moment after the typing stops, and before the page is
// left (a link, a reload, the tab closed). Changes to an answer already handed in cannot be kept as a
// draft (the teacher reads what was handed in), so leaving with them asks first.
import { useEffect, useRef, useState } from "react";
import { useBlocker, useFetcher, useLocation } from "react-router";
import { useLesson } from "./lesson-context";
import { LeavingQuestion } from "~/components/leaving-question";
import { SendButton } from "~/components/send-button";
import { owePendingSave } from "~/lib/pending-saves";
import { keepInTab, readInTab } from "~/lib/tab-storage";
import { isRubricScores, RUBRIC, rubricTotal, type RubricScores } from "~/lib/teaching/shared";

/** Each part's limit (the action's too). The browser stops typing and cuts a paste there without a word, so the count shows near it. */
const MAX_CHARACTERS = 4000;
const SHOW_COUNT_FROM = 3500;
/** How long the typing must pause before a draft saves itself. */
const AUTOSAVE_AFTER_MS = 1500;

type Part = "claim" | "evidence" | "reasoning";
const PARTS: Part[] = ["claim", "evidence", "reasoning"];

export function WrittenAnswer({ id, prompt }: { id: string; prompt: string }) {
  const { state, canAnswer, asAdult, reader } = useLesson();
  const saved = state.writtenAnswers[id];
  const fetcher = useFetcher<{ answerId?: string; errors?: Record<string, string>; error?: string; saved?: "draft" | "handed-in" }>();
  const mine = fetcher.data?.answerId === id ? fetcher.data : undefined;
  const handedIn = saved?.handedIn || mine?.saved === "handed-in";
  const [lengths, setLengths] = useState<Record<string, number>>({});
  const { unsaved, autosaved, problem, typed } = useKeptDraft(id, canAnswer && !handedIn, mine?.saved ? mine : undefined);
  const leaving = useBlocker(({ currentLocation, nextLocation }) => unsaved && handedIn && currentLocation.pathname !== nextLocation.pathname);
  const field = (name: Part, label: string, help: string) => (
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
          typed(name);
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
            <p aria-live="polite" className="font-bold text-ok" data-testid="written-answer-status">
              {mine?.saved === "draft"
                ? "Draft saved."
                : handedIn
                ? unsaved
                  ? "Changed since you handed it in: hand it in again to send the changes."
                  : `Handed in. Your ${reader} can read it now.`
                : autosaved
                ? "Draft saved by itself."
                : ""}
            </p>
          </div>
        )}
      </fetcher.Form>
      <LeavingQuestion
        leaving={leaving}
        className="mt-3"
        question="Your changes to this handed-in answer are not handed in yet. Leave without them?"
        stay="Stay and hand in again"
        leave="Leave without the changes"
      />
      {mine?.error && (
        <p className="mt-2 rounded bg-ember-wash p-3 text-danger" role="alert">
          {mine.error}
        </p>
      )}
      {problem && !mine?.error && (
        <p className="mt-2 rounded bg-ember-wash p-3 text-danger" role="alert" data-testid="draft-problem">
          {problem}
        </p>
      )}
      {asAdult && <p className="mt-3 text-ink-soft">You are looking at this lesson as an adult: a student writes here, and nothing is saved for you.</p>}
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

/** What one part's box holds now. */
const partText = (fields: HTMLFormControlsCollection, part: Part) => (fields.namedItem(part) as HTMLTextAreaElement | null)?.value ?? "";

/** Why a draft that saved itself did not reach the server, in the student's words. */
function draftProblem(status: number): string {
  if (status === 202 || status === 401 || status === 403) {
    return "Not saved: you are signed out. Sign in again in another tab, then come back here and press “Save a draft”: your words are still here.";
  }
  if (status === 409) {
    return "Not saved as a draft: this answer can no longer be changed here (it was handed in, perhaps in another tab, or the lesson has closed). Copy your words before you reload the page.";
  }
  return "Not saved yet: the connection failed. It tries again when you type or leave the page; “Save a draft” tries now.";
}

/**
 * The draft's life between the saves a student asks for. `typed(part)` is called with each change.
 * While a draft may be saved (`autosave`), the parts changed since the last save are sent
 * AUTOSAVE_AFTER_MS after the typing stops, and at once when the page is left (a link in the app, a
 * reload or closed tab: sent with `keepalive`, so it outlives the page) or before signing out. Only
 * the changed parts go, so two tabs of the same lesson do not wipe each other's other parts.
 * Otherwise (handed in) leaving with changes asks first. `ownSave` is the answer to the student's own
 * "Save a draft" or "Hand in" when it succeeded (it sent every part).
 */
function useKeptDraft(answerId: string, autosave: boolean, ownSave: unknown) {
  const { pathname } = useLocation();
  // The form, held past its removal from the page: a link away unmounts it before the last save reads it.
  const form = useRef<HTMLFormElement | null>(null);
  const changed = useRef(new Set<Part>()); // parts typed in since the last save that reached the server
  const timer = useRef<ReturnType<typeof setTimeout> | undefined>(undefined);
  const [unsaved, setUnsaved] = useState(false);
  const [autosaved, setAutosaved] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const canAutosave = useRef(autosave);
  canAutosave.current = autosave;

  useEffect(() => {
    if (!ownSave) return;
    changed.current.clear();
    setUnsaved(false);
    setProblem(null);
  }, [ownSave]);

  /** Sends the changed parts as the lesson's form would; keepalive lets a page being left still deliver it. */
  const saveNow = async (): Promise<void> => {
    clearTimeout(timer.current);
    const fields = form.current?.elements;
    if (changed.current.size === 0 || !canAutosave.current || !fields) return;
    const sending = [...changed.current];
    changed.current.clear();
    const body = new URLSearchParams({ intent: "written-answer", answerId, handIn: "0" });
    for (const part of sending) body.set(part, partText(fields, part));
    let status = 0;
    try {
      status = (await fetch(`${pathname}.data`, { method: "POST", body, keepalive: true, credentials: "same-origin" })).status;
    } catch {
      status = 0; // no connection
    }
    // React Router answers 200 for a saved draft; 202 is its redirect (to sign-in: the session ended).
    if (status === 200) {
      setProblem(null);
      setAutosaved(true);
      if (changed.current.size === 0) setUnsaved(false);
    } else {
      for (const part of sending) changed.current.add(part); // still owed
      setAutosaved(false);
      setProblem(draftProblem(status));
    }
  };
  const save = useRef(saveNow);
  save.current = saveNow;

  useEffect(() => {
    form.current = document.getElementById(`answer-${answerId}`)?.querySelector("form") ?? null;
    // A reload can reach the server before the save sent as the page went: the tab keeps a copy for a
    // short while, and the page it reloads into puts it back and saves it again.
    const copyKey = `bendwise-draft:${pathname}:${answerId}`;
    const copy = takeTabCopy(copyKey);
    const fields = form.current?.elements;
    if (copy && fields && canAutosave.current) {
      for (const part of PARTS) {
        const field = fields.namedItem(part) as HTMLTextAreaElement | null;
        const kept = copy[part];
        if (field && typeof kept === "string" && field.value !== kept) {
          field.value = kept;
          typedRef.current(part);
        }
      }
    }
    const onLeave = (event: BeforeUnloadEvent) => {
      if (changed.current.size === 0) return;
      if (!canAutosave.current) return event.preventDefault(); // the browser asks before leaving
      const values = form.current?.elements;
      if (values) keepInTab(copyKey, { at: Date.now(), parts: Object.fromEntries([...changed.current].map((part) => [part, partText(values, part)])) });
      void save.current();
    };
    window.addEventListener("beforeunload", onLeave);
    const stopOwing = owePendingSave(() => save.current());
    return () => {
      window.removeEventListener("beforeunload", onLeave);
      stopOwing();
      void save.current(); // the lesson page is going away (a link in the app)
    };
  }, [answerId, pathname]);

  const typed = (part: Part) => {
    changed.current.add(part);
    setUnsaved(true);
    setAutosaved(false);
    clearTimeout(timer.current);
    if (canAutosave.current) timer.current = setTimeout(() => void save.current(), AUTOSAVE_AFTER_MS);
  };
  const typedRef = useRef(typed);
  typedRef.current = typed;
  return { unsaved, autosaved, problem, typed };
}

/** How long the tab's copy of a draft is good for: long enough for a reload, short for a shared computer. */
const TAB_COPY_MS = 2 * 60_000;

/** The tab's copy, once (it is forgotten as it is read), if it is recent. */
function takeTabCopy(key: string): Partial<Record<Part, string>> | null {
  const copy = readInTab(key, { take: true }) as { at?: unknown; parts?: Partial<Record<Part, string>> } | null;
  return copy && typeof copy.at === "number" && Date.now() - copy.at < TAB_COPY_MS && copy.parts ? copy.parts : null;
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
