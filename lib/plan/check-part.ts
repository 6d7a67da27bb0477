import type { Part, Printer } from "./schema";

type PartShape = Pick<Part, "footprint" | "height" | "material" | "nozzle">;
type PrinterShape = Pick<Printer, "id" | "bed" | "height" | "materials" | "nozzle">;

export type PartCheck = { ok: true; printers: string[] } | { ok: false; reason: string };

const EPS = 1e-9;

/** Does a w × d footprint fit the bed less the margin on every side, as placed or turned 90°? */
export function footprintFits(footprint: readonly [number, number], bed: readonly [number, number], margin: number): boolean {
  const [w, d] = footprint;
  const bw = bed[0] - 2 * margin;
  const bd = bed[1] - 2 * margin;
  return (w <= bw + EPS && d <= bd + EPS) || (d <= bw + EPS && w <= bd + EPS);
}

const mm = (v: number) => `${Math.round(v * 10) / 10} mm`;

/**
 * Check one part instance against the printers before it is accepted. The filters run in the
 * order a member can act on (material, nozzle, footprint, height); the reason names the first
 * one that leaves no printer, with the nearest miss so the member knows by how much.
 */
export function checkPartInstance(part: PartShape, printers: readonly PrinterShape[], marginMm: number): PartCheck {
  if (printers.length === 0) return { ok: false, reason: "the workshop has no printers" };
  const byMaterial = printers.filter((p) => p.materials.includes(part.material));
  if (byMaterial.length === 0) return { ok: false, reason: `no printer takes ${part.material}` };
  const byNozzle = byMaterial.filter((p) => Math.abs(p.nozzle - part.nozzle) < EPS);
  if (byNozzle.length === 0) {
    const sizes = [...new Set(byMaterial.map((p) => p.nozzle))].sort((a, b) => a - b).map(mm);
    return { ok: false, reason: `no ${part.material} printer has a ${mm(part.nozzle)} nozzle (available: ${sizes.join(", ")})` };
  }
  const byBed = byNozzle.filter((p) => footprintFits(part.footprint, p.bed, marginMm));
  if (byBed.length === 0) {
    const largest = [...byNozzle].sort((a, b) => b.bed[0] * b.bed[1] - a.bed[0] * a.bed[1])[0]!;
    return {
      ok: false,
      reason:
        `footprint ${mm(part.footprint[0])} × ${mm(part.footprint[1])} does not fit any bed less the ${mm(marginMm)} margin, ` +
        `even turned 90° (largest usable: ${mm(largest.bed[0] - 2 * marginMm)} × ${mm(largest.bed[1] - 2 * marginMm)})`,
    };
  }
  const byHeight = byBed.filter((p) => part.height <= p.height + EPS);
  if (byHeight.length === 0) {
    const tallest = Math.max(...byBed.map((p) => p.height));
    return { ok: false, reason: `height ${mm(part.height)} exceeds the build height of every printer it fits on (tallest: ${mm(tallest)})` };
  }
  return { ok: true, printers: byHeight.map((p) => p.id) };
}
