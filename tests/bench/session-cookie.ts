// Session cookies for the benchmark's invented people, made the way Auth.js makes them after a
// sign-in (the same JWT, encrypted with AUTH_SECRET under the cookie's name), so 1,500 students can
// be "signed in" without 1,500 password hashes. The app reads them like any other session.
import { encode } from "@auth/core/jwt";

export const SESSION_COOKIE = "authjs.session-token";

export async function mintSessionCookie(secret: string, userId: string, options: { hours?: number; sessionVersion?: number } = {}): Promise<string> {
  const hours = options.hours ?? 8;
  const token = await encode({
    token: { sub: userId, sv: options.sessionVersion ?? 1, until: Date.now() + hours * 3600_000 },
    secret,
    salt: SESSION_COOKIE,
    maxAge: hours * 3600,
  });
  return `${SESSION_COOKIE}=${token}`;
}
