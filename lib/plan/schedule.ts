import type { AttendedCalendar } from "@/lib/calendar/attended-hours";
import type { PartInstance } from "./fair-share";
import type { PackedPlate } from "./pack";
import { housingAllows } from "./rules";
import { mergePlates } from "./consolidate";
import { stretchNights } from "./stretch";
import type { Printer, SpoolChange } from "./schema";

/** changeover: the printer's changeover minutes are added; spoolChange: the operator changes the spool (a touch). */
export type Timed = { plate: PackedPlate; printer: string; start: number; end: number; changeover: boolean; spoolChange: SpoolChange | null };
export type ScheduleContext = {
  printers: readonly Printer[];
  calendar: AttendedCalendar;
  nowMs: number;
  marginMm: number;
  gapMm: number;
  /** May a plate run past closing, and how long (hours, null = no cap)? */
  unattended: { allowed: boolean; maxHours: number | null };
  /** Operator minutes a touch (here: a spool change) is worth against a later finish. */
  touchMinutes: number;
};

const MIN = 60_000;
const EPS = 1e-6;

/** May this plate's layout go on this printer? */
export function plateFits(plate: PackedPlate, p: Printer, marginMm: number): boolean {
  const nozzle = plate.items[0]!.inst.part.nozzle;
  return (
    p.materials.includes(plate.material) &&
    housingAllows(p, plate.material) &&
    Math.abs(p.nozzle - nozzle) < 1e-9 &&
    plate.maxHeight <= p.height + 1e-9 &&
    plate.extent[0] <= p.bed[0] - marginMm + 1e-6 &&
    plate.extent[1] <= p.bed[1] - marginMm + 1e-6
  );
}

/** Plate time on a printer: changeover (if the spool differs) + start-up + the parts' minutes. */
export function plateMinutes(plate: PackedPlate, p: Printer, changeover: boolean): number {
  return (changeover ? p.changeover_minutes : 0) + p.startup_minutes + plate.partMinutes;
}

/**
 * Earliest start at or after t that is attended and keeps [start, start + minutes) clear of the
 * printer's unavailable windows. null when no such time exists within the calendar's reach.
 */
export function earliestStart(ctx: ScheduleContext, p: Printer, t: number, minutes: number): number | null {
  const windows = windowsOf(p);
  // Longer than any open spell allows under the unattended policy: it can never start.
  if (minutes > longestRun(ctx)) return null;
  let at = Math.max(t, ctx.nowMs);
  for (let guard = 0; guard < 10_000; guard++) {
    const open = nextOpening(ctx, at);
    if (open === null) return null;
    const end = open + minutes * MIN;
    const limit = endLimit(ctx, open);
    if (end > limit) {
      // It would run past closing longer than the policy allows: try from the next opening.
      const closing = ctx.calendar.closingAfter(open);
      if (closing === null || closing <= at) return null;
      at = closing;
      continue;
    }
    const clash = windows.find(([from, to]) => open < to && from < end);
    if (!clash) return open;
    at = clash[1];
  }
  return null;
}

// Parsed times, kept per object: the local search asks for them many thousand times.
const windowCache = new WeakMap<Printer, (readonly [number, number])[]>();
function windowsOf(p: Printer): (readonly [number, number])[] {
  let w = windowCache.get(p);
  if (!w) windowCache.set(p, (w = p.unavailable.map((u) => [Date.parse(u.from), Date.parse(u.to)] as const)));
  return w;
}
const dueCache = new WeakMap<object, number | null>();
function dueOf(part: PackedPlate["items"][number]["inst"]["part"]): number | null {
  let d = dueCache.get(part);
  if (d === undefined) dueCache.set(part, (d = part.due === null ? null : Date.parse(part.due)));
  return d;
}

/** The longest plate the policy allows (minutes): a spell plus the allowance past closing, or no limit. */
const runCache = new WeakMap<ScheduleContext, number>();
function longestRun(ctx: ScheduleContext): number {
  let r = runCache.get(ctx);
  if (r === undefined) {
    r = ctx.unattended.allowed && ctx.unattended.maxHours === null ? Number.POSITIVE_INFINITY : ctx.calendar.longestSpellMinutes() + (ctx.unattended.allowed ? ctx.unattended.maxHours! * 60 : 0);
    if (ctx.calendar.closingAfter(ctx.nowMs) === null) r = Number.POSITIVE_INFINITY;
    runCache.set(ctx, r);
  }
  return r;
}

