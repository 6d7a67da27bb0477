// Printable orientations (lib/rules/stability, orientation-names) on a ring, a wedge and an L made
// with manifold-3d. Contact areas and centres of mass are worked by hand from the shapes' dimensions
// (areas of rectangles and of a regular 32-gon, (n/2)·r²·sin(2π/n); centroid of a triangle at the mean
// of its corners; centre of mass of two boxes as their volume-weighted mean). The 25 mm² minimum
// contact is the documented common-practice value (no source).
import { describe, expect, it } from "vitest";
import { weld } from "@/lib/mesh/weld";
import { rotationForDown, searchOrientations } from "@/lib/orient";
import { centreOfMass, isStable, MIN_CONTACT_AREA_MM2, nameOrientation, requiredContact, stanceOf, turnInWords, type Frame } from "@/lib/rules";
import { loadWasm, lShape, toSoup, wedge } from "../orient/fixtures";

const frame = (down: [number, number, number]) => rotationForDown(down).matrix as unknown as Frame;

async function ring() {
  const w = await loadWasm();
  const outer = w.Manifold.cylinder(6, 20, 20, 32, false);
  const inner = w.Manifold.cylinder(6, 12, 12, 32, false);
  const r = outer.subtract(inner);
  outer.delete();
  inner.delete();
  return toSoup(r);
}

describe("minimum contact", () => {
  it("is 25 mm², or half the largest contact of a part too small for that", () => {
    expect(MIN_CONTACT_AREA_MM2).toBe(25);
    expect(requiredContact(1200)).toBe(25);
    expect(requiredContact(30)).toBe(15);
  });
});

