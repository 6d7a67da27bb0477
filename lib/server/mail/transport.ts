import "server-only";
import nodemailer, { type Transporter } from "nodemailer";
import { env } from "@/lib/env";

const g = globalThis as unknown as { __pwMailTransport?: { key: string; t: Transporter } };

/** One nodemailer transport per process, rebuilt only if the settings change. */
export function mailTransport(): Transporter {
  const e = env();
  const fake = e.MAIL_MODE === "fake";
  const options = {
    // The fake always lives on loopback; real settings come from the environment.
    host: fake ? "127.0.0.1" : e.SMTP_HOST,
    port: e.SMTP_PORT,
    secure: !fake && e.SMTP_SECURE === "true",
    ignoreTLS: fake,
    auth: !fake && e.SMTP_USER ? { user: e.SMTP_USER, pass: e.SMTP_PASSWORD ?? "" } : undefined,
    connectionTimeout: 5_000,
    greetingTimeout: 5_000,
    socketTimeout: 20_000,
  };
  const key = JSON.stringify(options);
  if (!g.__pwMailTransport || g.__pwMailTransport.key !== key) {
    g.__pwMailTransport?.t.close();
    g.__pwMailTransport = { key, t: nodemailer.createTransport(options) };
  }
  return g.__pwMailTransport.t;
}
