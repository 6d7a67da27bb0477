// Findings 2, 3 and 6 (issue 17) against the running server: the callback after sign-in stays on our
// origin; a session cookie stops working after sign-out; the throttle's address is the socket's,
// whatever X-Forwarded-For a client writes. Each test uses a throwaway account of its own.
import bcrypt from "bcryptjs";
import { expect, test } from "@playwright/test";
import type mysql from "mysql2/promise";
import { baseURL, e2eDb } from "./security-fixtures";

let conn: mysql.Connection;
const made: string[] = [];
const PASSWORD = "a long enough passphrase 42";

async function account(tag: string): Promise<string> {
  const email = `${tag}-${Date.now()}@kettlelane.example`;
  await conn.query("INSERT INTO users (email, name, password_hash, role) VALUES (?, ?, ?, 'member')", [email, `Check ${tag}`, await bcrypt.hash(PASSWORD, 10)]);
  made.push(email);
  return email;
}

/** next-auth credentials sign-in over plain HTTP (CSRF token, then the callback), optionally with a forged X-Forwarded-For. */
async function signIn(email: string, password: string, forwardedFor?: string) {
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

test.beforeAll(async () => {
  conn = await e2eDb();
});
test.afterAll(async () => {
  for (const e of made) await conn.query("DELETE FROM users WHERE email = ?", [e]);
  await conn.end();
});

test("finding 3: an old session cookie stops working after sign-out", async () => {
  const email = await account("revoke");
  const s = await signIn(email, PASSWORD);
  expect(s.session).toBeDefined();
  const me = await fetch(`${baseURL}/api/me`, { headers: { cookie: s.cookie } });
  expect(me.status).toBe(200);
  // Sign out the way the app's button does (next-auth's POST /api/auth/signout with the CSRF token).
  const out = await fetch(`${baseURL}/api/auth/signout`, { method: "POST", headers: { "content-type": "application/x-www-form-urlencoded", cookie: s.cookie }, body: new URLSearchParams({ csrfToken: s.csrfToken, json: "true" }), redirect: "manual" });
  expect(out.status).toBeLessThan(400);
  // The copy of the old cookie someone kept is refused everywhere, including next-auth's own session endpoint.
  expect((await fetch(`${baseURL}/api/me`, { headers: { cookie: s.cookie } })).status).toBe(401);
  expect(await (await fetch(`${baseURL}/api/auth/session`, { headers: { cookie: s.cookie } })).json()).toEqual({});
});

test("finding 2: the callback after sign-in never leaves our origin", async ({ page }) => {
  const email = await account("redirect");
  for (const cb of ["/\\127.0.0.1:4252/", "/\t/127.0.0.1:4252/", "//127.0.0.1:4252/"]) {
    await page.context().clearCookies();
    await page.goto(`/sign-in?callbackUrl=${encodeURIComponent(cb)}`);
    await page.getByLabel("E-mail").fill(email);
    await page.getByLabel("Password").fill(PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL((u) => !u.pathname.startsWith("/sign-in"), { timeout: 15_000 }).catch(() => undefined);
    expect(new URL(page.url()).origin, cb).toBe(baseURL);
  }
});

test("finding 6: a forged X-Forwarded-For does not give each guess a fresh address", async () => {
  test.setTimeout(60_000);
  // Five failures from this address on five accounts, each claiming another address.
  for (let i = 0; i < 5; i++) {
    const r = await signIn(await account(`fwd${i}`), "wrong password", `203.0.113.${i + 1}`);
    expect(r.url).toMatch(/error=/);
    expect(r.url).not.toContain("Too many");
  }
  // The sixth, claiming yet another address, is still seen as this address, now locked.
  const sixth = await signIn(await account("fwd5"), PASSWORD, "198.51.100.77");
  expect(sixth.url).toContain("Too many failed attempts");
  expect(sixth.session).toBeUndefined();
  // Once the lock has run out a right password works again and clears this address's count.
  await new Promise((r) => setTimeout(r, 2_500));
  expect((await signIn(made[made.length - 1]!, PASSWORD)).session).toBeDefined();
});
