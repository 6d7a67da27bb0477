import { fitVerdict } from "@/lib/rules/fit";
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


/**
 * Check one part instance against the printers before it is accepted. The filters run in the
 * order a member can act on (material, nozzle, footprint, height); the reason names the first
 * one that leaves no printer, with the nearest miss so the member knows by how much.
 */
export function checkPartInstance(part: PartShape, printers: readonly PrinterShape[], marginMm: number): PartCheck {
  // The workshop's one fit rule (lib/rules/fit.ts); the plan's material names are compared as given.
  return fitVerdict(part, printers.map((p) => ({ id: p.id, bed: p.bed, height: p.height, materials: p.materials, nozzle: p.nozzle })), part.material, part.material, marginMm);
}
