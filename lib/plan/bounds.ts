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
