import { beforeAll, describe, expect, it } from "vitest";
import { generateInstance } from "@/lib/plan/generate-instance";
import { computeMetrics, planWorkshop } from "@/lib/plan/plan";
import { validatePlan } from "@/lib/plan/validate";
import type { PlanInstance, PlanOutput } from "@/lib/plan/schema";

// The validator must catch each kind of fault: break a valid plan one way at a time.
let inst: PlanInstance;
let good: PlanOutput;
beforeAll(() => {
  inst = generateInstance({ seed: 41, printers: 3, instances: 40, hours: "workdays", maintenance: true, changeover: true });
  good = planWorkshop(inst);
});
const broken = (f: (o: PlanOutput) => void, refreshMetrics = true): string[] => {
  const o = structuredClone(good);
  f(o);
  if (refreshMetrics) o.metrics = computeMetrics(inst, o.plates);
  return validatePlan(inst, o);
};
const multi = () => good.plates.findIndex((p) => p.items.length >= 2);
const shift = (iso: string, minutes: number) => new Date(Date.parse(iso) + minutes * 60_000).toISOString();

describe("validatePlan catches broken plans", () => {
  it("accepts the planner's own plan", () => {
    expect(validatePlan(inst, good)).toEqual([]);
  });
  it("overlapping items", () => {
    const errs = broken((o) => {
      const p = o.plates[multi()]!;
      p.items[1]!.x = p.items[0]!.x;
      p.items[1]!.y = p.items[0]!.y;
    });
    expect(errs.join("\n")).toMatch(/overlaps|closer than/);
  });
  it("items closer than the gap", () => {
    const o = structuredClone(good);
    const p = o.plates[multi()]!;
    const a = p.items[0]!;
    const part = inst.parts.find((q) => q.id === a.part)!;
    const w = a.rotated ? part.footprint[1] : part.footprint[0];
    // Put item 1 just right of item 0, 1 mm apart (gap is 3 mm), same y.
    p.items[1]!.x = a.x + w + 1;
    p.items[1]!.y = a.y;
    o.metrics = computeMetrics(inst, o.plates);
    expect(validatePlan(inst, o).join("\n")).toMatch(/closer than 3 mm|leaves the bed/);
  });
  it("an item inside the margin", () => {
    expect(broken((o) => (o.plates[0]!.items[0]!.x = inst.margin_mm - 1)).join("\n")).toMatch(/margin/);
  });
  it("an instance on two plates, and one missing", () => {
    expect(broken((o) => o.plates[1]!.items.push({ ...o.plates[0]!.items[0]!, x: -500 })).join("\n")).toMatch(/appears twice/);
    expect(broken((o) => o.plates[0]!.items.pop()).join("\n")).toMatch(/neither on a plate nor unplaced/);
  });
  it("a plate on a printer that lacks its material or nozzle", () => {
    const errs = broken((o) => (o.plates[0]!.material = "UNOBTAINIUM"));
    expect(errs.join("\n")).toMatch(/does not take UNOBTAINIUM/);
  });
  it("a start outside attended hours", () => {
    // 03:00 Berlin on the first day is closed (hours are Mon-Fri 08:00-18:00).
    const errs = broken((o) => {
      o.plates[0]!.start = "2026-03-24T02:00:00.000Z";
      o.plates[0]!.end = shift("2026-03-24T02:00:00.000Z", 6000);
    });
    expect(errs.join("\n")).toMatch(/outside attended hours/);
  });
  it("two plates overlapping on one printer", () => {
    const errs = broken((o) => {
      const lane = o.plates.filter((p) => p.printer === o.plates[0]!.printer);
      lane[1]!.start = shift(lane[0]!.start, 1);
    });
    expect(errs.join("\n")).toMatch(/overlaps|lasts/);
  });
  it("a plate shorter than its parts need", () => {
    expect(broken((o) => (o.plates[0]!.end = shift(o.plates[0]!.start, 1))).join("\n")).toMatch(/needs/);
  });
  it("a plate inside a maintenance window", () => {
    const o = structuredClone(good);
    const p = o.plates[0]!;
    const printer = inst.printers.find((q) => q.id === p.printer)!;
    const saved = printer.unavailable;
    printer.unavailable = [{ from: shift(p.start, 10), to: shift(p.start, 20) }];
    const errs = validatePlan(inst, o);
    printer.unavailable = saved;
    expect(errs.join("\n")).toMatch(/unavailable window/);
  });
  it("metrics that do not match the plates", () => {
    expect(broken((o) => (o.metrics.plates += 1), false).join("\n")).toMatch(/metrics.plates/);
  });
  it("an unplaced entry without a reason", () => {
    expect(
      broken((o) => {
        const it = o.plates[0]!.items.pop()!;
        o.unplaced.push({ part: it.part, instance: it.instance, reason: " " });
      }).join("\n"),
    ).toMatch(/no reason/);
  });
});
