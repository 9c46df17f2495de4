// The box a table wider than the screen slides in. While it slides it says so and takes the keyboard
// (the arrow keys then scroll it), named after its table: every column can be reached without a mouse,
// even in a table with nothing else to focus.
import { useId } from "react";
import { SLIDES_SIDEWAYS, useOverflows } from "./use-overflows";

export function SlidingBox({
  label,
  className = "",
  testId,
  hintTestId,
  children,
}: {
  label: string;
  className?: string;
  testId?: string;
  hintTestId?: string;
  children: React.ReactNode;
}) {
  const { ref, overflows } = useOverflows<HTMLDivElement>();
  const hintId = useId();
  const keys = overflows ? { tabIndex: 0, role: "region", "aria-label": label, "aria-describedby": hintId } : {};
  return (
    <>
      {overflows ? (
        <p id={hintId} className="mb-2 text-[length:var(--text-step--1)] text-ink-soft" data-testid={hintTestId}>
          {SLIDES_SIDEWAYS}
        </p>
      ) : null}
      <div ref={ref} className={`overflow-x-auto ${className}`} data-testid={testId} {...keys}>
        {children}
      </div>
    </>
  );
}