/** The latest end the unattended policy allows for a plate started at `start`. */
function endLimit(ctx: ScheduleContext, start: number): number {
  if (ctx.unattended.allowed && ctx.unattended.maxHours === null) return Number.POSITIVE_INFINITY;
  const closing = ctx.calendar.closingAfter(start);
  if (closing === null) return Number.POSITIVE_INFINITY;
  return closing + (ctx.unattended.allowed ? ctx.unattended.maxHours! * 60 * MIN : 0);
}

/** When can the next plate start after one ends at e? Someone must take it off first. */
function readyAfter(ctx: ScheduleContext, e: number): number {
  return nextOpening(ctx, e) ?? Number.POSITIVE_INFINITY;
}

// The local search asks the calendar about thousands of instants; its open spells over the next
// weeks are read once per (calendar, now) and searched by bisection. Outside that reach the
// calendar itself answers.
const SPELL_REACH_MS = 120 * 86_400_000;
type Spells = { from: number; to: number; starts: number[]; ends: number[] };
const spellCache = new WeakMap<AttendedCalendar, Map<number, Spells>>();
function spellsOf(ctx: ScheduleContext): Spells {
  let byNow = spellCache.get(ctx.calendar);
  if (!byNow) spellCache.set(ctx.calendar, (byNow = new Map()));
  let sp = byNow.get(ctx.nowMs);
  if (!sp) {
    const from = ctx.nowMs;
    const to = from + SPELL_REACH_MS;
    const ivs = ctx.calendar.openIntervals(from, to);
    sp = { from, to, starts: ivs.map((iv) => iv.start), ends: ivs.map((iv) => iv.end) };
    byNow.set(ctx.nowMs, sp);
  }
  return sp;
}

/** The calendar's nextOpening(t) (t itself when open), from the cached spells when in reach. */
function nextOpening(ctx: ScheduleContext, t: number): number | null {
  const sp = spellsOf(ctx);
  // Spells are clipped at both ends of the reach, so only trust them well inside it.
  if (t < sp.from || t >= sp.to - 16 * 86_400_000) return ctx.calendar.nextOpening(t);
  let lo = 0;
  let hi = sp.ends.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (sp.ends[mid]! > t) hi = mid;
    else lo = mid + 1;
  }
  if (lo >= sp.ends.length) return ctx.calendar.nextOpening(t);
  return sp.starts[lo]! <= t ? t : sp.starts[lo]!;
}

type Lane = { printer: Printer; plates: PackedPlate[]; timed: Timed[]; lateness: number; finish: number; changes: number; ok: boolean };

function spoolDiffers(loaded: Printer["loaded"], plate: PackedPlate): boolean {
  return !loaded || loaded.material !== plate.material || loaded.color !== plate.color;
}

/** Time one printer's plates in rank order; sets lateness (minutes) and finish. */
function timeLane(ctx: ScheduleContext, lane: Lane): void {
  lane.plates.sort((a, b) => a.rank - b.rank);
  lane.timed = [];
  lane.lateness = 0;
  lane.finish = ctx.nowMs;
  lane.changes = 0;
  lane.ok = true;
  let ready = ctx.nowMs;
  let loaded = lane.printer.loaded;
  const left = [...lane.plates];
  const order: PackedPlate[] = [];
  while (left.length) {
    // The next plate in rank order, unless one of the next few (SEQUENCE_WINDOW) avoids a spool
    // change or a printer standing idle overnight (a plate ending while closed waits for the next
    // opening) by more than it costs; only when the plate in turn carries no due time, so nothing
    // is made late by it and the fair-share order moves by a plate or two at most.
    let pick = 0;
    if (!hasDue(left[0]!)) {
      let bestCost = Number.POSITIVE_INFINITY;
      for (let j = 0; j < Math.min(SEQUENCE_WINDOW, left.length); j++) {
        const t = timeOne(ctx, lane.printer, left[j]!, ready, loaded);
        if (!t) continue;
        const idle = (readyAfter(ctx, t.end) - t.end) / MIN;
        const cost = idle + (t.differs ? ctx.touchMinutes : 0) + j * SEQUENCE_STEP_MINUTES;
        if (cost < bestCost - 1e-6) {
          bestCost = cost;
          pick = j;
        }
      }
    }
    const plate = left.splice(pick, 1)[0]!;
    order.push(plate);
    const t = timeOne(ctx, lane.printer, plate, ready, loaded);
    if (!t) {
      lane.ok = false;
      return;
    }
    const { start, end, change, differs } = t;
    const spoolChange = differs ? { from: loaded ?? null, to: { material: plate.material, color: plate.color } } : null;
    lane.timed.push({ plate, printer: lane.printer.id, start, end, changeover: change, spoolChange });
    if (differs) lane.changes += 1;
    lane.lateness += plateLateness(plate, end);
    lane.finish = end;
    ready = readyAfter(ctx, end);
    loaded = { material: plate.material, color: plate.color };
  }
  lane.plates = order;
}

