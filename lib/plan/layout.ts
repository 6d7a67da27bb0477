import type { PartInstance } from "./fair-share";
import { brimOf } from "./rules";

/** The rectangle a copy takes on the bed, brim included, without the gap. */
export function bedRect(x: Pick<PartInstance, "part">): [number, number] {
  const b = 2 * brimOf(x.part);
  return [x.part.footprint[0] + b, x.part.footprint[1] + b];
}

/** Area a copy uses, counted with its gap (what a bed's usable area is measured against). */
export function paddedArea(x: Pick<PartInstance, "part">, gap: number): number {
  const [w, d] = bedRect(x);
  return (w + gap) * (d + gap);
}

/** Bed area less the margins, with one gap added back (items are counted with their gap). */
export function usableArea(bed: readonly [number, number], margin: number, gap: number): number {
  return (bed[0] - 2 * margin + gap) * (bed[1] - 2 * margin + gap);
}

export type LaidOut = { x: number; y: number; w: number; d: number; brim: number };

/**
 * Shift a plate's layout so its bounding box (brims included) sits in the middle of the bed
 * rather than crowded at one edge; x, y are each part's own lower-left corner.
 */
export function centreLayout<T extends LaidOut>(items: readonly T[], bed: readonly [number, number]): T[] {
  if (items.length === 0) return [...items];
  let x0 = Infinity;
  let y0 = Infinity;
  let x1 = -Infinity;
  let y1 = -Infinity;
  for (const it of items) {
    x0 = Math.min(x0, it.x - it.brim);
    y0 = Math.min(y0, it.y - it.brim);
    x1 = Math.max(x1, it.x + it.w + it.brim);
    y1 = Math.max(y1, it.y + it.d + it.brim);
  }
  const dx = (bed[0] - (x1 - x0)) / 2 - x0;
  const dy = (bed[1] - (y1 - y0)) / 2 - y0;
  return items.map((it) => ({ ...it, x: it.x + dx, y: it.y + dy }));
}
