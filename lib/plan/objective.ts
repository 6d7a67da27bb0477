import { DEFAULT_TOUCH_MINUTES } from "./rules";
import type { Plate, PlanInstance } from "./schema";

const MIN = 60_000;

/**
 * The planner's objective, shared by the code, the tests and the benchmark (lib/plan/README.md,
 * "Objective"). In order:
 * 1. every copy on a plate that can be (fewest unplaced);
 * 2. no copy late that could be on time: least total lateness (minutes past due, summed);
 * 3. a fair share between members: not scored here but built in, since plates take copies in the
 *    fair-share rank order (fair-share.ts) and a printer serves the most urgent group first;
 * 4. then operator touches against the finish, traded at `touch_minutes` (default 30): one touch
 *    saved is worth a finish that many minutes later. The cost is touches × touch_minutes + the
 *    finish (minutes from now to the end of the last plate).
 */
export type PlanScore = { unplaced: number; lateness: number; touches: number; finish: number; cost: number };

export function touchMinutes(inst: Pick<PlanInstance, "touch_minutes">): number {
  return inst.touch_minutes ?? DEFAULT_TOUCH_MINUTES;
}

/** Start and take-off per plate, plus one per spool change (spool_change set). */
export function countTouches(plates: readonly Pick<Plate, "spool_change">[]): { touches: number; changes: number } {
  const changes = plates.filter((p) => p.spool_change !== null).length;
  return { touches: 2 * plates.length + changes, changes };
}

export function planScore(inst: PlanInstance, plates: readonly Plate[], unplaced: number): PlanScore {
  const nowMs = Date.parse(inst.now);
  const due = new Map(inst.parts.map((p) => [p.id, p.due === null ? null : Date.parse(p.due)]));
  let lateness = 0;
  let finish = 0;
  for (const plate of plates) {
    const end = Date.parse(plate.end);
    finish = Math.max(finish, (end - nowMs) / MIN);
    for (const it of plate.items) {
      const d = due.get(it.part);
      if (d != null && end > d) lateness += (end - d) / MIN;
    }
  }
  const { touches } = countTouches(plates);
  return { unplaced, lateness, touches, finish, cost: touches * touchMinutes(inst) + finish };
}

/** Negative when a is the better plan. Lateness within a minute counts as equal. */
export function compareScores(a: PlanScore, b: PlanScore): number {
  if (a.unplaced !== b.unplaced) return a.unplaced - b.unplaced;
  if (Math.abs(a.lateness - b.lateness) > 1) return a.lateness - b.lateness;
  return a.cost - b.cost;
}
