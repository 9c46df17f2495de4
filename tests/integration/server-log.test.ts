// What the server logs when a request fails (app/entry.server.tsx, handleError): a page that does not
// exist is an everyday 404, not logged with a stack trace; a real fault is logged.
import { UNSAFE_ErrorResponseImpl as ErrorResponse } from "react-router";
import { afterEach, describe, expect, it, vi } from "vitest";
import { handleError } from "~/entry.server";

const args = (signal?: AbortSignal) => ({ request: new Request("http://127.0.0.1/nowhere", { signal }), params: {}, context: {} }) as never;

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
});
