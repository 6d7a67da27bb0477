// When a split earns its place (lib/rules/split; thresholds are a judgement, no source), and the
// planner on a plain box that needs no support and fits every printer: nothing is offered.
import { describe, expect, it } from "vitest";
import { planSplits } from "@/lib/orient";
import { splitEarnsItsPlace, splitSaving } from "@/lib/rules/split";
import { box } from "../../fixtures/meshes";
import { loadWasm } from "../orient/fixtures";

describe("splitEarnsItsPlace", () => {
  it("needs 500 mm³ and 10 % saved, or a part made to fit", () => {
    expect(splitSaving({ supportBefore: 2000, supportAfter: 1500 })).toEqual({ saved: 500, share: 0.25 });
    expect(splitEarnsItsPlace({ supportBefore: 2000, supportAfter: 1500, allPiecesFit: true }, true)).toBe(true);
    // The case: a few mm³ "saved" of a part that needs almost none.
    expect(splitEarnsItsPlace({ supportBefore: 1, supportAfter: 0.55, allPiecesFit: true }, true)).toBe(false);
    expect(splitEarnsItsPlace({ supportBefore: 100_000, supportAfter: 99_000, allPiecesFit: true }, true)).toBe(false); // 1 %
    expect(splitEarnsItsPlace({ supportBefore: 0, supportAfter: 0, allPiecesFit: true }, false)).toBe(true);
    expect(splitEarnsItsPlace({ supportBefore: 0, supportAfter: 0, allPiecesFit: false }, false)).toBe(false);
  });
  it("offers no cut for a box that needs no support and fits", async () => {
    const plan = await planSplits(await loadWasm(), box(40, 30, 20), { printers: [{ id: "a", bed: [220, 220], height: 250 }] });
    expect(plan.partFits).toBe(true);
    expect(plan.candidates).toEqual([]);
  });
});
