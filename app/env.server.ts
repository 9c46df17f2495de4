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
  /** The mail queue: how many times a refused e-mail is tried again, and the first wait in seconds (it doubles each time, with jitter). */
  MAIL_RETRY_LIMIT: z.coerce.number().int().min(0).max(30).default(12),
  MAIL_RETRY_DELAY_SECONDS: z.coerce.number().int().min(1).max(3600).default(10),
  /** When the weekly summaries are queued: a cron line read in MAIL_WEEKLY_TIME_ZONE (default Fridays 16:00). */
  MAIL_WEEKLY_CRON: z.string().default("0 16 * * 5"),
  MAIL_WEEKLY_TIME_ZONE: z.string().default("UTC"),
  /** "separate": a mail worker process sends the queue (npm start runs one); "in-process": this process sends it too (integration tests). */
  BENDWISE_MAIL_WORKER: z.enum(["separate", "in-process"]).default("separate"),
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
