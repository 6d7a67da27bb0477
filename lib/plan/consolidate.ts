import type { PartInstance } from "./fair-share";
import { packExact, type PackedPlate } from "./pack";
import type { Printer } from "./schema";

const MIN = 60_000;

/** What the merge pass needs of a printer's lane (schedule.ts owns the lanes). */
export type MergeLane = { printer: Printer; plates: PackedPlate[]; finish: number; lateness: number; changes: number; ok: boolean };

export type MergeContext = {
  marginMm: number;
  gapMm: number;
  nowMs: number;
  touchMinutes: number;
  retime: (lane: MergeLane) => void;
  /** May this copy go on this printer? */
  eligible: (x: PartInstance, p: Printer) => boolean;
  /** Most merges tried in all. */
  budget: number;
};

/** The objective over all lanes: [lateness, touches × touch minutes + finish] (objective.ts). */
function cost(lanes: readonly MergeLane[], ctx: MergeContext): [number, number] {
  let late = 0;
  let finish = ctx.nowMs;
  let touches = 0;
  for (const l of lanes) {
    if (!l.ok) return [Infinity, Infinity];
    late += l.lateness;
    finish = Math.max(finish, l.finish);
    touches += 2 * l.plates.length + l.changes;
  }
  return [late, touches * ctx.touchMinutes + (finish - ctx.nowMs) / MIN];
}

/**
 * Merge plates (lib/plan/README.md, "Consolidation"): two plates of one sharing group become one
 * when their copies fit one bed together, on the printer of either or on one that already holds
 * the spool, and the objective improves (lateness no worse, then touches × touch minutes + finish
 * lower). Each try lays the copies out again with packExact and re-times the printers touched.
 * Smallest plates are tried first; a budget bounds the work on large queues.
 */
export function mergePlates(lanes: MergeLane[], ctx: MergeContext): void {
  let budget = ctx.budget;
  let current = cost(lanes, ctx);
  const laneOf = (p: PackedPlate) => lanes.find((l) => l.plates.includes(p))!;
  for (let round = 0; round < 200 && budget > 0; round++) {
    const all = lanes.flatMap((l) => l.plates).sort((a, b) => a.items.length - b.items.length || a.rank - b.rank);
    let merged = false;
    outer: for (const a of all) {
      for (const b of all) {
        if (a === b || a.group !== b.group || budget <= 0) continue;
        const items = [...a.items, ...b.items].map((it) => it.inst);
        const la = laneOf(a);
        const lb = laneOf(b);
        const targets = [lb, ...lanes.filter((l) => l !== lb && l !== la)];
        for (const target of targets) {
          if (!items.every((x) => ctx.eligible(x, target.printer))) continue;
          if (--budget <= 0) break outer;
          const plate = packExact(items, target.printer, ctx);
          if (!plate) continue;
          const joined: PackedPlate = { ...plate, group: b.group, packedFor: target.printer.id, rank: Math.min(a.rank, b.rank) };
          const touched = [...new Set([la, lb, target])];
          const saved = touched.map((l) => ({ l, plates: l.plates }));
          for (const l of touched) l.plates = l.plates.filter((p) => p !== a && p !== b);
          target.plates = [...target.plates, joined];
          for (const l of touched) ctx.retime(l);
          const next = cost(lanes, ctx);
          if (next[0] <= current[0] + 1e-6 && next[1] < current[1] - 1e-6) {
            current = next;
            merged = true;
            break outer;
          }
          for (const s of saved) s.l.plates = s.plates;
          for (const l of touched) ctx.retime(l);
        }
      }
    }
    if (!merged) return;
  }
}
