import { describe, expect, it } from "vitest";
import { baselinePlan } from "@/lib/plan/baseline";
import { fairnessInstance, generateInstance, lastCopyMinutes } from "@/lib/plan/generate-instance";
import { countTouches } from "@/lib/plan/objective";
import { planWorkshop } from "@/lib/plan/plan";
import { parsePlanInstance, type PlanInstance, type PlanInstanceInput } from "@/lib/plan/schema";
import { validatePlan } from "@/lib/plan/validate";

const parse = (raw: PlanInstanceInput): PlanInstance => {
  const r = parsePlanInstance(raw);
  if (!r.ok) throw new Error(r.errors.join("; "));
  return r.instance;
};
const workdays = [1, 2, 3, 4, 5].map((weekday) => ({ weekday, open: "08:00", close: "18:00" }));
const printer = (id: string, extra: Partial<PlanInstanceInput["printers"][number]> = {}) => ({
  id,
  bed: [220, 220] as [number, number],
  height: 200,
  materials: ["PLA", "PETG", "ABS"],
  nozzle: 0.4,
  startup_minutes: 5,
  ...extra,
});
const part = (id: string, extra: Partial<PlanInstanceInput["parts"][number]> = {}) => ({
  id,
  footprint: [40, 30] as [number, number],
  height: 20,
  minutes: 60,
  material: "PLA",
  color: "black",
  layer_height: 0.2,
  nozzle: 0.4,
  quantity: 2,
  ...extra,
});
const base = { now: "2026-03-23T07:30:00Z", timezone: "Europe/Berlin", margin_mm: 5, gap_mm: 3 };

describe("fair share between members (objective.ts, point 3)", () => {
  // The case: one member sends 120 copies first, five others then send three small copies
  // each, one material group. The light members' last copies must print within a quarter of the
  // time the heavy member's last copy needs, measured from now.
  for (const seed of [1, 2, 3]) {
    it(`seed ${seed}: light members are not kept behind the heavy member`, () => {
      const inst = fairnessInstance(seed);
      const out = planWorkshop(inst);
      expect(validatePlan(inst, out)).toEqual([]);
      const last = lastCopyMinutes(inst, out.plates);
      const heavy = last.get("heavy")!;
      for (let m = 1; m <= 5; m++) expect(last.get(`light-${m}`)!).toBeLessThanOrEqual(0.25 * heavy);
    });
  }
});

describe("unattended printing policy", () => {
  const long = { ...base, attended: workdays, printers: [printer("a"), printer("b")], parts: [part("p", { minutes: 200, quantity: 8 })] };
  it("not allowed: every plate ends by closing", () => {
    const inst = parse({ ...long, unattended: { allowed: false, max_hours: null } });
    const out = planWorkshop(inst);
    expect(validatePlan(inst, out)).toEqual([]);
    expect(out.plates.length).toBeGreaterThan(0);
    expect(out.plates.every((p) => !p.runs_unattended)).toBe(true);
  });
  it("allowed with a cap: no plate runs longer than the cap past closing (validator checks it)", () => {
    const inst = parse({ ...long, unattended: { allowed: true, max_hours: 2 } });
    const out = planWorkshop(inst);
    expect(validatePlan(inst, out)).toEqual([]);
  });
  it("allowed (absent): a plate that runs past closing carries the caution", () => {
    const inst = parse(long);
    const out = planWorkshop(inst);
    expect(validatePlan(inst, out)).toEqual([]);
    for (const p of out.plates.filter((q) => q.runs_unattended)) expect(p.caution).toMatch(/fire risk/);
  });
});

