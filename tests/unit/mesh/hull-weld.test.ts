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

  /** UV sphere of radius r: `seg` meridians, `rings` rings (poles as fans), counter-clockwise outside. */
  function uvSphere(seg: number, rings: number, r: number): Float32Array {
    const out: number[] = [];
    const v = (i: number, j: number) => {
      const phi = (Math.PI * i) / rings, th = (2 * Math.PI * (j % seg)) / seg;
      const pole = i === 0 || i === rings;
      return [pole ? 0 : r * Math.sin(phi) * Math.cos(th), pole ? 0 : r * Math.sin(phi) * Math.sin(th), r - r * Math.cos(phi)];
    };
    for (let i = 0; i < rings; i++)
      for (let j = 0; j < seg; j++) {
        if (i > 0) out.push(...v(i, j), ...v(i, j + 1), ...v(i + 1, j + 1));
        if (i < rings - 1) out.push(...v(i, j), ...v(i + 1, j + 1), ...v(i + 1, j));
      }
    return new Float32Array(out);
  }

  it("welds a UV sphere to seg·(rings − 1) + 2 vertices in file order and in shuffled order", () => {
    // Vertex count of a UV sphere: one ring of `seg` vertices per inner ring plus two poles (closed
    // form, common practice). Shuffling the triangles scatters each vertex's uses far apart, so the
    // weld's small cache of recent corners evicts them and meets them again: the resolution step
    // must still make one vertex of each.
    const seg = 240, rings = 121;
    const p = uvSphere(seg, rings, 30);
    const nt = p.length / 9;
    const rnd = rng(5);
    const order = Array.from({ length: nt }, (_, i) => i);
    for (let i = nt - 1; i > 0; i--) { const j = Math.floor(rnd() * (i + 1)); [order[i], order[j]] = [order[j]!, order[i]!]; }
    const shuffled = new Float32Array(p.length);
    order.forEach((from, to) => shuffled.set(p.subarray(9 * from, 9 * from + 9), 9 * to));
    for (const positions of [p, shuffled]) {
      const m = weld({ positions });
      expect(m.vertices.length / 3).toBe(seg * (rings - 1) + 2);
      // Every corner's welded vertex is that corner's own coordinates (bit-identical input), and
      // ids follow first appearance (a corner uses an earlier id or the next new one).
      let wrongPlace = 0, outOfOrder = 0, next = 0;
      for (let c = 0; c < 3 * nt; c++) {
        const id = m.indices[c]!;
        for (let a = 0; a < 3; a++) if (m.vertices[3 * id + a] !== positions[3 * c + a]) wrongPlace++;
        if (id > next) outOfOrder++;
        if (id === next) next++;
      }
      expect({ wrongPlace, outOfOrder }).toEqual({ wrongPlace: 0, outOfOrder: 0 });
      const a = analyzeSoup({ positions });
      expect(a.topology).toMatchObject({ watertight: true, boundaryEdges: 0, nonManifoldEdges: 0, inconsistentEdges: 0, degenerateTriangles: 0 });
    }
  });

  it("welds corners that differ in their bits but share a weld cell, and keeps apart those that do not", () => {
    // Two triangles sharing an edge whose copies differ by 1e-9 mm (far below the default pitch of
    // 1e-6 × the diagonal) weld to 4 vertices; moved by 1 mm they stay 6 (common practice, no source).
    const a = [0, 0, 0, 10, 0, 0, 0, 10, 0];
    const near = [10 + 1e-9, 0, 0, 10, 10, 0, 0, 10 + 1e-9, 0];
    const far = [11, 0, 0, 10, 10, 0, 0, 11, 0];
    expect(weld({ positions: new Float32Array([...a, ...near]) }).vertices.length / 3).toBe(4);
    expect(weld({ positions: new Float32Array([...a, ...far]) }).vertices.length / 3).toBe(6);
  });

  it("counts triangles of zero area within float32 precision as degenerate", () => {
    // A tetrahedron (common practice) plus a collinear triangle (three points on a line) and a
    // triangle with a repeated corner: both have zero area; the tetrahedron's faces do not.
    const t = [0, 0, 0, 10, 0, 0, 0, 10, 0, 0, 0, 10];
    const tri = (i: number, j: number, k: number) => [...t.slice(3 * i, 3 * i + 3), ...t.slice(3 * j, 3 * j + 3), ...t.slice(3 * k, 3 * k + 3)];
    const tetra = [...tri(0, 2, 1), ...tri(0, 1, 3), ...tri(1, 2, 3), ...tri(0, 3, 2)];
    const line = [20, 0, 0, 25, 0, 0, 30, 0, 0];
    const repeated = [20, 5, 0, 20, 5, 0, 24, 9, 0];
    const a = analyzeSoup({ positions: new Float32Array([...tetra, ...line, ...repeated]) });
    expect(a.topology.degenerateTriangles).toBe(2);
    expect(analyzeSoup({ positions: new Float32Array(tetra) }).topology).toMatchObject({ degenerateTriangles: 0, watertight: true });
  });
});
