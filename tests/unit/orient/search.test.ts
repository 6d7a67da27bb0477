import { describe, expect, it } from "vitest";
import type { Vec3 } from "@/lib/mesh/types";
import { searchOrientations } from "@/lib/orient/search";
import { applyOrientation, rotationForDown } from "@/lib/orient/rotation";
import { weld } from "@/lib/mesh/weld";
import { supportVolumeHeightField } from "@/lib/orient/support";
import { SearchCancelledError } from "@/lib/orient/types";
import { box, loadWasm, lShape, soupBounds, tShape, toSoup, wedge } from "./fixtures";

const near = (a: Vec3, b: Vec3, tol = 1e-3) => Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]) < tol;

describe("orientation search finds the obvious best", () => {
  it("a wedge lies on its largest face, the sloped one", async () => {
    const w = await loadWasm();
    const r = await searchOrientations(wedge(w));
    const best = r.candidates[0]!;
    // Worked by hand: the hypotenuse face (44.7 × 30) has outward normal (1, 0, 2)/√5; on it the
    // other faces all face up (no overhang), contact is largest (1341.6 mm²) and height least
    // (40·20/√2000 = 17.9 mm).
    expect(near(best.down, [1 / Math.sqrt(5), 0, 2 / Math.sqrt(5)])).toBe(true);
    expect(best.supportVolume).toBeLessThan(1);
    expect(best.height).toBeCloseTo(800 / Math.sqrt(2000), 2);
    expect(best.bedContactArea).toBeCloseTo(Math.sqrt(2000) * 30, 0);
  });

  it("a T lies flat on its face rather than standing on its stem", async () => {
    const w = await loadWasm();
    const r = await searchOrientations(tShape(w));
    const best = r.candidates[0]!;
    // Worked by hand: flat on ±Y there is no overhang, height 10, contact 50·10 + 10·30 = 800 mm².
    expect(near(best.down, [0, 1, 0]) || near(best.down, [0, -1, 0])).toBe(true);
    expect(best.supportVolume).toBe(0);
    expect(best.bedContactArea).toBeCloseTo(800, 3);
    expect(best.layers).toBe(50); // 10 mm at 0.2 mm layers
    // The file's own (standing) orientation: arms overhang 2·20·10 = 400 mm² (worked by hand).
    expect(r.original.overhangArea).toBeCloseTo(400, 3);
    expect(r.original.score).toBeGreaterThan(best.score);
    expect(r.directionsEvaluated).toBeGreaterThanOrEqual(200);
  });

  it("an L lies flat on its face", async () => {
    const w = await loadWasm();
    const r = await searchOrientations(lShape(w));
    const best = r.candidates[0]!;
    // Worked by hand: profile area 40·10 + 30·10 = 700 mm², height 10, no overhang.
    expect(near(best.down, [0, 1, 0]) || near(best.down, [0, -1, 0])).toBe(true);
    expect(best.bedContactArea).toBeCloseTo(700, 3);
    expect(best.supportVolume).toBe(0);
    // Hanging the foot from the top (down = +Z) needs support under it (worked by hand:
    // 30 × 10 mm at 30 mm up: 9000 mm³), so no offered candidate may need more than the best.
    const hung = weld(applyOrientation(lShape(w), rotationForDown([0, 0, 1])));
    const hv = supportVolumeHeightField(hung.vertices, hung.indices, { cellSize: 0.25, sinTheta: Math.SQRT1_2 }).volume;
    expect(Math.abs(hv - 9000) / 9000).toBeLessThan(0.02);
    for (const c of r.candidates) expect(c.supportVolume).toBeLessThan(hv);
  });

  it("returns distinct candidates, each with its rotation applied consistently", async () => {
    const w = await loadWasm();
    const soup = tShape(w);
    const r = await searchOrientations(soup);
    expect(r.candidates.length).toBeGreaterThan(1);
    for (const c of r.candidates) {
      const oriented = applyOrientation(soup, c.rotation);
      const b = soupBounds(oriented.positions);
      // Resting on z = 0 with the measured height and footprint (common practice, no source).
      expect(b.min[2]).toBeCloseTo(0, 4);
      expect(b.max[2]! - b.min[2]!).toBeCloseTo(c.height, 3);
      expect(b.max[0]! - b.min[0]!).toBeCloseTo(c.footprint[0], 3);
      expect(b.max[1]! - b.min[1]!).toBeCloseTo(c.footprint[1], 3);
    }
  });
});

describe("printer fit", () => {
  it("uses a quarter turn when needed and refuses a part too tall", async () => {
    const w = await loadWasm();
    const soup = toSoup(box(w, [0, 0, 0], [190, 60, 8]));
    const printers = [
      { id: "narrow", bed: [100, 200] as [number, number], height: 100 },
      { id: "low", bed: [300, 300] as [number, number], height: 5 },
    ];
    const r = await searchOrientations(soup, { printers });
    const best = r.candidates[0]!;
    // Worked by hand: lying flat the footprint is 190 × 60, which fits 100 × 200 only turned;
    // 8 mm of height never fits under 5 mm.
    expect(best.down[2]).toBeCloseTo(best.down[2] < 0 ? -1 : 1, 6);
    expect(best.fits.find((f) => f.printerId === "narrow")).toMatchObject({ fits: true, turned: true });
    expect(best.fits.find((f) => f.printerId === "low")?.fits).toBe(false);
  });
});

describe("worker support", () => {
  it("reports rising progress ending at 1", async () => {
    const w = await loadWasm();
    const seen: number[] = [];
    await searchOrientations(tShape(w), { onProgress: (f) => seen.push(f) });
    expect(seen.length).toBeGreaterThan(10);
    for (let i = 1; i < seen.length; i++) expect(seen[i]!).toBeGreaterThanOrEqual(seen[i - 1]!);
    expect(seen.at(-1)).toBe(1);
  });

  it("stops when cancelled part-way", async () => {
    const w = await loadWasm();
    const signal = { aborted: false };
    let calls = 0;
    const run = searchOrientations(tShape(w), {
      signal,
      onProgress: () => {
        if (++calls === 3) signal.aborted = true;
      },
    });
    await expect(run).rejects.toBeInstanceOf(SearchCancelledError);
    expect(calls).toBeLessThan(6);
  });
});
