import { describe, expect, it } from "vitest";
import { analyzeSoup } from "@/lib/mesh";
import { box, concat, invertedPyramid, leaningBlock } from "@/tests/fixtures/meshes";

// Overhang rule (common practice): a facet overhangs when the angle between its outward normal and
// straight down is below 90° − θ, θ = 45° from vertical; facets on the bed are excluded.
// Expected areas are worked by hand from each shape's dimensions.
describe("overhang and bed contact, shapes known by hand", () => {
  it("a box on the bed: no overhang, its bottom face is the bed contact", () => {
    const r = analyzeSoup(box(20, 10, 5));
    expect(r.overhangArea).toBe(0);
    expect(r.bedContactArea).toBeCloseTo(200, 9);
    expect(r.footprint.area).toBeCloseTo(200, 9);
    expect(r.footprint.rect.area).toBeCloseTo(200, 9);
  });

  it("a box lifted on a thin stem: its whole underside overhangs, the stem foot touches the bed", () => {
    // Two touching bodies: a 20 × 20 × 10 box at z = 5 and a 2 × 2 × 5 stem under its centre.
    const r = analyzeSoup(concat(box(20, 20, 10, [-10, -10, 5]), box(2, 2, 5, [-1, -1, 0])), { mask: true });
    expect(r.overhangArea).toBeCloseTo(400, 9);
    expect(r.bedContactArea).toBeCloseTo(4, 9);
    // Two triangles of the box's underside are marked for the viewer, and nothing else.
    expect(r.overhangMask!.reduce((s, x) => s + x, 0)).toBe(2);
  });

  it("a pyramid standing on its apex: all four sides overhang (slope 63.4° from vertical)", () => {
    const s = 20, h = 5; // tan α = (s/2)/h = 2
    const r = analyzeSoup(invertedPyramid(s, h));
    expect(r.overhangArea).toBeCloseTo(2 * s * Math.hypot(h, s / 2), 9); // 4 × ½·s·slant
    expect(r.bedContactArea).toBe(0); // only the apex touches
    // With θ = 70° the sides (63.4° from vertical) are self-supporting.
    expect(analyzeSoup(invertedPyramid(s, h), { overhangDeg: 70 }).overhangArea).toBe(0);
  });

  it("a side leaning 30° from vertical is self-supporting; 60° is an overhang of its full area", () => {
    const w = 10, L = 8, h = 6;
    expect(analyzeSoup(leaningBlock(w, L, h, 30)).overhangArea).toBe(0);
    const deg = 60;
    const r = analyzeSoup(leaningBlock(w, L, h, deg));
    expect(r.overhangArea).toBeCloseTo((L * h) / Math.cos((deg * Math.PI) / 180), 4); // float32 corners
    expect(r.bedContactArea).toBeCloseTo(w * L, 9);
  });

  it("follows the up direction: the same box resting on its side", () => {
    // Up = +Y: the face at y = 0 (20 × 5) is now the bed contact; no overhang.
    const r = analyzeSoup(box(20, 10, 5), { up: [0, 1, 0] });
    expect(r.bedContactArea).toBeCloseTo(100, 9);
    expect(r.overhangArea).toBe(0);
    expect(r.footprint.area).toBeCloseTo(100, 9);
    // Up = −Z: the old top face is on the bed, the bottom is not an overhang either (it's on top).
    const d = analyzeSoup(box(20, 10, 5), { up: [0, 0, -1] });
    expect(d.bedContactArea).toBeCloseTo(200, 9);
  });
});
