// The one-line notice a page shows when an action sent the visitor there with `?notice=…`.
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { MemoryRouter } from "react-router";
import { describe, expect, it } from "vitest";
import { LandingNotice } from "~/components/site-chrome";

const at = (url: string) => renderToStaticMarkup(createElement(MemoryRouter, { initialEntries: [url] }, createElement(LandingNotice)));

describe("the landing notice", () => {
  it("says the new password is saved after a reset, and that other sign-ins ended", () => {
    expect(at("/family?notice=password-changed")).toMatch(/role="status".*new password is saved.*signed out/);
  });
  it("says nothing for an unknown notice or none", () => {
    expect(at("/family?notice=%3Cscript%3E")).toBe("");
    expect(at("/family")).toBe("");
  });
});
