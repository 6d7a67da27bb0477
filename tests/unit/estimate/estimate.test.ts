import { beforeAll, describe, expect, it } from "vitest";
import { calibrationFactor, estimatePart, estimatePlate } from "@/lib/estimate";
import type { PartGeometry } from "@/lib/estimate";
import { PRINTER, SETTINGS, manifold, measure } from "./fixtures";

const PLA = { densityGcm3: 1.24, pricePerKgCents: 2500 }; // NatureWorks Ingeo datasheets (density)
const SOLID = { ...SETTINGS, infill: 1 };

let cube20: PartGeometry;
beforeAll(async () => {
  const { Manifold } = await manifold();
  cube20 = measure(Manifold.cube([20, 20, 20]), 400); // 8000 mm³, 2400 mm² (closed forms)
});

describe("time of one part", () => {
  it("matches a hand-worked solid 20 mm cube", () => {
    // Flow 8 mm³/s (low end of the 8–15 mm³/s standard hotends melt, REFERENCES.md, common practice):
    //   extrusion 8000 mm³ / 8 mm³/s = 1000 s = 16.667 min
    //   layers    100 × 2 s          =  200 s =  3.333 min
    //   start-up                               =  5 min
    //   total                                  = 25 min
    const e = estimatePart(cube20, SOLID, PRINTER, PLA);
    expect(e.time.extrusionMinutes).toBeCloseTo(1000 / 60, 9);
    expect(e.time.layerMinutes).toBeCloseTo(200 / 60, 9);
    expect(e.time.startupMinutes).toBe(5);
    expect(e.time.minutes).toBeCloseTo(25, 9);
    expect(e.grams).toBeCloseTo(9.92, 6);
    expect(e.calibration.samples).toBe(0);
  });

  it("prices the part from its estimate", () => {
    // 9.92 g × 25.00/kg = 24.8 → 25 cents; 25 min × 3.50/h = 145.83 → 146 cents; fee 100.
    const e = estimatePart(cube20, SOLID, PRINTER, PLA, { feeCents: 100 });
    expect(e.cost).toEqual({ materialCents: 25, machineCents: 146, feeCents: 100, totalCents: 271 });
  });

  it("applies a printer's calibration to time, grams and cost", () => {
    // Four finished plates that ran 20 % long and weighed 5 % heavy (invented history).
    const history = [1, 2, 3, 4].map((i) => ({
      estimatedMinutes: 60 * i,
      actualMinutes: 72 * i,
      estimatedGrams: 10 * i,
      actualGrams: 10.5 * i,
    }));
    const calibration = calibrationFactor(history);
    const raw = estimatePart(cube20, SOLID, PRINTER, PLA);
    const cal = estimatePart(cube20, SOLID, PRINTER, PLA, { calibration });
    expect(cal.time.minutes).toBeCloseTo(raw.time.minutes * 1.2, 9);
    expect(cal.time.rawMinutes).toBeCloseTo(raw.time.rawMinutes, 12);
    expect(cal.grams).toBeCloseTo(raw.grams * 1.05, 9);
    expect(cal.rawGrams).toBeCloseTo(raw.rawGrams, 12);
    // 30 min × 3.50/h = 175 cents; 10.416 g × 25.00/kg = 26.04 → 26 cents.
    expect(cal.cost.machineCents).toBe(175);
    expect(cal.cost.materialCents).toBe(26);
    expect(cal.calibration.samples).toBe(4);
  });

  it("gets longer with more infill and a slower printer", () => {
    const sparse = estimatePart(cube20, SETTINGS, PRINTER, PLA);
    const dense = estimatePart(cube20, SOLID, PRINTER, PLA);
    const slow = estimatePart(cube20, SOLID, { ...PRINTER, volumetricFlowMm3s: 4 }, PLA);
    expect(dense.time.minutes).toBeGreaterThan(sparse.time.minutes);
    // Half the flow doubles the extrusion time (definition of the model, hand arithmetic).
    expect(slow.time.extrusionMinutes).toBeCloseTo(2 * dense.time.extrusionMinutes, 9);
  });

  it("refuses a printer with no flow", () => {
    expect(() => estimatePart(cube20, SOLID, { ...PRINTER, volumetricFlowMm3s: 0 }, PLA)).toThrow(RangeError);
  });
});

describe("plate of several parts", () => {
  it("pays the start-up once and each part's layers (default)", () => {
    // Two solid cubes: 2 × (16.667 + 3.333) + 5 = 45 min (hand arithmetic).
    const plate = estimatePlate([{ geometry: cube20, quantity: 2 }], SOLID, PRINTER, PLA);
    expect(plate.time.minutes).toBeCloseTo(45, 9);
    expect(plate.time.startupMinutes).toBe(5);
    expect(plate.grams).toBeCloseTo(2 * 9.92, 6);
    const single = estimatePart(cube20, SOLID, PRINTER, PLA);
    // Printing both on one plate saves exactly one start-up over two separate plates.
    expect(2 * single.time.minutes - plate.time.minutes).toBeCloseTo(PRINTER.startupMinutes, 9);
  });

  it("shares the layer overhead across parts when asked", () => {
    // 2 × 16.667 + 100 × 2 s + 5 = 33.333 + 3.333 + 5 = 41.667 min (hand arithmetic).
    const plate = estimatePlate([{ geometry: cube20 }, { geometry: cube20 }], SOLID, PRINTER, PLA, {
      layerOverhead: "shared",
    });
    expect(plate.time.minutes).toBeCloseTo(125 / 3, 9);
    expect(plate.layers).toBe(100);
  });

  it("counts two entries the same as one entry of quantity two", () => {
    const a = estimatePlate([{ geometry: cube20 }, { geometry: cube20 }], SETTINGS, PRINTER, PLA);
    const b = estimatePlate([{ geometry: cube20, quantity: 2 }], SETTINGS, PRINTER, PLA);
    expect(a.time.minutes).toBeCloseTo(b.time.minutes, 9);
    expect(a.grams).toBeCloseTo(b.grams, 9);
    expect(a.cost).toEqual(b.cost);
  });

  it("keeps per-part lines that add up to the plate", () => {
    const small = { ...cube20, volumeMm3: 1000, areaMm2: 600, heightMm: 10, footprintAreaMm2: 100 };
    const plate = estimatePlate([{ geometry: cube20 }, { geometry: small, quantity: 3 }], SETTINGS, PRINTER, PLA);
    const sumGrams = plate.parts.reduce((s, p) => s + p.rawGrams, 0);
    const sumPrint = plate.parts.reduce((s, p) => s + p.rawPrintMinutes, 0);
    expect(sumGrams).toBeCloseTo(plate.rawGrams, 9);
    expect(sumPrint + PRINTER.startupMinutes).toBeCloseTo(plate.time.rawMinutes, 9);
    expect(plate.layers).toBe(100);
  });

  it("charges nothing for an empty plate", () => {
    const plate = estimatePlate([], SETTINGS, PRINTER, PLA);
    expect(plate.time.minutes).toBe(0);
    expect(plate.cost.totalCents).toBe(0);
  });
});
