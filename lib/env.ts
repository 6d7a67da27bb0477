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
  // Outside fake mode both secrets must be set, and never to the fake's public values.
  PAYMENTS_SECRET_KEY: z.string().min(1).optional(),
  PAYMENTS_WEBHOOK_SECRET: z.string().min(1).optional(),
  PAYMENTS_FAKE_PORT: z.coerce.number().int().positive().default(4242),
});

/** The local payment fake's keys: public (they are in this repository), so valid in fake mode only. */
export const FAKE_PAYMENTS_SECRET_KEY = "sk_test_platewright_fake";
export const FAKE_PAYMENTS_WEBHOOK_SECRET = "whsec_platewright_fake_signing_secret";

const checked = schema
  .superRefine((v, ctx) => {
    if (v.PAYMENTS_MODE === "fake") return;
    const need = (key: "PAYMENTS_SECRET_KEY" | "PAYMENTS_WEBHOOK_SECRET", fake: string) => {
      if (!v[key]) ctx.addIssue({ code: "custom", path: [key], message: `required when PAYMENTS_MODE=${v.PAYMENTS_MODE} (the provider's own value)` });
      else if (v[key] === fake) ctx.addIssue({ code: "custom", path: [key], message: "is the local fake's public value; set the provider's own" });
    };
    need("PAYMENTS_SECRET_KEY", FAKE_PAYMENTS_SECRET_KEY);
    need("PAYMENTS_WEBHOOK_SECRET", FAKE_PAYMENTS_WEBHOOK_SECRET);
  })
  .transform((v) => ({
    ...v,
    PAYMENTS_SECRET_KEY: v.PAYMENTS_SECRET_KEY ?? FAKE_PAYMENTS_SECRET_KEY,
    PAYMENTS_WEBHOOK_SECRET: v.PAYMENTS_WEBHOOK_SECRET ?? FAKE_PAYMENTS_WEBHOOK_SECRET,
  }));

export type Env = z.infer<typeof checked>;

/** Parses settings from `source`; throws with every problem named. */
export function parseEnv(source: Record<string, string | undefined>): Env {
  const parsed = checked.safeParse(source);
  if (!parsed.success) {
    const issues = parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ");
    throw new Error(`Invalid environment: ${issues}`);
  }
  return parsed.data;
}

let cached: Env | undefined;

export function env(): Env {
  cached ??= parseEnv(process.env);
  return cached;
}
