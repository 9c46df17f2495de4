// A homeschooling parent signs up: every bad field named at once and nothing saved; the address check
// arrives in the mail catcher (through the mail queue and the in-process worker); opening the link uses
// nothing up; confirming makes the account, the household with its own HOME- code and the parent's
// membership, signs the parent in and opens /family; the link works once and runs out after a day;
// an address that already has an account gets the same page and a different e-mail.
import { randomBytes } from "node:crypto";
import { and, eq, sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { familySignUps, memberships, organisations, users, verificationTokens } from "~/db/schema.server";
import * as confirmRoute from "~/routes/join.family.confirm";
import * as familyRoute from "~/routes/family";
import * as joinRoute from "~/routes/join.family";
import { demoSignIns } from "../../drizzle/scripts/seed";
import { get, post, runRoute } from "./auth-helpers";
import { linkIn, mailsTo, sessionFrom, signInWith } from "./family-helpers";

const PASSWORD = "copper kettle on the stove";
const address = () => `robin.${randomBytes(4).toString("hex")}@family.test.example`;
const form = (email: string, over: Record<string, string> = {}) => ({ displayName: "Robin Achterberg", email, householdName: "The Achterberg family", password: PASSWORD, ...over });

describe("family sign-up", () => {
  it("names every bad field at once, keeps what was typed and saves nothing", async () => {
    const email = address();
    const result = await runRoute(joinRoute.action as never, post("/join/family", { displayName: "  ", email: "not-an-address", householdName: "<b>", password: "short" }));
    expect(result.status).toBe(400);
    const body = result.body as { values: Record<string, string>; fieldErrors: Record<string, string> };
    expect(Object.keys(body.fieldErrors).sort()).toEqual(["displayName", "email", "householdName", "password"]);
    expect(body.fieldErrors.email).toMatch(/Enter your e-mail address/);
    expect(body.fieldErrors.password).toMatch(/at least 8 characters/);
    expect(body.values.email).toBe("not-an-address");
    expect(JSON.stringify(body)).not.toContain("short");

    const common = await runRoute(joinRoute.action as never, post("/join/family", form(email, { password: "password123" })));
    expect((common.body as { fieldErrors: Record<string, string> }).fieldErrors.password).toMatch(/first anyone would guess/);
    expect(await db.select().from(familySignUps).where(eq(familySignUps.email, email))).toEqual([]);
  });

  it("e-mails a link; confirming it makes the account, the household with its code and the membership, and signs the parent in", async () => {
    const email = address();
    const asked = await runRoute(joinRoute.action as never, post("/join/family", form(email.toUpperCase())));
    expect(asked.status).toBe(200);
    expect(asked.body).toEqual({ sentTo: email });

    // Nothing but the waiting row exists yet; the password is stored hashed only.
    const [waiting] = await db.select().from(familySignUps).where(eq(familySignUps.email, email));
    expect(waiting.passwordHash).toMatch(/^\$argon2/);
    expect(await db.select().from(users).where(eq(users.email, email))).toEqual([]);
    expect(await signInWith({ email, password: PASSWORD })).toBeNull();

    const [mail] = await mailsTo(email);
    expect(mail.subject).toBe("Confirm your address to start Bendwise");
    expect(mail.html).toContain("#0d5c57");
    expect(mail.text).toContain("The Achterberg family");
    const link = linkIn(mail, "/join/family/confirm?token=");
    const token = new URL(link, "http://x").searchParams.get("token")!;

    // Opening the link (as a mail scanner would) uses nothing up.
    for (let i = 0; i < 2; i++) {
      const page = await runRoute(confirmRoute.loader as never, get(link));
      expect(page.body).toMatchObject({ mode: "confirm", email, householdName: "The Achterberg family" });
    }

    const confirmed = await runRoute(confirmRoute.action as never, post("/join/family/confirm", { token }));
    expect(confirmed.status).toBe(302);
    expect(confirmed.location).toBe("/family?welcome=1");
    const cookie = sessionFrom(confirmed.setCookies);
    expect(cookie).toContain("authjs.session-token");

    const [user] = await db.select().from(users).where(eq(users.email, email));
    expect(user.emailVerifiedAt).not.toBeNull();
    expect(user.homeOrganisationId).toBeNull();
    const [membership] = await db
      .select({ role: memberships.role, kind: organisations.kind, name: organisations.name, code: organisations.signInCode })
      .from(memberships)
      .innerJoin(organisations, eq(organisations.id, memberships.organisationId))
      .where(eq(memberships.userId, user.id));
    expect(membership).toMatchObject({ role: "parent", kind: "household", name: "The Achterberg family" });
    expect(membership.code).toMatch(/^HOME-[ACDEFGHJKMNPQRTUVWXY34679]{6}$/);
    expect(await db.select().from(familySignUps).where(eq(familySignUps.email, email))).toEqual([]);

    const home = await runRoute(familyRoute.loader as never, get("/family?welcome=1", { cookie }));
    expect(home.status).toBe(200);
    expect(home.body).toMatchObject({ welcome: true, households: [{ name: "The Achterberg family", signInCode: membership.code, children: [] }] });

    // The account is active: the password chosen at sign-up signs in.
    expect(await signInWith({ email, password: PASSWORD })).toContain("authjs.session-token");

    // The link worked once.
    expect((await runRoute(confirmRoute.loader as never, get(link))).body).toEqual({ mode: "spent" });
    const again = await runRoute(confirmRoute.action as never, post("/join/family/confirm", { token }));
    expect(again.status).toBe(400);
    expect(await db.select({ n: sql<number>`count(*)::int` }).from(users).where(eq(users.email, email))).toEqual([{ n: 1 }]);
  });

  it("answers an address that already has an account the same way, and e-mails that person instead", async () => {
    const existing = demoSignIns.teacher.email;
    const asked = await runRoute(joinRoute.action as never, post("/join/family", form(existing)));
    expect(asked.body).toEqual({ sentTo: existing });
    const [mail] = await mailsTo(existing, 1, 8000, "You already have a Bendwise account");
    expect(mail).toBeDefined();
    expect(mail.text).not.toContain("/join/family/confirm");
    expect(await db.select().from(familySignUps).where(eq(familySignUps.email, existing))).toEqual([]);
  });

  it("asking again replaces the waiting sign-up and its link; a link past its day does not work", async () => {
    const email = address();
    await runRoute(joinRoute.action as never, post("/join/family", form(email)));
    const first = linkIn((await mailsTo(email, 1))[0], "/join/family/confirm?token=");
    await runRoute(joinRoute.action as never, post("/join/family", form(email, { householdName: "The Achterberg-Lund family" })));
    const mails = await mailsTo(email, 2);
    const second = linkIn(mails.find((m) => m.text?.includes("Achterberg-Lund"))!, "/join/family/confirm?token=");
    expect((await runRoute(confirmRoute.loader as never, get(first))).body).toEqual({ mode: "spent" });
    expect((await runRoute(confirmRoute.loader as never, get(second))).body).toMatchObject({ mode: "confirm", householdName: "The Achterberg-Lund family" });

    // A day later the link has run out.
    const [row] = await db.select({ id: familySignUps.id }).from(familySignUps).where(eq(familySignUps.email, email));
    await db.update(verificationTokens).set({ expires: new Date(Date.now() - 1000) }).where(and(eq(verificationTokens.identifier, row.id), eq(verificationTokens.purpose, "verify-email")));
    expect((await runRoute(confirmRoute.loader as never, get(second))).body).toEqual({ mode: "spent" });
    const late = await runRoute(confirmRoute.action as never, post("/join/family/confirm", { token: new URL(second, "http://x").searchParams.get("token")! }));
    expect(late.status).toBe(400);
    expect(await db.select().from(users).where(eq(users.email, email))).toEqual([]);
  });
});
