import { createAttendedCalendar, type Interval } from "@/lib/calendar/attended-hours";
import { footprintWithBrim, groupKey, housingAllows } from "./rules";
import type { PlanInstance } from "./schema";

/**
 * Simple lower bounds any valid plan must respect, to judge the planner against:
 * - plates: per sharing group, ceil(total footprint area / largest usable bed area among the
 *   printers that take the group), summed over groups (area bound, common practice for bin packing);
 * - finish: max(total print minutes / printers, longest single part + the smallest start-up time),
 *   from `now`, with round-the-clock attendance (the classic makespan bound for parallel machines,
 *   Graham 1969, from memory); `finishByMaterialMinutes` also takes, per material, its work over
 *   the printers that take it (those printers alone must print it), which is still a lower bound.
 */
export function planLowerBounds(inst: PlanInstance): { plates: number; finishMinutes: number; finishByMaterialMinutes: number } {
  const m = inst.margin_mm;
  const areaByGroup = new Map<string, { area: number; bed: number }>();
  let minutes = 0;
  const byMaterial = new Map<string, number>();
  let longest = 0;
  const minStartup = Math.min(...inst.printers.map((p) => p.startup_minutes));
  for (const part of inst.parts) {
    const takers = inst.printers.filter((p) => p.materials.includes(part.material) && Math.abs(p.nozzle - part.nozzle) < 1e-9);
    if (takers.length === 0) continue;
    const bed = Math.max(...takers.map((p) => (p.bed[0] - 2 * m) * (p.bed[1] - 2 * m)));
    const key = groupKey(part);
    const g = areaByGroup.get(key) ?? { area: 0, bed: 0 };
    const [fw, fd] = footprintWithBrim(part);
    g.area += fw * fd * part.quantity;
    g.bed = Math.max(g.bed, bed);
    areaByGroup.set(key, g);
    minutes += part.minutes * part.quantity;
    byMaterial.set(part.material, (byMaterial.get(part.material) ?? 0) + part.minutes * part.quantity);
    longest = Math.max(longest, part.minutes);
  }
  let plates = 0;
  for (const g of areaByGroup.values()) plates += Math.ceil(g.area / g.bed - 1e-9);
  const finishMinutes = Math.max(minutes / inst.printers.length, longest + minStartup);
  let finishByMaterialMinutes = finishMinutes;
  for (const [material, work] of byMaterial) {
    const n = inst.printers.filter((p) => p.materials.includes(material)).length;
    finishByMaterialMinutes = Math.max(finishByMaterialMinutes, work / n);
  }
  return { plates, finishMinutes, finishByMaterialMinutes };
}

/**
 * Plates that any plan needs if it is to finish within `finishMinutes` of `now`. Each printer k
 * can print at most cap_k minutes of parts by then: `finishMinutes` round the clock, or with
 * `calendar: true` what the opening hours allow (printerCapacityMinutes). A plate holds at most its
 * bed's area: parts at least the gap apart and the margin from the edge, each grown by half the gap
 * on every side (and by its brim), lie apart inside the bed less the margins plus one gap, so a
 * plate's parts take at most (width - 2·margin + gap) × (depth - 2·margin + gap) of their
 * (w + gap) × (d + gap) areas.
 *
 * The bound is the fractional relaxation: min Σ_k (area printed on k) / (bed area of k) subject
 * to Σ_i x_ik = minutes of part i and Σ_i x_ik <= cap_k, parts split freely. Material, height and
 * start-up limits are dropped, which can only lower it. Proof of the closed form: moving minutes
 * from a smaller bed to a larger one with capacity left lowers the cost, so an optimum fills the
 * beds largest first; on those beds the cost per minute is a product (area per minute of the part
 * × 1 / bed area), a Monge matrix once parts are sorted by area per minute and beds by size, and
 * for a Monge transportation problem the north-west corner rule is optimal (Hoffman 1963, from
 * memory): the flattest parts go to the largest beds until their time is used, then the next.
 * tests/unit/plan/bounds.test.ts checks it against the HiGHS LP optimum, with and without a calendar.
 * Returns the fractional value (round up for a count); Infinity when the printers cannot print
 * all minutes within `finishMinutes` at all.
 */
export function platesForFinishBound(inst: PlanInstance, finishMinutes: number, opts: { calendar?: boolean } = {}): number {
  const m = inst.margin_mm;
  const g = inst.gap_mm;
  const caps = opts.calendar ? calendarCapacities(inst, finishMinutes) : inst.printers.map(() => finishMinutes);
  const beds = inst.printers
    .map((p, k) => ({ area: (p.bed[0] - 2 * m + g) * (p.bed[1] - 2 * m + g), cap: caps[k]! }))
    .filter((b) => b.area > 0 && b.cap > 0)
    .sort((a, b) => b.area - a.area);
  const items = inst.parts
    .filter((part) => inst.printers.some((p) => p.materials.includes(part.material)))
    .map((part) => {
      const [fw, fd] = footprintWithBrim(part);
      return { area: (fw + g) * (fd + g) * part.quantity, minutes: part.minutes * part.quantity };
    })
    .sort((a, b) => b.area * a.minutes - a.area * b.minutes); // most area per minute first
  let plates = 0;
  let k = 0;
  let left = beds.length ? beds[0]!.cap : 0;
  for (const it of items) {
    if (it.minutes <= 0) {
      if (beds.length === 0) return Number.POSITIVE_INFINITY;
      plates += it.area / beds[0]!.area;
      continue;
    }
    let minutes = it.minutes;
    while (minutes > 1e-9) {
      if (k >= beds.length) return Number.POSITIVE_INFINITY;
      const take = Math.min(minutes, left);
      plates += (it.area * take) / it.minutes / beds[k]!.area;
      minutes -= take;
      left -= take;
      if (left <= 1e-9) {
        k++;
        left = k < beds.length ? beds[k]!.cap : 0;
      }
    }
  }
  return plates;
}

