import { describe, expect, it } from "vitest";
import { weld } from "@/lib/mesh/weld";
import { applyOrientation, rotationForDown } from "@/lib/orient/rotation";
import { supportVolumeHeightField } from "@/lib/orient/support";
import type { TriangleSoup } from "@/lib/mesh/types";
import { box, loadWasm, tShape, toSoup, union } from "./fixtures";

const SIN45 = Math.SQRT1_2;

/** Height field at 0.25 mm cells, the documented default floor for small parts. */
function support(soup: TriangleSoup, cellSize = 0.25) {
  const m = weld(soup);
  return supportVolumeHeightField(m.vertices, m.indices, { cellSize, sinTheta: SIN45 }).volume;
}

/** Regular n-gon of circumradius r: (n/2) r² sin(2π/n) (closed form, see REFERENCES "Geometry"). */
const ngon = (n: number, r: number) => (n / 2) * r * r * Math.sin((2 * Math.PI) / n);

describe("height-field support volume against hand-worked values", () => {
  it("a box resting flat needs none", async () => {
    const w = await loadWasm();
    // Worked by hand: every facet is a wall, the top, or on the bed.
    expect(support(toSoup(box(w, [0, 0, 0], [30, 20, 10])))).toBe(0);
  });

  it("a T's arms need arm area × arm height", async () => {
    const w = await loadWasm();
    // Worked by hand: two arms 20 × 10 mm at z = 30: 2 · 200 · 30 = 12,000 mm³.
    const v = support(tShape(w));
    expect(Math.abs(v - 12000) / 12000).toBeLessThan(0.02);
  });

  it("a mushroom needs (cap − stem) area × stem height", async () => {
    const w = await loadWasm();
    const stem = w.Manifold.cylinder(20, 5, 5, 64);
    const capBase = w.Manifold.cylinder(5, 15, 15, 64);
    const cap = capBase.translate([0, 0, 20]);
    capBase.delete();
    const v = support(toSoup(union(w, [stem, cap])));
    // Worked by hand with the regular-polygon area: (A(64, 15) − A(64, 5)) · 20.
    const hand = (ngon(64, 15) - ngon(64, 5)) * 20;
    expect(Math.abs(v - hand) / hand).toBeLessThan(0.02);
  });

  it("a flat square pyramid: none on its base, base·h − volume on its apex", async () => {
    const w = await loadWasm();
    // 4-sided cylinder with top radius 0: circumradius 20, height 5, so the faces lean 70.5° from
    // vertical (atan((20/√2)/5)), beyond the 45° limit when they face down.
    const upright = toSoup(w.Manifold.cylinder(5, 20, 0, 4));
    expect(support(upright)).toBeLessThan(1); // worked by hand: 0
    const inverted = applyOrientation(upright, rotationForDown([0, 0, 1]));
    // Worked by hand: base area 2·20² = 800 mm²; 800·5 − 800·5/3 = 2666.7 mm³.
    const hand = 800 * 5 - (800 * 5) / 3;
    const v = support(inverted);
    expect(Math.abs(v - hand) / hand).toBeLessThan(0.02);
  });

  it("counts only the gap down to the part itself, not down to the bed", async () => {
    const w = await loadWasm();
    // A 40 × 40 slab at z 0..5 with a 10 × 10 post to z = 20 and a 30 × 30 roof 5 thick above it.
    // Worked by hand: roof overhang (900 − 100) mm² over the slab top at z = 5, gap 15: 12,000 mm³
    // (a distance-to-bed estimate would give 800 · 20 = 16,000).
    const soup = toSoup(union(w, [box(w, [0, 0, 0], [40, 40, 5]), box(w, [15, 15, 5], [10, 10, 15]), box(w, [5, 5, 20], [30, 30, 5])]));
    const v = support(soup);
    expect(Math.abs(v - 12000) / 12000).toBeLessThan(0.02);
  });

  it("stays within a few percent at a coarser 1 mm grid", async () => {
    const w = await loadWasm();
    const v = support(tShape(w), 1);
    expect(Math.abs(v - 12000) / 12000).toBeLessThan(0.05); // worked by hand, as above
  });
});
