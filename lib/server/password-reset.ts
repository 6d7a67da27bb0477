import "server-only";
import bcrypt from "bcryptjs";
import { and, eq, gt, isNull } from "drizzle-orm";
import { db } from "@/db";
import { passwordResets, users } from "@/db/schema";
import { env } from "@/lib/env";
import type { ResetConfirmInput } from "@/lib/validation/mail";
import { AppError } from "./errors";
import { hashToken, newToken, type LinkState } from "./invitations";
import { appUrl, notify } from "./mail";
import { assertPasswordStrong } from "./password-policy";
import { endAllSessions } from "./session-version";

/** At most this many open links per account, so the form cannot be used to flood someone's inbox. */
const MAX_OPEN = 3;

/**
 * Sends a reset link when the address belongs to an active account. The answer is the same either
 * way, so the form does not reveal who has an account.
 */
export async function requestPasswordReset(email: string): Promise<void> {
  const [u] = await db().select({ id: users.id, active: users.active }).from(users).where(eq(users.email, email)).limit(1);
  if (!u || !u.active) return;
  const now = new Date();
  const open = await db()
    .select({ id: passwordResets.id })
    .from(passwordResets)
    .where(and(eq(passwordResets.userId, u.id), isNull(passwordResets.usedAt), gt(passwordResets.expiresAt, now)));
  if (open.length >= MAX_OPEN) return;
  const { token, hash } = newToken();
  const expiresAt = new Date(now.getTime() + env().RESET_TTL_MINUTES * 60_000);
  await db().transaction(async (tx) => {
    await tx.insert(passwordResets).values({ userId: u.id, tokenHash: hash, expiresAt });
    await notify("password_reset", { userId: u.id, link: `${appUrl()}/reset/${token}`, expiresAt }, tx);
  });
}

export async function resetState(token: string): Promise<LinkState> {
  const [row] = await db()
    .select({ email: users.email, expiresAt: passwordResets.expiresAt, usedAt: passwordResets.usedAt })
    .from(passwordResets)
    .innerJoin(users, eq(users.id, passwordResets.userId))
    .where(eq(passwordResets.tokenHash, hashToken(token)))
    .limit(1);
  if (!row) return { state: "unknown" };
  if (row.usedAt) return { state: "used" };
  if (row.expiresAt.getTime() <= Date.now()) return { state: "expired" };
  return { state: "valid", email: row.email };
}

/** Sets the new password once; every other open link of the account stops working too. */
export async function confirmPasswordReset(input: ResetConfirmInput): Promise<{ email: string }> {
  const [who] = await db().select({ email: users.email, name: users.name }).from(passwordResets).innerJoin(users, eq(users.id, passwordResets.userId)).where(eq(passwordResets.tokenHash, hashToken(input.token))).limit(1);
  assertPasswordStrong(input.password, who ? [who.email, who.name] : []);
  const passwordHash = await bcrypt.hash(input.password, 10);
  return db().transaction(async (tx) => {
    const [r] = await tx
      .select({ id: passwordResets.id, userId: passwordResets.userId, expiresAt: passwordResets.expiresAt, usedAt: passwordResets.usedAt })
      .from(passwordResets)
      .where(eq(passwordResets.tokenHash, hashToken(input.token)))
      .for("update")
      .limit(1);
    if (!r) throw new AppError("conflict", "This reset link is not valid. Ask for a new one.");
    if (r.usedAt) throw new AppError("conflict", "This reset link was already used. Ask for a new one if you need to.");
    if (r.expiresAt.getTime() <= Date.now()) throw new AppError("conflict", "This reset link has expired. Ask for a new one.");
    const [u] = await tx.select({ email: users.email }).from(users).where(eq(users.id, r.userId)).limit(1);
    if (!u) throw new AppError("conflict", "This reset link is not valid. Ask for a new one.");
    await tx.update(users).set({ passwordHash, updatedAt: new Date() }).where(eq(users.id, r.userId));
    await endAllSessions(r.userId, tx); // sessions signed in with the old password end here
    await tx.update(passwordResets).set({ usedAt: new Date() }).where(and(eq(passwordResets.userId, r.userId), isNull(passwordResets.usedAt)));
    return { email: u.email };
  });
}