/**
 * Most part minutes one plate on printer k can hold (a valid over-estimate): fill its usable bed
 * area with the copies it may print, most minutes per area first, the last one split (fractional
 * knapsack).
 */
export function longestPlateMinutes(inst: PlanInstance, k: number): number {
  const p = inst.printers[k]!;
  const g = inst.gap_mm;
  let area = (p.bed[0] - 2 * inst.margin_mm + g) * (p.bed[1] - 2 * inst.margin_mm + g);
  const items = inst.parts
    .filter((part) => p.materials.includes(part.material) && housingAllows(p, part.material))
    .map((part) => {
      const [fw, fd] = footprintWithBrim(part);
      return { a: (fw + g) * (fd + g), m: part.minutes, q: part.quantity };
    })
    .sort((x, y) => y.m * x.a - x.m * y.a);
  let minutes = 0;
  for (const it of items) {
    if (area <= 0) break;
    const n = Math.min(it.q, area / it.a);
    minutes += n * it.m;
    area -= n * it.a;
  }
  return minutes;
}

/**
 * Part minutes a printer can print between `now` and `now + F` under the opening hours (prove:
 * plates start only while the workshop is open, and across each closed stretch at most one plate
 * runs, the one started before it, so the printer prints at most the open minutes plus, per closed
 * stretch after an opening, min(its length, the longest plate, the unattended cap)). A closed
 * stretch at `now` adds nothing (no plate of this plan is running yet); unavailable windows are
 * ignored, which only raises the capacity and keeps the bound valid.
 */
export function printerCapacityMinutes(spells: readonly Interval[], nowMs: number, finishMinutes: number, longestPlate: number, unattended: PlanInstance["unattended"]): number {
  const end = nowMs + finishMinutes * MIN;
  const closedCap = !unattended || unattended.allowed ? Math.min(longestPlate, unattended?.max_hours != null ? unattended.max_hours * 60 : Infinity) : 0;
  let minutes = 0;
  for (let i = 0; i < spells.length; i++) {
    const s = spells[i]!;
    if (s.start >= end) break;
    minutes += (Math.min(s.end, end) - s.start) / MIN;
    const next = i + 1 < spells.length ? spells[i + 1]!.start : Number.POSITIVE_INFINITY;
    if (s.end < end) minutes += Math.min((Math.min(next, end) - s.end) / MIN, closedCap);
  }
  return minutes;
}

const MIN = 60_000;
const HORIZON_MS = 400 * 86_400_000;

function spellsOf(inst: PlanInstance): Interval[] {
  const nowMs = Date.parse(inst.now);
  return createAttendedCalendar(inst.timezone, inst.attended).openIntervals(nowMs, nowMs + HORIZON_MS);
}

/** Each printer's capacity (printerCapacityMinutes) for a finish F minutes from now. */
export function calendarCapacities(inst: PlanInstance, finishMinutes: number, spells = spellsOf(inst)): number[] {
  const nowMs = Date.parse(inst.now);
  return inst.printers.map((_, k) => printerCapacityMinutes(spells, nowMs, finishMinutes, longestPlateMinutes(inst, k), inst.unattended));
}

/**
 * Calendar-aware finish bound: the least F such that the printers' capacities by now + F hold all
 * the work, and per material the printers that take it hold its work; and no sooner than the first
 * opening plus the longest part and the smallest start-up. Capacity grows with F, so F is found by
 * bisection to the minute. With round-the-clock hours it is planLowerBounds' per-material bound.
 */
export function calendarFinishBound(inst: PlanInstance): number {
  const spells = spellsOf(inst);
  const nowMs = Date.parse(inst.now);
  if (spells.length === 0) return Number.POSITIVE_INFINITY;
  const longest = inst.printers.map((_, k) => longestPlateMinutes(inst, k));
  const work = new Map<string, number>();
  let total = 0;
  let longestPart = 0;
  for (const part of inst.parts) {
    if (!inst.printers.some((p) => p.materials.includes(part.material))) continue;
    work.set(part.material, (work.get(part.material) ?? 0) + part.minutes * part.quantity);
    total += part.minutes * part.quantity;
    longestPart = Math.max(longestPart, part.minutes);
  }
  const first = (spells[0]!.start - nowMs) / MIN + longestPart + Math.min(...inst.printers.map((p) => p.startup_minutes));
  const enough = (F: number) => {
    const caps = inst.printers.map((_, k) => printerCapacityMinutes(spells, nowMs, F, longest[k]!, inst.unattended));
    if (caps.reduce((s, c) => s + c, 0) < total - 1e-6) return false;
    for (const [material, w] of work) {
      const c = inst.printers.reduce((s, p, k) => s + (p.materials.includes(material) ? caps[k]! : 0), 0);
      if (c < w - 1e-6) return false;
    }
    return true;
  };
  let lo = Math.max(first, 0);
  if (enough(lo)) return lo;
  let hi = Math.max(lo * 2, 60);
  while (!enough(hi)) {
    hi *= 2;
    if (hi > HORIZON_MS / MIN) return Number.POSITIVE_INFINITY;
  }
  while (hi - lo > 0.5) {
    const mid = (lo + hi) / 2;
    if (enough(mid)) hi = mid;
    else lo = mid;
  }
  return hi;
}