describe("a ring (washer: 32-gon, outer radius 20, inner 12, 6 high)", () => {
  const flat = 16 * Math.sin(Math.PI / 16) * (20 ** 2 - 12 ** 2); // 799.09 mm²
  it("lying flat: the annulus is on the bed and the centre of mass is over its hull", async () => {
    const m = weld(await ring());
    const com = centreOfMass(m);
    expect(com[0]).toBeCloseTo(0, 4);
    expect(com[1]).toBeCloseTo(0, 4);
    expect(com[2]).toBeCloseTo(3, 4);
    const s = stanceOf(m, frame([0, 0, -1]), com);
    expect(s.contactArea).toBeCloseTo(flat, 1);
    expect(s.balanced).toBe(true);
    expect(isStable(s, flat)).toBe(true);
  });
  it("balanced on its edge: a corner line touches the bed, 0 mm² (the 32-gon has a corner at +X)", async () => {
    const m = weld(await ring());
    const s = stanceOf(m, frame([1, 0, 0]), centreOfMass(m));
    expect(s.contactArea).toBeCloseTo(0, 6);
    expect(isStable(s, flat)).toBe(false);
  });
  it("the search offers no orientation on less than 25 mm², and names the flat one in words", async () => {
    const r = await searchOrientations(await ring(), { layerHeight: 0.2 });
    expect(r.candidates.length).toBeGreaterThan(0);
    for (const c of r.candidates) {
      expect(c.bedContactArea).toBeGreaterThanOrEqual(25);
      expect(c.stable).toBe(true);
    }
    expect(r.candidates[0]!.bedContactArea).toBeCloseTo(flat, 0);
    expect(r.candidates[0]!.label).toBe("Lying on its largest flat face");
    expect(r.candidates[0]!.label).not.toMatch(/\(/);
  });
});

describe("a wedge (right triangle, legs 40 along X and 20 up Z, 30 deep)", () => {
  // Centroid of the triangle (0,0), (40,0), (0,20): (40/3, 20/3); mid-depth 15.
  const com = [40 / 3, 15, 20 / 3];
  it("on its base: 40 × 30 = 1200 mm², centre of mass over it", async () => {
    const m = weld(await wedge(await loadWasm()));
    const c = centreOfMass(m);
    c.forEach((v, i) => expect(v).toBeCloseTo(com[i]!, 3));
    const s = stanceOf(m, frame([0, 0, -1]), c);
    expect(s.contactArea).toBeCloseTo(1200, 3);
    expect(s.centre[2]).toBeCloseTo(20 / 3, 3);
    expect(isStable(s, 1341.64)).toBe(true);
  });
  it("on its sloping face: √(40² + 20²) × 30 = 1341.64 mm², the largest; on its back: 20 × 30 = 600 mm²", async () => {
    const m = weld(await wedge(await loadWasm()));
    const c = centreOfMass(m);
    const slope = stanceOf(m, frame([20 / Math.hypot(20, 40), 0, 40 / Math.hypot(20, 40)]), c);
    expect(slope.contactArea).toBeCloseTo(Math.hypot(40, 20) * 30, 2);
    expect(slope.balanced).toBe(true);
    // The centroid's height above the sloping face: twice the area / hypotenuse / 3 = 800 / 44.72 / 3 = 5.963 mm.
    expect(slope.centre[2]).toBeCloseTo(800 / Math.hypot(40, 20) / 3, 3);
    const back = stanceOf(m, frame([-1, 0, 0]), c);
    expect(back.contactArea).toBeCloseTo(600, 3);
    expect(back.balanced).toBe(true);
    const r = await searchOrientations(await wedge(await loadWasm()), {});
    const largest = r.candidates.find((x) => x.label === "Lying on its largest flat face");
    expect(largest?.bedContactArea).toBeCloseTo(Math.hypot(40, 20) * 30, 1);
  });
});

describe("an L (foot 40 × 10 × 10 along X, upright 10 × 10 × 40 at x = 0)", () => {
  // Volumes: foot 4000 at (20, 5, 5), the upright above it 3000 at (5, 5, 25): centre (13.571, 5, 13.571).
  const c0 = [(4000 * 20 + 3000 * 5) / 7000, 5, (4000 * 5 + 3000 * 25) / 7000];
  it("standing as drawn: 400 mm² under the foot, centre of mass over it", async () => {
    const m = weld(await lShape(await loadWasm()));
    const c = centreOfMass(m);
    c.forEach((v, i) => expect(v).toBeCloseTo(c0[i]!, 3));
    const s = stanceOf(m, frame([0, 0, -1]), c);
    expect(s.contactArea).toBeCloseTo(400, 3);
    expect(isStable(s, 400)).toBe(true);
  });
  it("upside down on the top of the upright: 100 mm², but the centre (x 13.6) is past its 10 mm edge, so it tips", async () => {
    const m = weld(await lShape(await loadWasm()));
    const s = stanceOf(m, frame([0, 0, 1]), centreOfMass(m));
    expect(s.contactArea).toBeCloseTo(100, 3);
    expect(s.balanced).toBe(false);
    expect(isStable(s, 400)).toBe(false);
  });
  it("on the end of its foot: 100 mm², centre 13.6 mm up over a 10 mm face: tips; on its back: 400 mm², stands", async () => {
    const m = weld(await lShape(await loadWasm()));
    const c = centreOfMass(m);
    expect(stanceOf(m, frame([1, 0, 0]), c).balanced).toBe(false);
    const back = stanceOf(m, frame([-1, 0, 0]), c);
    expect(back.contactArea).toBeCloseTo(400, 3);
    expect(back.balanced).toBe(true);
    const r = await searchOrientations(await lShape(await loadWasm()), {});
    for (const x of r.candidates) expect(x.stable).toBe(true);
    expect(r.candidates.some((x) => Math.abs(x.down[2] - 1) < 1e-6)).toBe(false);
  });
});

describe("names in words", () => {
  it("names the turns from the drawing", () => {
    expect(turnInWords([0, 0, -1])).toBe("standing as drawn");
    expect(turnInWords([0, -1, 0])).toBe("tipped onto its front, 90° about X");
    expect(turnInWords([1, 0, 0])).toBe("turned onto its right side, 90° about Y");
    expect(turnInWords([0, 0, 1])).toBe("upside down, 180° about X");
    expect(turnInWords([0, Math.sin(Math.PI / 6), -Math.cos(Math.PI / 6)])).toBe("tilted 30° about X");
    expect(nameOrientation([-1, 0, 0], true)).toEqual({ label: "Lying on its largest flat face", turn: "turned onto its left side, 90° about Y" });
  });
});
