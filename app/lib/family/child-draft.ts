// What a parent typed on "Add a child" (the name, the username and the grade band, never the password),
// kept in this browser tab's sessionStorage while they go and buy a seat, so coming back to the page
// (by Back, or through "Add a child") finds it there. It is cleared once the account is made.
export type ChildDraft = { displayName: string; username: string; gradeBand: string };

const KEY_PREFIX = "bendwise:new-child:";
const keyFor = (familyCode: string) => `${KEY_PREFIX}${familyCode}`;

function storage(): Storage | null {
  try {
    return typeof window === "undefined" ? null : window.sessionStorage;
  } catch {
    return null; // storage turned off: nothing is kept, and the page says nothing it cannot keep
  }
}

export function saveChildDraft(familyCode: string, draft: ChildDraft) {
  const store = storage();
  if (!store) return;
  try {
    if (draft.displayName.trim() === "" && draft.username.trim() === "") store.removeItem(keyFor(familyCode));
    else store.setItem(keyFor(familyCode), JSON.stringify(draft));
  } catch {
    // a full or refused storage keeps nothing; the form itself still works
  }
}

export function readChildDraft(familyCode: string): ChildDraft | null {
  const raw = storage()?.getItem(keyFor(familyCode));
  if (!raw) return null;
  try {
    const value = JSON.parse(raw) as Partial<ChildDraft>;
    return { displayName: String(value.displayName ?? ""), username: String(value.username ?? ""), gradeBand: String(value.gradeBand ?? "") };
  } catch {
    return null;
  }
}

/** Forgets every family's draft in this tab (after an account is made). */
export function clearChildDrafts() {
  const store = storage();
  if (!store) return;
  for (let i = store.length - 1; i >= 0; i--) {
    const key = store.key(i);
    if (key?.startsWith(KEY_PREFIX)) store.removeItem(key);
  }
}
