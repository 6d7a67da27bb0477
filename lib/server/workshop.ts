import "server-only";
import { and, eq, sql } from "drizzle-orm";
import { db } from "@/db";
import { workshopSettings } from "@/db/schema";
import type { WorkshopSettingsInput } from "@/lib/validation/workshop";
import { AppError } from "./errors";
import type { SessionUser } from "./session";
import { can } from "@/lib/permissions";

const columns = {
  name: workshopSettings.name,
  timezone: workshopSettings.timezone,
  currency: workshopSettings.currency,
  contactEmail: workshopSettings.contactEmail,
  defaultLayerHeightMm: workshopSettings.defaultLayerHeightMm,
  defaultWalls: workshopSettings.defaultWalls,
  defaultInfillPercent: workshopSettings.defaultInfillPercent,
  plateFeeCents: workshopSettings.plateFeeCents,
  safetyNote: workshopSettings.safetyNote,
  unattendedAllowed: workshopSettings.unattendedAllowed,
  unattendedMaxHours: workshopSettings.unattendedMaxHours,
  version: workshopSettings.version,
  updatedAt: workshopSettings.updatedAt,
};

type Row = { [K in keyof typeof columns]: (typeof columns)[K]["_"]["data"] };
export type WorkshopSettings = Omit<Row, "unattendedAllowed" | "unattendedMaxHours"> & { unattendedAllowed: boolean; unattendedMaxHours: number | null };

export async function getWorkshopSettings(): Promise<WorkshopSettings> {
  const [row] = await db().select(columns).from(workshopSettings).where(eq(workshopSettings.id, 1)).limit(1);
  if (!row) throw new AppError("not_found", "The workshop has not been set up yet. Run the seed.");
  return { ...row, unattendedAllowed: row.unattendedAllowed === 1 };
}

/** Saves the settings when the caller saw the current version; otherwise 409 so nothing is overwritten blindly. */
export async function updateWorkshopSettings(user: SessionUser, input: WorkshopSettingsInput): Promise<WorkshopSettings> {
  if (!can(user.role, "workshop:edit")) throw new AppError("forbidden", "Only an admin changes the workshop settings.");
  const { version, unattendedAllowed, unattendedMaxHours, ...values } = input;
  const policy = {
    ...(unattendedAllowed === undefined ? {} : { unattendedAllowed: unattendedAllowed ? 1 : 0 }),
    ...(unattendedMaxHours === undefined ? {} : { unattendedMaxHours }),
  };
  const [res] = await db()
    .update(workshopSettings)
    .set({ ...values, ...policy, version: sql`${workshopSettings.version} + 1`, updatedAt: new Date() })
    .where(and(eq(workshopSettings.id, 1), eq(workshopSettings.version, version)));
  if (res.affectedRows === 0) {
    throw new AppError("conflict", "Someone else saved the settings since you opened them. Reload to see their changes.");
  }
  return getWorkshopSettings();
}
