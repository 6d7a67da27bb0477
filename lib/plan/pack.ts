import { MaxRectsBin, PACKING_LOGIC } from "maxrects-packer/dist/maxrects-packer.mjs";
import type { PartInstance } from "./fair-share";
import type { Part, Printer } from "./schema";

/** Parts that may share a plate: same material and colour, same layer height and nozzle. */
export function groupKey(p: Pick<Part, "material" | "color" | "layer_height" | "nozzle">): string {
  return `${p.material}\u0000${p.color}\u0000${p.layer_height}\u0000${p.nozzle}`;
}

export type PackedItem = { inst: PartInstance; x: number; y: number; rotated: boolean; w: number; d: number };
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
   * Cap plate time at this share of the average printer load (1/3: at least about three plates
   * per printer), so the work can be spread evenly; null = no cap.
   */
  loadShare: number | null;
};

type Rect = { width: number; height: number; x: number; y: number; rot: boolean; data: PartInstance };

/** Can this instance go on this printer at all (group already matches)? */
export type Eligibility = (inst: PartInstance, printer: Printer) => boolean;

/**
 * Build plates one at a time, most urgent first (see README.md, "Packing"). Each new plate starts
 * with the most urgent unplaced instance of any group, goes to the eligible printer with the least
 * work estimated so far, and is filled from that group: a look-ahead window of the next instances
 * in rank order, largest first, then any later instance that still fits.
 */
export function packPlates(ranked: readonly PartInstance[], printers: readonly Printer[], eligible: Eligibility, opt: PackOptions): PackedPlate[] {
  const pending = new Map<string, PartInstance[]>();
  for (const inst of ranked) {
    const key = groupKey(inst.part);
    const list = pending.get(key) ?? [];
    list.push(inst);
    pending.set(key, list);
  }
  const load = new Map(printers.map((p) => [p.id, 0]));
  let remainingMinutes = ranked.reduce((s, x) => s + x.part.minutes, 0);
  const shareCap = opt.loadShare === null ? Number.POSITIVE_INFINITY : (opt.loadShare * remainingMinutes) / printers.length;
  const plates: PackedPlate[] = [];
  for (let guard = 0; guard <= ranked.length; guard++) {
    // The group whose head is the most urgent.
    let headGroup: string | null = null;
    let head: PartInstance | undefined;
    for (const [key, list] of pending) {
      const first = list[0];
      if (first && (!head || first.rank < head.rank)) {
        head = first;
        headGroup = key;
      }
    }
    if (!head || headGroup === null) break;
    const group = pending.get(headGroup)!;
    const headInst = head;
    const candidates = printers.filter((p) => eligible(headInst, p));
    const printer = [...candidates].sort(
      (a, b) => load.get(a.id)! - load.get(b.id)! || b.bed[0] * b.bed[1] - a.bed[0] * a.bed[1] || (a.id < b.id ? -1 : 1),
    )[0]!;
    let cap = Math.min(opt.spellCapMinutes ?? Number.POSITIVE_INFINITY, shareCap);
    if (opt.balanceTail) cap = Math.min(cap, remainingMinutes / printers.length);
    cap = Math.max(cap, printer.startup_minutes + head.part.minutes);
    const plate = fillPlate(group, printer, eligible, opt, cap);
    const placed = new Set(plate.items.map((i) => i.inst));
    pending.set(headGroup, group.filter((x) => !placed.has(x)));
    if (pending.get(headGroup)!.length === 0) pending.delete(headGroup);
    remainingMinutes -= plate.partMinutes;
    load.set(printer.id, load.get(printer.id)! + printer.startup_minutes + plate.partMinutes);
    plates.push(plate);
  }
  return plates;
}

function fillPlate(group: readonly PartInstance[], printer: Printer, eligible: Eligibility, opt: PackOptions, capMinutes: number): PackedPlate {
  const [bedW, bedD] = printer.bed;
  const bin = new MaxRectsBin<Rect>(bedW, bedD, opt.gapMm, {
    smart: false,
    pot: false,
    square: false,
    allowRotation: true,
    border: opt.marginMm,
    logic: PACKING_LOGIC.MAX_AREA,
  });
  const usable = (bedW - 2 * opt.marginMm + opt.gapMm) * (bedD - 2 * opt.marginMm + opt.gapMm);
  const padded = (x: PartInstance) => (x.part.footprint[0] + opt.gapMm) * (x.part.footprint[1] + opt.gapMm);
  let freeArea = usable;
  let minutes = printer.startup_minutes;
  const items: PackedItem[] = [];
  const tryPlace = (x: PartInstance): boolean => {
    if (padded(x) > freeArea + 1e-9) return false;
    if (items.length > 0 && minutes + x.part.minutes > capMinutes) return false;
    if (!eligible(x, printer)) return false;
    const [w, d] = x.part.footprint;
    const r = bin.add(w, d, x) as Rect | undefined;
    if (!r) return false;
    const rotated = Boolean(r.rot);
    // A turned rectangle keeps its width and height unswapped: its footprint is d × w.
    items.push({ inst: x, x: r.x, y: r.y, rotated, w: rotated ? d : w, d: rotated ? w : d });
    freeArea -= padded(x);
    minutes += x.part.minutes;
    return true;
  };
  const head = group[0]!;
  tryPlace(head);
  // Look-ahead window: enough of the next instances to fill the bed about one and a half times,
  // placed largest first (large-first is the usual way to get fuller rectangle packings).
  const window: PartInstance[] = [];
  let windowArea = padded(head);
  let windowMinutes = minutes;
  let i = 1;
  for (; i < group.length && windowArea < 1.5 * usable && windowMinutes < capMinutes; i++) {
    const x = group[i]!;
    window.push(x);
    windowArea += padded(x);
    windowMinutes += x.part.minutes;
  }
  window.sort((a, b) => padded(b) - padded(a) || a.rank - b.rank);
  for (const x of window) tryPlace(x);
  // Fill the holes with anything later in the queue that fits.
  const smallest = Math.min(...group.map(padded));
  for (; i < group.length && freeArea >= smallest && minutes < capMinutes; i++) tryPlace(group[i]!);
  let maxX = 0;
  let maxY = 0;
  let maxHeight = 0;
  let partMinutes = 0;
  for (const it of items) {
    maxX = Math.max(maxX, it.x + it.w);
    maxY = Math.max(maxY, it.y + it.d);
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
