import { describe, expect, it } from "vitest";
import { generateInstance, type GenerateOptions } from "@/lib/plan/generate-instance";
import { planWorkshop } from "@/lib/plan/plan";
import { validatePlan } from "@/lib/plan/validate";


// Validity is checked by validatePlan, written from the rules in the brief (one plate or unplaced
// per instance, bed less margin, gap, height, material, attended starts, maintenance windows, no
// overlap in time). Its own fault-finding is tested on broken plans in validator.test.ts.
const cases: GenerateOptions[] = [
  { seed: 11, printers: 3, instances: 40, hours: "all" },
  { seed: 12, printers: 4, instances: 60, hours: "workdays", maintenance: true, changeover: true },
  { seed: 13, printers: 5, instances: 80, hours: "evening", maintenance: true, dueFraction: 0.5 },
  { seed: 14, printers: 2, instances: 30, hours: "workdays", beds: [[120, 120], [300, 200]], materials: ["PLA", "ASA"] },
  { seed: 15, printers: 6, instances: 120, hours: "all", changeover: true, owners: 3 },
];

describe("plans for generated instances are valid (seeded PRNG)", () => {
  for (const c of cases) {
    it(`seed ${c.seed}: ${c.instances} instances on ${c.printers} printers, ${c.hours} hours`, () => {
      const inst = generateInstance(c);
      const out = planWorkshop(inst);
      expect(validatePlan(inst, out)).toEqual([]);
      expect(out.plates.length).toBeGreaterThan(0);
      const placed = out.plates.reduce((s, p) => s + p.items.length, 0);
      expect(placed + out.unplaced.length).toBe(inst.parts.reduce((s, p) => s + p.quantity, 0));
    });
  }

  it("is deterministic for the same input", () => {
    const inst = generateInstance(cases[1]!);
    expect(JSON.stringify(planWorkshop(inst))).toBe(JSON.stringify(planWorkshop(structuredClone(inst))));
  });

  it("lists parts no printer can take as unplaced, with the reason", () => {
    const inst = generateInstance({ seed: 21, printers: 2, instances: 10 });
    inst.parts.push({ ...inst.parts[0]!, id: "too-wide", footprint: [900, 20], quantity: 2, material: "PLA" });
    inst.parts.push({ ...inst.parts[0]!, id: "nylon", material: "PA6", quantity: 1 });
    const out = planWorkshop(inst);
    expect(validatePlan(inst, out)).toEqual([]);
    expect(out.unplaced.filter((u) => u.part === "too-wide")).toHaveLength(2);
    expect(out.unplaced.find((u) => u.part === "nylon")?.reason).toMatch(/no printer takes PA6/);
  });

  it("flags plates that run past closing with a caution", () => {
    const inst = generateInstance({ seed: 22, printers: 2, instances: 30, hours: "workdays" });
    const out = planWorkshop(inst);
    expect(validatePlan(inst, out)).toEqual([]);
    const late = out.plates.filter((p) => p.runs_unattended);
    // Mon-Fri 08:00-18:00 with about 30 parts of 15-150 min on 2 printers: some plate must cross 18:00.
    expect(late.length).toBeGreaterThan(0);
    for (const p of late) expect(p.caution).toMatch(/unattended/i);
    for (const p of out.plates.filter((q) => !q.runs_unattended)) expect(p.caution).toBeNull();
  });

  it("a spool already loaded wins over an otherwise equal printer", () => {
    const inst = generateInstance({ seed: 23, printers: 2, instances: 1, beds: [[220, 220]], materials: ["PLA"], changeover: true });
    inst.printers[0]!.loaded = { material: "PLA", color: "white" };
    inst.printers[1]!.loaded = { material: "PLA", color: inst.parts[0]!.color };
    inst.printers[0]!.startup_minutes = inst.printers[1]!.startup_minutes;
    inst.printers[0]!.height = inst.printers[1]!.height = 250;
    const out = planWorkshop(inst);
    expect(out.plates[0]?.printer).toBe(inst.printers[1]!.id);
  });

  it("shares work between members: a small queue is not held back by a large one", () => {
    const inst = generateInstance({ seed: 24, printers: 1, instances: 1, beds: [[220, 220]], materials: ["PLA"] });
    const base = { ...inst.parts[0]!, footprint: [100, 100] as [number, number], height: 20, minutes: 60, due: null, priority: 0, color: "black" };
    inst.parts = [
      { ...base, id: "big-queue", owner: "ann", quantity: 20 },
      { ...base, id: "small-queue", owner: "bob", quantity: 2 },
    ];
    const out = planWorkshop(inst);
    expect(validatePlan(inst, out)).toEqual([]);
    // Four 100 mm squares fit a plate (210 mm usable), so bob's two must be on the first plate.
    const first = out.plates[0]!;
    expect(first.items.filter((i) => i.part === "small-queue")).toHaveLength(2);
  });
});

