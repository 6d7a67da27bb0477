import "server-only";
import { eq, sql } from "drizzle-orm";
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

export async function recordFailure(key: string, now = new Date()): Promise<void> {
  const [row] = await db().select().from(signInThrottle).where(eq(signInThrottle.key, key)).limit(1);
  const fresh = !row || now.getTime() - row.firstFailureAt.getTime() > WINDOW_MS;
  const failures = fresh ? 1 : row.failures + 1;
  const lock = lockMsAfter(failures);
  const lockedUntil = lock ? new Date(now.getTime() + lock) : null;
  await db()
    .insert(signInThrottle)
    .values({ key, failures, firstFailureAt: now, lockedUntil })
    .onDuplicateKeyUpdate({
      set: {
        failures,
        firstFailureAt: fresh ? now : sql`${signInThrottle.firstFailureAt}`,
        lockedUntil,
      },
    });
}

export async function clearFailures(key: string): Promise<void> {
  await db().delete(signInThrottle).where(eq(signInThrottle.key, key));
}
