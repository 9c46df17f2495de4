// What the server logs when a request fails (app/entry.server.tsx, handleError): a page that does not
// exist is an everyday 404, not logged with a stack trace; a real fault is logged.
import { UNSAFE_ErrorResponseImpl as ErrorResponse } from "react-router";
import { afterEach, describe, expect, it, vi } from "vitest";
import { handleDataRequest, handleError, statusAfterFailures } from "~/entry.server";

const args = (signal?: AbortSignal, request = new Request("http://127.0.0.1/nowhere", { signal })) => ({ request, params: {}, context: {} }) as never;

describe("the server log", () => {
  afterEach(() => vi.restoreAllMocks());

  it("leaves out a page that does not exist and a request the browser gave up on", () => {
    const log = vi.spyOn(console, "error").mockImplementation(() => {});
    handleError(new ErrorResponse(404, "Not Found", new Error('No route matches URL "/nowhere"'), true), args());
    const aborted = new AbortController();
    aborted.abort();
    handleError(new Error("the browser went away"), args(aborted.signal));
    expect(log).not.toHaveBeenCalled();
  });

  it("logs a real fault, and a refusal other than 404", () => {
    const log = vi.spyOn(console, "error").mockImplementation(() => {});
    const fault = new Error("something broke");
    handleError(fault, args());
    handleError(new ErrorResponse(500, "Internal Server Error", "boom"), args());
    expect(log).toHaveBeenCalledTimes(2);
    expect(log).toHaveBeenCalledWith(fault);
  });

  it("answers 503 instead of 500 when PostgreSQL went away in the middle of the request, and logs one line for it", () => {
    const log = vi.spyOn(console, "error").mockImplementation(() => {});
    const during = new Request("http://127.0.0.1/teach/classes");
    // As drizzle hands it on: its own error, with the outage as the cause (see client.server.ts).
    const outage = new Error("Failed query", { cause: new Response(null, { status: 503, headers: { "Retry-After": "5" } }) });
    handleError(outage, args(undefined, during));
    expect(statusAfterFailures(during, 500)).toBe(503);
    expect(log).toHaveBeenCalledWith("GET /teach/classes: PostgreSQL could not be reached.");
    // Another request, or another failure, keeps its status.
    const other = new Request("http://127.0.0.1/teach/classes");
    handleError(new Error("something broke"), args(undefined, other));
    expect(statusAfterFailures(other, 500)).toBe(500);
    expect(statusAfterFailures(during, 200)).toBe(200);
  });

  it("answers a data request (a client navigation, a fetcher) 503 with Retry-After in the same case", async () => {
    vi.spyOn(console, "error").mockImplementation(() => {});
    const during = new Request("http://127.0.0.1/teach/classes.data");
    handleError(new Error("Failed query", { cause: new Response(null, { status: 503, headers: { "Retry-After": "5" } }) }), args(undefined, during));
    const sent = await handleDataRequest(new Response('[{"_1":2}]', { status: 500 }), args(undefined, during));
    expect(sent.status).toBe(503);
    expect(sent.headers.get("Retry-After")).toBe("5");
    expect(await sent.text()).toBe('[{"_1":2}]');
    // Any other data answer keeps its status and its body.
    const other = await handleDataRequest(new Response('[{"_1":3}]', { status: 500 }), args());
    expect([other.status, await other.text()]).toEqual([500, '[{"_1":3}]']);
  });
});
