// Helpers for the security specs: throwaway member accounts and next-auth's credentials sign-in over
// plain HTTP (CSRF token, then the callback), optionally with a client-written X-Forwarded-For.
import { test } from "@playwright/test";
import bcrypt from "bcryptjs";
import type mysql from "mysql2/promise";
import { baseURL, e2eDb } from "./security-fixtures";

export const PASSWORD = "a long enough passphrase 42";

async function throwawayAccount(conn: mysql.Connection, made: string[], tag: string): Promise<string> {
  const email = `${tag}-${Date.now()}-${made.length}@kettlelane.example`;
  await conn.query("INSERT INTO users (email, name, password_hash, role) VALUES (?, ?, ?, 'member')", [email, `Check ${tag}`, await bcrypt.hash(PASSWORD, 10)]);
  made.push(email);
  return email;
}

/**
 * Throwaway accounts for one spec file: opens the e2e database before its tests, and deletes every
 * account it made and closes the connection after them. `make(tag)` returns a new account's e-mail.
 */
export function throwawayAccounts(): { make: (tag: string) => Promise<string> } {
  let conn: mysql.Connection;
  const made: string[] = [];
  test.beforeAll(async () => {
    conn = await e2eDb();
  });
  test.afterAll(async () => {
    for (const e of made) await conn.query("DELETE FROM users WHERE email = ?", [e]);
    await conn.end();
  });
  return { make: (tag) => throwawayAccount(conn, made, tag) };
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
