// A school administrator invites a teacher by e-mail. The link (a one-time token, stored hashed, see
// auth/email-tokens.server.ts) works for a week; opening it shows the school's name, and accepting
// either makes the teacher's account with the password they choose, or, when the address already has
// an account, adds the school to it. Sending the invitation again makes a new link and the old one
// stops working; withdrawing it deletes it. An accepted link keeps a receipt for a month, so its
// teacher opening it again, signed in, is told it is done and shown the way to their classes.
import { and, desc, eq, inArray, isNotNull, isNull, sql } from "drizzle-orm";
import { z } from "zod";
import type { Database } from "~/db/client.server";
import { memberships, organisations, teacherInvitations, users, verificationTokens } from "~/db/schema.server";
import { consumeEmailToken, createEmailToken, EMAIL_TOKEN_MINUTES, keepTokenReceipt, peekEmailToken } from "~/lib/auth/email-tokens.server";
import { renderEmail, sendMail } from "~/lib/mailer.server";
import { hashPassword } from "~/lib/passwords.server";
import { formatLongDate } from "~/lib/teaching/time";

type Db = { db: Database };

export const INVITATION_DAYS = EMAIL_TOKEN_MINUTES["teacher-invite"] / (24 * 60);

export const inviteSchema = z.object({
  displayName: z
    .string()
    .transform((s) => s.trim().replace(/\s+/g, " "))
    .pipe(z.string().min(1, "Enter the teacher's name.").max(80, "Keep the name under 80 characters.").refine((s) => !/[<>]/.test(s), "Leave out < and > in the name.")),
  email: z
    .string()
    .trim()
    .toLowerCase()
    .pipe(z.email({ error: "Enter the teacher's e-mail address, like name@school.org." }).max(254, "That e-mail address is too long.")),
});

export interface InvitationView {
  id: string;
  email: string;
  displayName: string;
  invitedOn: Date;
  expiresAt: Date;
  expired: boolean;
}


async function mailInvitation(db: Database, invitationId: string, appUrl: string) {
  const [row] = await db
    .select({ email: teacherInvitations.email, displayName: teacherInvitations.displayName, school: organisations.name, inviter: users.displayName })
    .from(teacherInvitations)
    .innerJoin(organisations, eq(organisations.id, teacherInvitations.organisationId))
    .leftJoin(users, eq(users.id, teacherInvitations.invitedBy))
    .where(eq(teacherInvitations.id, invitationId));
  const token = await createEmailToken({ db }, invitationId, "teacher-invite");
  const expiresAt = new Date(Date.now() + EMAIL_TOKEN_MINUTES["teacher-invite"] * 60_000);
  await db.update(teacherInvitations).set({ expiresAt }).where(eq(teacherInvitations.id, invitationId));
  await sendMail({
    to: row.email,
    subject: `${row.school} invites you to teach with Bendwise`,
    ...renderEmail({
      heading: `Join ${row.school} on Bendwise`,
      paragraphs: [
        `Hello ${row.displayName},`,
        `${row.inviter ?? "The school's administrator"} invites you to teach with Bendwise at ${row.school}: hands-on lessons on how materials stretch, bend and break, with each calculation checked and a gradebook for your classes.`,
        "Open the link to accept. If you are new to Bendwise you choose a password there; if you already have an account, the school is added to it.",
      ],
      button: { label: "Accept the invitation", url: `${appUrl.replace(/\/$/, "")}/join/teacher?token=${token}` },
      footnote: `The link works until ${formatLongDate(expiresAt)}. Not expecting this? Ignore this e-mail: nothing happens unless you accept.`,
    }),
  });
  return expiresAt;
}

export type InviteResult = { ok: true; id: string; expiresAt: Date } | { ok: false; field: "email"; message: string };

