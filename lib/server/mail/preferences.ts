import "server-only";
import { eq, sql } from "drizzle-orm";
import { db } from "@/db";
import { mailPreferences } from "@/db/schema/mail";
import type { PreferencesInput } from "@/lib/validation/mail";
import type { Executor } from "./outbox";
import type { SessionUser } from "../session";

export interface Preferences {
  partPrinted: boolean;
  plateFailed: boolean;
  operatorDigest: boolean;
}

/** Optional messages start on for members' own work and off for the weekly digest. */
export const defaultPreferences: Preferences = { partPrinted: true, plateFailed: true, operatorDigest: false };

export async function preferencesOf(userId: number, d: Executor = db()): Promise<Preferences> {
  const [row] = await d
    .select({ partPrinted: mailPreferences.partPrinted, plateFailed: mailPreferences.plateFailed, operatorDigest: mailPreferences.operatorDigest })
    .from(mailPreferences)
    .where(eq(mailPreferences.userId, userId))
    .limit(1);
  return row ?? defaultPreferences;
}

/** The signed-in person's own choices; nobody edits another person's. */
export async function getMyPreferences(user: SessionUser): Promise<Preferences> {
  return preferencesOf(user.id);
}

export async function updateMyPreferences(user: SessionUser, input: PreferencesInput): Promise<Preferences> {
  await db()
    .insert(mailPreferences)
    .values({ userId: user.id, ...input, updatedAt: new Date() })
    .onDuplicateKeyUpdate({
      set: { partPrinted: input.partPrinted, plateFailed: input.plateFailed, operatorDigest: input.operatorDigest, updatedAt: sql`CURRENT_TIMESTAMP(3)` },
    });
  return preferencesOf(user.id);
}
