// Password hashing (Argon2id, OWASP's recommended parameters) and the NIST SP 800-63B rules we follow:
// a minimum length, a generous maximum, no composition rules, no forced changes.
import { hash, verify } from "@node-rs/argon2";

export const MIN_PASSWORD_LENGTH = 8; // SP 800-63B §5.1.1.2: at least 8 characters when chosen by the user.
export const MAX_PASSWORD_LENGTH = 256; // SP 800-63B: verifiers should permit at least 64.

export function hashPassword(password: string): Promise<string> {
  return hash(password.normalize("NFKC"));
}

export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
  try {
    return await verify(passwordHash, password.normalize("NFKC"));
  } catch {
    return false;
  }
}
