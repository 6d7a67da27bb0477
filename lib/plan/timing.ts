import type { AttendedCalendar } from "@/lib/calendar/attended-hours";
import type { Printer } from "./schema";

const MIN = 60_000;
/** The calendar's open spells are read once for this far ahead and searched by bisection. */
const SPELL_REACH_MS = 120 * 86_400_000;

/**
 * Calendar questions the planner asks thousands of times, answered from the open spells of the
 * next 120 days (read once) and the printers' unavailable windows (parsed once).
 */
export type Timing = {
  readonly nowMs: number;
  /** t itself when open, else the next opening; null when it never opens. */
  nextOpening(t: number): number | null;
  /** The end of the open spell holding t (or of the next one); null when always open. */
  closingAfter(t: number): number | null;
  /** When may the next plate start after one ends at `end`? Someone must take it off first. */
  readyAfter(end: number): number;
  /** Earliest attended start ≥ t keeping [start, start + minutes) clear of the printer's windows. */
  earliestStart(p: Printer, t: number, minutes: number): number | null;
  /** The printer's next unavailable window starting after t, if any. */
  nextWindow(p: Printer, t: number): readonly [number, number] | null;
};

export function makeTiming(calendar: AttendedCalendar, nowMs: number): Timing {
  const ivs = calendar.openIntervals(nowMs, nowMs + SPELL_REACH_MS);
  const starts = ivs.map((iv) => iv.start);
  const ends = ivs.map((iv) => iv.end);
  const trustedUntil = nowMs + SPELL_REACH_MS - 16 * 86_400_000;
  // Index of the first spell ending after t.
  const spellAfter = (t: number) => {
    let lo = 0;
    let hi = ends.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (ends[mid]! > t) hi = mid;
      else lo = mid + 1;
    }
    return lo;
  };
  const alwaysOpen = calendar.closingAfter(nowMs) === null && calendar.nextOpening(nowMs) !== null;
  const nextOpening = (t: number): number | null => {
    if (t < nowMs || t >= trustedUntil) return calendar.nextOpening(t);
    const i = spellAfter(t);
    if (i >= ends.length) return calendar.nextOpening(t);
    return starts[i]! <= t ? t : starts[i]!;
  };
  const closingAfter = (t: number): number | null => {
    if (alwaysOpen) return null;
    if (t < nowMs || t >= trustedUntil) return calendar.closingAfter(t);
    const i = spellAfter(t);
    return i < ends.length ? ends[i]! : calendar.closingAfter(t);
  };
  const windows = new WeakMap<Printer, (readonly [number, number])[]>();
  const windowsOf = (p: Printer) => {
    let w = windows.get(p);
    if (!w) {
      w = p.unavailable.map((u) => [Date.parse(u.from), Date.parse(u.to)] as const).sort((a, b) => a[0] - b[0]);
      windows.set(p, w);
    }
    return w;
  };
  return {
    nowMs,
    nextOpening,
    closingAfter,
    readyAfter: (end) => nextOpening(end) ?? Number.POSITIVE_INFINITY,
    earliestStart(p, t, minutes) {
      const w = windowsOf(p);
      let at = Math.max(t, nowMs);
      for (let guard = 0; guard < 10_000; guard++) {
        const open = nextOpening(at);
        if (open === null) return null;
        const end = open + minutes * MIN;
        const clash = w.find(([from, to]) => open < to && from < end);
        if (!clash) return open;
        at = clash[1];
      }
      return null;
    },
    nextWindow(p, t) {
      return windowsOf(p).find(([, to]) => to > t) ?? null;
    },
  };
}