/** How many plates ahead in rank order a printer may look for its next one, and what a step costs. */
const SEQUENCE_WINDOW = 3;
const SEQUENCE_STEP_MINUTES = 20;

function timeOne(ctx: ScheduleContext, p: Printer, plate: PackedPlate, ready: number, loaded: Printer["loaded"]) {
  const differs = spoolDiffers(loaded, plate);
  const change = differs && p.changeover_minutes > 0;
  const minutes = plateMinutes(plate, p, change);
  const start = earliestStart(ctx, p, ready, minutes);
  if (start === null) return null;
  return { start, end: start + minutes * MIN, change, differs };
}

const hasDue = (plate: PackedPlate) => plate.items.some((it) => it.inst.target !== null);

export function plateLateness(plate: PackedPlate, end: number): number {
  let sum = 0;
  for (const it of plate.items) {
    const due = dueOf(it.inst.part);
    if (due !== null) sum += Math.max(0, (end - due) / MIN);
  }
  return sum;
}

type Score = [number, number, number];
/** [total lateness, spool changes × touch minutes + finish, sum of squared printer finishes]: objective.ts's order. */
function score(lanes: readonly Lane[], ctx: ScheduleContext): Score {
  const nowMs = ctx.nowMs;
  let late = 0;
  let makespan = 0;
  let sq = 0;
  let changes = 0;
  for (const l of lanes) {
    if (!l.ok) return [Infinity, Infinity, Infinity];
    late += l.lateness;
    changes += l.changes;
    makespan = Math.max(makespan, (l.finish - nowMs) / MIN);
    // Sum of squared finishes: a tie-breaker that rewards evening out the printers.
    sq += ((l.finish - nowMs) / MIN) ** 2;
  }
  return [late, makespan + changes * ctx.touchMinutes, sq];
}
const better = (a: Score, b: Score) =>
  a[0] < b[0] - EPS || (Math.abs(a[0] - b[0]) <= EPS && (a[1] < b[1] - EPS || (Math.abs(a[1] - b[1]) <= EPS && a[2] < b[2] - EPS)));

/**
 * Assign plates to printers (README.md, "Scheduling"): in rank order, each plate goes to the
 * printer where it would finish first (a loaded matching spool saves the changeover, so such a
 * printer wins ties and usually wins outright). Then a local search moves single plates and swaps
 * pairs between printers while that lowers total lateness, then the finish of the last plate.
 * Each printer always runs its plates in rank order, so the fair-share order holds per printer.
 */
export function schedulePlates(plates: readonly PackedPlate[], ctx: ScheduleContext, maxPasses = 300, eligible: (x: PartInstance, p: Printer) => boolean = () => true): { timed: Timed[]; unscheduled: PackedPlate[] } {
  const lanes: Lane[] = ctx.printers.map((printer) => ({ printer, plates: [], timed: [], lateness: 0, finish: ctx.nowMs, changes: 0, ok: true }));
  const fits = new Map<PackedPlate, Lane[]>();
  const unscheduled: PackedPlate[] = [];
  const ordered = [...plates].sort((a, b) => a.rank - b.rank);
  for (const plate of ordered) {
    const options = lanes.filter((l) => plateFits(plate, l.printer, ctx.marginMm));
    fits.set(plate, options);
    // First choice: the printers with the bed the plate was packed for (the packer balanced the
    // work between bed sizes); the local search below may still move it to a larger bed.
    const packedBed = ctx.printers.find((p) => p.id === plate.packedFor)?.bed;
    const own = packedBed ? options.filter((l) => l.printer.bed[0] === packedBed[0] && l.printer.bed[1] === packedBed[1]) : [];
    let best: { lane: Lane; end: number; cost: number } | null = null;
    for (const lane of own.length > 0 ? own : options) {
      const last = lane.timed[lane.timed.length - 1];
      const loaded = last ? { material: last.plate.material, color: last.plate.color } : lane.printer.loaded;
      const differs = spoolDiffers(loaded, plate);
      const change = differs && lane.printer.changeover_minutes > 0;
      const minutes = plateMinutes(plate, lane.printer, change);
      const start = earliestStart(ctx, lane.printer, last ? readyAfter(ctx, last.end) : ctx.nowMs, minutes);
      if (start === null) continue;
      const end = start + minutes * MIN;
      // A spool change is a touch: it counts as touchMinutes of a later end.
      const cost = end + (differs ? ctx.touchMinutes * MIN : 0);
      if (!best || cost < best.cost) best = { lane, end, cost };
    }
    if (!best) {
      unscheduled.push(plate);
      continue;
    }
    best.lane.plates.push(plate);
    timeLane(ctx, best.lane);
  }
  improve(lanes, fits, ctx, maxPasses);
  if (maxPasses > 0) {
    mergePlates(lanes, { marginMm: ctx.marginMm, gapMm: ctx.gapMm, nowMs: ctx.nowMs, touchMinutes: ctx.touchMinutes, retime: (l) => timeLane(ctx, l as Lane), eligible, budget: 1500 });
  }
  // Nights and weekends: turn the hours a printer stands idle after a plate that ended while closed
  // into print time (stretch.ts). Only for a full schedule, and only when the workshop closes.
  if (maxPasses > 0 && ctx.calendar.closingAfter(ctx.nowMs) !== null) {
    stretchNights(lanes, { marginMm: ctx.marginMm, gapMm: ctx.gapMm, readyAfter: (t) => readyAfter(ctx, t), retime: (l) => timeLane(ctx, l as Lane), fits: (plate, p) => plateFits(plate, p, ctx.marginMm), eligible, budget: 4000 });
  }
  return { timed: lanes.flatMap((l) => l.timed), unscheduled };
}

