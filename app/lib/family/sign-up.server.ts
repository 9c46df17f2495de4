// A homeschooling parent joins Bendwise: they give their name, e-mail address, a name for their
// household and a password; a link goes to their inbox; opening it makes the account, the household
// (with its own sign-in code for the children) and the parent's membership, all at once.
//
// Until the link is opened nothing exists but a waiting row in family_sign_ups (the password already
// hashed). The page answers the same way whether or not the address already has an account, so it
// cannot be used to find out who uses Bendwise; an existing account gets a "you already have an
// account" e-mail instead of a second one.
import { randomBytes, randomInt } from "node:crypto";
import { and, eq, isNull, lt, sql } from "drizzle-orm";
import { z } from "zod";
import type { Database } from "~/db/client.server";
import { familySignUps, memberships, organisations, users, verificationTokens } from "~/db/schema.server";
import { consumeEmailToken, createEmailToken, EMAIL_TOKEN_MINUTES, peekEmailToken } from "~/lib/auth/email-tokens.server";
import { newPasswordSchema } from "~/lib/auth/password-rules.server";
import { renderEmail, sendMail } from "~/lib/mailer.server";
import { hashPassword } from "~/lib/passwords.server";
import { CLASS_CODE_ALPHABET } from "~/lib/teaching/classes.server";

export const SIGN_UPS_PER_ADDRESS_PER_HOUR = 5;

const name = (what: string, max: number) =>
  z
    .string()
    .transform((s) => s.trim().replace(/\s+/g, " "))
    .pipe(
      z
        .string()
        .min(1, `Enter ${what}.`)
        .max(max, `Keep ${what} under ${max} characters.`)
        .refine((s) => !/[\u0000-\u001f<>]/.test(s), `Leave out < and > in ${what}.`),
    );

export const familySignUpSchema = z
  .object({
    displayName: name("your name", 80),
    email: z
      .string()
      .trim()
      .toLowerCase()
      .pipe(z.email({ error: "Enter your e-mail address, like name@example.org." }).max(254, "That e-mail address is too long.")),
    householdName: name("a name for your family", 80),
    password: z.string(),
  })
  .superRefine((values, ctx) => {
    const problem = newPasswordSchema({ email: values.email }).safeParse(values.password);
    if (!problem.success) ctx.addIssue({ code: "custom", path: ["password"], message: problem.error.issues[0]?.message ?? "Choose another password." });
  });

export type FamilySignUp = z.infer<typeof familySignUpSchema>;

/** "HOME-" and six characters without look-alikes (the class codes' alphabet): about 2.4 × 10^8 codes, plus a username and a password. */
export function newHouseholdCode(): string {
  let code = "HOME-";
  for (let i = 0; i < 6; i++) code += CLASS_CODE_ALPHABET[randomInt(CLASS_CODE_ALPHABET.length)];
  return code;
}

async function allowAnotherSignUpMail(db: Database, email: string): Promise<boolean> {
  const rows = await db.execute<{ hits: number }>(sql`
    insert into rate_limits as r (bucket, window_start, hits)
    values (${`family-sign-up:${email}`}, date_trunc('hour', now()), 1)
    on conflict (bucket, window_start) do update set hits = r.hits + 1
    returning hits`);
  return Number(rows[0]?.hits ?? 0) <= SIGN_UPS_PER_ADDRESS_PER_HOUR;
}

export type SignUpOutcome = "sent" | "account-exists" | "too-many";

