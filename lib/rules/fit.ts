/**
 * Does a part fit a printer? One answer for the part page, the quote, the orientation panel, the
 * split planner, the queue and the planner.
 *
 * A part lies on the bed in some orientation; its footprint w × d (the bounding rectangle in the
 * bed plane, mm) must fit the bed less the margin on every side, as placed or turned a quarter
 * about Z; its height must fit under the printer's build height; and the printer must take its
 * material.
 */
import { isMaterialKey } from "../estimate/materials";
import { materialName } from "./materials";

/**
 * Clear border kept free on every side of the bed, mm: room for a skirt or brim line and for the
 * clips or edge some beds lose, and the planner's placement margin. Common practice, no source.
 */
export const BED_MARGIN_MM = 5;

/** Rounding slack for coordinates that went through a rotation, mm. */
const SLACK_MM = 1e-6;

export interface PartEnvelope {
  /** Bounding rectangle on the bed, mm (x, y of the print frame). */
  footprint: readonly [number, number];
  /** Height above the bed, mm. */
  height: number;
  /** Nozzle the part asks for, mm; absent: any. */
  nozzle?: number;
}

export interface PrinterEnvelope {
  id: string;
  name?: string;
  /** Bed width and depth, mm. */
  bed: readonly [number, number];
  /** Build height, mm. */
  height: number;
  /**
   * Materials the printer takes, as keys (lib/rules/materials: "pla", "petg", …) or, in planner
   * instances, the instance's own names. An empty list: none (the workshop has not said).
   */
  materials: readonly string[];
  /** Nozzle fitted, mm; absent: matches any part. */
  nozzle?: number;
}

const nozzleMatches = (part: PartEnvelope, p: PrinterEnvelope) => part.nozzle === undefined || p.nozzle === undefined || Math.abs(part.nozzle - p.nozzle) < 1e-9;

export interface PrinterFitAnswer {
  printerId: string;
  name: string;
  fits: boolean;
  /** Fits only after a quarter turn about Z. */
  turned: boolean;
  /** Why not, in plain words; empty when it fits. */
  reason: string;
}

const mm = (v: number) => `${Math.round(v * 10) / 10} mm`;
const shown = (m: string) => (isMaterialKey(m) ? materialName(m) : m);

/** The part of the bed a part may occupy: the bed less the margin on every side. */
export function usableBed(bed: readonly [number, number], margin = BED_MARGIN_MM): [number, number] {
  return [Math.max(0, bed[0] - 2 * margin), Math.max(0, bed[1] - 2 * margin)];
}

/** Does a w × d footprint fit the bed less the margin, as placed ("straight") or turned 90°? */
export function footprintFit(footprint: readonly [number, number], bed: readonly [number, number], margin = BED_MARGIN_MM): { fits: boolean; turned: boolean } {
  const [w, d] = footprint;
  const [bw, bd] = usableBed(bed, margin);
  const straight = w <= bw + SLACK_MM && d <= bd + SLACK_MM;
  const turned = !straight && d <= bw + SLACK_MM && w <= bd + SLACK_MM;
  return { fits: straight || turned, turned };
}

/**
 * The geometric half of the rule (bed less the margin, either quarter turn, and build height), for
 * callers that already kept only the printers taking the material (the orientation search).
 */
export function envelopeFits(part: PartEnvelope, bed: readonly [number, number], buildHeight: number, margin = BED_MARGIN_MM): { fits: boolean; turned: boolean } {
  const flat = footprintFit(part.footprint, bed, margin);
  const tallEnough = part.height <= buildHeight + SLACK_MM;
  return { fits: flat.fits && tallEnough, turned: flat.turned };
}

/**
 * The one fit rule. `material` null means the workshop does not print the part's material at all;
 * `materialLabel` is how the member wrote it (for the message).
 */
