import { TZDate } from "@date-fns/tz";

/**
 * Attended hours: when someone is in the workshop to start a plate or take one off.
 *
 * Opening times are wall-clock times in the workshop's IANA time zone, one entry per weekday
 * (ISO numbering, Monday 1 … Sunday 7). A weekday with no entry is closed. A close time earlier
 * than the open time means the window runs past midnight into the next day; open equal to close
 * means the whole day (24 wall-clock hours). "24:00" is accepted as a close time.
 *
 * All times in and out are epoch milliseconds (a Date is accepted too). Intervals are half-open:
 * open at the opening minute, closed at the closing minute.
 */
export type AttendedWindow = { weekday: number; open: string; close: string };
export type TimeInput = number | Date;
export type Interval = { start: number; end: number };

export type AttendedCalendar = {
  readonly timezone: string;
  /** True when someone is present at t. */
  isOpen(t: TimeInput): boolean;
  /** t itself when open, else the next opening; null when the calendar never opens. */
  nextOpening(t: TimeInput): number | null;
  /**
   * The closing time of the open spell containing t, or of the next one when closed at t.
   * Adjacent windows (Monday 22:00–24:00 then Tuesday 00:00–06:00) count as one spell.
   * null when no closing falls within the search horizon (always open) or it never opens.
   */
  closingAfter(t: TimeInput): number | null;
  /** Attended minutes in [a, b). */
  openMinutesBetween(a: TimeInput, b: TimeInput): number;
  /** Merged open intervals overlapping [a, b), clipped to it. */
  openIntervals(a: TimeInput, b: TimeInput): Interval[];
  /** Length in minutes of the longest single open spell (capped at the horizon). */
  longestSpellMinutes(): number;
};

const DAY_MS = 86_400_000;
/** Search horizon for the next opening or closing: two weeks covers any weekly pattern. */
const HORIZON_DAYS = 15;

const HHMM = /^([01]\d|2[0-4]):([0-5]\d)$/;

export function parseHhmm(s: string): number {
  const m = HHMM.exec(s);
  if (!m) throw new Error(`time "${s}" is not HH:MM`);
  const minutes = Number(m[1]) * 60 + Number(m[2]);
  if (minutes > 24 * 60) throw new Error(`time "${s}" is past 24:00`);
  return minutes;
}

function ms(t: TimeInput): number {
  return typeof t === "number" ? t : t.getTime();
}

/** Epoch ms of a wall-clock time on a local calendar day (minutes may exceed 24 h). */
function wallToEpoch(y: number, mo: number, d: number, minutes: number, tz: string): number {
  const dayShift = Math.floor(minutes / 1440);
  const rest = minutes - dayShift * 1440;
  // Day overflow is normalised by the date arithmetic; a non-existent wall time in the spring
  // gap resolves forward, an ambiguous autumn time resolves to one of its two instants.
  return new TZDate(y, mo, d + dayShift, Math.floor(rest / 60), rest % 60, tz).getTime();
}

