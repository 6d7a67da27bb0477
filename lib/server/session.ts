import "server-only";
import { eq } from "drizzle-orm";
import { decode, getToken } from "next-auth/jwt";
import { cookies } from "next/headers";
import { forbidden, redirect } from "next/navigation";
import { cache } from "react";
import { db } from "@/db";
import { users, type Role } from "@/db/schema";
import { can, type Action } from "@/lib/permissions";
import { authOptions } from "./auth";
import { AppError } from "./errors";

export interface SessionUser {
  id: number;
  email: string;
  name: string;
  role: Role;
}

/**
 * Decoded session cookies of this process, by the cookie's exact value: the token is sealed
 * (A256GCM), so one value always decodes to the same account id and expiry, and a repeat request
 * skips the key derivation and decryption. Only the account id is taken from it; expiry is checked
 * on every use; at most TOKEN_CACHE_MAX entries (oldest dropped first).
 */
const TOKEN_CACHE_MAX = 1000;
const tokenCache = new Map<string, { uid: number; sv: number; exp: number }>();

/**
 * The account id and session version in the request's session cookie, or null. This is what `getServerSession` reads
 * in a server component or route handler (its refreshed cookie is thrown away there), without
 * running the whole session endpoint for it.
 */
async function sessionAccount(): Promise<{ uid: number; sv: number } | null> {
  const secureCookie = authOptions.useSecureCookies ?? process.env.NEXTAUTH_URL?.startsWith("https://") ?? false;
  const cookieName = authOptions.cookies?.sessionToken?.name ?? `${secureCookie ? "__Secure-" : ""}next-auth.session-token`;
  // Cookies only (joined when the session was split into chunks); an Authorization header is not a session.
  const raw = await getToken({ req: { cookies: await cookies(), headers: {} } as unknown as Parameters<typeof getToken>[0]["req"], secureCookie, cookieName, raw: true });
  if (!raw) return null;
  const now = Date.now() / 1000;
  const hit = tokenCache.get(raw);
  if (hit) {
    if (hit.exp > now) return hit;
    tokenCache.delete(raw);
    return null;
  }
  const secret = authOptions.secret ?? process.env.NEXTAUTH_SECRET ?? process.env.AUTH_SECRET;
  if (!secret) return null;
  const payload = await decode({ token: raw, secret }).catch(() => null);
  const uid = Number(payload?.uid);
  const exp = Number(payload?.exp);
  // A cookie without a session version (made before versions existed) is not a session.
  const sv = typeof payload?.sv === "number" ? payload.sv : NaN;
  if (!Number.isInteger(uid) || uid <= 0 || !Number.isFinite(exp) || exp <= now || !Number.isInteger(sv)) return null;
  if (tokenCache.size >= TOKEN_CACHE_MAX) tokenCache.delete(tokenCache.keys().next().value!);
  const entry = { uid, sv, exp };
  tokenCache.set(raw, entry);
  return entry;
}

/**
 * The signed-in user, re-read from the database on every request: the role comes from the
 * users table, never from anything the client sent; a deactivated account stops at once, and so does
 * a session signed in under an older session version (signed out, password reset, deactivated).
 */
export const currentUser = cache(async (): Promise<SessionUser | null> => {
  const s = await sessionAccount();
  if (!s) return null;
  const [row] = await db()
    .select({ id: users.id, email: users.email, name: users.name, role: users.role, active: users.active, sv: users.sessionVersion })
    .from(users)
    .where(eq(users.id, s.uid))
    .limit(1);
  if (!row || !row.active || row.sv !== s.sv) return null;
  return { id: row.id, email: row.email, name: row.name, role: row.role };
});

/** For route handlers and server actions: 401 when signed out, 403 when the role may not act. */
export async function requireUser(action?: Action): Promise<SessionUser> {
  const user = await currentUser();
  if (!user) throw new AppError("unauthenticated", "Sign in first.");
  if (action && !can(user.role, action)) throw new AppError("forbidden", "Your role may not do this.");
  return user;
}

/** For pages: signed-out visitors go to sign-in (and come back); a wrong role sees 403. */
export async function requirePageUser(action?: Action, from?: string): Promise<SessionUser> {
  const user = await currentUser();
  if (!user) redirect(from ? `/sign-in?callbackUrl=${encodeURIComponent(from)}` : "/sign-in");
  if (action && !can(user.role, action)) forbidden();
  return user;
}