function improve(lanes: Lane[], fits: Map<PackedPlate, Lane[]>, ctx: ScheduleContext, maxPasses: number): void {
  const laneOf = new Map<PackedPlate, Lane>();
  for (const l of lanes) for (const p of l.plates) laneOf.set(p, l);
  let current = score(lanes, ctx);
  // A budget on trial re-timings keeps large queues fast; small ones finish well within it.
  let budget = 6_000;
  const trial = (a: Lane, b: Lane, mutate: () => void, undo: () => void): boolean => {
    budget--;
    mutate();
    timeLane(ctx, a);
    timeLane(ctx, b);
    const s = score(lanes, ctx);
    if (better(s, current)) {
      current = s;
      return true;
    }
    undo();
    timeLane(ctx, a);
    timeLane(ctx, b);
    return false;
  };
  for (let pass = 0; pass < maxPasses && budget > 0; pass++) {
    let improved = false;
    const critical = lanes.reduce((m, l) => (l.finish > m.finish ? l : m), lanes[0]!);
    // Plates worth moving: those on the printer that finishes last, and any plate that is late.
    const movable = lanes.flatMap((l) => l.timed.filter((t) => l === critical || plateLateness(t.plate, t.end) > 0).map((t) => t.plate));
    const length = (p: PackedPlate) => (p.partMinutes + laneOf.get(p)!.printer.startup_minutes) * MIN;
    const makespan = critical.finish;
    for (const plate of movable) {
      const from = laneOf.get(plate)!;
      const late = plateLateness(plate, from.timed.find((t) => t.plate === plate)!.end) > 0;
      for (const to of fits.get(plate)!) {
        if (to === from || budget <= 0) continue;
        // Without lateness at stake, only a move that could shorten the last printer is worth timing.
        if (!late && to.finish + length(plate) >= makespan && !to.plates.some((o) => length(o) < length(plate))) continue;
        const moved = trial(
          from,
          to,
          () => ((from.plates = from.plates.filter((p) => p !== plate)), to.plates.push(plate)),
          () => ((to.plates = to.plates.filter((p) => p !== plate)), from.plates.push(plate)),
        );
        if (moved) {
          laneOf.set(plate, to);
          improved = true;
          break;
        }
        let swapped = false;
        for (const other of [...to.plates]) {
          if (budget <= 0) break;
          if (!fits.get(other)!.includes(from)) continue;
          if (!late && to.finish + length(plate) - length(other) >= makespan) continue;
          const swap = () => {
            from.plates = from.plates.filter((p) => p !== plate).concat(other);
            to.plates = to.plates.filter((p) => p !== other).concat(plate);
          };
          const unswap = () => {
            from.plates = from.plates.filter((p) => p !== other).concat(plate);
            to.plates = to.plates.filter((p) => p !== plate).concat(other);
          };
          if (trial(from, to, swap, unswap)) {
            laneOf.set(plate, to);
            laneOf.set(other, from);
            swapped = true;
            break;
          }
        }
        if (swapped) {
          improved = true;
          break;
        }
      }
      if (improved) break;
    }
    if (!improved) return;
  }
}
