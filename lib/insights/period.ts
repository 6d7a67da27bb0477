import { TZDate } from "@date-fns/tz";

/**
 * Report periods as local calendar dates in the workshop's IANA zone. A period runs from 00:00 of
 * its first day to 24:00 of its last, and is cut at "now" so a month to date ends now (the time
 * after now has not happened, so it is neither idle nor busy). All instants are epoch ms.
 */
export type PeriodKind = "week" | "month" | "custom";
export interface PeriodQuery {
  period: PeriodKind;
  from?: string;
  to?: string;
}
export interface Period {
  kind: PeriodKind;
  timezone: string;
  /** Local dates, YYYY-MM-DD, inclusive. */
  from: string;
  to: string;
  start: number;
  end: number;
}
export interface Bucket {
  start: number;
  end: number;
  label: string;
}
export interface HourBucket {
  start: number;
  end: number;
  /** ISO weekday, 1 = Monday … 7 = Sunday, and local hour 0–23. */
  weekday: number;
  hour: number;
}

const DAY_MS = 86_400_000;
const HOUR_MS = 3_600_000;

export function isoDate(y: number, m: number, d: number): string {
  const n = new Date(Date.UTC(y, m, d));
  return n.toISOString().slice(0, 10);
}

function parts(date: string): [number, number, number] {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(date);
  if (!m) throw new Error(`date "${date}" is not YYYY-MM-DD`);
  return [Number(m[1]), Number(m[2]) - 1, Number(m[3])];
}

/** The instant of local midnight starting the given local date. */
export function localMidnight(date: string, timezone: string): number {
  const [y, m, d] = parts(date);
  return new TZDate(y, m, d, 0, 0, timezone).getTime();
}

/** The local date (YYYY-MM-DD) of an instant in the zone. */
export function localDateOf(t: number, timezone: string): string {
  const z = new TZDate(t, timezone);
  return isoDate(z.getFullYear(), z.getMonth(), z.getDate());
}

export function addDays(date: string, n: number): string {
  const [y, m, d] = parts(date);
  return isoDate(y, m, d + n);
}

/** ISO weekday of a local date: Monday 1 … Sunday 7. */
export function isoWeekday(date: string): number {
  const [y, m, d] = parts(date);
  const js = new Date(Date.UTC(y, m, d)).getUTCDay();
  return js === 0 ? 7 : js;
}

/**
 * week: Monday of this week to today; month: the 1st of this month to today; custom: from–to.
 * The end is 24:00 of the last day, or now when that is earlier.
 */
export function resolvePeriod(q: PeriodQuery, timezone: string, now: number): Period {
  const today = localDateOf(now, timezone);
  let from: string;
  let to = today;
  if (q.period === "week") from = addDays(today, 1 - isoWeekday(today));
  else if (q.period === "month") from = `${today.slice(0, 8)}01`;
  else {
    if (!q.from || !q.to) throw new Error("a custom period needs from and to");
    from = q.from;
    to = q.to;
  }
  const start = localMidnight(from, timezone);
  const end = Math.min(localMidnight(addDays(to, 1), timezone), Math.max(now, start));
  return { kind: q.period, timezone, from, to, start, end };
}

/**
 * One bucket per hour of [start, end), counted from the start (a local midnight), each named by
 * the local weekday and hour at its beginning. Both 02:00 hours of an autumn clock change are
 * named 02; the spring day has no 02. Local hours fall on this grid wherever the zone's offsets
 * differ by whole hours (every daylight-saving zone but Lord Howe Island's half-hour shift).
 */
export function hourBuckets(p: Pick<Period, "start" | "end" | "timezone">): HourBucket[] {
  const out: HourBucket[] = [];
  for (let s = p.start; s < p.end; s += HOUR_MS) {
    const z = new TZDate(s, p.timezone);
    const js = z.getDay();
    out.push({ start: s, end: Math.min(s + HOUR_MS, p.end), weekday: js === 0 ? 7 : js, hour: z.getHours() });
  }
  return out;
}

/** Trend buckets: days up to 2 weeks, weeks (from Monday) up to ~4 months, calendar months beyond. */
export function trendBuckets(p: Pick<Period, "start" | "end" | "timezone" | "from">): Bucket[] {
  const span = (p.end - p.start) / DAY_MS;
  const step: "day" | "week" | "month" = span <= 14 ? "day" : span <= 124 ? "week" : "month";
  let date = p.from;
  if (step === "week") date = addDays(date, 1 - isoWeekday(date));
  if (step === "month") date = `${date.slice(0, 8)}01`;
  const out: Bucket[] = [];
  for (let guard = 0; guard < 500; guard++) {
    const [y, m] = parts(date);
    const next = step === "day" ? addDays(date, 1) : step === "week" ? addDays(date, 7) : isoDate(y, m + 1, 1);
    const s = Math.max(localMidnight(date, p.timezone), p.start);
    const e = Math.min(localMidnight(next, p.timezone), p.end);
    if (e > s) out.push({ start: s, end: e, label: step === "month" ? date.slice(0, 7) : step === "week" ? `w/c ${date}` : date });
    if (localMidnight(next, p.timezone) >= p.end) break;
    date = next;
  }
  return out;
}
