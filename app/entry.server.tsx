// React Router's server entry, as the framework ships it, plus Bendwise's security headers
// and a nonce for the inline scripts that hydration needs.
import { Writable } from "node:stream";
import type { EntryContext, HandleDataRequestFunction, HandleErrorFunction } from "react-router";
import { isRouteErrorResponse, ServerRouter } from "react-router";
import { renderToPipeableStream } from "react-dom/server";
import { isDatabaseUnavailable } from "~/db/client.server";
import { bestEncoding, encodeBody, encodingHeaders } from "~/lib/http-encoding.server";
import { NonceContext } from "~/lib/nonce";
import { applySecurityHeaders, newNonce } from "~/lib/security-headers.server";

export const streamTimeout = 5_000;

export default function handleRequest(
  request: Request,
  responseStatusCode: number,
  responseHeaders: Headers,
  routerContext: EntryContext,
) {
  const nonce = newNonce();
  applySecurityHeaders(responseHeaders, nonce);
  // A 503 (the database cannot be reached just now: see client.server.ts) says when to try again.
  responseStatusCode = outageStatus(request, responseStatusCode, responseHeaders);

  if (request.method.toUpperCase() === "HEAD") {
    return new Response(null, { status: responseStatusCode, headers: responseHeaders });
  }

  // The whole page is rendered, compressed and sent in one piece with its length. No Bendwise page
  // streams a part later (no Suspense, no deferred data), so streaming would only cut the page into
  // many small writes, and the compression the server puts in front of it (brotli or gzip) pays per write.
  return new Promise((resolve, reject) => {
    let timeoutId: ReturnType<typeof setTimeout> | undefined = setTimeout(() => abort(), streamTimeout + 1000);
    const { pipe, abort } = renderToPipeableStream(
      <NonceContext.Provider value={nonce}>
        <ServerRouter context={routerContext} url={request.url} nonce={nonce} />
      </NonceContext.Provider>,
      {
        nonce,
        onAllReady() {
          const chunks: Buffer[] = [];
          const body = new Writable({
            write(chunk, _encoding, callback) {
              chunks.push(Buffer.isBuffer(chunk) ? chunk : Buffer.from(chunk));
              callback();
            },
            final(callback) {
              clearTimeout(timeoutId);
              timeoutId = undefined;
              // Compressed here, whole, in one call (see http-encoding.server.ts).
              const encoding = bestEncoding(request.headers.get("accept-encoding"));
              encodeBody(Buffer.concat(chunks), encoding, "per-request").then(
                (body) => {
                  responseHeaders.set("Content-Type", "text/html; charset=utf-8");
                  encodingHeaders(responseHeaders, encoding, body.length);
                  resolve(new Response(body, { headers: responseHeaders, status: responseStatusCode }));
                  callback();
                },
                (error: Error) => {
                  reject(error);
                  callback(error);
                },
              );
            },
          });
          pipe(body);
        },
        onShellError(error: unknown) {
          reject(error);
        },
        onError(error: unknown) {
          responseStatusCode = 500;
          console.error(error);
        },
      },
    );
  });
}

/**
 * What goes to the server's log when a loader, an action or a render fails. A page that does not exist
 * (a mistyped address, a bot probing) is an everyday 404 shown to the visitor, not a fault of the
 * server: it is not logged with a stack trace. A request the browser gave up on is not logged either.
 * Everything else is logged as React Router would.
 */
export const handleError: HandleErrorFunction = (error, { request }) => {
  if (request.signal.aborted) return;
  if (isRouteErrorResponse(error) && error.status === 404) return;
  if (isDatabaseUnavailable(error)) {
    // PostgreSQL went away in the middle of this request (after the person was read): a passing
    // outage, answered 503 like the rest (statusAfterFailures), and logged as one line.
    outageDuring.add(request);
    console.error(`${request.method} ${new URL(request.url).pathname}: PostgreSQL could not be reached.`);
    return;
  }
  console.error(error);
};

/** Requests that failed because PostgreSQL could not be reached (see handleError). */
const outageDuring = new WeakSet<Request>();

/**
 * The status a page goes out with: a 500 whose cause was PostgreSQL being unreachable becomes the
 * same 503 (with Retry-After) that the app answers when the database is away from the start.
 */
export function statusAfterFailures(request: Request, status: number): number {
  return status === 500 && outageDuring.has(request) ? 503 : status;
}

/** statusAfterFailures, with the Retry-After that every 503 of the app carries set on `headers`. */
function outageStatus(request: Request, status: number, headers: Headers): number {
  const sent = statusAfterFailures(request, status);
  if (sent === 503) headers.set("Retry-After", "5");
  return sent;
}

/**
 * React Router's data requests (the `.data` answers to fetchers, revalidations and actions) are
 * compressed the same way as pages: whole, in one call. They never stream a part later either.
 * Small answers (an answer check's feedback) go as they are, as the server's compression would send them.
 */
export const handleDataRequest: HandleDataRequestFunction = async (response, { request }) => {
  // A loader or action that met PostgreSQL gone mid-request answers 503 here too (see handleError).
  const headers = new Headers(response.headers);
  const status = outageStatus(request, response.status, headers);
  const statusText = status === response.status ? response.statusText : "";
  if (!response.body || response.headers.has("Content-Encoding")) {
    return status === response.status ? response : new Response(response.body, { status, statusText, headers });
  }
  const bytes = Buffer.from(await response.arrayBuffer());
  const encoding = bytes.length < 1024 ? "identity" : bestEncoding(request.headers.get("accept-encoding"));
  const body = await encodeBody(bytes, encoding, "per-request");
  encodingHeaders(headers, encoding, body.length);
  return new Response(body, { status, statusText, headers });
};

// The mail worker runs from this same server build (drizzle/scripts/mail-worker.ts imports the build
// and finds these on its entry module), so it uses exactly the app's compiled code and lessons.
// React Router does nothing with extra exports of the server entry.
export { closeMailConnections, startMailWorker, weeklySummariesNow } from "~/lib/mail/worker.server";
