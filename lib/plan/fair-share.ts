import type { Part } from "./schema";

/** One copy of a part, as the planner moves it around. */
export type PartInstance = { part: Part; instance: number; owner: string; rank: number; fairTag: number; atRisk: boolean };

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
export function rankInstances(parts: readonly Part[], nowMs: number, riskHorizonMinutes: number): PartInstance[] {
  const list: PartInstance[] = [];
  const inputOrder = new Map(parts.map((p, i) => [p.id, i]));
  for (const part of parts) {
    for (let k = 1; k <= part.quantity; k++) {
      list.push({ part, instance: k, owner: part.owner ?? UNOWNED, rank: 0, fairTag: 0, atRisk: false });
    }
  }
  const due = (x: PartInstance) => (x.part.due === null ? Number.POSITIVE_INFINITY : Date.parse(x.part.due));
  const horizonMs = nowMs + riskHorizonMinutes * 60_000;
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
