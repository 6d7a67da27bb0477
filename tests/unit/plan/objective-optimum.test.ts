import { describe, expect, it } from "vitest";
import { planScore } from "@/lib/plan/objective";
import { planWorkshop } from "@/lib/plan/plan";
import { validatePlan } from "@/lib/plan/validate";
import { objectiveLowerBound, smallInstance } from "../../support/objective-bound";

// The HiGHS relaxation (tests/support/objective-bound.ts) is a lower bound on the documented
// objective's cost; it must never exceed a valid plan's cost. The goal (within 10 % of the
// optimum) is not met on every seed: `npm run bench:plan` prints the ratio per seed. What we hold
// here is the bound's validity and a floor on our quality.
describe("small instances against the HiGHS bound on the objective", () => {
  for (const seed of [402, 405]) {
    it(`seed ${seed}: 3 printers, opening hours, a loaded spool`, async () => {
      const inst = smallInstance(seed);
      const out = planWorkshop(inst);
      expect(validatePlan(inst, out)).toEqual([]);
      expect(out.unplaced).toEqual([]);
      expect(out.plates.length).toBeLessThanOrEqual(8);
      const ours = planScore(inst, out.plates, 0);
      const lb = await objectiveLowerBound(inst, ours.finish);
      expect(ours.cost).toBeGreaterThanOrEqual(lb - 1e-6);
      expect(ours.cost).toBeLessThanOrEqual(1.3 * lb);
    }, 60_000);
  }
});
