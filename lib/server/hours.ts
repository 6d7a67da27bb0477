import "server-only";
import { TZDate } from "@date-fns/tz";
import { format } from "date-fns";
import { asc } from "drizzle-orm";
import { db } from "@/db";
import { attendedHours } from "@/db/schema";
import { createAttendedCalendar, type AttendedCalendar, type AttendedWindow } from "@/lib/calendar/attended-hours";
import { can } from "@/lib/permissions";
import type { AttendedHoursInput } from "@/lib/validation/hours";
import { AppError } from "./errors";
import type { SessionUser } from "./session";
import { getWorkshopSettings } from "./workshop";

/** The stored windows, Monday first; a weekday without a window is closed. */
export async function getAttendedWindows(): Promise<AttendedWindow[]> {
  const rows = await db()
    .select({ weekday: attendedHours.weekday, open: attendedHours.opensAt, close: attendedHours.closesAt })
    .from(attendedHours)
    .orderBy(asc(attendedHours.weekday), asc(attendedHours.opensAt));
  return rows;
}

/** The workshop's attended calendar in its own time zone, for the planner and the pages. */
export async function getAttendedCalendar(): Promise<AttendedCalendar> {
  const [{ timezone }, windows] = await Promise.all([getWorkshopSettings(), getAttendedWindows()]);
  return createAttendedCalendar(timezone, windows);
}

export interface AttendedHoursView {
  timezone: string;
  windows: AttendedWindow[];
  openNow: boolean;
  /** ISO instant of the next opening (now when open), null when never open. */
  nextOpeningAt: string | null;
  /** The same, as wall-clock text in the workshop's zone, e.g. "Mon 2 Mar, 09:00". */
  nextOpeningLocal: string | null;
  closesAt: string | null;
}

export async function attendedHoursView(now = new Date()): Promise<AttendedHoursView> {
  const [{ timezone }, windows] = await Promise.all([getWorkshopSettings(), getAttendedWindows()]);
  const cal = createAttendedCalendar(timezone, windows);
  const next = cal.nextOpening(now);
  const closes = cal.closingAfter(now);
  return {
    timezone,
    windows,
    openNow: cal.isOpen(now),
    nextOpeningAt: next === null ? null : new Date(next).toISOString(),
    // date-fns formats the instant as wall-clock time in the workshop's zone.
    nextOpeningLocal: next === null ? null : format(new TZDate(next, timezone), "EEE d MMM, HH:mm"),
    closesAt: closes === null ? null : new Date(closes).toISOString(),
  };
}

/** Replaces the whole week (admins only). Days left out are closed. */
export async function setAttendedHours(user: SessionUser, input: AttendedHoursInput): Promise<AttendedHoursView> {
  if (!can(user.role, "hours:edit")) throw new AppError("forbidden", "Only an admin sets the opening hours.");
  const { timezone } = await getWorkshopSettings();
  try {
    createAttendedCalendar(timezone, input.windows);
  } catch (e) {
    throw new AppError("invalid", e instanceof Error ? e.message : "These opening hours are not valid.");
  }
  await db().transaction(async (tx) => {
    await tx.delete(attendedHours);
    if (input.windows.length) {
      await tx.insert(attendedHours).values(input.windows.map((w) => ({ weekday: w.weekday, opensAt: w.open, closesAt: w.close })));
    }
  });
  return attendedHoursView();
}