export function createAttendedCalendar(timezone: string, attended: readonly AttendedWindow[]): AttendedCalendar {
  // Validate the zone once: Intl throws a RangeError on an unknown IANA name.
  new Intl.DateTimeFormat("en", { timeZone: timezone });
  const byWeekday = new Map<number, { open: number; close: number }[]>();
  for (const w of attended) {
    if (!Number.isInteger(w.weekday) || w.weekday < 1 || w.weekday > 7) throw new Error(`weekday ${w.weekday} is not 1-7`);
    const open = parseHhmm(w.open);
    let close = parseHhmm(w.close);
    if (open >= 1440) throw new Error(`open time "${w.open}" must be before 24:00`);
    if (close <= open) close += 1440; // past midnight, or open == close: the whole day
    const list = byWeekday.get(w.weekday) ?? [];
    list.push({ open, close });
    byWeekday.set(w.weekday, list);
  }
  const never = byWeekday.size === 0;
  const dayCache = new Map<number, Interval[]>();

  /** Raw intervals of the windows that open on local calendar day y-mo-d. */
  function intervalsOfLocalDay(y: number, mo: number, d: number): Interval[] {
    const key = y * 10000 + mo * 100 + d;
    const hit = dayCache.get(key);
    if (hit) return hit;
    const jsDay = new Date(Date.UTC(y, mo, d)).getUTCDay();
    const iso = jsDay === 0 ? 7 : jsDay;
    const out: Interval[] = [];
    for (const w of byWeekday.get(iso) ?? []) {
      out.push({ start: wallToEpoch(y, mo, d, w.open, timezone), end: wallToEpoch(y, mo, d, w.close, timezone) });
    }
    dayCache.set(key, out);
    return out;
  }

  /** Merged intervals for local days from the day before a to the day of b. */
  function merged(a: number, b: number): Interval[] {
    const first = new TZDate(a, timezone);
    const raw: Interval[] = [];
    let y = first.getFullYear();
    let mo = first.getMonth();
    let d = first.getDate() - 1; // a window that opened yesterday may still run past midnight
    for (let guard = 0; guard < 400; guard++) {
      const norm = new Date(Date.UTC(y, mo, d));
      y = norm.getUTCFullYear();
      mo = norm.getUTCMonth();
      d = norm.getUTCDate();
      if (guard > 0 && wallToEpoch(y, mo, d, 0, timezone) > b) break;
      for (const iv of intervalsOfLocalDay(y, mo, d)) raw.push(iv);
      d += 1;
    }
    raw.sort((p, q) => p.start - q.start || p.end - q.end);
    const out: Interval[] = [];
    for (const iv of raw) {
      if (iv.end <= iv.start) continue;
      const last = out[out.length - 1];
      if (last && iv.start <= last.end) last.end = Math.max(last.end, iv.end);
      else out.push({ ...iv });
    }
    return out;
  }

  function isOpen(t: TimeInput): boolean {
    if (never) return false;
    const x = ms(t);
    return merged(x, x).some((iv) => iv.start <= x && x < iv.end);
  }

  /** First merged spell ending after x; exact when it ends before the window end. */
  function spellAfter(x: number): { iv: Interval; exact: boolean } | null {
    for (const days of [2, HORIZON_DAYS]) {
      const b = x + days * DAY_MS;
      for (const iv of merged(x, b)) {
        if (iv.end > x) {
          if (iv.end < b || days === HORIZON_DAYS) return { iv, exact: iv.end < b };
          break;
        }
      }
    }
    return null;
  }

  function nextOpening(t: TimeInput): number | null {
    if (never) return null;
    const x = ms(t);
    // A spell's start is exact in any window that begins before x, so no need to see its end.
    for (const days of [2, HORIZON_DAYS]) {
      for (const iv of merged(x, x + days * DAY_MS)) if (iv.end > x) return Math.max(iv.start, x);
    }
    return null;
  }

  function closingAfter(t: TimeInput): number | null {
    if (never) return null;
    const hit = spellAfter(ms(t));
    return hit && hit.exact ? hit.iv.end : null;
  }

  function openIntervals(a: TimeInput, b: TimeInput): Interval[] {
    const x = ms(a);
    const y = ms(b);
    if (never || y <= x) return [];
    const out: Interval[] = [];
    for (const iv of merged(x, y)) {
      const s = Math.max(iv.start, x);
      const e = Math.min(iv.end, y);
      if (e > s) out.push({ start: s, end: e });
    }
    return out;
  }

  function openMinutesBetween(a: TimeInput, b: TimeInput): number {
    return openIntervals(a, b).reduce((sum, iv) => sum + (iv.end - iv.start) / 60_000, 0);
  }

  function longestSpellMinutes(): number {
    if (never) return 0;
    // Any weekly pattern repeats within a fortnight; look at one from a fixed reference week.
    const ref = Date.UTC(2024, 0, 1);
    let best = 0;
    for (const iv of merged(ref, ref + HORIZON_DAYS * DAY_MS)) best = Math.max(best, (iv.end - iv.start) / 60_000);
    return best;
  }

  return { timezone, isOpen, nextOpening, closingAfter, openMinutesBetween, openIntervals, longestSpellMinutes };
}
