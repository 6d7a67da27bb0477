import { describe, expect, it } from "vitest";
import { analyzeSoup, convexHull2d, polygonArea, weld } from "@/lib/mesh";

/** Small deterministic generator (LCG constants from Numerical Recipes; common practice). */
function rng(seed: number): () => number {
  let s = seed >>> 0;
  return () => (s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32;
}

describe("convex hull of many points", () => {
  it("regular n-gon corners among interior points give the n-gon's area", () => {
    // Closed form: (n/2)·r²·sin(2π/n) (REFERENCES.md, regular n-gon).
    const rnd = rng(7);
    for (const n of [3, 5, 8, 17, 360, 5000]) {
      const r = 40;
      const inner = 20_000;
      const pts = new Float64Array(2 * (n + inner));
      for (let i = 0; i < inner; i++) {
        const a = 2 * Math.PI * rnd(), d = r * Math.cos(Math.PI / n) * Math.sqrt(rnd()) * 0.999;
        pts[2 * i] = d * Math.cos(a); pts[2 * i + 1] = d * Math.sin(a);
      }
      for (let k = 0; k < n; k++) {
        pts[2 * (inner + k)] = r * Math.cos((2 * Math.PI * k) / n + 0.1);
        pts[2 * (inner + k) + 1] = r * Math.sin((2 * Math.PI * k) / n + 0.1);
      }
      const hull = convexHull2d(pts);
      expect(hull.length / 2).toBe(n);
      const expected = (n / 2) * r * r * Math.sin((2 * Math.PI) / n);
      expect(Math.abs(polygonArea(hull) - expected) / expected).toBeLessThan(1e-12);
      expect(polygonArea(hull)).toBeGreaterThan(0); // counter-clockwise
    }
  });

  it("contains every point and turns strictly left on grids full of duplicates and collinear points", () => {
    // Definition of a convex hull without collinear corners (common practice, no source).
    const rnd = rng(11);
    for (let t = 0; t < 200; t++) {
      const m = 3 + Math.floor(rnd() * 60);
      const pts = new Float64Array(2 * m);
      for (let i = 0; i < 2 * m; i++) pts[i] = Math.floor(rnd() * 6);
      const hull = convexHull2d(pts);
      // Every input point lies inside or on the hull (all edge cross products ≥ 0).
      const h = hull.length / 2;
      if (h >= 3) {
        for (let i = 0; i < m; i++) {
          for (let k = 0; k < h; k++) {
            const k2 = (k + 1) % h;
            const c = (hull[2 * k2]! - hull[2 * k]!) * (pts[2 * i + 1]! - hull[2 * k + 1]!) - (hull[2 * k2 + 1]! - hull[2 * k + 1]!) * (pts[2 * i]! - hull[2 * k]!);
            expect(c).toBeGreaterThanOrEqual(0);
          }
        }
        // No collinear corner: each turn is strictly left.
        for (let k = 0; k < h; k++) {
          const a = (k + h - 1) % h, b = (k + 1) % h;
          const c = (hull[2 * k]! - hull[2 * a]!) * (hull[2 * b + 1]! - hull[2 * a + 1]!) - (hull[2 * k + 1]! - hull[2 * a + 1]!) * (hull[2 * b]! - hull[2 * a]!);
          expect(c).toBeGreaterThan(0);
        }
      }
      // Never larger than the points' bounding box.
      let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity;
      for (let i = 0; i < m; i++) { x0 = Math.min(x0, pts[2 * i]!); x1 = Math.max(x1, pts[2 * i]!); y0 = Math.min(y0, pts[2 * i + 1]!); y1 = Math.max(y1, pts[2 * i + 1]!); }
      expect(Math.abs(polygonArea(hull))).toBeLessThanOrEqual((x1 - x0) * (y1 - y0));
    }
  });
});

describe("welding", () => {
  it("welds bit-identical corners even when the tolerance is far below the model's span", () => {
    // A 1000 mm cube (12 triangles, 8 corners; common practice) with a 1e-12 mm weld pitch: cells
    // would overflow 32-bit integers, so the pitch widens and exact duplicates still weld.
    const s = 1000;
    const c = [[0, 0, 0], [s, 0, 0], [s, s, 0], [0, s, 0], [0, 0, s], [s, 0, s], [s, s, s], [0, s, s]] as const;
    const f = [[0, 2, 1], [0, 3, 2], [4, 5, 6], [4, 6, 7], [0, 1, 5], [0, 5, 4], [1, 2, 6], [1, 6, 5], [2, 3, 7], [2, 7, 6], [3, 0, 4], [3, 4, 7]];
    const positions = new Float32Array(f.flatMap((t) => t.flatMap((i) => [...c[i]!])));
    expect(weld({ positions }, 1e-12).vertices.length / 3).toBe(8);
    const a = analyzeSoup({ positions }, { weldTolerance: 1e-12 });
    expect(a.vertices).toBe(8);
    expect(a.topology.watertight).toBe(true);
    expect(a.volume).toBeCloseTo(s ** 3, 3); // a³
  });
});
