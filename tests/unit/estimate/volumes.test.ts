import { beforeAll, describe, expect, it } from "vitest";
import { estimateVolumes, gramsOf, layerCount } from "@/lib/estimate";
import type { PartGeometry } from "@/lib/estimate";
import { SETTINGS, manifold, measure, seededRandom } from "./fixtures";

let cube20: PartGeometry;
beforeAll(async () => {
  const { Manifold } = await manifold();
  // 20 mm cube built by manifold-3d; closed form a³ = 8000 mm³, 6a² = 2400 mm² (REFERENCES.md
  // "Geometry"), footprint a² = 400 mm².
  cube20 = measure(Manifold.cube([20, 20, 20]), 400);
});

describe("layer count", () => {
  // Definition: one layer for each started layer height, ceil(height / layer height) (common
  // practice, no source). Oracle: exact integer arithmetic in micrometres, free of float noise.
  const ceilMicrons = (heightUm: number, layerUm: number) => Math.floor((heightUm + layerUm - 1) / layerUm);

  it.each([
    [20, 0.2],
    [0.6, 0.2],
    [1.1, 0.1],
    [0.3, 0.1],
    [0.7, 0.1],
    [4.8, 0.12],
    [35.7, 0.3],
    [10.05, 0.2],
    [12.34, 0.12],
    [100, 0.28],
    [0.05, 0.2],
    [250, 0.08],
  ])("height %s mm at %s mm layers", (h, lh) => {
    expect(layerCount(h, lh)).toBe(ceilMicrons(Math.round(h * 1000), Math.round(lh * 1000)));
  });

  it("is exact on every multiple of common layer heights", () => {
    const wrong: string[] = [];
    for (const layerUm of [50, 80, 100, 120, 150, 160, 200, 240, 250, 280, 300]) {
      const lh = layerUm / 1000;
      for (let k = 1; k <= 1500; k++) {
        // The height as a user would type it (decimal string), and as k × lh in floats.
        const typed = Number(((k * layerUm) / 1000).toFixed(3));
        if (layerCount(typed, lh) !== k) wrong.push(`${typed}/${lh}`);
        if (layerCount(k * lh, lh) !== k) wrong.push(`${k}×${lh}`);
        // One micrometre more starts a new layer.
        if (layerCount(typed + 0.001, lh) !== k + 1) wrong.push(`${typed}+0.001/${lh}`);
      }
    }
    expect(wrong).toEqual([]);
  });

  it("gives 20 / 0.2 = 100 exactly and 0 for a flat part", () => {
    expect(layerCount(20, 0.2)).toBe(100);
    expect(layerCount(0, 0.2)).toBe(0);
  });

  it("refuses a zero or negative layer height", () => {
    expect(() => layerCount(10, 0)).toThrow(RangeError);
    expect(() => layerCount(-1, 0.2)).toThrow(RangeError);
  });
});

