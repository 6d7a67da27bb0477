import { MaxRectsBin, PACKING_LOGIC } from "maxrects-packer/dist/maxrects-packer.mjs";
import type { PartInstance } from "./fair-share";
import { bedRect, paddedArea } from "./layout";
import { brimOf, groupKey } from "./rules";
import type { Printer } from "./schema";

/** x, y: the part's own lower-left corner; w × d its footprint as placed; its brim lies around it. */
export type PackedItem = { inst: PartInstance; x: number; y: number; rotated: boolean; w: number; d: number; brim: number };
export type PackedPlate = {
  group: string;
  material: string;
  color: string;
  /** The printer the layout was packed for; the scheduler may move it to any printer it fits. */
  packedFor: string;
  items: PackedItem[];
  partMinutes: number;
  maxHeight: number;
  /** Farthest item edges from the bed origin, mm: the plate fits a bed of at least extent + margin. */
  extent: [number, number];
  rank: number;
};

export type PackOptions = {
  marginMm: number;
  gapMm: number;
  /** Longest plate time (start-up + parts) that still fits one attended spell; null = no limit. */
  spellCapMinutes: number | null;
  /** Shorten plates near the end of the queue so the last ones spread over all printers. */
  balanceTail: boolean;
  /**
   * Cap plate time at this share of the average printer load (total minutes / printers), so the
   * work can still be spread over the printers; null = no cap.
   */
  loadShare: number | null;
  /** The share of a bed's area (items counted with their gap) a planned plate-load takes. */
  chunkFill: number;
  /** `now`, ms since the epoch: due times are measured from it. */
  nowMs: number;
  /** How many times the split between bed sizes is re-balanced (at least 1). */
  balanceRounds: number;
};

type Rect = { width: number; height: number; x: number; y: number; rot: boolean; data: PartInstance };

/** Can this instance go on this printer at all (group already matches)? */
export type Eligibility = (inst: PartInstance, printer: Printer) => boolean;

/** Printers with the same bed: a plate packed for one fits them all (height and material aside). */
type BedClass = { bed: [number, number]; printers: Printer[] };

/** Bed area less the margins, with the gap added once (items are counted with their gap). */
const usableArea = (p: Printer, opt: PackOptions) => (p.bed[0] - 2 * opt.marginMm + opt.gapMm) * (p.bed[1] - 2 * opt.marginMm + opt.gapMm);

/**
 * Build the plates (README.md, "Packing"):
 * 0. The front of the queue (up to the last instance at risk of being late) first, in rank order:
 *    each plate goes to a printer that can still end it by the head's due time and is topped up
 *    with the group's flattest other instances.
 * 1. Bed sizes for the rest, a plate-load at a time: for each bed size from the largest, the
 *    flattest next plate-load (least print minutes per area) of any group goes to that size while
 *    its printers have time left; what is left goes to smaller beds. Small printers thus get few
 *    plates of long, compact parts and large printers full plates of flat, wide ones.
 * 2. Plates per group and bed size, largest first, most urgent instance first; the last one is
 *    topped up from the group's smaller-bed share. Steps 1-2 are repeated with each size's share
 *    scaled until the packed work matches the printers' time, keeping the best balance.
 * Every plate is packed several ways (orders, maxrects heuristics) and the fullest is kept.
 */
