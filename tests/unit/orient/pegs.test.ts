// Registration pegs (lib/orient/pegs.ts), checked with manifold-3d's own volumes against closed forms:
// a regular 32-gon prism of circumradius r and height h has volume 16·r²·sin(2π/32)·h (REFERENCES.md,
// "Geometry"). The pieces with pegs and holes must sum to the original within 0.1 %, once the clearance
// volume (holes less pegs) is added back.
import { describe, expect, it } from "vitest";
import { addPegs, DEFAULT_PEG_CLEARANCE_MM, PEG_DEPTH_MM, PEG_DIAMETER_MM } from "@/lib/orient/pegs";
import { box, loadWasm } from "./fixtures";

const prism32 = (r: number, h: number) => 16 * r * r * Math.sin((2 * Math.PI) / 32) * h;

describe("addPegs", () => {
  it("a 40 × 30 × 60 block cut across the middle: pegs and holes, volumes add up", async () => {
    const w = await loadWasm();
    const whole = box(w, [0, 0, 0], [40, 30, 60]);
    const V = whole.volume();
    expect(V).toBeCloseTo(72_000, 3);
    const n: [number, number, number] = [0, 0, 1];
    const [above, below] = whole.splitByPlane(n, 30);
    const cut = addPegs(w, whole, above, below, n, 30, { clearanceMm: DEFAULT_PEG_CLEARANCE_MM });
    try {
      expect(cut.pegs).toBe(2); // one 40 × 30 face, long enough for two
      const r = PEG_DIAMETER_MM / 2, c = DEFAULT_PEG_CLEARANCE_MM, d = PEG_DEPTH_MM;
      const pegs = cut.pegs * prism32(r, d);
      const holes = cut.pegs * prism32(r + c, d + c);
      expect(cut.pegVolume).toBeCloseTo(pegs, 1);
      expect(cut.holeVolume).toBeCloseTo(holes, 1);
      const sum = cut.above.volume() + cut.below.volume();
      expect(Math.abs(sum + (holes - pegs) - V) / V).toBeLessThan(0.001);
      // Each piece is still one closed solid.
      expect(cut.above.decompose().length).toBe(1);
      expect(cut.below.decompose().length).toBe(1);
      expect(cut.above.status()).toBe("NoError");
    } finally {
      cut.above.delete();
      cut.below.delete();
      whole.delete();
    }
  });

  it("a tilted cut and a face too small for a peg", async () => {
    const w = await loadWasm();
    const whole = box(w, [0, 0, 0], [40, 30, 60]);
    const n: [number, number, number] = [Math.SQRT1_2, 0, Math.SQRT1_2];
    const [above, below] = whole.splitByPlane(n, 40);
    const cut = addPegs(w, whole, above, below, n, 40);
    const sum = cut.above.volume() + cut.below.volume();
    expect(cut.pegs).toBeGreaterThan(0);
    expect(Math.abs(sum + cut.holeVolume - cut.pegVolume - 72_000) / 72_000).toBeLessThan(0.001);
    cut.above.delete();
    cut.below.delete();
    whole.delete();
    // A 6 × 6 mm post: the face has no room for a 5 mm peg with a 1.5 mm wall.
    const post = box(w, [0, 0, 0], [6, 6, 40]);
    const [a2, b2] = post.splitByPlane([0, 0, 1], 20);
    const none = addPegs(w, post, a2, b2, [0, 0, 1], 20);
    expect(none.pegs).toBe(0);
    none.above.delete();
    none.below.delete();
    post.delete();
  });
});