export async function inviteTeacher(
  { db }: Db,
  input: { organisationId: string; invitedBy: string; displayName: string; email: string; appUrl: string },
): Promise<InviteResult> {
  const [already] = await db
    .select({ id: users.id })
    .from(users)
    .innerJoin(memberships, and(eq(memberships.userId, users.id), eq(memberships.organisationId, input.organisationId), eq(memberships.role, "teacher")))
    .where(eq(users.email, input.email));
  if (already) return { ok: false, field: "email", message: `${input.email} is already a teacher at your school.` };
  const [waiting] = await db
    .select({ id: teacherInvitations.id })
    .from(teacherInvitations)
    .where(and(eq(teacherInvitations.organisationId, input.organisationId), eq(teacherInvitations.email, input.email), isNull(teacherInvitations.acceptedAt)));
  let id = waiting?.id;
  if (id) {
    await db.update(teacherInvitations).set({ displayName: input.displayName, invitedBy: input.invitedBy }).where(eq(teacherInvitations.id, id));
  } else {
    const [row] = await db
      .insert(teacherInvitations)
      .values({ organisationId: input.organisationId, email: input.email, displayName: input.displayName, invitedBy: input.invitedBy, expiresAt: new Date() })
      .returning({ id: teacherInvitations.id });
    id = row.id;
  }
  const expiresAt = await mailInvitation(db, id, input.appUrl);
  return { ok: true, id, expiresAt };
}

/** The invitations of these schools not yet accepted, newest first. */
export async function openInvitations({ db }: Db, organisationIds: string[], now = new Date()): Promise<(InvitationView & { organisationId: string })[]> {
  if (organisationIds.length === 0) return [];
  const rows = await db
    .select({
      id: teacherInvitations.id,
      organisationId: teacherInvitations.organisationId,
      email: teacherInvitations.email,
      displayName: teacherInvitations.displayName,
      invitedOn: teacherInvitations.createdAt,
      expiresAt: teacherInvitations.expiresAt,
    })
    .from(teacherInvitations)
    .where(and(inArray(teacherInvitations.organisationId, organisationIds), isNull(teacherInvitations.acceptedAt)))
    .orderBy(desc(teacherInvitations.createdAt));
  return rows.map((r) => ({ ...r, expired: r.expiresAt.getTime() <= now.getTime() }));
}

/** Sends an invitation of this school again, with a new link; the old link stops working. */
export async function resendInvitation({ db }: Db, organisationId: string, invitationId: string, appUrl: string): Promise<Date | null> {
  const [row] = await db
    .select({ id: teacherInvitations.id })
    .from(teacherInvitations)
    .where(and(eq(teacherInvitations.id, invitationId), eq(teacherInvitations.organisationId, organisationId), isNull(teacherInvitations.acceptedAt)));
  if (!row) return null;
  return mailInvitation(db, row.id, appUrl);
}

export async function withdrawInvitation({ db }: Db, organisationId: string, invitationId: string): Promise<boolean> {
  const gone = await db
    .delete(teacherInvitations)
    .where(and(eq(teacherInvitations.id, invitationId), eq(teacherInvitations.organisationId, organisationId), isNull(teacherInvitations.acceptedAt)))
    .returning({ id: teacherInvitations.id });
  await db.delete(verificationTokens).where(and(eq(verificationTokens.identifier, invitationId), eq(verificationTokens.purpose, "teacher-invite")));
  return gone.length > 0;
}

export interface InvitationForLink {
  id: string;
  email: string;
  displayName: string;
  schoolName: string;
  organisationId: string;
  /** An account with this address exists: accepting adds the school to it. */
  hasAccount: boolean;
}

/** What the link's page shows; null when the link is unknown, used or past its date. */
export async function invitationForToken({ db }: Db, token: string): Promise<InvitationForLink | null> {
  const id = await peekEmailToken({ db }, token, "teacher-invite");
  if (!id) return null;
  const [row] = await db
    .select({
      id: teacherInvitations.id,
      email: teacherInvitations.email,
      displayName: teacherInvitations.displayName,
      schoolName: organisations.name,
      organisationId: teacherInvitations.organisationId,
      expiresAt: teacherInvitations.expiresAt,
      acceptedAt: teacherInvitations.acceptedAt,
    })
    .from(teacherInvitations)
    .innerJoin(organisations, eq(organisations.id, teacherInvitations.organisationId))
    .where(eq(teacherInvitations.id, id));
  if (!row || row.acceptedAt || row.expiresAt.getTime() <= Date.now()) return null;
  const [account] = await db.select({ id: users.id }).from(users).where(and(eq(users.email, row.email), isNull(users.homeOrganisationId)));
  return { id: row.id, email: row.email, displayName: row.displayName, schoolName: row.schoolName, organisationId: row.organisationId, hasAccount: Boolean(account) };
}

