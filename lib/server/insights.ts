import "server-only";
import { asc } from "drizzle-orm";
import { db } from "@/db";
import { printers as printersTable } from "@/db/schema";
import { resolvePeriod } from "@/lib/insights/period";
import type { InsightsData } from "@/lib/insights/types";
import { can } from "@/lib/permissions";
import type { InsightsQuery } from "@/lib/validation/insights";
import { AppError } from "./errors";
import { getAttendedCalendar } from "./hours";
import { estimates } from "./insights/estimates";
import { failures } from "./insights/failures";
import { material } from "./insights/material";
import { members } from "./insights/members";
import { heatmap, utilisation } from "./insights/utilisation";
import type { SessionUser } from "./session";
import { getWorkshopSettings } from "./workshop";

/**
 * The workshop's insights for one period, all from SQL aggregates. Operators and admins may look;
 * only those who may see money get the currency and member charges (the fields are left out, not
 * blanked, for everyone else).
 */
export async function getInsights(user: SessionUser, q: Pick<InsightsQuery, "period" | "from" | "to">, now = Date.now()): Promise<InsightsData> {
  if (!can(user.role, "insights:view")) throw new AppError("forbidden", "Only operators and admins see the workshop's insights.");
  const money = can(user.role, "insights:money");
  const [settings, cal, printers] = await Promise.all([
    getWorkshopSettings(),
    getAttendedCalendar(),
    db().select({ id: printersTable.id, name: printersTable.name }).from(printersTable).orderBy(asc(printersTable.name)),
  ]);
  const p = resolvePeriod(q, settings.timezone, now);
  const [util, heat, fail, est, mat, mem] = await Promise.all([utilisation(p, cal, printers), heatmap(p), failures(p, printers), estimates(p, printers), material(p), members(p, money)]);
  return {
    period: { kind: p.kind, from: p.from, to: p.to, timezone: p.timezone, start: new Date(p.start).toISOString(), end: new Date(p.end).toISOString(), hours: (p.end - p.start) / 3_600_000 },
    ...(money ? { currency: settings.currency } : {}),
    utilisation: util,
    heatmap: heat,
    failures: fail,
    estimates: est,
    material: mat,
    members: mem,
  };
}