/** Step 1: keeps the waiting sign-up and queues the e-mail with the link. The page says the same for every outcome. */
export async function startFamilySignUp({ db }: { db: Database }, input: FamilySignUp, appUrl: string): Promise<SignUpOutcome> {
  const base = appUrl.replace(/\/$/, "");
  // Sign-ups whose link ran out are dropped whenever someone new signs up.
  await db.delete(familySignUps).where(lt(familySignUps.expiresAt, sql`now()`));
  await db.delete(verificationTokens).where(and(eq(verificationTokens.purpose, "verify-email"), lt(verificationTokens.expires, sql`now()`)));
  if (!(await allowAnotherSignUpMail(db, input.email))) return "too-many";

  const [existing] = await db
    .select({ id: users.id, displayName: users.displayName })
    .from(users)
    .where(and(eq(users.email, input.email), isNull(users.homeOrganisationId)));
  if (existing) {
    await sendMail({
      to: input.email,
      subject: "You already have a Bendwise account",
      ...renderEmail({
        heading: "You already have an account",
        paragraphs: [
          `Hello ${existing.displayName},`,
          "someone (we hope you) just asked to make a family account on Bendwise with this address. This address already has an account, so no second one was made.",
          "Sign in with your password, or ask for a sign-in link or a new password on the sign-in page.",
        ],
        button: { label: "Go to the sign-in page", url: `${base}/sign-in` },
        footnote: "Did not ask for this? Ignore this e-mail: nothing has changed.",
      }),
    });
    return "account-exists";
  }

  const expiresAt = new Date(Date.now() + EMAIL_TOKEN_MINUTES["verify-email"] * 60_000);
  const values = {
    email: input.email,
    displayName: input.displayName,
    householdName: input.householdName,
    passwordHash: await hashPassword(input.password),
    expiresAt,
  };
  // Asking again replaces the waiting sign-up (and its link) with the new details.
  const [row] = await db
    .insert(familySignUps)
    .values(values)
    .onConflictDoUpdate({ target: familySignUps.email, set: { ...values, createdAt: sql`now()` } })
    .returning({ id: familySignUps.id });
  const token = await createEmailToken({ db }, row.id, "verify-email");
  await sendMail({
    to: input.email,
    subject: "Confirm your address to start Bendwise",
    ...renderEmail({
      heading: "Confirm your e-mail address",
      paragraphs: [
        `Hello ${input.displayName},`,
        `thank you for starting a family account for ${input.householdName}. Open the link below to confirm that this address is yours; your account is made when you do.`,
        "Then buy a seat for each child and make their accounts: they sign in with your family's code, a username and a password, with no e-mail address of their own.",
      ],
      button: { label: "Confirm my address", url: `${base}/join/family/confirm?token=${token}` },
      footnote: `The link works once, within the next 24 hours. Did not ask for this? Ignore this e-mail: no account is made.`,
    }),
  });
  return "sent";
}

/** What the confirm page shows before the button is pressed (the link itself is not used up by opening it). */
export async function peekFamilySignUp({ db }: { db: Database }, token: string): Promise<{ email: string; householdName: string } | null> {
  const id = await peekEmailToken({ db }, token, "verify-email");
  if (!id) return null;
  const [row] = await db.select({ email: familySignUps.email, householdName: familySignUps.householdName }).from(familySignUps).where(eq(familySignUps.id, id));
  return row ?? null;
}

export type ConfirmResult =
  | { ok: true; userId: string; householdId: string; signInCode: string }
  | { ok: false; reason: "link-not-valid" | "account-exists" };

/** Step 2: uses the link up and makes the account, the household with its code, and the parent's membership, in one transaction. */
export async function confirmFamilySignUp({ db }: { db: Database }, token: string): Promise<ConfirmResult> {
  const id = await consumeEmailToken({ db }, token, "verify-email");
  if (!id) return { ok: false, reason: "link-not-valid" };
  return db.transaction(async (tx) => {
    const [pending] = await tx.delete(familySignUps).where(eq(familySignUps.id, id)).returning();
    if (!pending) return { ok: false, reason: "link-not-valid" } as const;
    const [taken] = await tx.select({ id: users.id }).from(users).where(eq(users.email, pending.email));
    if (taken) return { ok: false, reason: "account-exists" } as const;
    const [user] = await tx
      .insert(users)
      .values({ email: pending.email, displayName: pending.displayName, passwordHash: pending.passwordHash, emailVerifiedAt: new Date() })
      .returning({ id: users.id });
    let signInCode = newHouseholdCode();
    for (let attempt = 0; attempt < 5; attempt++) {
      const [clash] = await tx.select({ id: organisations.id }).from(organisations).where(eq(organisations.signInCode, signInCode));
      if (!clash) break;
      signInCode = newHouseholdCode();
    }
    const [household] = await tx
      .insert(organisations)
      .values({ kind: "household", name: pending.householdName, slug: `home-${randomBytes(6).toString("hex")}`, signInCode })
      .returning({ id: organisations.id });
    await tx.insert(memberships).values({ userId: user.id, organisationId: household.id, role: "parent" });
    return { ok: true, userId: user.id, householdId: household.id, signInCode } as const;
  });
}