describe("volume breakdown", () => {
  it("gets the cube's measurements from the reference library", () => {
    // Closed forms for a cube (REFERENCES.md "Geometry"), via manifold-3d.
    expect(cube20.volumeMm3).toBeCloseTo(8000, 6);
    expect(cube20.areaMm2).toBeCloseTo(2400, 6);
    expect(cube20.heightMm).toBeCloseTo(20, 9);
  });

  it("weighs a 20 mm cube at 100 % infill as 8 cm³ × density", () => {
    // 8 cm³ × 1.24 g/cm³ (PLA, NatureWorks Ingeo datasheets) = 9.92 g.
    const v = estimateVolumes(cube20, { ...SETTINGS, infill: 1 });
    expect(v.wallMm3 + v.shellMm3 + v.infillMm3).toBeCloseTo(8000, 6);
    expect(v.supportMm3).toBe(0);
    expect(gramsOf(v.extrudedMm3, 1.24)).toBeCloseTo(9.92, 6);
  });

  it("splits a 20 mm cube at 20 % infill as worked by hand", () => {
    // Hand arithmetic of the documented model (README.md), layer 0.2, 2 walls of 0.45, 4 + 3 shells:
    //   shell  = 400 mm² × (4 + 3) × 0.2 mm  =  560 mm³
    //   wall   = 2 × 0.45 mm × 2400 mm²       = 2160 mm³
    //   infill = 0.2 × (8000 − 560 − 2160)    = 1056 mm³
    //   total  = 3776 mm³ → × 1.24 g/cm³      = 4.68224 g
    const v = estimateVolumes(cube20, SETTINGS);
    expect(v.shellMm3).toBeCloseTo(560, 6);
    expect(v.wallMm3).toBeCloseTo(2160, 6);
    expect(v.infillMm3).toBeCloseTo(1056, 6);
    expect(v.extrudedMm3).toBeCloseTo(3776, 6);
    expect(gramsOf(v.extrudedMm3, 1.24)).toBeCloseTo(4.68224, 6);
    expect(v.layers).toBe(100);
  });

  it("prints a thin plate solid whatever the infill", () => {
    // 100 × 100 × 1 mm: 10 000 mm³ (closed form); the shells alone would need 14 000 mm³.
    const plate = { volumeMm3: 10_000, areaMm2: 20_400, heightMm: 1, footprintAreaMm2: 10_000 };
    for (const infill of [0, 0.5, 1]) {
      const v = estimateVolumes(plate, { ...SETTINGS, infill });
      expect(v.extrudedMm3).toBeCloseTo(10_000, 6);
      expect(v.wallMm3 + v.shellMm3).toBeLessThanOrEqual(10_000);
    }
  });

  it("never puts more than the volume into walls, shells and infill (random solids)", async () => {
    // Solids from manifold-3d; footprints from closed forms: box x·y, cylinder of an n-gon
    // (n/2)r² sin(2π/n) (REFERENCES.md "Geometry").
    const { Manifold } = await manifold();
    const rand = seededRandom(20240611);
    for (let i = 0; i < 60; i++) {
      const a = 1 + rand() * 60;
      const b = 1 + rand() * 60;
      const c = 0.3 + rand() * 80;
      const n = 8 + Math.floor(rand() * 56);
      const part =
        i % 2 === 0
          ? measure(Manifold.cube([a, b, c]), a * b)
          : measure(Manifold.cylinder(c, a / 2, a / 2, n), (n / 2) * (a / 2) ** 2 * Math.sin((2 * Math.PI) / n));
      const settings = {
        layerHeightMm: [0.1, 0.2, 0.28][i % 3] as number,
        wallCount: Math.floor(rand() * 6),
        lineWidthMm: 0.3 + rand() * 0.5,
        topLayers: Math.floor(rand() * 8),
        bottomLayers: Math.floor(rand() * 8),
        infill: rand(),
      };
      const v = estimateVolumes(part, settings);
      const model = v.wallMm3 + v.shellMm3 + v.infillMm3;
      expect(model).toBeLessThanOrEqual(part.volumeMm3 * (1 + 1e-12));
      expect(Math.min(v.wallMm3, v.shellMm3, v.infillMm3)).toBeGreaterThanOrEqual(0);
      const full = estimateVolumes(part, { ...settings, infill: 1 });
      expect(full.wallMm3 + full.shellMm3 + full.infillMm3).toBeCloseTo(part.volumeMm3, 6);
      expect(full.extrudedMm3).toBeGreaterThanOrEqual(v.extrudedMm3);
    }
  });

  it("adds support only when support is used", () => {
    const withRegion = { ...cube20, supportVolumeMm3: 1000 };
    expect(estimateVolumes(withRegion, SETTINGS).supportMm3).toBe(0);
    const v = estimateVolumes(withRegion, { ...SETTINGS, supportDensity: 0.15 });
    // 1000 mm³ region × 0.15 fill = 150 mm³ (hand arithmetic).
    expect(v.supportMm3).toBeCloseTo(150, 9);
    expect(v.extrudedMm3).toBeCloseTo(3776 + 150, 6);
  });

  it("uses half the surface area for the shells when the footprint is missing", () => {
    // A thin flat plate's area is almost exactly twice its footprint (closed form), so A/2 ≈ footprint.
    const plate = { volumeMm3: 200 * 200 * 0.4, areaMm2: 2 * 200 * 200 + 4 * 200 * 0.4, heightMm: 0.4 };
    const withFootprint = estimateVolumes({ ...plate, footprintAreaMm2: 40_000 }, { ...SETTINGS, topLayers: 1, bottomLayers: 1 });
    const without = estimateVolumes(plate, { ...SETTINGS, topLayers: 1, bottomLayers: 1 });
    expect(without.shellMm3 / withFootprint.shellMm3).toBeCloseTo(1, 2);
  });

  it("refuses infill outside 0..1 and negative measurements", () => {
    expect(() => estimateVolumes(cube20, { ...SETTINGS, infill: 1.2 })).toThrow(RangeError);
    expect(() => estimateVolumes({ ...cube20, volumeMm3: -1 }, SETTINGS)).toThrow(RangeError);
    expect(() => estimateVolumes({ ...cube20, areaMm2: Number.NaN }, SETTINGS)).toThrow(RangeError);
  });
});
