// The small rules around sign-in: where people may be sent back to, what a new password must be,
// how a wait is put into words, and which posts count as coming from Bendwise's own pages.
import { describe, expect, it } from "vitest";
import { safeRedirectTo } from "~/lib/auth/redirect-to";
import { checkNewPassword } from "~/lib/auth/password-rules.server";
import { assertSameOrigin, isSameOrigin } from "~/lib/auth/same-origin.server";
import { describeWait, THROTTLE_POLICY } from "~/lib/auth/throttle.server";

describe("redirectTo after sign-in", () => {
  it.each([
    ["/teach", "/teach"],
    ["/learn/02-force-and-deformation?step=3#readings", "/learn/02-force-and-deformation?step=3#readings"],
    ["/teach/classes/abc", "/teach/classes/abc"],
    ["/a/../school", "/school"],
  ])("keeps the same-site path %s", (value, expected) => {
    expect(safeRedirectTo(value)).toBe(expected);
  });

  it.each([
    "//evil.example/steal",
    "https://evil.example/",
    "http:evil.example",
    "/\\evil.example",
    "\\\\evil.example",
    "javascript:alert(1)",
    "/\t/evil.example",
    " /teach",
    "",
    "teach",
    "/auth/signout",
    "/sign-out",
    "/" + "a".repeat(3000),
  ])("drops %j", (value) => {
    expect(safeRedirectTo(value)).toBeNull();
  });

  it("drops anything that is not a string", () => {
    expect(safeRedirectTo(null)).toBeNull();
    expect(safeRedirectTo(["/teach"])).toBeNull();
  });
});

describe("new passwords (NIST SP 800-63B)", () => {
  it("asks for at least 8 characters, counting characters rather than bytes", () => {
    expect(checkNewPassword("bend7ab")).toBe("That password has 7 characters: use at least 8 characters.");
    expect(checkNewPassword("strip ok")).toBeNull();
    expect(checkNewPassword("ñandú🙂ok")).toBeNull(); // 8 characters, more bytes
  });

  it("welcomes long passphrases with spaces (64+ characters, up to 256)", () => {
    const passphrase = "the glued stack of three craft sticks sagged far less than the loose bundle did";
    expect(passphrase.length).toBeGreaterThan(64);
    expect(checkNewPassword(passphrase)).toBeNull();
    expect(checkNewPassword("x".repeat(10) + " y".repeat(123))).toBeNull(); // 256 characters
    expect(checkNewPassword("word ".repeat(52))).toBe("A password can be at most 256 characters long.");
  });

  it("has no composition rules: no digit, capital or symbol is required", () => {
    expect(checkNewPassword("rulerandspringscale")).toBeNull();
    expect(checkNewPassword("RULERANDSPRING")).toBeNull();
    expect(checkNewPassword("48213957260")).toBeNull();
  });

  it("refuses the passwords everyone guesses first, and the account's own name", () => {
    expect(checkNewPassword("password")).toMatch(/first anyone would guess/);
    expect(checkNewPassword("12345678")).toMatch(/first anyone would guess/);
    expect(checkNewPassword("aaaaaaaaaa")).toMatch(/first anyone would guess/);
    expect(checkNewPassword("Bendwise123")).toMatch(/first anyone would guess/);
    expect(checkNewPassword("r.oduya@maplebrook.example", { email: "r.oduya@maplebrook.example" })).toMatch(/e-mail address or username/);
    expect(checkNewPassword("amira.kk", { username: "amira.kk" })).toMatch(/e-mail address or username/);
  });
});

describe("waits in words", () => {
  it("rounds up, so nobody comes back too early", () => {
    expect(describeWait(1)).toBe("1 second");
    expect(describeWait(2)).toBe("2 seconds");
    expect(describeWait(59)).toBe("59 seconds");
    expect(describeWait(60)).toBe("1 minute");
    expect(describeWait(61)).toBe("2 minutes");
    expect(describeWait(900)).toBe("15 minutes");
  });

  it("never waits longer than 15 minutes (no permanent lock-out)", () => {
    expect(THROTTLE_POLICY.account.capSeconds).toBe(900);
    expect(THROTTLE_POLICY.address.capSeconds).toBe(900);
  });
});

describe("assertSameOrigin (CSRF check for our own form posts)", () => {
  const appUrl = process.env.APP_URL ?? "http://127.0.0.1:3000";
  const request = (method: string, headers: Record<string, string>, url = `${appUrl}/sign-in`) =>
    new Request(url, { method, headers, body: method === "POST" ? "a=1" : undefined });

  it("lets reading requests through untouched", () => {
    expect(isSameOrigin(request("GET", { "sec-fetch-site": "cross-site" }))).toBe(true);
    expect(isSameOrigin(request("HEAD", {}))).toBe(true);
  });

  it("accepts a post from our own pages", () => {
    expect(isSameOrigin(request("POST", { "sec-fetch-site": "same-origin", origin: appUrl }))).toBe(true);
    // Older browsers without Sec-Fetch-Site: the Origin header decides.
    expect(isSameOrigin(request("POST", { origin: appUrl }))).toBe(true);
    // The address the request reached counts too (e.g. localhost vs 127.0.0.1 in development).
    expect(isSameOrigin(request("POST", { origin: "http://localhost:4444" }, "http://localhost:4444/sign-in"))).toBe(true);
  });

  it("refuses a post from another site, a sibling site, or with neither header", () => {
    expect(isSameOrigin(request("POST", { "sec-fetch-site": "cross-site", origin: "https://evil.example" }))).toBe(false);
    expect(isSameOrigin(request("POST", { "sec-fetch-site": "same-site", origin: appUrl.replace("127.0.0.1", "localhost") }))).toBe(false);
    expect(isSameOrigin(request("POST", { "sec-fetch-site": "none" }))).toBe(false);
    expect(isSameOrigin(request("POST", { origin: "https://evil.example" }))).toBe(false);
    expect(isSameOrigin(request("POST", { origin: "null" }))).toBe(false);
    expect(isSameOrigin(request("POST", {}))).toBe(false);
    // Sec-Fetch-Site wins over a forged-looking Origin: a browser sets both, a page can set neither.
    expect(isSameOrigin(request("POST", { "sec-fetch-site": "cross-site", origin: appUrl }))).toBe(false);
  });

  it("throws a 403 response with a sentence saying what happened", async () => {
    let thrown: unknown;
    try {
      assertSameOrigin(request("POST", { "sec-fetch-site": "cross-site", origin: "https://evil.example" }));
    } catch (error) {
      thrown = error;
    }
    expect(thrown).toBeInstanceOf(Response);
    expect((thrown as Response).status).toBe(403);
    expect(await (thrown as Response).text()).toMatch(/sent from another website/);
    expect(() => assertSameOrigin(request("POST", { "sec-fetch-site": "same-origin" }))).not.toThrow();
  });
});
