import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { checkPartInstance } from "@/lib/plan/check-part";
import { parsePlanInstance } from "@/lib/plan/schema";
import { planWorkshop } from "@/lib/plan/plan";
import { validatePlan } from "@/lib/plan/validate";

const printers = [
  { id: "a", bed: [220, 220] as [number, number], height: 250, materials: ["PLA", "PETG"], nozzle: 0.4 },
  { id: "b", bed: [300, 150] as [number, number], height: 150, materials: ["PLA"], nozzle: 0.4 },
];
const part = { footprint: [100, 100] as [number, number], height: 50, material: "PLA", nozzle: 0.4 };

describe("checkPartInstance (worked examples, from the definition)", () => {
  it("accepts a part on every printer it fits", () => {
    expect(checkPartInstance(part, printers, 5)).toEqual({ ok: true, printers: ["a", "b"] });
  });
  it("a 280 × 100 footprint fits only the 300 × 150 bed less 5 mm margins (290 × 140)", () => {
    expect(checkPartInstance({ ...part, footprint: [280, 100] }, printers, 5)).toEqual({ ok: true, printers: ["b"] });
    // Turned 90°: 100 × 280 also fits b.
    expect(checkPartInstance({ ...part, footprint: [100, 280] }, printers, 5)).toEqual({ ok: true, printers: ["b"] });
  });
  it("gives the reason when nothing fits", () => {
    expect(checkPartInstance({ ...part, material: "ABS" }, printers, 5)).toMatchObject({ ok: false, reason: "no printer takes ABS" });
    expect(checkPartInstance({ ...part, nozzle: 0.6 }, printers, 5)).toMatchObject({ ok: false, reason: expect.stringMatching(/0.6 mm nozzle/) });
    expect(checkPartInstance({ ...part, footprint: [295, 100] }, printers, 5)).toMatchObject({ ok: false, reason: expect.stringMatching(/does not fit any bed/) });
    expect(checkPartInstance({ ...part, footprint: [250, 100], height: 200 }, printers, 5)).toMatchObject({ ok: false, reason: expect.stringMatching(/height 200 mm/) });
  });
});

describe("instance schema", () => {
  it("reads the documented example and plans it validly", () => {
    const r = parsePlanInstance(JSON.parse(readFileSync("examples/plan-instance.json", "utf8")));
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const out = planWorkshop(r.instance);
    expect(validatePlan(r.instance, out)).toEqual([]);
    expect(out.unplaced.map((u) => u.part)).toEqual(["tall-mast"]);
  });
  it("names the field in errors", () => {
    const r = parsePlanInstance({ now: "soon", timezone: "UTC", attended: [{ weekday: 9, open: "8", close: "18:00" }], margin_mm: 5, gap_mm: 2, printers: [], parts: [] });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    const text = r.errors.join("\n");
    expect(text).toMatch(/^now: /m);
    expect(text).toMatch(/attended\[0\]\.weekday/);
    expect(text).toMatch(/attended\[0\]\.open: must be HH:MM/);
    expect(text).toMatch(/^printers: /m);
  });
});
