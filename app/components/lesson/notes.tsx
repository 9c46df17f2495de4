// Small prose components: a safety caution and a hint the student opens.
export function Caution({ children }: { children: React.ReactNode }) {
  return (
    <aside className="my-6 rounded-lg border-l-8 border-caution bg-caution-wash px-5 py-4 text-caution" aria-label="Safety">
      <p className="mb-1 font-bold font-ui uppercase tracking-wide text-[length:var(--text-step--1)]">Safety first</p>
      <div className="text-ink [&>p]:my-1">{children}</div>
    </aside>
  );
}

export function Hint({ children, label = "Need a hint?" }: { children: React.ReactNode; label?: string }) {
  return (
    <details className="my-4 rounded-lg border border-rule bg-card px-4 py-2">
      <summary className="cursor-pointer py-1.5 font-ui font-bold text-spruce">{label}</summary>
      <div className="pt-2 [&>p]:my-1">{children}</div>
    </details>
  );
}
