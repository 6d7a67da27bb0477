import { describe, expect, it } from "vitest";
import { analyzeBytes, analyzeSoup, writeStl } from "@/lib/mesh";
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

/**
 * A bar whose two long sides flare out at exactly 45° from vertical as they rise (a 45° chamfer
 * on each side, facing down): section in XZ (0,0) (w,0) (w+h,h) (−h,h), length L along Y, turned
 * `turnDeg` about Z and shifted by `shift`, corners stored as float32 in the file's unit.
 */
function chamferBar(w: number, h: number, L: number, turnDeg: number, shift: number): Float32Array {
  const sec: [number, number][] = [[0, 0], [w, 0], [w + h, h], [-h, h]];
  const c = Math.cos((turnDeg * Math.PI) / 180), s = Math.sin((turnDeg * Math.PI) / 180);
  const P = (k: number, y: number) => {
    const [x, z] = sec[k]!;
    return [c * x - s * y + shift, s * x + c * y + shift, z];
  };
  const tris: number[][] = [];
  for (let k = 0; k < 4; k++) {
    const j = (k + 1) % 4; // edge k → j of a counter-clockwise section: outward is (dz, −dx)
    tris.push([...P(k, 0), ...P(j, L), ...P(j, 0)], [...P(k, 0), ...P(k, L), ...P(j, L)]);
  }
  tris.push([...P(0, 0), ...P(1, 0), ...P(2, 0)], [...P(0, 0), ...P(2, 0), ...P(3, 0)]); // front, −Y
  tris.push([...P(0, L), ...P(2, L), ...P(1, L)], [...P(0, L), ...P(3, L), ...P(2, L)]); // back, +Y
  return new Float32Array(tris.flat());
}

describe("a face at the self-supporting limit is self-supporting (common practice: the 45° chamfer)", () => {
  // Hand-worked: bed contact w·L; each chamfer face √2·h·L; total area = 2(w+h)h (ends) + wL
  // (bottom) + (w+2h)L (top) + 2√2·hL; volume (w+h)·h·L. Overhang 0: both chamfers are at 45°.
  const cases = [
    { name: "millimetres, turned 30° about Z", w: 20, h: 5, L: 30, shift: 100, units: "mm" as const, k: 1 },
    { name: "inches, turned 30° about Z", w: 0.8, h: 0.2, L: 1.2, shift: 4, units: "in" as const, k: 25.4 },
  ];
  it.each(cases)("$name: overhang 0, bed contact w·L, areas and volume by hand", ({ w, h, L, shift, units, k }) => {
    const r = analyzeBytes(writeStl({ positions: chamferBar(w, h, L, 30, shift) }), { units, mask: true }).analysis;
    const W = w * k, H = h * k, LL = L * k;
    expect(r.overhangArea).toBe(0);
    expect(r.overhangMask!.every((x) => x === 0)).toBe(true);
    expect(r.bedContactArea / (W * LL)).toBeCloseTo(1, 5);
    expect(r.area / (2 * (W + H) * H + W * LL + (W + 2 * H) * LL + 2 * Math.SQRT2 * H * LL)).toBeCloseTo(1, 5);
    expect(r.volume / ((W + H) * H * LL)).toBeCloseTo(1, 5);
  });

  it("float32 rounding does put some chamfer facets past 45° (so the tolerance is what passes them)", () => {
    // The plain rule n·down > sin 45°·|n| on the rounded corners, without the tolerance.
    let past = 0;
    for (const { w, h, L, shift, k } of cases) {
      const p = chamferBar(w, h, L, 30, shift).map((v) => Math.fround(v * k));
      for (let t = 0; t < p.length; t += 9) {
        const e1 = [p[t + 3]! - p[t]!, p[t + 4]! - p[t + 1]!, p[t + 5]! - p[t + 2]!];
        const e2 = [p[t + 6]! - p[t]!, p[t + 7]! - p[t + 1]!, p[t + 8]! - p[t + 2]!];
        const n = [e1[1]! * e2[2]! - e1[2]! * e2[1]!, e1[2]! * e2[0]! - e1[0]! * e2[2]!, e1[0]! * e2[1]! - e1[1]! * e2[0]!];
        if (-n[2]! > Math.SQRT1_2 * Math.hypot(...n)) past++;
      }
    }
    expect(past).toBeGreaterThan(0);
  });

  it("a face 0.1° past the limit still overhangs (the tolerance is 0.01°)", () => {
    // Section flaring at 45.1° from vertical: horizontal run h·tan 45.1° over a rise h.
    const w = 20, h = 5, L = 30, run = h * Math.tan((45.1 * Math.PI) / 180);
    const p = chamferBar(w, h, L, 0, 0);
    for (let i = 0; i < p.length; i += 3) if (p[i + 2] === h) p[i] = p[i]! < 0 ? -run : w + run;
    const r = analyzeSoup({ positions: p });
    expect(r.overhangArea / (2 * L * Math.hypot(h, run))).toBeCloseTo(1, 5);
  });
});
