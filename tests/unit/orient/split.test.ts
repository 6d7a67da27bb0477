import { describe, expect, it } from "vitest";
import type { TriangleSoup } from "@/lib/mesh/types";
import { solidFromSoup } from "@/lib/orient/manifold-bridge";
import { applyOrientation } from "@/lib/orient/rotation";
import { planSplits, splitUntilFits, type SplitCandidate } from "@/lib/orient/split";
import { SearchCancelledError, type Printer } from "@/lib/orient/types";
import { box, loadWasm, soupBounds, tShape, toSoup } from "./fixtures";

const PRINTERS: Printer[] = [
  { id: "mid", bed: [220, 220], height: 250 },
  { id: "small", bed: [180, 180], height: 180 },
];

/** Volume by manifold-3d's own computation, from the soup alone. */
async function manifoldVolume(soup: TriangleSoup): Promise<number> {
  const w = await loadWasm();
  const s = solidFromSoup(w, soup);
  const v = s.volume();
  s.delete();
  return v;
}

async function expectVolumesSum(c: SplitCandidate, whole: number) {
  let sum = 0;
  for (const p of c.pieces) sum += await manifoldVolume(p.soup);
  // Cutting must neither lose nor add material: within 0.1 % (checked with manifold-3d's volume).
  expect(Math.abs(sum - whole) / whole).toBeLessThan(0.001);
}

/** Does a piece, stood as its orientation says, fit a printer? Checked from its own bounds. */
function fitsByBounds(soup: TriangleSoup, rotation: Parameters<typeof applyOrientation>[1]): boolean {
  const b = soupBounds(applyOrientation(soup, rotation).positions);
  const [x, y, z] = [0, 1, 2].map((k) => b.max[k]! - b.min[k]!) as [number, number, number];
  return PRINTERS.some((p) => z <= p.height + 1e-6 && ((x <= p.bed[0] + 1e-6 && y <= p.bed[1] + 1e-6) || (y <= p.bed[0] + 1e-6 && x <= p.bed[1] + 1e-6)));
}

describe("split planner", () => {
  it("cuts an upright T under its arms and saves the support", async () => {
    const w = await loadWasm();
    const soup = tShape(w);
    const whole = await manifoldVolume(soup);
    // Worked by hand: 10·10·30 + 50·10·10 = 8000 mm³.
    expect(whole).toBeCloseTo(8000, 3);
    const plan = await planSplits(w, soup, { printers: PRINTERS });
    expect(plan.candidates.length).toBeGreaterThan(0);
    for (const c of plan.candidates) await expectVolumesSum(c, whole);
    // Worked by hand: standing, the arms need 2·200·30 = 12,000 mm³ of support.
    expect(Math.abs(plan.supportBefore - 12000) / 12000).toBeLessThan(0.02);
    const under = plan.candidates.find((c) => c.planes[0]!.kind === "under-overhang");
    expect(under).toBeDefined();
    // Worked by hand: the cut at z = 30 crosses only the stem, a 10 × 10 glue face, into 2 pieces.
    expect(under!.planes[0]!.offset).toBeCloseTo(30, 3);
    expect(under!.pieces).toHaveLength(2);
    expect(under!.cutArea).toBeCloseTo(100, 2);
    expect(under!.supportAfter).toBeLessThan(plan.supportBefore * 0.02);
    expect(plan.candidates[0]!.supportSaved).toBeGreaterThan(plan.supportBefore * 0.9);
  });

  it("splits a bar longer than every bed until every piece fits", async () => {
    const w = await loadWasm();
    const soup = toSoup(box(w, [0, 0, 0], [400, 20, 20]));
    const c = await splitUntilFits(w, soup, { printers: PRINTERS });
    expect(c).not.toBeNull();
    // Worked by hand: 400 mm fits neither bed (220, 180) nor height (250), even turned; one cut
    // in the middle gives two 200 mm pieces that lie on the 220 mm bed.
    expect(c!.pieces).toHaveLength(2);
    expect(c!.allPiecesFit).toBe(true);
    for (const p of c!.pieces) expect(fitsByBounds(p.soup, p.orientation.rotation)).toBe(true);
    await expectVolumesSum(c!, 400 * 20 * 20);
    expect(c!.cutArea).toBeCloseTo(400, 2); // worked by hand: one 20 × 20 face
  });

  it("keeps cutting when one cut is not enough, and offers it first", async () => {
    const w = await loadWasm();
    const soup = toSoup(box(w, [0, 0, 0], [700, 15, 15]));
    const plan = await planSplits(w, soup, { printers: PRINTERS, maxPlanes: 4 });
    expect(plan.partFits).toBe(false);
    const top = plan.candidates[0]!;
    expect(top.kind).toBe("to-fit");
    expect(top.allPiecesFit).toBe(true);
    // Worked by hand: halving 700 → 350 → 175 mm gives 4 pieces, each ≤ 220.
    expect(top.pieces).toHaveLength(4);
    for (const p of top.pieces) expect(fitsByBounds(p.soup, p.orientation.rotation)).toBe(true);
    await expectVolumesSum(top, 700 * 15 * 15);
  });

  it("offers nothing for a part that fits and needs no support", async () => {
    const w = await loadWasm();
    const plan = await planSplits(w, toSoup(box(w, [0, 0, 0], [30, 30, 30])), { printers: PRINTERS });
    expect(plan.partFits).toBe(true);
    expect(plan.supportBefore).toBe(0); // worked by hand: a box on its face
    expect(plan.candidates).toHaveLength(0);
  });

  it("can be cancelled between candidates", async () => {
    const w = await loadWasm();
    const signal = { aborted: false };
    const run = planSplits(w, tShape(w), { printers: PRINTERS, signal, onProgress: () => (signal.aborted = true) });
    await expect(run).rejects.toBeInstanceOf(SearchCancelledError);
  });
});
