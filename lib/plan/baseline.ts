import { createAttendedCalendar } from "@/lib/calendar/attended-hours";
import { checkPartInstance } from "./check-part";
import { computeMetrics } from "./plan";
import { bedRect } from "./layout";
import { rankInstances, type PartInstance } from "./fair-share";
import { brimOf, groupKey, housingAllows, sameSpool } from "./rules";
import type { Plate, PlanInstance, PlanOutput, Printer, Spool, Unplaced } from "./schema";
import { makeTiming } from "./timing";

const MIN = 60_000;

type ShelfPlate = { group: string; spool: Spool; bed: readonly [number, number]; items: { inst: PartInstance; x: number; y: number; rotated: boolean }[]; minutes: number; height: number; extent: [number, number] };

/**
 * The plain method the planner is measured against (bench:plan): per sharing group, shelf packing
 * on the group's largest bed (copies turned long side across, tallest shelf first, next-fit), then
 * longest plate first onto the printer where it can start earliest. No due dates, no spool
 * planning, no fair share. Same rules otherwise (opening hours, take-off at the next opening,
 * changeovers, windows), so its output passes validatePlan.
 */
export function baselinePlan(inst: PlanInstance): PlanOutput {
  const nowMs = Date.parse(inst.now);
  const timing = makeTiming(createAttendedCalendar(inst.timezone, inst.attended), nowMs);
  const m = inst.margin_mm;
  const g = inst.gap_mm;
  const instances = rankInstances(inst.parts, nowMs, 0);
  const takers = new Map<string, Printer[]>();
  const unplaced: Unplaced[] = [];
  const groups = new Map<string, PartInstance[]>();
  for (const x of instances) {
    let t = takers.get(x.part.id);
    if (!t) {
      const housed = inst.printers.filter((p) => housingAllows(p, x.part.material));
      const b = 2 * brimOf(x.part);
      const c = checkPartInstance({ ...x.part, footprint: [x.part.footprint[0] + b, x.part.footprint[1] + b] }, housed, m);
      takers.set(x.part.id, (t = c.ok ? housed.filter((p) => c.printers.includes(p.id)) : []));
    }
    if (t.length === 0) unplaced.push({ part: x.part.id, instance: x.instance, reason: "no printer takes it" });
    else (groups.get(groupKey(x.part)) ?? groups.set(groupKey(x.part), []).get(groupKey(x.part))!).push(x);
  }

  const shelfPlates: ShelfPlate[] = [];
  for (const [key, list] of groups) {
    const bed = takers.get(list[0]!.part.id)!.reduce((a, p) => (p.bed[0] * p.bed[1] > a[0] * a[1] ? p.bed : a), [0, 0] as readonly [number, number]);
    // Each copy lies with its long side across (x) when that fits, shelves tallest first.
    const rects = list
      .map((inst) => {
        const [w, d] = bedRect(inst);
        const across = Math.max(w, d) <= bed[0] - 2 * m ? Math.max(w, d) : Math.min(w, d);
        return { inst, w: across, d: across === w ? d : w, rotated: across !== w };
      })
      .filter((r) => r.w <= bed[0] - 2 * m && r.d <= bed[1] - 2 * m)
      .sort((a, b) => b.d - a.d || a.inst.rank - b.inst.rank);
    let plate: ShelfPlate | null = null;
    let x = m;
    let y = m;
    let shelf = 0;
    for (const r of rects) {
      if (plate && x + r.w > bed[0] - m) {
        x = m;
        y += shelf + g;
        shelf = 0;
      }
      if (!plate || y + r.d > bed[1] - m) {
        plate = { group: key, spool: { material: r.inst.part.material, color: r.inst.part.color }, bed, items: [], minutes: 0, height: 0, extent: [0, 0] };
        shelfPlates.push(plate);
        x = m;
        y = m;
        shelf = 0;
      }
      const brim = brimOf(r.inst.part);
      plate.items.push({ inst: r.inst, x: x + brim, y: y + brim, rotated: r.rotated });
      plate.minutes += r.inst.part.minutes;
      plate.height = Math.max(plate.height, r.inst.part.height);
      plate.extent = [Math.max(plate.extent[0], x + r.w), Math.max(plate.extent[1], y + r.d)];
      x += r.w + g;
      shelf = Math.max(shelf, r.d);
    }
  }

  // Longest plate first, each onto the printer where it can start earliest.
  const lanes = inst.printers.map((p) => ({ p, free: timing.nextOpening(nowMs) ?? Number.POSITIVE_INFINITY, loaded: (p.loaded ?? null) as Spool | null }));
  const timed: { plate: ShelfPlate; printer: Printer; start: number; end: number; change: boolean; from: Spool | null }[] = [];
  for (const plate of [...shelfPlates].sort((a, b) => b.minutes - a.minutes)) {
    let best: (typeof timed)[number] | null = null;
    let bestLane: (typeof lanes)[number] | null = null;
    for (const lane of lanes) {
      const p = lane.p;
      const fits = plate.items.every((it) => takers.get(it.inst.part.id)!.includes(p)) && plate.extent[0] <= p.bed[0] - m + 1e-6 && plate.extent[1] <= p.bed[1] - m + 1e-6;
      if (!fits) continue;
      const change = !sameSpool(lane.loaded, plate.spool);
      const minutes = (change ? p.changeover_minutes : 0) + p.startup_minutes + plate.minutes;
      const start = timing.earliestStart(p, lane.free, minutes);
      if (start === null) continue;
      if (!best || start < best.start) {
        best = { plate, printer: p, start, end: start + minutes * MIN, change, from: lane.loaded };
        bestLane = lane;
      }
    }
    if (!best || !bestLane) {
      for (const it of plate.items) unplaced.push({ part: it.inst.part.id, instance: it.inst.instance, reason: "no printer could take the plate" });
      continue;
    }
    timed.push(best);
    bestLane.free = timing.readyAfter(best.end);
    bestLane.loaded = plate.spool;
  }
  const plates: Plate[] = timed
    .sort((a, b) => a.start - b.start || (a.printer.id < b.printer.id ? -1 : 1))
    .map((t, i) => {
      const closing = timing.closingAfter(t.start);
      const unattended = closing !== null && t.end > closing;
      return {
        id: `base-${String(i + 1).padStart(3, "0")}`,
        printer: t.printer.id,
        material: t.plate.spool.material,
        color: t.plate.spool.color,
        start: new Date(t.start).toISOString(),
        end: new Date(t.end).toISOString(),
        items: t.plate.items.map((it) => ({ part: it.inst.part.id, instance: it.inst.instance, x: it.x, y: it.y, rotated: it.rotated })),
        runs_unattended: unattended,
        caution: null,
        spool_change: t.change ? { from: t.from, to: t.plate.spool } : null,
      };
    });
  return { plates, unplaced, metrics: computeMetrics(inst, plates), assemblies: [] };
}