export function packPlates(ranked: readonly PartInstance[], printers: readonly Printer[], eligible: Eligibility, opt: PackOptions): PackedPlate[] {
  if (ranked.length === 0) return [];
  const bedAreaOf = (p: Printer) => p.bed[0] * p.bed[1];
  const classes = bedClasses(printers);
  const classIndex = new Map<string, number>();
  classes.forEach((c, i) => c.printers.forEach((p) => classIndex.set(p.id, i)));
  const totalMinutes = ranked.reduce((s, x) => s + x.part.minutes, 0);
  const share = totalMinutes / printers.length;
  const shareCap = opt.loadShare === null ? Number.POSITIVE_INFINITY : opt.loadShare * share;
  const plateCap = Math.min(opt.spellCapMinutes ?? Number.POSITIVE_INFINITY, shareCap);

  // Which printers take each part (one list per part, shared by its instances).
  const takers = new Map<string, Printer[]>();
  const takersOf = (x: PartInstance) => {
    let t = takers.get(x.part.id);
    if (!t) takers.set(x.part.id, (t = printers.filter((p) => eligible(x, p))));
    return t;
  };
  const padded = (x: PartInstance) => paddedArea(x, opt.gapMm);

  // 0. Plates for the instances at risk of being late, earliest due first: each goes to the printer
  //    with the least such work so far and is kept short enough to end by its first due time, then
  //    topped up with the group's flattest other instances (area without much time).
  const taken = new Set<PartInstance>();
  const urgentPlates: PackedPlate[] = [];
  const urgentLoad = new Map(printers.map((p) => [p.id, 0]));
  const dueMs = (x: PartInstance) => x.target!;
  // The front of the queue: everything ranked up to the last instance at risk (so higher
  // priorities too), in rank order, which is earliest due first among those at risk.
  let front = 0;
  ranked.forEach((x, i) => {
    if (x.atRisk) front = i + 1;
  });
  const urgent = ranked.slice(0, front);
  const urgentSet = new Set(urgent);
  for (const head of urgent) {
    if (taken.has(head)) continue;
    // A printer that can still finish it in time, with the least such work, larger bed on ties.
    const untilDueOn = (p: Printer) => (head.target === null ? Number.POSITIVE_INFINITY : (dueMs(head) - opt.nowMs) / 60_000 - urgentLoad.get(p.id)!);
    const inTime = (p: Printer) => untilDueOn(p) >= p.startup_minutes + head.part.minutes;
    const printer = [...takersOf(head)].sort(
      (a, b) =>
        Number(inTime(b)) - Number(inTime(a)) ||
        urgentLoad.get(a.id)! - urgentLoad.get(b.id)! ||
        bedAreaOf(b) - bedAreaOf(a) ||
        (a.id < b.id ? -1 : 1),
    )[0]!;
    const key = groupKey(head.part);
    const untilDue = untilDueOn(printer);
    // Short enough to end by the head's due time; when that is out of reach anyway, no shorter than
    // a quarter of the average load (a plate of one late part would only cost a plate).
    const cap = Math.max(Math.min(plateCap, inTime(printer) ? untilDue : Math.max(untilDue, share / 4)), printer.startup_minutes + head.part.minutes);
    const own = urgent.filter((x) => !taken.has(x) && groupKey(x.part) === key);
    const filler = ranked
      .filter((x) => !taken.has(x) && !urgentSet.has(x) && groupKey(x.part) === key)
      .sort((a, b) => a.part.minutes / padded(a) - b.part.minutes / padded(b) || a.rank - b.rank);
    const plate = bestFill(own, filler, printer, eligible, opt, cap, true);
    if (plate.items.length === 0) continue;
    // The plate runs in its urgent instances' turn; the top-up rides along.
    plate.rank = Math.min(...plate.items.filter((it) => urgentSet.has(it.inst)).map((it) => it.inst.rank));
    for (const it of plate.items) taken.add(it.inst);
    urgentLoad.set(printer.id, urgentLoad.get(printer.id)! + printer.startup_minutes + plate.partMinutes);
    urgentPlates.push(plate);
  }
  const rest = ranked.filter((x) => !taken.has(x));

  // The top-up moves some print time from smaller to larger beds, so the split is repeated a
  // few times with each bed size's share scaled by how far its packed work missed its target;
  // the plan with the best balance (then the fewest plates) is kept.
  const weight = classes.map(() => 1);
  let best: { plates: PackedPlate[]; over: number } | null = null;
  for (let round = 0; round < opt.balanceRounds; round++) {
    const { classOf, planned } = assignBeds(weight);
    const plates = [...urgentPlates, ...buildPlates(classOf, planned)];
    const packed = classes.map(() => 0);
    for (const pl of plates) packed[classIndex.get(pl.packedFor)!]! += pl.partMinutes + printers.find((p) => p.id === pl.packedFor)!.startup_minutes;
    // How far above the average load the printers must run: a plate fits its own bed size and any
    // larger one, so the k largest bed sizes together must print all of their own plates.
    let over = 0;
    let work = 0;
    let count = 0;
    classes.forEach((c, ci) => {
      work += packed[ci]!;
      count += c.printers.length;
      over = Math.max(over, work / (count * share));
    });
    if (!best || over < best.over - 0.02 || (over < best.over + 0.02 && plates.length < best.plates.length)) best = { plates, over };
    classes.forEach((c, ci) => {
      const target = c.printers.length * share;
      if (packed[ci]! > 0) weight[ci] = weight[ci]! * Math.min(1.5, Math.max(0.5, target / packed[ci]!));
    });
  }
  return best!.plates.sort((a, b) => a.rank - b.rank);

  /**
   * 1. Bed size per instance, a plate's worth at a time: for each bed size from the largest, the
   *    flattest plate-load (least print minutes per area) of any group goes to a printer of that
   *    size taking the group while its weighted share of the time lasts; the rest go to smaller beds.
   *    Returns each instance's bed size and, per group, the plates meant for each size.
   */
  function assignBeds(w: readonly number[]): { classOf: Map<PartInstance, number>; planned: Map<string, number[]> } {
    const timeLeft = new Map(printers.map((p) => [p.id, share * w[classIndex.get(p.id)!]! - urgentLoad.get(p.id)!]));
    const classOf = new Map<PartInstance, number>();
    const planned = new Map<string, number[]>();
    const pools = new Map<string, PartInstance[]>();
    for (const x of rest) {
      const key = groupKey(x.part);
      (pools.get(key) ?? pools.set(key, []).get(key)!).push(x);
      if (!planned.has(key)) planned.set(key, classes.map(() => 0));
    }
    const flatness = (x: PartInstance) => x.part.minutes / padded(x);
    for (const list of pools.values()) list.sort((a, b) => flatness(a) - flatness(b) || a.rank - b.rank);
    for (let ci = 0; ci + 1 < classes.length; ci++) {
      const load = usableArea(classes[ci]!.printers[0]!, opt) * opt.chunkFill;
      const closed = new Set<string>();
      for (let guard = 0; guard <= rest.length; guard++) {
        // The flattest next plate-load of each group (instances a printer of this size takes).
        let pick: { key: string; items: PartInstance[]; minutes: number; ratio: number } | null = null;
        for (const [key, list] of pools) {
          if (closed.has(key)) continue;
          const items: PartInstance[] = [];
          let area = 0;
          let minutes = 0;
          for (const x of list) {
            if (area >= load || (items.length > 0 && minutes + x.part.minutes > plateCap)) break;
            if (!takersOf(x).some((p) => classIndex.get(p.id) === ci)) continue;
            items.push(x);
            area += padded(x);
            minutes += x.part.minutes;
          }
          if (items.length === 0) {
            closed.add(key);
            continue;
          }
          const ratio = minutes / area;
          if (!pick || ratio < pick.ratio) pick = { key, items, minutes, ratio };
        }
        if (!pick) break;
        let printer: Printer | undefined;
        for (const p of takersOf(pick.items[0]!)) {
          if (classIndex.get(p.id) === ci && (!printer || timeLeft.get(p.id)! > timeLeft.get(printer.id)!)) printer = p;
        }
        if (!printer || timeLeft.get(printer.id)! < pick.minutes / 2) {
          closed.add(pick.key);
          continue;
        }
        timeLeft.set(printer.id, timeLeft.get(printer.id)! - pick.minutes);
        const chosen = new Set(pick.items);
        for (const x of chosen) classOf.set(x, ci);
        planned.get(pick.key)![ci]!++;
        pools.set(pick.key, pools.get(pick.key)!.filter((x) => !chosen.has(x)));
      }
    }
    // The rest: the smallest bed that takes them.
    for (const list of pools.values()) {
      for (const x of list) classOf.set(x, Math.max(...takersOf(x).map((p) => classIndex.get(p.id)!)));
    }
    return { classOf, planned };
  }

  /** 2. Plates per group, most urgent group first, largest bed first. */
  function buildPlates(classOf: Map<PartInstance, number>, planned: Map<string, number[]>): PackedPlate[] {
    const groups = new Map<string, PartInstance[]>();
    for (const x of rest) {
      const key = groupKey(x.part);
      const list = groups.get(key) ?? [];
      list.push(x);
      groups.set(key, list);
    }
    const load = new Map(printers.map((p) => [p.id, 0]));
    let remainingMinutes = totalMinutes;
    const plates: PackedPlate[] = [];
    for (const members of groups.values()) {
      const left = new Set(members);
      const plan = [...planned.get(groupKey(members[0]!.part))!];
      for (let ci = 0; ci < classes.length; ci++) {
        let made = 0;
        for (let guard = 0; guard <= members.length; guard++) {
          const own = members.filter((x) => left.has(x) && classOf.get(x) === ci);
          if (own.length === 0) break;
          if (made >= plan[ci]! && ci + 1 < classes.length) {
            // This size's planned plates are made: what did not fit goes to the next smaller bed
            // that takes it (or stays when none does).
            let moved = 0;
            for (const x of own) {
              const next = Math.min(...takersOf(x).map((p) => classIndex.get(p.id)!).filter((c) => c > ci));
              if (Number.isFinite(next)) {
                classOf.set(x, next);
                moved++;
              }
            }
            if (moved === own.length) break;
            plan[ci] = Number.POSITIVE_INFINITY;
            continue;
          }
          const head = own[0]!;
          // The printer of this bed size that takes the head and has the least work so far.
          const printer = [...takersOf(head)]
            .filter((p) => classIndex.get(p.id) === ci)
            .sort((a, b) => load.get(a.id)! - load.get(b.id)! || (a.id < b.id ? -1 : 1))[0]!;
          // Top-up candidates: the group's instances meant for smaller beds, next size first, flattest first.
          const filler = members
            .filter((x) => left.has(x) && classOf.get(x)! > ci)
            .sort((a, b) => classOf.get(a)! - classOf.get(b)! || a.part.minutes / padded(a) - b.part.minutes / padded(b) || a.rank - b.rank);
          let cap = Math.min(opt.spellCapMinutes ?? Number.POSITIVE_INFINITY, shareCap);
          if (opt.balanceTail) cap = Math.min(cap, remainingMinutes / printers.length);
          cap = Math.max(cap, printer.startup_minutes + head.part.minutes);
          const plate = bestFill(own, filler, printer, eligible, opt, cap);
          if (plate.items.length === 0) break;
          for (const it of plate.items) left.delete(it.inst);
          remainingMinutes -= plate.partMinutes;
          load.set(printer.id, load.get(printer.id)! + printer.startup_minutes + plate.partMinutes);
          plates.push(plate);
          made++;
        }
      }
    }
    return plates;
  }
}

