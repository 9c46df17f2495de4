// Small pieces shared by the teaching pages: labelled fields with their messages, notices, and the
// header with its tabs that every page of a class carries.
import { useId } from "react";
import { Form, NavLink } from "react-router";
import { SendButton } from "~/components/send-button";

type InputProps = React.InputHTMLAttributes<HTMLInputElement> & { name: string };

/** A labelled input; its hint and error are tied to it for screen readers. */
export function TextField({ label, hint, error, className, ...input }: { label: string; hint?: string; error?: string } & InputProps) {
  const id = useId();
  const describedBy = [hint ? `${id}-hint` : null, error ? `${id}-error` : null].filter(Boolean).join(" ") || undefined;
  return (
    <div className={className ?? "mb-4"}>
      <label htmlFor={id} className="mb-1 block font-bold">
        {label}
      </label>
      {hint ? (
        <p id={`${id}-hint`} className="mb-1 text-[length:var(--text-step--1)] text-ink-soft">
          {hint}
        </p>
      ) : null}
      <input id={id} className="field" aria-invalid={error ? true : undefined} aria-describedby={describedBy} {...input} />
      {error ? (
        <p id={`${id}-error`} className="mt-1 text-[length:var(--text-step--1)] font-bold text-danger">
          {error}
        </p>
      ) : null}
    </div>
  );
}

export function SelectField({
  label,
  hint,
  error,
  options,
  className,
  ...select
}: {
  label: string;
  hint?: string;
  error?: string;
  /** options with a `group` are shown under that group's heading, in the order given */
  options: { value: string; label: string; group?: string }[];
} & React.SelectHTMLAttributes<HTMLSelectElement> & { name: string }) {
  const id = useId();
  const groups = [...new Set(options.map((o) => o.group))];
  const optionsOf = (group: string | undefined) =>
    options
      .filter((o) => o.group === group)
      .map((o) => (
        <option key={o.value} value={o.value}>
          {o.label}
        </option>
      ));
  const describedBy = [hint ? `${id}-hint` : null, error ? `${id}-error` : null].filter(Boolean).join(" ") || undefined;
  return (
    <div className={className ?? "mb-4"}>
      <label htmlFor={id} className="mb-1 block font-bold">
        {label}
      </label>
      {hint ? (
        <p id={`${id}-hint`} className="mb-1 text-[length:var(--text-step--1)] text-ink-soft">
          {hint}
        </p>
      ) : null}
      <select id={id} className="field" aria-invalid={error ? true : undefined} aria-describedby={describedBy} {...select}>
        {groups.map((group) =>
          group === undefined ? (
            optionsOf(undefined)
          ) : (
            <optgroup key={group} label={group}>
              {optionsOf(group)}
            </optgroup>
          ),
        )}
      </select>
      {error ? (
        <p id={`${id}-error`} className="mt-1 text-[length:var(--text-step--1)] font-bold text-danger">
          {error}
        </p>
      ) : null}
    </div>
  );
}

/** The message box every page uses (auth-forms.tsx). */
export { Notice } from "~/components/auth-forms";

export interface ClassHeading {
  id: string;
  name: string;
  schoolYear: string;
  schoolName: string;
  code: string;
  archived: boolean;
}

const TABS = [
  { to: "gradebook", label: "Gradebook" },
  { to: "roster", label: "Students" },
  { to: "assignments", label: "Lessons assigned" },
  { to: "settings", label: "Class settings" },
];

/** The class's name, code and tabs, at the top of every page of the class. */
export function ClassHeader({ klass, title }: { klass: ClassHeading; title?: string }) {
  return (
    <header className="mb-6">
      <p className="mb-1 text-[length:var(--text-step--1)]">
        <NavLink to="/teach/classes">Your classes</NavLink> <span className="text-ink-soft">· {klass.schoolName}</span>
      </p>
      <h1 className="mb-1 text-[length:var(--text-step-3)]">
        {klass.name}
        {title ? <span className="block text-[length:var(--text-step-1)] text-ink-soft">{title}</span> : null}
      </h1>
      <p className="mb-4 text-ink-soft">
        {klass.schoolYear} · class code <strong className="font-mono text-ink" data-testid="class-code">{klass.code}</strong>
        {klass.archived ? <strong className="ml-2 text-danger">Archived</strong> : null}
      </p>
      <nav aria-label="This class" className="-mx-1 flex flex-wrap gap-1 border-b border-rule pb-2">
        {TABS.map((tab) => (
          <NavLink
            key={tab.to}
            to={`/teach/classes/${klass.id}/${tab.to}`}
            className={({ isActive }) =>
              `rounded-md px-3 py-1.5 font-bold no-underline ${isActive ? "bg-spruce text-white hover:text-white" : "text-spruce hover:bg-spruce-wash"}`
            }
            end={false}
          >
            {tab.label}
          </NavLink>
        ))}
      </nav>
    </header>
  );
}

export function Percent({ value, empty = "—" }: { value: number | null; empty?: string }) {
  return <>{value === null ? empty : `${value}%`}</>;
}

/** Escape closes an open <details> that holds a form and gives the keyboard back to its summary. */
export function closeOnEscape(event: React.KeyboardEvent<HTMLDetailsElement>) {
  const details = event.currentTarget;
  if (event.key !== "Escape" || !details.open) return;
  event.stopPropagation(); // an inner one closes alone
  details.open = false;
  details.querySelector("summary")?.focus();
}

/**
 * Taking a lesson off a class's list asks once more, without JavaScript: the dates and the late-work
 * rule go, the students' work stays. Shared by the teacher's and the parent's lesson lists.
 */
export function TakeOffTheList({ assignmentId, slug, busy, whoseWork }: { assignmentId: string; slug: string; busy: boolean; whoseWork: string }) {
  return (
    <details className="mt-3" onKeyDown={closeOnEscape}>
      <summary className="cursor-pointer font-bold text-spruce">Take off the list…</summary>
      <Form method="post" preventScrollReset className="mt-2">
        <p className="mb-2 text-ink-soft">Its dates and late-work rule go; {whoseWork} work on it stays, and you can assign it again at any time.</p>
        <input type="hidden" name="intent" value="unassign" />
        <input type="hidden" name="assignmentId" value={assignmentId} />
        <input type="hidden" name="slug" value={slug} />
        <SendButton className="btn btn-quiet" busy={busy}>
          Yes, take it off the list
        </SendButton>
      </Form>
    </details>
  );
}
