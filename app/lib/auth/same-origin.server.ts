// CSRF protection for Bendwise's own form posts (Auth.js checks its own /auth/* posts with its
// double-submit token). Call `assertSameOrigin(request)` first thing in every action.
//
// Why a header check and not a token: every browser Bendwise supports sends `Sec-Fetch-Site` on
// requests, and `Origin` on every POST; neither can be set by another site's page. Checking them
// needs no hidden field in each form and no cookie, so forms work with and without JavaScript and
// after the page sat open for a day. Session cookies are also SameSite=Lax, a second layer.
import { serverEnv } from "~/env.server";

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

export const CROSS_SITE_MESSAGE =
  "This form was sent from another website, so Bendwise did not act on it. Go back to Bendwise, reload the page and try again.";

/** The origins a form on Bendwise can be posted from: the public address and the address the request reached. */
function allowedOrigins(request: Request): Set<string> {
  const origins = new Set([new URL(request.url).origin]);
  try {
    origins.add(new URL(serverEnv().APP_URL).origin);
  } catch {
    // APP_URL is validated at start-up; nothing to add if it is somehow unusable.
  }
  return origins;
}

/** True when a state-changing request comes from one of Bendwise's own pages. */
export function isSameOrigin(request: Request): boolean {
  if (SAFE_METHODS.has(request.method.toUpperCase())) return true;
  const fetchSite = request.headers.get("sec-fetch-site");
  if (fetchSite) return fetchSite === "same-origin";
  const origin = request.headers.get("origin");
  if (origin) return allowedOrigins(request).has(origin);
  // Neither header: not a browser we can vouch for. Browsers always send Origin on POST.
  return false;
}

/** Throws a 403 (shown by the root error page) unless the request comes from Bendwise's own pages. */
export function assertSameOrigin(request: Request): void {
  if (!isSameOrigin(request)) {
    throw new Response(CROSS_SITE_MESSAGE, { status: 403, headers: { "Content-Type": "text/plain; charset=utf-8" } });
  }
}
