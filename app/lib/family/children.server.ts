// A parent makes an account for a child: a display name, a username, a password and a grade band —
// nothing else (no e-mail address, no birth date). The child takes one of the household's seats for
// the current school year through the seat rules; with no free seat no account is made.
import { z } from "zod";
import type { Database } from "~/db/client.server";
import { newPasswordSchema } from "~/lib/auth/password-rules.server";
import { hashPassword } from "~/lib/passwords.server";
import { schoolYearOf } from "~/lib/school-year";
import { createChildUsingSeat, type SeatLedgerRow } from "~/lib/seats.server";
import { displayNameProblem, usernameProblem } from "~/lib/teaching/roster.server";
import { joinFamilyClass } from "./household.server";

export const newChildSchema = z
  .object({
    displayName: z.string().transform((s) => s.trim().replace(/\s+/g, " ")),
    username: z.string().transform((s) => s.trim().toLowerCase()),
    password: z.string(),
    // A plain string here, checked below, so a missing grade band does not hide the other fields' messages.
    gradeBand: z.string(),
  })
  .superRefine((v, ctx) => {
    if (v.gradeBand !== "6-8" && v.gradeBand !== "9-10") ctx.addIssue({ code: "custom", path: ["gradeBand"], message: "Choose the grade band: 6–8 or 9–10." });
    const nameProblem = displayNameProblem(v.displayName);
    if (nameProblem) ctx.addIssue({ code: "custom", path: ["displayName"], message: nameProblem.replace("The display name is missing.", "Enter the name your child goes by, e.g. a first name.") });
    const userProblem = usernameProblem(v.username);
    if (userProblem) ctx.addIssue({ code: "custom", path: ["username"], message: userProblem.replace("The username is missing.", "Choose a username for signing in, e.g. juno or juno.s.") });
    const passwordCheck = newPasswordSchema({ username: v.username }).safeParse(v.password);
    if (!passwordCheck.success) ctx.addIssue({ code: "custom", path: ["password"], message: passwordCheck.error.issues[0]?.message ?? "Choose another password." });
  })
  // Everything was checked above; this only gives the result its exact type.
  .pipe(z.object({ displayName: z.string(), username: z.string(), password: z.string(), gradeBand: z.enum(["6-8", "9-10"]) }));

export type NewChild = z.infer<typeof newChildSchema>;

export type AddChildResult =
  | { ok: true; child: { id: string; displayName: string; username: string }; ledger: SeatLedgerRow }
  | { ok: false; field: "username"; message: string }
  | { ok: false; field: "seat"; message: string; schoolYear: string };

export async function addChild({ db }: { db: Database }, householdId: string, input: NewChild, schoolYear = schoolYearOf()): Promise<AddChildResult> {
  const passwordHash = await hashPassword(input.password);
  const made = await createChildUsingSeat({ db }, { householdId, schoolYear, displayName: input.displayName, username: input.username, gradeBand: input.gradeBand, passwordHash });
  if (!made.ok) {
    if (made.reason === "no-free-seat") {
      const message =
        made.ledger.bought === 0
          ? `Your family has no seats for ${made.ledger.schoolYear} yet, so no child account can be made. Buy a seat for each child first.`
          : `${made.ledger.bought === 1 ? "Your family's 1 seat" : `All ${made.ledger.bought} of your family's seats`} for ${made.ledger.schoolYear} ${made.ledger.bought === 1 ? "is" : "are"} in use, so no more child accounts can be made. Buy another seat first.`;
      return { ok: false, field: "seat", message, schoolYear: made.ledger.schoolYear };
    }
    if (made.reason === "username-taken") return { ok: false, field: "username", message: `The username “${input.username}” is already used in your family. Choose another.` };
    throw new Error(made.message);
  }
  await joinFamilyClass({ db }, householdId, made.child.id);
  return { ok: true, child: { id: made.child.id, displayName: made.child.displayName, username: made.child.username }, ledger: made.ledger };
}
