import highsLoader from "highs";
import { describe, expect, it } from "vitest";
import { planLowerBounds, platesForFinishBound } from "@/lib/plan/bounds";
import { generateInstance } from "@/lib/plan/generate-instance";
import { planWorkshop } from "@/lib/plan/plan";
import type { PlanInstance } from "@/lib/plan/schema";

/**
 * platesForFinishBound is the optimum of a linear programme (README.md, "Lower bounds"): parts
 * split freely between printers, each printer's minutes <= F, plates = area on a printer / its bed
 * area (parts grown by the gap). We solve that same LP with the HiGHS solver (npm `highs`) and
 * compare: the closed form (flattest parts to the largest beds) must equal the LP optimum.
 */
async function lpOptimum(inst: PlanInstance, finish: number): Promise<number> {
  const highs = await highsLoader();
  const m = inst.margin_mm;
  const g = inst.gap_mm;
  const obj: string[] = [];
  const rows: string[] = [];
  const cap = inst.printers.map(() => [] as string[]);
  inst.parts.forEach((part, i) => {
    const area = (part.footprint[0] + g) * (part.footprint[1] + g) * part.quantity;
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
  cap.forEach((t, k) => rows.push(` c${k}: ${t.join(" + ")} <= ${finish}`));
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
