// Saves a page still owes the server (a written answer's draft that has not gone yet), so that signing
// out can send them first: once the session cookie is gone they could no longer be saved.
const pending = new Set<() => Promise<void>>();

/** Registers a way to send what is owed now; the returned function unregisters it. */
export function owePendingSave(flush: () => Promise<void>): () => void {
  pending.add(flush);
  return () => pending.delete(flush);
}

/** Sends every owed save and waits for them (never fails: what fails stays on the page as it was). */
export async function sendPendingSaves(): Promise<void> {
  await Promise.allSettled([...pending].map((flush) => flush()));
}

export function hasPendingSaves(): boolean {
  return pending.size > 0;
}
