import highsLoader from "highs";
import { describe, expect, it } from "vitest";
import { calendarCapacities, calendarFinishBound, planLowerBounds, platesForFinishBound, printerCapacityMinutes } from "@/lib/plan/bounds";
import { createAttendedCalendar } from "@/lib/calendar/attended-hours";
import { footprintWithBrim } from "@/lib/plan/rules";
import { generateInstance } from "@/lib/plan/generate-instance";
import { planWorkshop } from "@/lib/plan/plan";
import type { PlanInstance } from "@/lib/plan/schema";

/**
 * platesForFinishBound is the optimum of a linear programme (README.md, "Lower bounds"): parts
 * split freely between printers, each printer's minutes <= F, plates = area on a printer / its bed
 * area (parts grown by the gap). We solve that same LP with the HiGHS solver (npm `highs`) and
 * compare: the closed form (flattest parts to the largest beds) must equal the LP optimum.
 */
async function lpOptimum(inst: PlanInstance, finish: number, caps: number[] = inst.printers.map(() => finish)): Promise<number> {
  const highs = await highsLoader();
  const m = inst.margin_mm;
  const g = inst.gap_mm;
  const obj: string[] = [];
  const rows: string[] = [];
  const cap = inst.printers.map(() => [] as string[]);
  inst.parts.forEach((part, i) => {
    const [fw, fd] = footprintWithBrim(part);
    const area = (fw + g) * (fd + g) * part.quantity;
    const terms: string[] = [];
    inst.printers.forEach((p, k) => {
      const v = `y_${i}_${k}`;
      const bed = (p.bed[0] - 2 * m + g) * (p.bed[1] - 2 * m + g);
      obj.push(`${area / bed} ${v}`);
      terms.push(v);
      cap[k]!.push(`${part.minutes * part.quantity} ${v}`);
    });
    rows.push(` a${i}: ${terms.join(" + ")} = 1`);
  });
  cap.forEach((t, k) => rows.push(` c${k}: ${t.join(" + ")} <= ${caps[k]}`));
  const lp = ["Minimize", ` obj: ${obj.join(" + ")}`, "Subject To", ...rows, "End"].join("\n");
  const r = highs.solve(lp, { output_flag: false });
  if (r.Status !== "Optimal") throw new Error(`HiGHS: ${r.Status}`);
  return r.ObjectiveValue;
}

describe("plates needed for a given finish (LP bound)", () => {
  for (const seed of [301, 302, 303]) {
    it(`seed ${seed}: the closed form equals the HiGHS LP optimum`, async () => {
      const inst = generateInstance({ seed, printers: 4, instances: 40, hours: "all", beds: [[150, 150], [200, 200], [256, 256]] });
      const lb = planLowerBounds(inst);
      for (const factor of [1, 1.15, 1.5]) {
        const finish = factor * lb.finishMinutes;
        expect(platesForFinishBound(inst, finish)).toBeCloseTo(await lpOptimum(inst, finish), 6);
      }
    });
  }

  // The calendar-aware version: each printer's capacity is what the opening hours allow by F
  // (open minutes, plus per closed stretch after an opening at most one plate). The same LP with
  // those capacities, solved by HiGHS, must equal the closed form.
  for (const seed of [321, 322, 323]) {
    it(`seed ${seed}: with opening hours, the closed form equals the HiGHS LP optimum`, async () => {
      const inst = { ...generateInstance({ seed, printers: 4, instances: 40, hours: "workdays", beds: [[150, 150], [200, 200], [256, 256]] }) };
      const f0 = calendarFinishBound(inst);
      expect(Number.isFinite(f0)).toBe(true);
      for (const factor of [1, 1.3, 2]) {
        const finish = factor * f0;
        const caps = calendarCapacities(inst, finish);
        expect(platesForFinishBound(inst, finish, { calendar: true })).toBeCloseTo(await lpOptimum(inst, finish, caps), 6);
      }
      // With unattended printing not allowed, only open minutes count: never more capacity.
      const strict = { ...inst, unattended: { allowed: false, max_hours: null } };
      expect(calendarFinishBound(strict)).toBeGreaterThanOrEqual(f0);
    });
  }

  it("printer capacity: open minutes plus at most one plate across each closed stretch (worked example)", () => {
    // Mon-Fri 08:00-18:00 UTC, from Monday 08:00 for 48 h: open Mon 10 h + Tue 10 h + Wed 08:00-08:00 = 0,
    // closed Mon 18:00-Tue 08:00 (14 h) and Tue 18:00-Wed 08:00 (14 h). Hand-worked, common practice, no source.
    const cal = createAttendedCalendar("UTC", [1, 2, 3, 4, 5].map((weekday) => ({ weekday, open: "08:00", close: "18:00" })));
    const now = Date.UTC(2026, 2, 23, 8, 0); // a Monday
    const spells = cal.openIntervals(now, now + 10 * 86_400_000);
    expect(printerCapacityMinutes(spells, now, 48 * 60, 1e9, undefined)).toBe(20 * 60 + 28 * 60); // plates across both nights
    expect(printerCapacityMinutes(spells, now, 48 * 60, 6 * 60, undefined)).toBe(20 * 60 + 12 * 60); // the longest plate is 6 h
    expect(printerCapacityMinutes(spells, now, 48 * 60, 1e9, { allowed: false, max_hours: null })).toBe(20 * 60); // no unattended runs
    expect(printerCapacityMinutes(spells, now, 48 * 60, 1e9, { allowed: true, max_hours: 2 })).toBe(20 * 60 + 4 * 60); // 2 h past closing
  });

  it("is infinite when the printers cannot print every minute in time", () => {
    const inst = generateInstance({ seed: 304, printers: 3, instances: 20, hours: "all" });
    const total = inst.parts.reduce((s, p) => s + p.minutes * p.quantity, 0);
    expect(platesForFinishBound(inst, (0.9 * total) / inst.printers.length)).toBe(Number.POSITIVE_INFINITY);
  });

  // A plan's own finish is a finish it meets, so its plates can never be fewer than the bound
  // for that finish (round-the-clock hours, no maintenance, so nothing else stretches the time).
  for (const seed of [311, 312, 313]) {
    it(`seed ${seed}: a plan uses at least the plates its own finish needs`, () => {
      const inst = generateInstance({ seed, printers: 6, instances: 150, hours: "all", dueFraction: 0.2 });
      const out = planWorkshop(inst);
      expect(out.unplaced).toEqual([]);
      expect(out.metrics.plates).toBeGreaterThanOrEqual(Math.ceil(platesForFinishBound(inst, out.metrics.makespan_minutes) - 1e-6));
    });
  }
});
