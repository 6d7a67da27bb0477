// Which printers can take a planned plate as it is laid out: one rule for the Floor's Move list and
// movePlate's own check. Pure (no database), so both call it with the rows they read.
import { brimOf, housingAllows } from "@/lib/plan/rules";

export interface FitPrinter {
  id: number;
  name: string;
  bedX: number;
  bedY: number;
  height: number;
  enclosed: boolean;
  materials: readonly string[];
  state: string;
}

/** A plate item as stored: lower-left corner of its footprint after any turn, the footprint before the turn, its height. */
export interface FitItem {
  x: number;
  y: number;
  rotated: boolean;
  sizeX: number;
  sizeY: number;
  sizeZ: number;
}

export interface PlateExtent {
  minX: number;
  minY: number;
  width: number;
  depth: number;
  height: number;
}

/** The box the layout takes on the bed, brims included (the plan's own brim rule, lib/plan/rules.ts). */
export function plateExtent(material: string, items: readonly FitItem[]): PlateExtent {
  const brim = brimOf({ material: material.toUpperCase() });
  let x0 = Infinity;
  let y0 = Infinity;
  let x1 = -Infinity;
  let y1 = -Infinity;
  let h = 0;
  for (const it of items) {
    const w = it.rotated ? it.sizeY : it.sizeX;
    const d = it.rotated ? it.sizeX : it.sizeY;
    x0 = Math.min(x0, it.x - brim);
    y0 = Math.min(y0, it.y - brim);
    x1 = Math.max(x1, it.x + w + brim);
    y1 = Math.max(y1, it.y + d + brim);
    h = Math.max(h, it.sizeZ);
  }
  if (!items.length) return { minX: 0, minY: 0, width: 0, depth: 0, height: 0 };
  return { minX: x0, minY: y0, width: x1 - x0, depth: y1 - y0, height: h };
}

const EPS = 1e-6;

/**
 * Why this printer cannot take the plate, or null when it can: it prints the material, its housing
 * allows it (ABS/ASA only enclosed), it is not under maintenance, and the layout's extent fits the
 * bed less the margin on every side and under its height. The layout is re-centred on the new bed,
 * so only its extent matters, not where it sat on the old one.
 */
export function whyNot(plate: { printerId: number; material: string }, extent: PlateExtent, p: FitPrinter, marginMm: number): string | null {
  const type = plate.material.toLowerCase();
  if (p.id === plate.printerId) return "The plate is on that printer already.";
  if (!p.materials.includes(type)) return `${p.name} does not print ${type.toUpperCase()}.`;
  if (!housingAllows({ enclosed: p.enclosed }, type)) return `${type.toUpperCase()} needs an enclosed printer and ${p.name} is open.`;
  if (p.state === "maintenance") return `${p.name} is under maintenance.`;
  if (extent.width > p.bedX - 2 * marginMm + EPS || extent.depth > p.bedY - 2 * marginMm + EPS || extent.height > p.height + EPS) {
    return `This plate's layout (${Math.ceil(extent.width)} × ${Math.ceil(extent.depth)} × ${Math.ceil(extent.height)} mm) does not fit ${p.name}'s ${p.bedX} × ${p.bedY} × ${p.height} mm build volume less its ${marginMm} mm margin.`;
  }
  return null;
}

/** The printers a plate may move to, in the given order. */
export function moveTargets(plate: { printerId: number; material: string }, items: readonly FitItem[], printers: readonly FitPrinter[], marginMm: number): FitPrinter[] {
  const extent = plateExtent(plate.material, items);
  return printers.filter((p) => whyNot(plate, extent, p, marginMm) === null);
}

/** The shift that puts the layout's extent in the middle of a bed. */
export function recentre(extent: PlateExtent, bed: { bedX: number; bedY: number }): { dx: number; dy: number } {
  return { dx: (bed.bedX - extent.width) / 2 - extent.minX, dy: (bed.bedY - extent.depth) / 2 - extent.minY };
}
