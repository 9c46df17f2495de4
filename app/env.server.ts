// Environment, parsed once with zod so a missing setting fails fast with a readable list.
import { z } from "zod";

const envSchema = z.object({
  DATABASE_URL: z.string().url(),
  /** Signs session cookies; at least 32 characters. */
  AUTH_SECRET: z.string().min(32, "AUTH_SECRET must be at least 32 characters"),
  /** The address people reach the app at; used in e-mailed links and payment return addresses. */
  APP_URL: z.string().url().default("http://localhost:3000"),
  SMTP_URL: z.string().default("smtp://127.0.0.1:1025"),
  MAIL_FROM: z.string().default("Bendwise <hello@bendwise.example>"),
  /** Where the payment provider's API answers; our local fake by default. */
  PAYMENTS_API_URL: z.string().url().default("http://127.0.0.1:12111"),
  PAYMENTS_SECRET_KEY: z.string().default("sk_test_bendwise_local"),
  PAYMENTS_WEBHOOK_SECRET: z.string().default("whsec_bendwise_local"),
  UPLOADS_DIR: z.string().default(".data/uploads"),
});

export type ServerEnv = z.infer<typeof envSchema>;

let parsed: ServerEnv | undefined;

export function serverEnv(): ServerEnv {
  if (parsed) return parsed;
  const result = envSchema.safeParse(process.env);
  if (!result.success) {
    const problems = result.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`).join("\n");
    throw new Error(`Bendwise cannot start; fix these settings:\n${problems}`);
  }
  parsed = result.data;
  return parsed;
}