function bedClasses(printers: readonly Printer[]): BedClass[] {
  const map = new Map<string, BedClass>();
  for (const p of printers) {
    const key = `${p.bed[0]}x${p.bed[1]}`;
    const c = map.get(key) ?? { bed: [p.bed[0], p.bed[1]] as [number, number], printers: [] };
    c.printers.push(p);
    map.set(key, c);
  }
  return [...map.values()].sort((a, b) => b.bed[0] * b.bed[1] - a.bed[0] * a.bed[1] || b.bed[0] - a.bed[0]);
}

type Order = (a: PartInstance, b: PartInstance) => number;
const VARIANTS: { sort: (gap: number) => Order; logic: PACKING_LOGIC }[] = [
  // Largest area first: the usual order for fuller rectangle packings.
  { sort: (g) => (a, b) => (b.part.footprint[0] + g) * (b.part.footprint[1] + g) - (a.part.footprint[0] + g) * (a.part.footprint[1] + g) || a.rank - b.rank, logic: PACKING_LOGIC.MAX_AREA },
  { sort: (g) => (a, b) => (b.part.footprint[0] + g) * (b.part.footprint[1] + g) - (a.part.footprint[0] + g) * (a.part.footprint[1] + g) || a.rank - b.rank, logic: PACKING_LOGIC.MAX_EDGE },
  // Longest side first.
  { sort: () => (a, b) => Math.max(...b.part.footprint) - Math.max(...a.part.footprint) || a.rank - b.rank, logic: PACKING_LOGIC.MAX_AREA },
  { sort: () => (a, b) => Math.max(...b.part.footprint) - Math.max(...a.part.footprint) || a.rank - b.rank, logic: PACKING_LOGIC.MAX_EDGE },
  // Longest perimeter first.
  { sort: () => (a, b) => b.part.footprint[0] + b.part.footprint[1] - a.part.footprint[0] - a.part.footprint[1] || a.rank - b.rank, logic: PACKING_LOGIC.MAX_AREA },
];

