// Where to send someone after sign-in. Only a path on this site is accepted: an address that would
// leave Bendwise ("//evil.example", "https://…", "/\evil.example", "javascript:…") is dropped, so a
// crafted sign-in link cannot bounce a freshly signed-in user to another site.
const base = "http://bendwise.invalid";

/** The same-site path (with query and fragment) to return to, or null when `value` is not one. */
export function safeRedirectTo(value: unknown): string | null {
  if (typeof value !== "string") return null;
  if (value.length === 0 || value.length > 2048) return null;
  // A path must start with exactly one "/"; "//host" and "/\host" are read as another host by browsers.
  if (!value.startsWith("/") || value.startsWith("//") || value.startsWith("/\\")) return null;
  // Control characters and backslashes are never part of our own links.
  if (/[\u0000-\u001f\u007f\\]/.test(value)) return null;
  let url: URL;
  try {
    url = new URL(value, base);
  } catch {
    return null;
  }
  if (url.origin !== base) return null;
  // Never send someone back into the sign-in machinery itself.
  if (url.pathname.startsWith("/auth/") || url.pathname === "/sign-out") return null;
  return `${url.pathname}${url.search}${url.hash}`;
}
