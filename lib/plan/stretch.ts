import type { PartInstance } from "./fair-share";
import { paddedArea, usableArea } from "./layout";
import { packExact, type PackedPlate } from "./pack";
import type { Printer } from "./schema";

const MIN = 60_000;

/** What the stretch pass needs of a printer's lane (schedule.ts owns the lanes). */
export type StretchLane = { printer: Printer; plates: PackedPlate[]; timed: { plate: PackedPlate; start: number; end: number }[]; finish: number; lateness: number; ok: boolean };

export type StretchContext = {
  marginMm: number;
  gapMm: number;
  /** When can the next plate start after one ends at t (the next opening, or t when open)? */
  readyAfter: (t: number) => number;
  /** Re-time one lane (sets timed, finish, lateness, ok). */
  retime: (lane: StretchLane) => void;
  /** May this plate's layout go on this printer (material, housing, bed, height)? */
  fits: (plate: PackedPlate, p: Printer) => boolean;
  /** May this copy go on this printer? */
  eligible: (x: PartInstance, p: Printer) => boolean;
  /** Most swaps tried in all. */
  budget: number;
};

/**
 * Fill the nights (lib/plan/README.md, "Nights and weekends"). A plate that ends while the workshop
 * is closed leaves its printer idle until the next opening. When a later plate of the same printer
 * and spool holds a longer copy, swapping it for a shorter copy of the idle plate (both plates laid
 * out again) makes the night plate run longer and the later one shorter: the idle hours become
 * print time and everything after moves earlier. A copy with a due time or a fair-share target
 * never moves to a later plate. Kept only when lateness does not grow, no printer touched ends
 * later, and the print minutes are done sooner on the whole (minutes × time of their plate's end);
 * a later plate left empty is dropped, one plate fewer.
 */
export function stretchNights(lanes: StretchLane[], ctx: StretchContext): void {
  let budget = ctx.budget;
  for (const lane of lanes) {
    for (let round = 0; round < 60 && budget > 0 && lane.ok; round++) {
      let improved = false;
      for (let i = 0; i < lane.timed.length && !improved && budget > 0; i++) {
        const t = lane.timed[i]!;
        const idle = (ctx.readyAfter(t.end) - t.end) / MIN;
        if (idle < 20) continue;
        const night = t.plate;
        // Later plates of the same spool: on this printer, or on another one that it fits and that
        // starts them after this plate ends (so taking a copy from them never delays it).
        const later: { q: PackedPlate; lane: StretchLane }[] = [];
        for (const other of lanes) {
          if (other !== lane && !ctx.fits(night, other.printer)) continue;
          for (const x of other === lane ? lane.timed.slice(i + 1) : other.timed) {
            if (x.plate.group === night.group && (other === lane || x.start >= t.end)) later.push({ q: x.plate, lane: other });
          }
        }
        if (later.length === 0) continue;
        // Shortest movable copies of the night plate against the longest of the later plates.
        const give = night.items.map((it) => it.inst).filter((x) => x.target === null);
        const pairs: { q: PackedPlate; qLane: StretchLane; take: PartInstance; give: PartInstance | null; gain: number }[] = [];
        for (const { q, lane: qLane } of later) {
          for (const it of q.items) {
            const take = it.inst;
            if (!ctx.eligible(take, lane.printer)) continue;
            pairs.push({ q, qLane, take, give: null, gain: Math.min(take.part.minutes, idle) });
            for (const g of give) {
              if (take.part.minutes > g.part.minutes && (qLane === lane || ctx.eligible(g, qLane.printer))) pairs.push({ q, qLane, take, give: g, gain: Math.min(take.part.minutes - g.part.minutes, idle) });
            }
          }
        }
        // Only swaps whose areas can work: the copy taken needs no more room than the one given plus
        // what the night plate has free (a check before the slower layout).
        const g = ctx.gapMm;
        const area = (x: PartInstance) => paddedArea(x, g);
        const free = usableArea(lane.printer.bed, ctx.marginMm, g) - night.items.reduce((s, it) => s + area(it.inst), 0);
        const viable = pairs.filter((pr) => area(pr.take) - (pr.give ? area(pr.give) : 0) <= free);
        viable.sort((a, b) => b.gain - a.gain);
        pairs.length = 0;
        pairs.push(...viable);
        for (const pr of pairs.slice(0, 24)) {
          if (budget-- <= 0) break;
          if (tryMove(lane, night, pr.qLane, pr.q, pr.take, pr.give, ctx)) {
            improved = true;
            break;
          }
        }
      }
      if (!improved) break;
    }
  }
}

/** Print minutes weighted by when they are done (minutes × hours from the first plate's start): lower is sooner. */
function doneWhen(lane: StretchLane): number {
  const t0 = lane.timed[0]?.start ?? 0;
  let sum = 0;
  for (const t of lane.timed) sum += t.plate.partMinutes * ((t.end - t0) / 3_600_000);
  return sum;
}

function tryMove(lane: StretchLane, a: PackedPlate, qLane: StretchLane, b: PackedPlate, take: PartInstance, give: PartInstance | null, ctx: StretchContext): boolean {
  const aItems = a.items.map((it) => it.inst).filter((x) => x !== give).concat(take);
  const bItems = b.items.map((it) => it.inst).filter((x) => x !== take).concat(give ? [give] : []);
  const na = packExact(aItems, lane.printer, ctx);
  if (!na) return false;
  const nb = bItems.length ? packExact(bItems, qLane.printer, ctx) : null;
  if (bItems.length && !nb) return false;
  const touched = qLane === lane ? [lane] : [lane, qLane];
  const before = touched.map((l) => ({ l, finish: l.finish, lateness: l.lateness, plates: l.plates, work: doneWhen(l) }));
  const keep = (from: PackedPlate, to: PackedPlate | null) => (to ? { ...to, group: from.group, packedFor: from.packedFor, rank: from.rank } : null);
  const newA = keep(a, na)!;
  const newB = keep(b, nb);
  for (const l of touched) l.plates = l.plates.flatMap((p) => (p === a ? [newA] : p === b ? (newB ? [newB] : []) : [p]));
  for (const l of touched) ctx.retime(l);
  const late = (xs: { lateness: number }[]) => xs.reduce((s, x) => s + x.lateness, 0);
  const ok =
    touched.every((l) => l.ok) &&
    late(touched) <= late(before) + 1e-6 &&
    Math.max(...touched.map((l) => l.finish)) <= Math.max(...before.map((x) => x.finish)) &&
    touched.reduce((s, l) => s + doneWhen(l), 0) < before.reduce((s, x) => s + x.work, 0) - 1;
  if (ok) return true;
  for (const x of before) {
    x.l.plates = x.plates;
    ctx.retime(x.l);
  }
  return false;
}
