import "server-only";
import { eq } from "drizzle-orm";
import { db } from "@/db";
import { signInThrottle } from "@/db/schema";

// Failed sign-ins slow down guessing, per account and per address: after FREE failures inside
// WINDOW, each further failure locks the key for 2^(n-FREE) seconds, capped at MAX.
// (Common practice, no source; the numbers are our own choice.)
const FREE = 5;
const WINDOW_MS = 15 * 60_000;
const MAX_LOCK_MS = 15 * 60_000;

export function lockMsAfter(failures: number): number {
  if (failures < FREE) return 0;
  return Math.min(MAX_LOCK_MS, 1000 * 2 ** (failures - FREE));
}

/** Seconds until the key may try again, or 0. */
export async function lockedFor(key: string, now = new Date()): Promise<number> {
  const [row] = await db().select().from(signInThrottle).where(eq(signInThrottle.key, key)).limit(1);
  if (!row?.lockedUntil) return 0;
  const ms = row.lockedUntil.getTime() - now.getTime();
  return ms > 0 ? Math.ceil(ms / 1000) : 0;
}

/**
 * Counts one sign-in attempt against the key before its password is checked, and says whether it may
 * go on. Atomic: the key's row is locked while it is read and written, so parallel guesses are
 * counted one by one and at most FREE of them reach the password check before the lock. An attempt
 * refused (the key is locked) is not counted; one that goes on counts as a failure until
 * `clearFailures` (a successful sign-in) removes the row. Returns the seconds to wait, or 0.
 */
export async function takeAttempt(key: string, now = new Date()): Promise<number> {
  // The row exists before the transaction locks it (a separate statement, committed at once), so
  // concurrent first attempts do not take shared locks that could deadlock each other.
  await db().insert(signInThrottle).ignore().values({ key, failures: 0, firstFailureAt: now, lockedUntil: null });
  return db().transaction(async (tx) => {
    const [row] = await tx.select().from(signInThrottle).where(eq(signInThrottle.key, key)).for("update");
    if (!row) return 0;
    const wait = row.lockedUntil ? row.lockedUntil.getTime() - now.getTime() : 0;
    if (wait > 0) return Math.ceil(wait / 1000);
    const fresh = row.failures === 0 || now.getTime() - row.firstFailureAt.getTime() > WINDOW_MS;
    const failures = fresh ? 1 : row.failures + 1;
    const lock = lockMsAfter(failures);
    await tx
      .update(signInThrottle)
      .set({ failures, firstFailureAt: fresh ? now : row.firstFailureAt, lockedUntil: lock ? new Date(now.getTime() + lock) : null })
      .where(eq(signInThrottle.key, key));
    return 0;
  });
}

export async function clearFailures(key: string): Promise<void> {
  await db().delete(signInThrottle).where(eq(signInThrottle.key, key));
}
