// Finding 3 (issue 17): a session cookie must stop working after sign-out, a password reset and
// deactivation. The cookie is a real next-auth JWT (encoded with next-auth's own `encode`), read by
// the app's real `currentUser`; only next/headers' cookie store is stood in for.
process.env.NEXTAUTH_SECRET ??= "integration-test-secret-0123456789abcdef";
import { eq } from "drizzle-orm";
import { encode } from "next-auth/jwt";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { closeDb, db } from "@/db";
import { passwordResets, users } from "@/db/schema";

let cookieValue = "";
vi.mock("next/headers", () => ({
  cookies: async () => ({ getAll: () => (cookieValue ? [{ name: "next-auth.session-token", value: cookieValue }] : []), get: () => undefined }),
}));

const { authOptions } = await import("@/lib/server/auth");
const { currentUser } = await import("@/lib/server/session");
const { hashToken, updatePerson } = await import("@/lib/server/invitations");
const { confirmPasswordReset } = await import("@/lib/server/password-reset");
const { endAllSessions } = await import("@/lib/server/session-version");

let memberId = 0;
const admin = { id: 0, email: "rev-admin@test.example", name: "rev-admin", role: "admin" as const };

/** What next-auth puts in the cookie at sign-in: the jwt callback's token, sealed with the secret. */
async function signIn(): Promise<string> {
  const [u] = await db().select({ id: users.id, email: users.email, name: users.name, role: users.role, sv: users.sessionVersion }).from(users).where(eq(users.id, memberId));
  const token = await authOptions.callbacks!.jwt!({ token: {}, user: { id: String(u!.id), email: u!.email, name: u!.name, role: u!.role, sessionVersion: u!.sv } as never, account: null, trigger: "signIn" } as never);
  return encode({ token, secret: process.env.NEXTAUTH_SECRET!, maxAge: 3600 });
}

async function whoIs(cookie: string): Promise<number | null> {
  cookieValue = cookie;
  // currentUser is wrapped in React's per-request cache; outside a request each call reads again.
  return (await currentUser())?.id ?? null;
}

beforeAll(async () => {
  await db().insert(users).values({ email: "rev-m@test.example", name: "rev-m", role: "member", passwordHash: "x" });
  const [m] = await db().select({ id: users.id }).from(users).where(eq(users.email, "rev-m@test.example"));
  memberId = m!.id;
  const [a] = await db().insert(users).values({ email: admin.email, name: admin.name, role: "admin", passwordHash: "x" }).$returningId();
  admin.id = a!.id;
});
afterAll(closeDb);

describe("ending sessions", () => {
  it("a cookie without a session version (made before versions) is not a session", async () => {
    const legacy = await encode({ token: { uid: memberId }, secret: process.env.NEXTAUTH_SECRET!, maxAge: 3600 });
    expect(await whoIs(legacy)).toBeNull();
  });

  it("sign-out ends the old cookie, here and at next-auth's own session endpoint", async () => {
    const cookie = await signIn();
    expect(await whoIs(cookie)).toBe(memberId);
    const [u] = await db().select({ sv: users.sessionVersion }).from(users).where(eq(users.id, memberId));
    await authOptions.events!.signOut!({ token: { uid: memberId, sv: u!.sv } } as never);
    expect(await whoIs(cookie)).toBeNull();
    await expect(authOptions.callbacks!.jwt!({ token: { uid: memberId, sv: u!.sv } } as never)).rejects.toThrow(/ended/);
    // A fresh sign-in works again.
    expect(await whoIs(await signIn())).toBe(memberId);
  });

  it("a password reset ends every session signed in before it", async () => {
    const cookie = await signIn();
    expect(await whoIs(cookie)).toBe(memberId);
    const token = "reset-token-for-revocation-test-000000000000";
    await db().insert(passwordResets).values({ userId: memberId, tokenHash: hashToken(token), expiresAt: new Date(Date.now() + 3_600_000) });
    await confirmPasswordReset({ token, password: "a long new passphrase 42" });
    expect(await whoIs(cookie)).toBeNull();
  });

  it("deactivation ends sessions, and reactivation does not bring them back", async () => {
    const cookie = await signIn();
    await updatePerson(admin, memberId, { active: false });
    expect(await whoIs(cookie)).toBeNull();
    await updatePerson(admin, memberId, { active: true });
    expect(await whoIs(cookie)).toBeNull();
    expect(await whoIs(await signIn())).toBe(memberId);
  });

  it("ending sessions of one account leaves another's alone", async () => {
    const cookie = await signIn();
    await endAllSessions(admin.id);
    expect(await whoIs(cookie)).toBe(memberId);
  });
});
