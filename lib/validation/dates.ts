import { z } from "zod";

/**
 * A calendar date as YYYY-MM-DD that exists (no 2026-02-31: `Date.parse` rolls such a day over
 * into the next month instead of refusing it) and that the database's DATE type holds (years
 * 1000-9999, MariaDB's documented range).
 */
export function isCalendarDate(s: string): boolean {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(s)) return false;
  const year = Number(s.slice(0, 4));
  if (year < 1000) return false;
  const d = new Date(`${s}T00:00:00Z`);
  return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === s;
}

export const calendarDate = (format = "Use a date such as 2026-09-30.") =>
  z
    .string()
    .regex(/^\d{4}-\d{2}-\d{2}$/, format)
    .refine(isCalendarDate, "That date does not exist.");
