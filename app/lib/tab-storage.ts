// What a browser tab keeps of a form while it is open (sessionStorage: never sent, gone with the tab):
// a child's name while a seat is bought, the analyser's readings, a draft a reload outran. Storage may
// be turned off or full; then nothing is kept and every form still works, so no call here throws.

function tab(): Storage | null {
  try {
    return typeof window === "undefined" ? null : window.sessionStorage;
  } catch {
    return null;
  }
}

/** Keeps `value` (as JSON) under `key`; null forgets it. */
export function keepInTab(key: string, value: unknown): void {
  try {
    if (value === null) tab()?.removeItem(key);
    else tab()?.setItem(key, JSON.stringify(value));
  } catch {
    // full or refused: nothing is kept
  }
}

/** What is kept under `key`, parsed, or null (none, or unreadable). `take` forgets it as it is read. */
export function readInTab(key: string, { take = false } = {}): unknown {
  try {
    const raw = tab()?.getItem(key) ?? null;
    if (raw !== null && take) tab()?.removeItem(key);
    return raw === null ? null : (JSON.parse(raw) as unknown);
  } catch {
    return null;
  }
}

/** Forgets what is kept under every key that begins with `prefix`, or everything (signing out). */
export function forgetInTab(prefix = ""): void {
  const store = tab();
  if (!store) return;
  try {
    if (prefix === "") return store.clear();
    for (let i = store.length - 1; i >= 0; i--) {
      const key = store.key(i);
      if (key?.startsWith(prefix)) store.removeItem(key);
    }
  } catch {
    // refused: nothing was kept
  }
}
