// The rules for a new password, after NIST SP 800-63B §3.1.1.2 (rev. 4 §5.1.1.2): at least 8
// characters, long passphrases (spaces and any script) welcome up to 256, no "must contain a digit and
// a symbol" rules, no forced changes — but a password everyone guesses first is refused.
import { z } from "zod";
import { MAX_PASSWORD_LENGTH, MIN_PASSWORD_LENGTH } from "~/lib/passwords.server";

// The guesses at the top of every published list of leaked passwords, plus our own name.
const COMMON = new Set([
  "password", "password1", "password12", "password123", "passw0rd", "12345678", "123456789", "1234567890",
  "87654321", "11111111", "00000000", "qwertyui", "qwerty123", "qwertyuiop", "1q2w3e4r", "1qaz2wsx",
  "abcd1234", "abc12345", "iloveyou", "sunshine", "princess", "football", "baseball", "welcome1",
  "letmein1", "trustno1", "superman", "starwars", "whatever", "computer", "asdfghjk", "zaq12wsx",
  "bendwise", "bendwise1", "bendwise123", "changeme", "school123", "student1", "teacher1",
]);

const characters = (s: string) => [...s.normalize("NFKC")].length;

/** Parses a new password; the messages are shown as they are beside the field. */
export function newPasswordSchema(context: { email?: string | null; username?: string | null } = {}) {
  return z
    .string({ error: "Choose a password." })
    // Says what was wrong (the field's hint already says the rule and how to make a good one).
    .refine((p) => characters(p) >= MIN_PASSWORD_LENGTH, {
      error: (issue) => {
        const length = typeof issue.input === "string" ? characters(issue.input) : 0;
        return `That password has ${length} ${length === 1 ? "character" : "characters"}: use at least ${MIN_PASSWORD_LENGTH} characters.`;
      },
    })
    .refine((p) => characters(p) <= MAX_PASSWORD_LENGTH, {
      message: `A password can be at most ${MAX_PASSWORD_LENGTH} characters long.`,
    })
    .refine((p) => !COMMON.has(p.normalize("NFKC").toLowerCase()) && !/^(.)\1+$/u.test(p), {
      message: "That password is one of the first anyone would guess. Pick something less common.",
    })
    .refine(
      (p) => {
        const lower = p.normalize("NFKC").toLowerCase();
        const email = context.email?.toLowerCase();
        const username = context.username?.toLowerCase();
        return lower !== email && lower !== email?.split("@")[0] && lower !== username;
      },
      { message: "Don't use your e-mail address or username as your password." },
    );
}

/** The message for a new password, or null when it is fine. */
export function checkNewPassword(password: string, context: { email?: string | null; username?: string | null } = {}): string | null {
  const result = newPasswordSchema(context).safeParse(password);
  return result.success ? null : (result.error.issues[0]?.message ?? "Choose another password.");
}
