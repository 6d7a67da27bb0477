import { z } from "zod";

// Every setting the server reads, parsed once. `.env.example` documents each one.
const schema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  DB_HOST: z.string().default("127.0.0.1"),
  DB_PORT: z.coerce.number().int().positive().default(3307),
  DB_NAME: z.string().regex(/^[A-Za-z0-9_]+$/).default("platewright"),
  DB_USER: z.string().default("app"),
  DB_PASSWORD: z.string().default("platewright-dev"),
  DB_POOL_SIZE: z.coerce.number().int().positive().default(10),
  NEXTAUTH_SECRET: z.string().min(16).optional(),
  NEXTAUTH_URL: z.string().url().optional(),
  UPLOAD_LIMIT_MB: z.coerce.number().positive().default(200),
  STORAGE_DIR: z.string().default(".data/files"),
  // Mail: "fake" sends to the local fake SMTP server (scripts/fakes.sh) and shows the mailbox page.
  MAIL_MODE: z.enum(["fake", "smtp"]).default("fake"),
  MAIL_FROM: z.string().default("Platewright <no-reply@platewright.localhost>"),
  SMTP_HOST: z.string().default("127.0.0.1"),
  SMTP_PORT: z.coerce.number().int().positive().default(2525),
  SMTP_SECURE: z.enum(["true", "false"]).default("false"),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  MAILBOX_DIR: z.string().default(".data/mailbox"),
  MAIL_OUTBOX_INTERVAL_MS: z.coerce.number().int().min(200).default(5000),
  INVITE_TTL_HOURS: z.coerce.number().positive().default(168),
  RESET_TTL_MINUTES: z.coerce.number().positive().default(60),
  // Payments: "fake" talks to the local payment fake (scripts/fakes.sh) through the same SDK.
  PAYMENTS_MODE: z.enum(["fake", "stripe"]).default("fake"),
  PAYMENTS_SECRET_KEY: z.string().default("sk_test_platewright_fake"),
  PAYMENTS_WEBHOOK_SECRET: z.string().default("whsec_platewright_fake_signing_secret"),
  PAYMENTS_FAKE_PORT: z.coerce.number().int().positive().default(4242),
});

export type Env = z.infer<typeof schema>;

let cached: Env | undefined;

export function env(): Env {
  if (!cached) {
    const parsed = schema.safeParse(process.env);
    if (!parsed.success) {
      const issues = parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ");
      throw new Error(`Invalid environment: ${issues}`);
    }
    cached = parsed.data;
  }
  return cached;
}