export function fitOnPrinter(part: PartEnvelope, printer: PrinterEnvelope, material: string | null, materialLabel?: string, margin = BED_MARGIN_MM): PrinterFitAnswer {
  const reasons: string[] = [];
  const flat = footprintFit(part.footprint, printer.bed, margin);
  const [bw, bd] = usableBed(printer.bed, margin);
  if (material === null) reasons.push(`the workshop does not print ${materialLabel?.trim() || "this material"}`);
  else if (!printer.materials.includes(material)) reasons.push(printer.materials.length ? `it does not print ${shown(material)}` : "no materials are set up for it");
  if (!nozzleMatches(part, printer)) reasons.push(`it has a ${mm(printer.nozzle ?? 0)} nozzle, not ${mm(part.nozzle ?? 0)}`);
  if (!flat.fits) reasons.push(`footprint ${mm(part.footprint[0])} × ${mm(part.footprint[1])} is larger than its usable bed of ${mm(bw)} × ${mm(bd)} (the bed less ${mm(margin)} on each side), even turned 90°`);
  if (part.height > printer.height + SLACK_MM) reasons.push(`height ${mm(part.height)} is over its ${mm(printer.height)} build height`);
  return { printerId: printer.id, name: printer.name ?? printer.id, fits: reasons.length === 0, turned: flat.turned, reason: reasons.join("; ") };
}

export function fitPrinters(part: PartEnvelope, printers: readonly PrinterEnvelope[], material: string | null, materialLabel?: string, margin = BED_MARGIN_MM): PrinterFitAnswer[] {
  return printers.map((p) => fitOnPrinter(part, p, material, materialLabel, margin));
}

/** Ids of the printers the part fits. */
export function fittingPrinterIds(part: PartEnvelope, printers: readonly PrinterEnvelope[], material: string | null, margin = BED_MARGIN_MM): string[] {
  return fitPrinters(part, printers, material, undefined, margin).filter((f) => f.fits).map((f) => f.printerId);
}

export type FitVerdict = { ok: true; printers: string[] } | { ok: false; reason: string };

/**
 * The queue's yes or no with one reason: the filters run in the order a member can act on
 * (material, nozzle, footprint, height), and the reason names the first that leaves no printer, with the
 * nearest miss so the member knows by how much.
 */
export function fitVerdict(part: PartEnvelope, printers: readonly PrinterEnvelope[], material: string | null, materialLabel?: string, margin = BED_MARGIN_MM): FitVerdict {
  if (printers.length === 0) return { ok: false, reason: "the workshop has no printers" };
  if (material === null) return { ok: false, reason: `the workshop does not print ${materialLabel?.trim() || "this material"}` };
  const byMaterial = printers.filter((p) => p.materials.includes(material));
  if (byMaterial.length === 0) return { ok: false, reason: `no printer takes ${shown(material)}` };
  const byNozzle = byMaterial.filter((p) => nozzleMatches(part, p));
  if (byNozzle.length === 0) {
    const sizes = [...new Set(byMaterial.map((p) => p.nozzle ?? 0))].sort((a, b) => a - b).map(mm);
    return { ok: false, reason: `no ${shown(material)} printer has a ${mm(part.nozzle ?? 0)} nozzle (available: ${sizes.join(", ")})` };
  }
  const byBed = byNozzle.filter((p) => footprintFit(part.footprint, p.bed, margin).fits);
  if (byBed.length === 0) {
    const largest = [...byNozzle].sort((a, b) => b.bed[0] * b.bed[1] - a.bed[0] * a.bed[1])[0]!;
    const [uw, ud] = usableBed(largest.bed, margin);
    return {
      ok: false,
      reason: `footprint ${mm(part.footprint[0])} × ${mm(part.footprint[1])} does not fit any bed less the ${mm(margin)} margin, even turned 90° (largest usable: ${mm(uw)} × ${mm(ud)})`,
    };
  }
  const byHeight = byBed.filter((p) => part.height <= p.height + SLACK_MM);
  if (byHeight.length === 0) {
    const tallest = Math.max(...byBed.map((p) => p.height));
    return { ok: false, reason: `height ${mm(part.height)} exceeds the build height of every printer it fits on (tallest: ${mm(tallest)})` };
  }
  return { ok: true, printers: byHeight.map((p) => p.id) };
}
