import { groupKey } from "./pack";
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
    g.area += part.footprint[0] * part.footprint[1] * part.quantity;
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
 * Plates that any plan needs if it is to finish within `finishMinutes` of `now` (round-the-clock
 * hours). Each printer then prints at most `finishMinutes` of part time, and a plate holds at most
 * its bed's area: parts at least the gap apart and the margin from the edge, each grown by half the
 * gap on every side, lie apart inside the bed less the margins plus one gap, so a plate's parts
 * take at most (width - 2·margin + gap) × (depth - 2·margin + gap) of (w + gap) × (d + gap) areas.
 * The bound is the fractional relaxation: min Σ plates = Σ_k (area printed on k) / (bed area of k)
 * subject to each printer's minutes <= finishMinutes, parts split freely between printers. Material,
 * height and start-up limits are dropped, which can only lower it. With costs (area / minutes of a
 * part) × (1 / bed area), a product form, the optimum sends the flattest parts (most area per
 * minute) to the largest beds until their time is used, then the next (rearrangement inequality;
 * tests/unit/plan/bounds.test.ts checks it against the HiGHS LP optimum).
 * Returns the fractional value (round up for a count); Infinity when the printers cannot print
 * all minutes within `finishMinutes` at all.
 */
export function platesForFinishBound(inst: PlanInstance, finishMinutes: number): number {
  const m = inst.margin_mm;
  const g = inst.gap_mm;
  const beds = inst.printers
    .map((p) => (p.bed[0] - 2 * m + g) * (p.bed[1] - 2 * m + g))
    .filter((a) => a > 0)
    .sort((a, b) => b - a);
  const items = inst.parts
    .filter((part) => inst.printers.some((p) => p.materials.includes(part.material)))
    .map((part) => ({ area: (part.footprint[0] + g) * (part.footprint[1] + g) * part.quantity, minutes: part.minutes * part.quantity }))
    .sort((a, b) => b.area * a.minutes - a.area * b.minutes); // most area per minute first
  let plates = 0;
  let k = 0;
  let left = beds.length ? finishMinutes : 0;
  for (const it of items) {
    if (it.minutes <= 0) {
      if (beds.length === 0) return Number.POSITIVE_INFINITY;
      plates += it.area / beds[0]!;
      continue;
    }
    let minutes = it.minutes;
    while (minutes > 1e-9) {
      if (k >= beds.length) return Number.POSITIVE_INFINITY;
      const take = Math.min(minutes, left);
      plates += (it.area * take) / it.minutes / beds[k]!;
      minutes -= take;
      left -= take;
      if (left <= 1e-9) {
        k++;
        left = finishMinutes;
      }
    }
  }
  return plates;
}
