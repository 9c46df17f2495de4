// React Router's server entry, as the framework ships it, plus Bendwise's security headers
// and a nonce for the inline scripts that hydration needs.
import { Writable } from "node:stream";
import type { EntryContext } from "react-router";
import { ServerRouter } from "react-router";
import { renderToPipeableStream } from "react-dom/server";
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
  if (responseStatusCode === 503) responseHeaders.set("Retry-After", "5");

  if (request.method.toUpperCase() === "HEAD") {
    return new Response(null, { status: responseStatusCode, headers: responseHeaders });
  }

  // The whole page is rendered, then sent in one piece with its length. No Bendwise page streams a
  // part later (no Suspense, no deferred data), so streaming would only cut the page into many small
  // writes, and the compression the server puts in front of it (brotli or gzip) pays per write.
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
              const html = Buffer.concat(chunks);
              responseHeaders.set("Content-Type", "text/html; charset=utf-8");
              responseHeaders.set("Content-Length", String(html.length));
              resolve(new Response(html, { headers: responseHeaders, status: responseStatusCode }));
              callback();
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

// The mail worker runs from this same server build (drizzle/scripts/mail-worker.ts imports the build
// and finds these on its entry module), so it uses exactly the app's compiled code and lessons.
// React Router does nothing with extra exports of the server entry.
export { closeMailConnections, startMailWorker, weeklySummariesNow } from "~/lib/mail/worker.server";
