import "server-only";
import { eq, sql } from "drizzle-orm";
import { db } from "@/db";
import { users } from "@/db/schema";
import type { Executor } from "./mail";

/**
 * Ends every session of an account: each session cookie carries the account's session version from
 * when it was signed in, and `currentUser` refuses a cookie whose version is not the row's. Called on
 * sign-out (which therefore signs out every device), a password reset and deactivation; pass the
 * transaction when there is one.
 */
export async function endAllSessions(userId: number, d: Executor = db()): Promise<void> {
  await d.update(users).set({ sessionVersion: sql`${users.sessionVersion} + 1` }).where(eq(users.id, userId));
}

/** The account's current session version (for the sign-in token), or null when there is no such account. */
export async function sessionVersionOf(userId: number, d: Executor = db()): Promise<number | null> {
  const [row] = await d.select({ v: users.sessionVersion, active: users.active }).from(users).where(eq(users.id, userId)).limit(1);
  return row && row.active ? row.v : null;
}
