// Teacher invitations from the school administrator: every bad field named; the e-mail (through the
// mail queue) carries a link that works once and for a week; accepting makes the teacher's account
// with the password they choose and signs them in, or adds the school to an existing account; an
// expired link does nothing, sending again makes a new link, withdrawing ends it.
import { randomBytes } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { memberships, organisations, teacherInvitations, users, verificationTokens } from "~/db/schema.server";
import * as joinTeacher from "~/routes/join.teacher";
import * as teachRoute from "~/routes/teach";
import * as teachersRoute from "~/routes/school.teachers";
import { demoSignIns } from "../../drizzle/scripts/seed";
import { get, post, runRoute, sessionCookieFor, userIdOf } from "./auth-helpers";
import { linkIn, mailsTo, sessionFrom, signInWith } from "./family-helpers";

let admin: string;
let schoolId: string;
const address = () => `teacher.${randomBytes(4).toString("hex")}@invite.test.example`;
const invite = (email: string, displayName = "Mei Tanaka") => runRoute(teachersRoute.action as never, post("/school/teachers", { intent: "invite", displayName, email }, { cookie: admin }));
const tokenOf = (link: string) => new URL(link, "http://x").searchParams.get("token")!;

beforeAll(async () => {
  admin = await sessionCookieFor("schoolAdmin");
  [{ id: schoolId }] = await db.select({ id: organisations.id }).from(organisations).where(eq(organisations.slug, "maplebrook"));
}, 60_000);

