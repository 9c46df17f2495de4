// E-mailed sign-in links and password resets, end to end: the page asks, the mail arrives at the
// test mail catcher (read through its REST API), the link is opened and used once.
import { randomBytes } from "node:crypto";
import { eq, sql } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { memberships, organisations, users, verificationTokens } from "~/db/schema.server";
import { getUser } from "~/lib/auth.server";
import { EMAILS_PER_PERSON_PER_HOUR } from "~/lib/auth/email-links.server";
import { hashPassword } from "~/lib/passwords.server";
import * as signIn from "~/routes/sign-in";
import * as signInLink from "~/routes/sign-in.link";
import * as resetPassword from "~/routes/reset-password";
import * as chooseNewPassword from "~/routes/reset-password.$token";
import { listCaughtMail, type CaughtMail } from "../fakes/mail-catcher";
import { appUrl, cookieHeaderFrom, get, post, runRoute } from "./auth-helpers";

const mailPort = Number(process.env.BENDWISE_MAIL_WEB_PORT);
const OLD_PASSWORD = "an old password nobody remembers";

/** A fresh teacher at the demo school, with an address no other test file writes to. */
async function newTeacher() {
  const email = `pat.${randomBytes(4).toString("hex")}@links.test.example`;
  const [user] = await db
    .insert(users)
    .values({ email, displayName: "Pat Ellery", passwordHash: await hashPassword(OLD_PASSWORD), emailVerifiedAt: new Date() })
    .returning({ id: users.id });
  const [school] = await db.select({ id: organisations.id }).from(organisations).where(eq(organisations.slug, "maplebrook"));
  await db.insert(memberships).values({ userId: user.id, organisationId: school.id, role: "teacher" });
  return { id: user.id, email };
}

async function mailsTo(address: string, count = 1): Promise<CaughtMail[]> {
  for (let i = 0; i < 50; i++) {
    const mine = (await listCaughtMail(mailPort)).filter((m) => m.to.some((t) => t.address === address));
    if (mine.length >= count) return mine;
    await new Promise((r) => setTimeout(r, 100));
  }
  return (await listCaughtMail(mailPort)).filter((m) => m.to.some((t) => t.address === address));
}

function linkIn(mail: CaughtMail, path: string): string {
  const match = new RegExp(`${appUrl.replace(/[.*+?^${}()|[\]\\]/g, "\\$&")}${path}[A-Za-z0-9_\\-?=]+`).exec(mail.text ?? "");
  if (!match) throw new Error(`no ${path} link in: ${mail.text}`);
  return match[0].replace(appUrl, "");
}

beforeAll(() => {
  if (!mailPort) throw new Error("BENDWISE_MAIL_WEB_PORT is not set: run through npm test");
});

describe("sign-in link by e-mail", () => {
  it("arrives in Bendwise's look, signs in once from its page, and never again", async () => {
    const pat = await newTeacher();
    const asked = await runRoute(signInLink.action as never, post("/sign-in/link", { intent: "send", email: pat.email.toUpperCase() }));
    expect(asked.status).toBe(200);
    expect(asked.body).toMatchObject({ sent: true });

    const [mail] = await mailsTo(pat.email);
    expect(mail.subject).toBe("Your Bendwise sign-in link");
    expect(mail.text).toMatch(/It works once, within the next 15 minutes/);
    expect(mail.html).toContain("Sign in to Bendwise");
    expect(mail.html).toContain("#0d5c57"); // the spruce button
    const link = linkIn(mail, "/sign-in/link\\?token=");
    const token = new URL(link, appUrl).searchParams.get("token")!;

    // Only a hash of the token is stored.
    const stored = await db.select().from(verificationTokens).where(eq(verificationTokens.identifier, pat.id));
    expect(stored).toHaveLength(1);
    expect(stored[0].token).not.toContain(token);
    expect(stored[0].token).toMatch(/^[0-9a-f]{64}$/);

    // Opening the link (as a mail scanner would) does not use it up.
    const page = await runRoute(signInLink.loader as never, get(link));
    expect(page.body).toMatchObject({ mode: "use", email: pat.email });
    expect((await runRoute(signInLink.loader as never, get(link))).body).toMatchObject({ mode: "use" });

    const used = await runRoute(signInLink.action as never, post("/sign-in/link", { intent: "use", token }));
    expect(used.status).toBe(302);
    expect(used.location).toBe("/teach");
    const user = await getUser(get("/teach", { cookie: cookieHeaderFrom(used.setCookies) }));
    expect(user?.email).toBe(pat.email);

    const again = await runRoute(signInLink.action as never, post("/sign-in/link", { intent: "use", token }));
    expect(again.status).toBe(400);
    expect(again.setCookies).toEqual([]);
    expect((await runRoute(signInLink.loader as never, get(link))).body).toMatchObject({ mode: "spent" });
  });

  it("stops working when it runs out", async () => {
    const pat = await newTeacher();
    await runRoute(signInLink.action as never, post("/sign-in/link", { intent: "send", email: pat.email }));
    const token = new URL(linkIn((await mailsTo(pat.email))[0], "/sign-in/link\\?token="), appUrl).searchParams.get("token")!;
    await db.update(verificationTokens).set({ expires: sql`now() - interval '1 second'` }).where(eq(verificationTokens.identifier, pat.id));
    const used = await runRoute(signInLink.action as never, post("/sign-in/link", { intent: "use", token }));
    expect(used.status).toBe(400);
    expect(used.body).toMatchObject({ problem: expect.stringMatching(/used or has run out/) });
  });

  it("answers the same for an address with no account, and sends nothing", async () => {
    const email = `nobody.${randomBytes(4).toString("hex")}@links.test.example`;
    const asked = await runRoute(signInLink.action as never, post("/sign-in/link", { intent: "send", email }));
    expect(asked.body).toMatchObject({ sent: true, email });
    await new Promise((r) => setTimeout(r, 300));
    expect((await listCaughtMail(mailPort)).filter((m) => m.to.some((t) => t.address === email))).toEqual([]);
  });

  it("keeps a mistyped address in the field with a message", async () => {
    const asked = await runRoute(signInLink.action as never, post("/sign-in/link", { intent: "send", email: "pat at school" }));
    expect(asked.status).toBe(400);
    expect(asked.body).toMatchObject({ email: "pat at school", error: expect.stringMatching(/e-mail address/) });
  });

  it(`sends at most ${EMAILS_PER_PERSON_PER_HOUR} links an hour to one person`, async () => {
    const pat = await newTeacher();
    for (let i = 0; i < EMAILS_PER_PERSON_PER_HOUR + 2; i++) {
      const asked = await runRoute(signInLink.action as never, post("/sign-in/link", { intent: "send", email: pat.email }));
      expect(asked.body).toMatchObject({ sent: true });
    }
    await new Promise((r) => setTimeout(r, 300));
    expect(await mailsTo(pat.email, EMAILS_PER_PERSON_PER_HOUR + 2)).toHaveLength(EMAILS_PER_PERSON_PER_HOUR);
  });
});

