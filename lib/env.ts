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