/** Pack one plate several ways and keep the fullest (the first on ties). */
function bestFill(
  own: readonly PartInstance[],
  filler: readonly PartInstance[],
  printer: Printer,
  eligible: Eligibility,
  opt: PackOptions,
  cap: number,
  topUpAlways = false,
): PackedPlate {
  let best: PackedPlate | null = null;
  let bestArea = -1;
  for (const v of VARIANTS) {
    const plate = fillPlate(own, filler, printer, eligible, opt, cap, v.sort(opt.gapMm), v.logic, topUpAlways);
    const area = plate.items.reduce((s, it) => s + it.w * it.d, 0);
    if (area > bestArea + 1e-9) {
      best = plate;
      bestArea = area;
    }
  }
  return best!;
}

function fillPlate(
  own: readonly PartInstance[],
  filler: readonly PartInstance[],
  printer: Printer,
  eligible: Eligibility,
  opt: PackOptions,
  capMinutes: number,
  order: Order,
  logic: PACKING_LOGIC,
  topUpAlways: boolean,
): PackedPlate {
  const [bedW, bedD] = printer.bed;
  const bin = new MaxRectsBin<Rect>(bedW, bedD, opt.gapMm, {
    smart: false,
    pot: false,
    square: false,
    allowRotation: true,
    border: opt.marginMm,
    logic,
  });
  const usable = (bedW - 2 * opt.marginMm + opt.gapMm) * (bedD - 2 * opt.marginMm + opt.gapMm);
  const padded = (x: PartInstance) => paddedArea(x, opt.gapMm);
  let freeArea = usable;
  let minutes = printer.startup_minutes;
  const items: PackedItem[] = [];
  const tryPlace = (x: PartInstance): boolean => {
    if (padded(x) > freeArea + 1e-9) return false;
    if (items.length > 0 && minutes + x.part.minutes > capMinutes) return false;
    if (!eligible(x, printer)) return false;
    const [w, d] = bedRect(x);
    // A free rectangle must hold it (either way round) before the packer is asked: failed adds are slow.
    const pw = w + opt.gapMm;
    const pd = d + opt.gapMm;
    let room = false;
    for (const f of bin.freeRects) {
      if ((f.width >= pw && f.height >= pd) || (f.width >= pd && f.height >= pw)) {
        room = true;
        break;
      }
    }
    if (!room) return false;
    const r = bin.add(w, d, x) as Rect | undefined;
    if (!r) return false;
    const rotated = Boolean(r.rot);
    const brim = brimOf(x.part);
    const [fw, fd] = x.part.footprint;
    // A turned rectangle keeps its width and height unswapped: its footprint is d × w.
    items.push({ inst: x, x: r.x + brim, y: r.y + brim, rotated, w: rotated ? fd : fw, d: rotated ? fw : fd, brim });
    freeArea -= padded(x);
    minutes += x.part.minutes;
    return true;
  };
  const head = own[0]!;
  tryPlace(head);
  // Look-ahead window: the next instances in rank order, enough to fill the bed about one and a
  // half times, so urgent parts share the early plates; then the rest, and then the top-up.
  const window: PartInstance[] = [];
  let windowArea = padded(head);
  let windowMinutes = minutes;
  let i = 1;
  for (; i < own.length && windowArea < 1.5 * usable && windowMinutes < capMinutes; i++) {
    const x = own[i]!;
    window.push(x);
    windowArea += padded(x);
    windowMinutes += x.part.minutes;
  }
  window.sort(order);
  for (const x of window) tryPlace(x);
  const smallest = Math.min(...own.map(padded), ...filler.map(padded));
  if (i < own.length && freeArea >= smallest && minutes < capMinutes) {
    const rest = own.slice(i).sort(order);
    for (const x of rest) {
      if (freeArea < smallest || minutes >= capMinutes) break;
      tryPlace(x);
    }
  }
  // Top-up from the next bed size's share only once this bed size's own instances are all placed,
  // so that it fills the last, partial plate without moving much print time to this bed size.
  const ownDone = topUpAlways || own.every((x) => items.some((it) => it.inst === x));
  for (const x of ownDone ? filler : []) {
    if (freeArea < smallest || minutes >= capMinutes) break;
    tryPlace(x);
  }
  let maxX = 0;
  let maxY = 0;
  let maxHeight = 0;
  let partMinutes = 0;
  for (const it of items) {
    maxX = Math.max(maxX, it.x + it.w + it.brim);
    maxY = Math.max(maxY, it.y + it.d + it.brim);
    maxHeight = Math.max(maxHeight, it.inst.part.height);
    partMinutes += it.inst.part.minutes;
  }
  return {
    group: groupKey(head.part),
    material: head.part.material,
    color: head.part.color,
    packedFor: printer.id,
    items,
    partMinutes,
    maxHeight,
    extent: [maxX, maxY],
    rank: Math.min(...items.map((it) => it.inst.rank)),
  };
}

/**
 * Lay out exactly these copies on one printer's bed (several orders and maxrects heuristics; the
 * first that places all of them), or null when they do not fit together. Used when copies move
 * between plates after scheduling.
 */
export function packExact(items: readonly PartInstance[], printer: Printer, opt: Pick<PackOptions, "marginMm" | "gapMm">): PackedPlate | null {
  if (items.length === 0) return null;
  const full = opt as PackOptions;
  const byRank = [...items].sort((a, b) => a.rank - b.rank);
  for (const v of VARIANTS) {
    const ordered = [...byRank].sort(v.sort(opt.gapMm));
    const plate = fillPlate(ordered, [], printer, () => true, full, Number.POSITIVE_INFINITY, v.sort(opt.gapMm), v.logic, false);
    if (plate.items.length === items.length) return plate;
  }
  return null;
}
