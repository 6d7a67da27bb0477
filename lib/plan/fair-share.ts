import type { Part } from "./schema";

/** One copy of a part, as the planner moves it around. */
export type PartInstance = {
  part: Part;
  instance: number;
  owner: string;
  rank: number;
  fairTag: number;
  atRisk: boolean;
  /**
   * When the copy should be printed by, ms: its due time, or sooner its member's fair-share target
   * (fairTarget) when that member has little work queued; null when neither applies.
   */
  target: number | null;
};

/**
 * Fair share for members with little work (README.md, "Fair share"): a member whose queue W is
 * under LIGHT_SHARE of an even split between the members should see it printed within
 * FAIR_GRACE_MINUTES + FAIR_FACTOR × W / printers of now. Such copies count as at risk with that
 * target, so they go on the short plates at the front instead of waiting behind a long queue.
 */
export const FAIR_GRACE_MINUTES = 480;
export const FAIR_FACTOR = 2;
export const LIGHT_SHARE = 0.25;

/** Instances without an owner share one account, so they cannot outrun named members either. */
export const UNOWNED = "(no owner)";

/**
 * Order every part instance for planning (documented in README.md, "Fair share"):
 * 1. higher priority first;
 * 2. within a priority, instances at risk of being late (a due date sooner than the time the
 *    whole queue would take on all printers) come first, earliest due first;
 * 3. the rest by fair-share tag: each member's instances, in their own order (due date, then
 *    input order), carry the running total of that member's print minutes. Smallest tag first,
 *    so members take turns by print time and one member's long queue cannot hold back others.
 * Ties break on due date, owner, part id and instance number, so the order is deterministic.
 */
export function rankInstances(parts: readonly Part[], nowMs: number, riskHorizonMinutes: number, printers = 0): PartInstance[] {
  const list: PartInstance[] = [];
  const inputOrder = new Map(parts.map((p, i) => [p.id, i]));
  for (const part of parts) {
    for (let k = 1; k <= part.quantity; k++) {
      list.push({ part, instance: k, owner: part.owner ?? UNOWNED, rank: 0, fairTag: 0, atRisk: false, target: null });
    }
  }
  const horizonMs = nowMs + riskHorizonMinutes * 60_000;
  // Each member's fair-share target (only with a printer count; the baseline has none).
  const work = new Map<string, number>();
  for (const x of list) work.set(x.owner, (work.get(x.owner) ?? 0) + x.part.minutes);
  const evenSplit = [...work.values()].reduce((s, w) => s + w, 0) / Math.max(1, work.size);
  for (const x of list) {
    const dueMs = x.part.due === null ? null : Date.parse(x.part.due);
    const light = printers > 0 && work.get(x.owner)! < LIGHT_SHARE * evenSplit;
    const fair = light ? nowMs + (FAIR_GRACE_MINUTES + (FAIR_FACTOR * work.get(x.owner)!) / printers) * 60_000 : null;
    x.target = fair !== null && fair < horizonMs && (dueMs === null || fair < dueMs) ? fair : dueMs;
  }
  const due = (x: PartInstance) => x.target ?? Number.POSITIVE_INFINITY;
  // Running totals per (priority, member), in the member's own order.
  const own = [...list].sort(
    (a, b) => due(a) - due(b) || inputOrder.get(a.part.id)! - inputOrder.get(b.part.id)! || a.instance - b.instance,
  );
  const totals = new Map<string, number>();
  for (const x of own) {
    const key = `${x.part.priority}\u0000${x.owner}`;
    const t = (totals.get(key) ?? 0) + Math.max(x.part.minutes, 1);
    totals.set(key, t);
    x.fairTag = t;
    x.atRisk = due(x) <= horizonMs;
  }
  list.sort((a, b) => {
    if (a.part.priority !== b.part.priority) return b.part.priority - a.part.priority;
    if (a.atRisk !== b.atRisk) return a.atRisk ? -1 : 1;
    if (a.atRisk && due(a) !== due(b)) return due(a) - due(b);
    return (
      a.fairTag - b.fairTag ||
      due(a) - due(b) ||
      (a.owner < b.owner ? -1 : a.owner > b.owner ? 1 : 0) ||
      (a.part.id < b.part.id ? -1 : a.part.id > b.part.id ? 1 : 0) ||
      a.instance - b.instance
    );
  });
  list.forEach((x, i) => (x.rank = i));
  return list;
}
