import { describe, expect, it } from "vitest";
import { analyzeBytes, analyzeSoup, writeStl } from "@/lib/mesh";
import { cube, icosahedron, octahedron, prism, tetrahedron, uvSphere } from "@/tests/fixtures/meshes";

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe("volume and area against closed forms", () => {
  // Volume by the divergence theorem, V = (1/6) Σ a·(b × c) (Mirtich 1996; Zhang & Chen, ICIP 2001).
  // Closed forms: standard polyhedron formulas (e.g. CRC Standard Mathematical Tables; REFERENCES.md).
  const a = 7.5;
  const cases: [string, ReturnType<typeof cube>, number, number][] = [
    ["cube: a³, 6a²", cube(a), a ** 3, 6 * a * a],
    ["regular tetrahedron: a³/(6√2), √3·a²", tetrahedron(a), a ** 3 / (6 * Math.SQRT2), Math.sqrt(3) * a * a],
    ["regular octahedron: (√2/3)a³, 2√3·a²", octahedron(a), (Math.SQRT2 / 3) * a ** 3, 2 * Math.sqrt(3) * a * a],
    ["regular icosahedron: (5/12)(3+√5)a³, 5√3·a²", icosahedron(a), (5 / 12) * (3 + Math.sqrt(5)) * a ** 3, 5 * Math.sqrt(3) * a * a],
  ];
  for (const [name, soup, vol, area] of cases) {
    it(name, () => {
      const r = analyzeSoup(soup);
      expect(rel(r.volume, vol)).toBeLessThan(1e-6);
      expect(rel(r.area, area)).toBeLessThan(1e-6);
      expect(r.topology.watertight).toBe(true);
      expect(r.volumeReliable).toBe(true);
    });
  }

  it("regular n-gon prism: V = (n/2)r² sin(2π/n)·h, area = 2·base + n·(2r sin(π/n))·h", () => {
    for (const n of [3, 5, 12, 61]) {
      const r = 4, h = 9;
      const base = (n / 2) * r * r * Math.sin((2 * Math.PI) / n);
      const res = analyzeSoup(prism(n, r, h));
      expect(rel(res.volume, base * h)).toBeLessThan(1e-6);
      expect(rel(res.area, 2 * base + n * 2 * r * Math.sin(Math.PI / n) * h)).toBeLessThan(1e-6);
      // Footprint of a prism standing on its base is the base polygon itself.
      expect(rel(res.footprint.area, base)).toBeLessThan(1e-6);
    }
  });

  /**
   * UV sphere, by elementary geometry from its vertices: each latitude band is a frustum of a
   * regular n-gon pyramid (V = h/3·(A1 + A2 + √(A1·A2)), A = (n/2)ρ² sin(2π/n)); its sides are
   * n isosceles trapezoids with parallel sides 2ρ sin(π/n) and slant height
   * √(Δz² + ((ρ2 − ρ1)·cos(π/n))²). Caps are the frusta with ρ = 0 (pyramids).
   */
  function facetedSphere(n: number, m: number, r: number) {
    let V = 0, S = 0;
    for (let i = 0; i < m; i++) {
      const p1 = (Math.PI * i) / m, p2 = (Math.PI * (i + 1)) / m;
      const r1 = r * Math.sin(p1), r2 = r * Math.sin(p2);
      const dz = r * (Math.cos(p1) - Math.cos(p2));
      const A1 = (n / 2) * r1 * r1 * Math.sin((2 * Math.PI) / n), A2 = (n / 2) * r2 * r2 * Math.sin((2 * Math.PI) / n);
      V += (dz / 3) * (A1 + A2 + Math.sqrt(A1 * A2));
      const slant = Math.hypot(dz, (r2 - r1) * Math.cos(Math.PI / n));
      S += n * ((2 * r1 * Math.sin(Math.PI / n) + 2 * r2 * Math.sin(Math.PI / n)) / 2) * slant;
    }
    return { V, S };
  }

  it("UV sphere matches the exact faceted volume and area, and converges to 4/3·πr³ and 4πr²", () => {
    const r = 10;
    let lastErr = Infinity;
    for (const [n, m] of [[8, 4], [24, 12], [96, 48], [256, 128]] as const) {
      const res = analyzeSoup(uvSphere(n, m, r));
      const ex = facetedSphere(n, m, r);
      // float32 coordinates: relative error ~1e-7 per term
      expect(rel(res.volume, ex.V)).toBeLessThan(1e-5);
      expect(rel(res.area, ex.S)).toBeLessThan(1e-5);
      expect(res.topology.watertight).toBe(true);
      const err = rel(res.volume, (4 / 3) * Math.PI * r ** 3);
      expect(err).toBeLessThan(lastErr);
      lastErr = err;
    }
    // Inscribed polyhedron with 256×128 facets: within 0.1 % of the sphere (second-order convergence).
    expect(lastErr).toBeLessThan(1e-3);
    expect(rel(analyzeSoup(uvSphere(256, 128, r)).area, 4 * Math.PI * r * r)).toBeLessThan(1e-3);
  });

  it("the same numbers come back through binary STL bytes (the in-place reader)", () => {
    // The last one spans several of the reader's 4,096-record stretches and has an odd count
    // (an extra separate triangle), so a stretch ends with an even record that has no odd partner.
    const extra = (s: { positions: Float32Array }) => ({ positions: new Float32Array([...s.positions, 90, 0, 0, 91, 0, 0, 90, 1, 0]) });
    for (const soup of [icosahedron(3), uvSphere(33, 17, 5), extra(uvSphere(151, 60, 20))]) {
      const direct = analyzeSoup(soup);
      const viaBytes = analyzeBytes(writeStl(soup)).analysis;
      expect(viaBytes.triangles).toBe(direct.triangles);
      expect(viaBytes.vertices).toBe(direct.vertices);
      expect(viaBytes.topology).toEqual(direct.topology);
      expect(rel(viaBytes.volume, direct.volume)).toBeLessThan(1e-9);
      expect(rel(viaBytes.area, direct.area)).toBeLessThan(1e-9);
    }
  });
});