export type AcceptResult =
  | { ok: true; userId: string; email: string; created: boolean; schoolName: string }
  | { ok: false; reason: "link-not-valid" | "password-needed" };

/**
 * Uses the link up and makes the person a teacher of the school: a new account with this password
 * (already checked by the caller) when the address has none, else the existing account.
 */
export async function acceptInvitation({ db }: Db, token: string, newAccount: { displayName: string; password: string } | null): Promise<AcceptResult> {
  const before = await invitationForToken({ db }, token);
  if (!before) return { ok: false, reason: "link-not-valid" };
  // A new account needs its password; the link is not used up until it has one.
  if (!before.hasAccount && !newAccount) return { ok: false, reason: "password-needed" };
  const passwordHash = newAccount ? await hashPassword(newAccount.password) : null;
  const id = await consumeEmailToken({ db }, token, "teacher-invite");
  if (!id) return { ok: false, reason: "link-not-valid" };
  const result = await db.transaction(async (tx) => {
    const [invitation] = await tx
      .update(teacherInvitations)
      .set({ acceptedAt: new Date() })
      .where(and(eq(teacherInvitations.id, id), isNull(teacherInvitations.acceptedAt), sql`${teacherInvitations.expiresAt} > now()`))
      .returning();
    if (!invitation) return { ok: false, reason: "link-not-valid" } as const;
    const [school] = await tx.select({ name: organisations.name }).from(organisations).where(eq(organisations.id, invitation.organisationId));
    let [user] = await tx.select({ id: users.id }).from(users).where(and(eq(users.email, invitation.email), isNull(users.homeOrganisationId)));
    let created = false;
    if (!user) {
      // The address lost its account between the check and now: undo, so nothing half-done is kept.
      if (!passwordHash || !newAccount) throw new Error("the invited address has no account and no password was given");
      [user] = await tx
        .insert(users)
        .values({ email: invitation.email, displayName: newAccount.displayName, passwordHash, emailVerifiedAt: new Date() })
        .returning({ id: users.id });
      created = true;
    } else {
      // Opening the link proves the mailbox, as a sign-in link does.
      await tx.update(users).set({ emailVerifiedAt: sql`coalesce(${users.emailVerifiedAt}, now())` }).where(eq(users.id, user.id));
    }
    await tx.insert(memberships).values({ userId: user.id, organisationId: invitation.organisationId, role: "teacher" }).onConflictDoNothing();
    await tx.update(teacherInvitations).set({ acceptedBy: user.id }).where(eq(teacherInvitations.id, invitation.id));
    return { ok: true, userId: user.id, email: invitation.email, created, schoolName: school.name } as const;
  });
  // The used link keeps a receipt, so opening it again can tell the teacher who accepted it so.
  if (result.ok) await keepTokenReceipt({ db }, token, id, "teacher-invite-accepted");
  return result;
}

/**
 * The invitation a used-up link belonged to, when it was accepted (within a month): who accepted it
 * and at which school. The link's page tells that teacher, signed in, that it is done.
 */
export async function acceptedInvitationForToken({ db }: Db, token: string): Promise<{ acceptedBy: string | null; schoolName: string } | null> {
  const id = await peekEmailToken({ db }, token, "teacher-invite-accepted");
  if (!id) return null;
  const [row] = await db
    .select({ acceptedBy: teacherInvitations.acceptedBy, schoolName: organisations.name })
    .from(teacherInvitations)
    .innerJoin(organisations, eq(organisations.id, teacherInvitations.organisationId))
    .where(and(eq(teacherInvitations.id, id), isNotNull(teacherInvitations.acceptedAt)));
  return row ?? null;
}
