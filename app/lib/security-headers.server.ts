// Headers every page carries. The content-security policy allows only the app's own origin:
// no font, script, style or image from anywhere else (Bendwise ships every asset itself).
// Inline scripts that React Router writes carry a per-response nonce.
import { randomBytes } from "node:crypto";

export function newNonce(): string {
  return randomBytes(16).toString("base64");
}

export function contentSecurityPolicy(nonce: string): string {
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}'`,
    // KaTeX and React set inline style attributes; styles cannot run code.
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    // A seat order form answers with a redirect to the payment service's hosted page: the local
    // fake on loopback, or the real provider's checkout (without JavaScript the browser applies
    // form-action to that redirect too).
    "form-action 'self' http://127.0.0.1:* http://localhost:* https://checkout.stripe.com",
    "frame-ancestors 'none'",
    "base-uri 'self'",
    "object-src 'none'",
  ].join("; ");
}

export function applySecurityHeaders(headers: Headers, nonce: string) {
  headers.set("Content-Security-Policy", contentSecurityPolicy(nonce));
  headers.set("X-Content-Type-Options", "nosniff");
  headers.set("Referrer-Policy", "same-origin");
  headers.set("X-Frame-Options", "DENY");
  headers.set("Permissions-Policy", "camera=(), microphone=(), geolocation=(), interest-cohort=()");
}
