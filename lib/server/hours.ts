import "server-only";
import { TZDate } from "@date-fns/tz";
import { format } from "date-fns";
import { asc } from "drizzle-orm";
import { db } from "@/db";
import { changeGeneration } from "@/db/change-watch";
import { attendedHours } from "@/db/schema";
import { createAttendedCalendar, type AttendedCalendar, type AttendedWindow, type Interval } from "@/lib/calendar/attended-hours";
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

/**
 * A process-wide copy of the calendar for hot read paths (the Floor board polls it). It is dropped
 * as soon as this process writes anything the calendar is built from (db/change-watch.ts moves its
 * counter after every such write has completed or committed), so a read after this process's own
 * write never sees the old week. Writes made by another process (the seed, a restore) are picked up
 * within CALENDAR_TTL_MS.
 */
const CALENDAR_TTL_MS = 5_000;
type CalendarEntry = { cal: AttendedCalendar; generation: number; at: number; spans: Map<string, Interval[]> };
let calendarEntry: CalendarEntry | null = null;

async function cachedEntry(): Promise<CalendarEntry> {
  const generation = changeGeneration();
  const hit = calendarEntry;
  if (hit && hit.generation === generation && Date.now() - hit.at < CALENDAR_TTL_MS) return hit;
  const entry = { cal: await getAttendedCalendar(), generation, at: Date.now(), spans: new Map<string, Interval[]>() };
  // Kept only when nothing was written while it was read.
  if (changeGeneration() === generation) calendarEntry = entry;
  return entry;
}

export async function cachedAttendedCalendar(): Promise<AttendedCalendar> {
  return (await cachedEntry()).cal;
}

const HOUR_MS = 3_600_000;

/**
 * The attended intervals between two instants, from the cached calendar. The intervals of the
 * whole hours around [from, to] are computed once and kept with the calendar; each call clips them.
 */
export async function cachedOpenIntervals(from: Date, to: Date): Promise<{ timezone: string; open: Interval[] }> {
  const entry = await cachedEntry();
  const a = Math.floor(from.getTime() / HOUR_MS) * HOUR_MS;
  const b = Math.ceil(to.getTime() / HOUR_MS) * HOUR_MS;
  const key = `${a}:${b}`;
  let span = entry.spans.get(key);
  if (!span) {
    if (entry.spans.size > 32) entry.spans.clear();
    span = entry.cal.openIntervals(a, b);
    entry.spans.set(key, span);
  }
  const f = from.getTime();
  const t = to.getTime();
  const open: Interval[] = [];
  for (const iv of span) {
    const start = Math.max(iv.start, f);
    const end = Math.min(iv.end, t);
    if (end > start) open.push({ start, end });
  }
  return { timezone: entry.cal.timezone, open };
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