describe("the right spool, the right printer, room for a brim", () => {
  it("ABS goes only to enclosed printers, with the fumes caution; none enclosed leaves it unplaced with the reason", () => {
    const inst = parse({ ...base, attended: workdays, printers: [printer("open", { enclosed: false }), printer("box", { enclosed: true })], parts: [part("abs", { material: "ABS" })] });
    const out = planWorkshop(inst);
    expect(validatePlan(inst, out)).toEqual([]);
    expect(out.plates.map((p) => p.printer)).toEqual(["box"]);
    expect(out.plates[0]!.caution).toMatch(/fumes/);
    const none = parse({ ...base, attended: workdays, printers: [printer("open", { enclosed: false })], parts: [part("abs", { material: "ABS" })] });
    const r = planWorkshop(none);
    expect(r.plates).toEqual([]);
    expect(r.unplaced[0]!.reason).toMatch(/enclosed/);
  });
  it("a colour the workshop has no spool of waits with that reason", () => {
    const inst = parse({ ...base, attended: workdays, printers: [printer("a")], spools: [{ material: "PLA", color: "black" }], parts: [part("g", { material: "PETG", color: "green" }), part("k")] });
    const out = planWorkshop(inst);
    expect(validatePlan(inst, out)).toEqual([]);
    expect(out.unplaced.map((u) => u.reason)).toEqual(["waiting for a PETG green spool: the workshop has none", "waiting for a PETG green spool: the workshop has none"]);
  });
  it("ABS copies keep a 5 mm brim clear of each other (common practice, no source) and the layout sits mid-bed", () => {
    const inst = parse({ ...base, attended: workdays, printers: [printer("box", { enclosed: true })], parts: [part("abs", { material: "ABS", quantity: 6 })] });
    const out = planWorkshop(inst);
    expect(validatePlan(inst, out)).toEqual([]); // the validator grows each footprint by its brim
    const plate = out.plates[0]!;
    const xs = plate.items.map((it) => [it.x - 5, it.x + (it.rotated ? 30 : 40) + 5]);
    const lo = Math.min(...xs.map((x) => x[0]!));
    const hi = Math.max(...xs.map((x) => x[1]!));
    expect(Math.abs((lo + hi) / 2 - 110)).toBeLessThan(1e-6);
  });
  it("a plate goes to the printer already holding its spool; a change is a touch and names both spools", () => {
    const inst = parse({
      ...base,
      attended: workdays,
      printers: [printer("a", { loaded: { material: "PLA", color: "white" }, changeover_minutes: 10 }), printer("b", { loaded: { material: "PETG", color: "green" }, changeover_minutes: 10 })],
      parts: [part("g", { material: "PETG", color: "green", quantity: 1 }), part("w", { color: "white", quantity: 1 }), part("k", { quantity: 1 })],
    });
    const out = planWorkshop(inst);
    expect(validatePlan(inst, out)).toEqual([]);
    const green = out.plates.find((p) => p.material === "PETG")!;
    expect(green.printer).toBe("b");
    expect(green.spool_change).toBeNull();
    const { touches, changes } = countTouches(out.plates);
    expect(out.metrics.touches).toBe(touches);
    expect(out.metrics.spool_changes).toBe(changes);
    const black = out.plates.find((p) => p.color === "black")!;
    expect(black.spool_change?.to).toEqual({ material: "PLA", color: "black" });
  });
});

describe("assembly completion", () => {
  it("reports when each member's assembly's last copy prints", () => {
    const inst = parse({ ...base, attended: workdays, printers: [printer("a"), printer("b", { bed: [180, 180] })], parts: [part("x", { owner: "jun", assembly: "Lamp", quantity: 5 }), part("y", { owner: "jun", assembly: "Lamp", minutes: 300 }), part("z", { owner: "priya" })] });
    const out = planWorkshop(inst);
    expect(validatePlan(inst, out)).toEqual([]);
    expect(out.assemblies).toHaveLength(1);
    const lamp = out.assemblies[0]!;
    const ends = out.plates.filter((p) => p.items.some((it) => it.part === "x" || it.part === "y")).map((p) => Date.parse(p.end));
    expect(lamp).toMatchObject({ owner: "jun", assembly: "Lamp", copies: 7, unplaced: 0 });
    expect(Date.parse(lamp.last_end!)).toBe(Math.max(...ends));
  });
});

describe("the plain baseline the benchmark compares against", () => {
  it("is a valid plan on the benchmark's kind of instance", () => {
    const inst = generateInstance({ seed: 5, printers: 6, instances: 150, hours: "workdays", dueFraction: 0.2, changeover: true });
    const out = baselinePlan(inst);
    expect(validatePlan(inst, out)).toEqual([]);
    expect(out.unplaced).toEqual([]);
  });
});
