// Helpers for the security specs: throwaway member accounts and next-auth's credentials sign-in over
// plain HTTP (CSRF token, then the callback), optionally with a client-written X-Forwarded-For.
import bcrypt from "bcryptjs";
import type mysql from "mysql2/promise";
import { baseURL } from "./security-fixtures";

export const PASSWORD = "a long enough passphrase 42";

export async function throwawayAccount(conn: mysql.Connection, made: string[], tag: string): Promise<string> {
  const email = `${tag}-${Date.now()}-${made.length}@kettlelane.example`;
  await conn.query("INSERT INTO users (email, name, password_hash, role) VALUES (?, ?, ?, 'member')", [email, `Check ${tag}`, await bcrypt.hash(PASSWORD, 10)]);
  made.push(email);
  return email;
}

export async function httpSignIn(email: string, password: string, forwardedFor?: string) {
  const csrf = await fetch(`${baseURL}/api/auth/csrf`);
  const jar = csrf.headers.getSetCookie().map((c) => c.split(";")[0]!);
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const res = await fetch(`${baseURL}/api/auth/callback/credentials`, {
    method: "POST",
    headers: { "content-type": "application/x-www-form-urlencoded", cookie: jar.join("; "), ...(forwardedFor ? { "x-forwarded-for": forwardedFor } : {}) },
    body: new URLSearchParams({ csrfToken, email, password, json: "true" }),
    redirect: "manual",
  });
  const cookies = [...jar, ...res.headers.getSetCookie().map((c) => c.split(";")[0]!)];
  const body = (await res.json().catch(() => ({}))) as { url?: string };
  return { url: decodeURIComponent(body.url ?? ""), cookie: cookies.join("; "), session: cookies.find((c) => c.includes("session-token=")), csrfToken };
}
