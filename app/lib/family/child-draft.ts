// What a parent typed on "Add a child" (the name, the username and the grade band, never the password),
// kept in this browser tab while they go and buy a seat, so coming back to the page (by Back, or
// through "Add a child") finds it there. It is cleared once the account is made.
import { forgetInTab, keepInTab, readInTab } from "~/lib/tab-storage";

export type ChildDraft = { displayName: string; username: string; gradeBand: string };

const KEY_PREFIX = "bendwise:new-child:";
const keyFor = (familyCode: string) => `${KEY_PREFIX}${familyCode}`;

export function saveChildDraft(familyCode: string, draft: ChildDraft) {
  const empty = draft.displayName.trim() === "" && draft.username.trim() === "";
  keepInTab(keyFor(familyCode), empty ? null : draft);
}

export function readChildDraft(familyCode: string): ChildDraft | null {
  const value = readInTab(keyFor(familyCode));
  if (typeof value !== "object" || value === null) return null;
  const kept = value as Partial<ChildDraft>;
  return { displayName: String(kept.displayName ?? ""), username: String(kept.username ?? ""), gradeBand: String(kept.gradeBand ?? "") };
}

/** Forgets every family's draft in this tab (after an account is made). */
export function clearChildDrafts() {
  forgetInTab(KEY_PREFIX);
}