describe("inviting a teacher", () => {
  it("names bad fields, and refuses someone who already teaches here", async () => {
    const bad = await invite("not an address", " ");
    expect(bad.status).toBe(400);
    expect(Object.keys((bad.body as { fieldErrors: Record<string, string> }).fieldErrors).sort()).toEqual(["displayName", "email"]);
    const already = await invite(demoSignIns.teacher.email.toUpperCase(), "Ruth Oduya");
    expect(already.status).toBe(409);
    expect((already.body as { fieldErrors: Record<string, string> }).fieldErrors.email).toBe(`${demoSignIns.teacher.email} is already a teacher at your school.`);
  });

  it("e-mails a link that makes the account with the chosen password, signs in once, and never again", async () => {
    const email = address();
    const sent = await invite(email);
    expect(sent.status).toBe(200);
    const [mail] = await mailsTo(email);
    expect(mail.subject).toBe("Maplebrook Middle School (invented demo) invites you to teach with Bendwise");
    expect(mail.text).toContain("Dana Whitcombe invites you");
    const link = linkIn(mail, "/join/teacher?token=");

    const page = await runRoute(joinTeacher.loader as never, get(link));
    expect(page.body).toMatchObject({ mode: "accept", email, displayName: "Mei Tanaka", hasAccount: false, school: "Maplebrook Middle School (invented demo)" });

    const weak = await runRoute(joinTeacher.action as never, post("/join/teacher", { token: tokenOf(link), displayName: "Mei Tanaka", password: "short" }));
    expect(weak.status).toBe(400);
    expect((weak.body as { fieldErrors: Record<string, string> }).fieldErrors.password).toMatch(/at least 8 characters/);
    expect((await runRoute(joinTeacher.loader as never, get(link))).body).toMatchObject({ mode: "accept" });

    const accepted = await runRoute(joinTeacher.action as never, post("/join/teacher", { token: tokenOf(link), displayName: "Mei  Tanaka", password: "sixteen paper cranes" }));
    expect(accepted.status).toBe(302);
    expect(accepted.location).toBe("/teach");
    const cookie = sessionFrom(accepted.setCookies);
    expect((await runRoute(teachRoute.loader as never, get("/teach", { cookie }))).status).toBe(200);
    const [user] = await db.select().from(users).where(eq(users.email, email));
    expect(user).toMatchObject({ displayName: "Mei Tanaka" });
    expect(user.emailVerifiedAt).not.toBeNull();
    expect(await db.select({ role: memberships.role }).from(memberships).where(and(eq(memberships.userId, user.id), eq(memberships.organisationId, schoolId)))).toEqual([{ role: "teacher" }]);
    expect(await signInWith({ email, password: "sixteen paper cranes" })).toContain("authjs.session-token");

    expect((await runRoute(joinTeacher.loader as never, get(link))).body).toEqual({ mode: "spent" });
    // Opened again by the teacher who accepted it, signed in: it says so (and the page links to their
    // classes); to anyone else the link simply does not work any more.
    expect((await runRoute(joinTeacher.loader as never, get(link, { cookie }))).body).toEqual({ mode: "accepted", school: "Maplebrook Middle School (invented demo)", displayName: "Mei Tanaka" });
    expect((await runRoute(joinTeacher.loader as never, get(link, { cookie: await sessionCookieFor("teacher") }))).body).toEqual({ mode: "spent" });
    expect((await runRoute(joinTeacher.action as never, post("/join/teacher", { token: tokenOf(link), displayName: "Someone", password: "another long phrase" }))).status).toBe(400);
    const listed = await runRoute(teachersRoute.loader as never, get("/school/teachers", { cookie: admin }));
    expect((listed.body as { invitations: { email: string }[] }).invitations.map((i) => i.email)).not.toContain(email);
    expect((listed.body as { teachers: { email: string }[] }).teachers.map((t) => t.email)).toContain(email);
  });

  it("stops working after a week; sending it again gives a new link and the old one stays dead", async () => {
    const email = address();
    await invite(email, "Tomas Berg");
    const old = linkIn((await mailsTo(email))[0], "/join/teacher?token=");
    const [row] = await db.select({ id: teacherInvitations.id }).from(teacherInvitations).where(eq(teacherInvitations.email, email));
    // A week and a second later:
    const past = new Date(Date.now() - 1000);
    await db.update(teacherInvitations).set({ expiresAt: past }).where(eq(teacherInvitations.id, row.id));
    await db.update(verificationTokens).set({ expires: past }).where(eq(verificationTokens.identifier, row.id));

    expect((await runRoute(joinTeacher.loader as never, get(old))).body).toEqual({ mode: "spent" });
    const late = await runRoute(joinTeacher.action as never, post("/join/teacher", { token: tokenOf(old), displayName: "Tomas Berg", password: "a long enough phrase" }));
    expect(late.status).toBe(400);
    expect(await db.select().from(users).where(eq(users.email, email))).toEqual([]);
    const listed = await runRoute(teachersRoute.loader as never, get("/school/teachers", { cookie: admin }));
    expect((listed.body as { invitations: { email: string; expired: boolean }[] }).invitations.find((i) => i.email === email)).toMatchObject({ expired: true });

    const again = await runRoute(teachersRoute.action as never, post("/school/teachers", { intent: "resend", invitationId: row.id }, { cookie: admin }));
    expect((again.body as { done: string }).done).toMatch(/^Sent again, with a new link that works until/);
    const fresh = linkIn((await mailsTo(email, 2)).at(-1)!, "/join/teacher?token=");
    expect(fresh).not.toBe(old);
    expect((await runRoute(joinTeacher.loader as never, get(fresh))).body).toMatchObject({ mode: "accept", displayName: "Tomas Berg" });
    expect((await runRoute(joinTeacher.loader as never, get(old))).body).toEqual({ mode: "spent" });

    // Withdrawn: the new link stops too.
    const withdrawn = await runRoute(teachersRoute.action as never, post("/school/teachers", { intent: "withdraw", invitationId: row.id }, { cookie: admin }));
    expect(withdrawn.status).toBe(200);
    expect((await runRoute(joinTeacher.loader as never, get(fresh))).body).toEqual({ mode: "spent" });
  });

  it("adds the school to an existing account without asking for a new password", async () => {
    await invite(demoSignIns.parent.email, "Sam Lindqvist");
    // Other files write to this demo address too: wait for the invitation itself.
    const [mail] = await mailsTo(demoSignIns.parent.email, 1, 8000, "Maplebrook Middle School (invented demo) invites you to teach with Bendwise");
    const link = linkIn(mail, "/join/teacher?token=");
    expect((await runRoute(joinTeacher.loader as never, get(link))).body).toMatchObject({ mode: "accept", hasAccount: true });
    const accepted = await runRoute(joinTeacher.action as never, post("/join/teacher", { token: tokenOf(link) }));
    expect(accepted.status).toBe(302);
    const parentId = await userIdOf("parent");
    const roles = await db.select({ role: memberships.role }).from(memberships).where(eq(memberships.userId, parentId));
    expect(roles.map((r) => r.role).sort()).toEqual(["parent", "teacher"]);
    expect(await signInWith({ email: demoSignIns.parent.email, password: demoSignIns.parent.password })).toContain("authjs.session-token");
  });

  it("is the administrator's alone: another school's link list and actions are their own", async () => {
    const other = await sessionCookieFor("otherSchoolAdmin");
    const [mine] = await db.select({ id: teacherInvitations.id }).from(teacherInvitations).where(eq(teacherInvitations.organisationId, schoolId)).limit(1);
    const listed = await runRoute(teachersRoute.loader as never, get("/school/teachers", { cookie: other }));
    expect((listed.body as { invitations: unknown[] }).invitations).toEqual([]);
    if (mine) {
      const refused = await runRoute(teachersRoute.action as never, post("/school/teachers", { intent: "withdraw", invitationId: mine.id }, { cookie: other }));
      expect(refused.status).toBe(404);
    }
    const teacher = await sessionCookieFor("teacher");
    expect((await runRoute(teachersRoute.action as never, post("/school/teachers", { intent: "invite", displayName: "X", email: address() }, { cookie: teacher }))).status).toBe(403);
  });
});