describe("password reset by e-mail", () => {
  it("sets a new password from the e-mailed link, ends older sessions and signs in", async () => {
    const pat = await newTeacher();
    const before = await runRoute(signIn.action as never, post("/sign-in", { door: "adult", email: pat.email, password: OLD_PASSWORD }));
    const oldSession = cookieHeaderFrom(before.setCookies);
    expect(await getUser(get("/teach", { cookie: oldSession }))).not.toBeNull();

    const asked = await runRoute(resetPassword.action as never, post("/reset-password", { email: pat.email }));
    expect(asked.body).toMatchObject({ sent: true });
    const [mail] = await mailsTo(pat.email);
    expect(mail.subject).toBe("Choose a new Bendwise password");
    const link = linkIn(mail, "/reset-password/");
    const token = link.split("/").at(-1)!;

    const page = await runRoute(chooseNewPassword.loader as never, get(link), { token });
    expect(page.body).toMatchObject({ valid: true, email: pat.email });

    // A too-short password is refused with the rule, and the link still works.
    const short = await runRoute(chooseNewPassword.action as never, post(link, { password: "bend" }), { token });
    expect(short.status).toBe(400);
    expect(short.body).toMatchObject({ error: expect.stringMatching(/at least 8 characters/) });

    const passphrase = "three craft sticks glued together bend far less than three loose ones";
    expect(passphrase.length).toBeGreaterThan(64);
    const saved = await runRoute(chooseNewPassword.action as never, post(link, { password: passphrase }), { token });
    expect(saved.status).toBe(302);
    expect(saved.location).toBe("/teach?notice=password-changed"); // the page says the new password is saved
    expect(await getUser(get("/teach", { cookie: cookieHeaderFrom(saved.setCookies) }))).not.toBeNull();

    // The session from before the reset has ended; the old password no longer works; the new one does.
    expect(await getUser(get("/teach", { cookie: oldSession }))).toBeNull();
    const oldTry = await runRoute(signIn.action as never, post("/sign-in", { door: "adult", email: pat.email, password: OLD_PASSWORD }));
    expect(oldTry.status).toBe(400);
    const newTry = await runRoute(signIn.action as never, post("/sign-in", { door: "adult", email: pat.email, password: passphrase }));
    expect(newTry.status).toBe(302);

    // The link is used up.
    const reused = await runRoute(chooseNewPassword.action as never, post(link, { password: "another long passphrase" }), { token });
    expect(reused.body).toMatchObject({ spent: true });
    expect((await runRoute(chooseNewPassword.loader as never, get(link), { token })).body).toMatchObject({ valid: false });
  });

  it("lifts a running sign-in wait once the mailbox owner sets a new password", async () => {
    const pat = await newTeacher();
    for (let i = 0; i < 7; i++) {
      await runRoute(signIn.action as never, post("/sign-in", { door: "adult", email: pat.email, password: "wrong" }));
    }
    await runRoute(resetPassword.action as never, post("/reset-password", { email: pat.email }));
    const link = linkIn((await mailsTo(pat.email))[0], "/reset-password/");
    const token = link.split("/").at(-1)!;
    const saved = await runRoute(chooseNewPassword.action as never, post(link, { password: "a brand new passphrase" }), { token });
    expect(saved.status).toBe(302);
    expect(saved.setCookies.some((c) => c.includes("session-token="))).toBe(true);
  });

  it("refuses a post from another site", async () => {
    const result = await runRoute(
      resetPassword.action as never,
      post("/reset-password", { email: "someone@maplebrook.example" }, { origin: "https://evil.example", fetchSite: "cross-site" }),
    );
    expect(result.status).toBe(403);
  });
});
