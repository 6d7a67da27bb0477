import highsLoader from "highs";
import { createAttendedCalendar } from "@/lib/calendar/attended-hours";
import { calendarCapacities } from "@/lib/plan/bounds";
import { generateInstance } from "@/lib/plan/generate-instance";
import { paddedArea, usableArea } from "@/lib/plan/layout";
import { touchMinutes } from "@/lib/plan/objective";
import { groupKey, housingAllows } from "@/lib/plan/rules";
import type { PlanInstance } from "@/lib/plan/schema";

/**
 * Small instances against the HiGHS optimum of the documented objective (objective.ts): no due
 * dates, so the cost is touches × touch_minutes + finish. HiGHS (npm `highs`) solves a relaxation
 * whose optimum is a lower bound on any plan's cost, so ours within 10 % of it is within 10 % of
 * the true optimum:
 * - y_ik: copy i on printer k (binary, only where the printer takes it); n_gk: plates of sharing
 *   group g on printer k (integer); u_gk: group g used on printer k (binary);
 * - area: Σ_i∈g padded area × y_ik ≤ usable bed area × n_gk (a plate holds at most its bed);
 * - changes: Σ_g u_gk, less one when the printer's loaded spool is among them (each group in one
 *   run is the least any order needs);
 * - time: Σ_i minutes × y_ik + start-up × Σ_g n_gk ≤ the printer's calendar capacity by F
 *   (bounds.ts: open minutes, plus at most one plate across each closed stretch; here unattended
 *   printing is not allowed, so only open minutes count and the capacity is exact about nights);
 * - spells: Σ_i∈g minutes × y_ik ≤ (longest open spell − start-up) × n_gk (no plate runs past closing).
 * touches*(F) falls as F grows, so over a grid F_0 < F_1 < … the bound is
 * min_j T × touches*(F_{j+1}) + F_j.
 */
export async function objectiveLowerBound(inst: PlanInstance, finishHi: number): Promise<number> {
  const highs = await highsLoader();
  const T = touchMinutes(inst);
  const copies = inst.parts.flatMap((p) => Array.from({ length: p.quantity }, (_, k) => ({ part: p, k })));
  const groups = [...new Set(inst.parts.map((p) => groupKey(p)))];
  const takes = (c: (typeof copies)[number], k: number) => {
    const p = inst.printers[k]!;
    return p.materials.includes(c.part.material) && housingAllows(p, c.part.material) && c.part.height <= p.height;
  };
  const spell = createAttendedCalendar(inst.timezone, inst.attended).longestSpellMinutes();
  const touchesBy = (F: number): number => {
    const caps = calendarCapacities(inst, F);
    const obj: string[] = [];
    const rows: string[] = [];
    const bins: string[] = [];
    const ints: string[] = [];
    copies.forEach((c, i) => {
      const terms = inst.printers.map((_, k) => (takes(c, k) ? `y_${i}_${k}` : null)).filter((v): v is string => v !== null);
      bins.push(...terms);
      rows.push(` a${i}: ${terms.join(" + ")} = 1`);
    });
    inst.printers.forEach((p, k) => {
      const time: string[] = [];
      const used: string[] = [];
      groups.forEach((g, gi) => {
        const members = copies.map((c, i) => ({ c, i })).filter(({ c }) => groupKey(c.part) === g && takes(c, k));
        const n = `n_${gi}_${k}`;
        const u = `u_${gi}_${k}`;
        ints.push(n);
        bins.push(u);
        obj.push(`${2 * T} ${n}`, `${T} ${u}`);
        used.push(u);
        const area = members.map(({ c, i }) => `${paddedArea({ part: c.part }, inst.gap_mm)} y_${i}_${k}`);
        rows.push(` ar${gi}_${k}: ${area.length ? area.join(" + ") + " - " : ""}${usableArea(p.bed, inst.margin_mm, inst.gap_mm)} ${n} <= 0`);
        members.forEach(({ i }) => rows.push(` us${gi}_${k}_${i}: y_${i}_${k} - ${u} <= 0`));
        rows.push(` un${gi}_${k}: ${n} - ${members.length} ${u} <= 0`);
        // No plate may run past closing here, so none is longer than the longest open spell.
        const mins = members.map(({ c, i }) => `${c.part.minutes} y_${i}_${k}`);
        if (mins.length) rows.push(` sp${gi}_${k}: ${mins.join(" + ")} - ${spell - p.startup_minutes} ${n} <= 0`);
        time.push(`${p.startup_minutes} ${n}`);
        members.forEach(({ c, i }) => time.push(`${c.part.minutes} y_${i}_${k}`));
        const loaded = p.loaded && groupKey({ ...c0(members), material: p.loaded.material, color: p.loaded.color }) === g;
        if (loaded) obj.push(`-${T} ${u}`);
      });
      rows.push(` t${k}: ${time.join(" + ")} <= ${caps[k]}`);
    });
    const lp = ["Minimize", ` obj: ${obj.join(" + ").replace(/\+ -/g, "- ")}`, "Subject To", ...rows, "Bounds", ...ints.map((n) => ` 0 <= ${n} <= 20`), "General", ` ${ints.join(" ")}`, "Binaries", ` ${bins.join(" ")}`, "End"].join("\n");
    const r = highs.solve(lp, { output_flag: false, mip_rel_gap: 0 });
    if (r.Status === "Infeasible") return Number.POSITIVE_INFINITY;
    if (r.Status !== "Optimal") throw new Error(`HiGHS: ${r.Status}`);
    // With the loaded spool's group used, the -T term can make the objective one touch short of the
    // changes' floor of zero; touches are never negative.
    return Math.max(0, r.ObjectiveValue);
  };
  const step = 60;
  let best = Number.POSITIVE_INFINITY;
  let next = touchesBy(step);
  for (let F = 0; F <= finishHi; F += step) {
    const t = next;
    next = touchesBy(F + 2 * step);
    if (Number.isFinite(t)) best = Math.min(best, t + F);
  }
  return best;
}
const c0 = (members: { c: { part: PlanInstance["parts"][number] } }[]) => members[0]?.c.part ?? { layer_height: 0.2, nozzle: 0.4 };


/** The small instances (3 printers, Mon-Fri opening hours, a loaded spool, no unattended runs). */
export function smallInstance(seed: number): PlanInstance {
  const base = generateInstance({ seed, printers: 3, instances: 10 + (seed % 3) * 3, hours: "workdays", dueFraction: 0, changeover: true, beds: [[180, 180], [220, 220], [256, 256]] });
  return { ...base, unattended: { allowed: false, max_hours: null }, parts: base.parts.map((p) => ({ ...p, minutes: Math.min(p.minutes, 240) })) };
}
