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

export const UNREADABLE_FORM_MESSAGE =
  "This form arrived in a shape Bendwise cannot read, so nothing was done. Reload the page and send it again.";

const guarded = new WeakSet<Request>();

/**
 * A body that is not a form (another content type, a multipart body cut short or with the wrong
 * boundary) makes `request.formData()` throw a TypeError, which would be a 500. Every action calls
 * assertSameOrigin first, so it also wraps this request's formData(): an unreadable form becomes a 400
 * with a plain sentence, thrown like the 403 above. Nothing else about the request changes.
 */
function answerUnreadableFormsWith400(request: Request) {
  if (guarded.has(request)) return;
  guarded.add(request);
  const read = request.formData.bind(request);
  Object.defineProperty(request, "formData", {
    configurable: true,
    value: async () => {
      try {
        return await read();
      } catch (error) {
        if (error instanceof TypeError) {
          throw new Response(UNREADABLE_FORM_MESSAGE, { status: 400, headers: { "Content-Type": "text/plain; charset=utf-8" } });
        }
        throw error;
      }
    },
  });
}

/** Throws a 403 (shown by the root error page) unless the request comes from Bendwise's own pages. */
export function assertSameOrigin(request: Request): void {
  if (!isSameOrigin(request)) {
    throw new Response(CROSS_SITE_MESSAGE, { status: 403, headers: { "Content-Type": "text/plain; charset=utf-8" } });
  }
  if (!SAFE_METHODS.has(request.method.toUpperCase())) answerUnreadableFormsWith400(request);
}
