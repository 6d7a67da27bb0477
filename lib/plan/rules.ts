import type { Part, PlanInstance, Printer, Spool } from "./schema";

/**
 * The planner's material rules, in one place (lib/plan/README.md, "Rules").
 *
 * Brim: warp-prone materials get a brim around each footprint so it stays down. 5 mm for ABS and
 * ASA is common practice, no source; the others print without one unless the part says so.
 */
const BRIM_MM: Record<string, number> = { ABS: 5, ASA: 5 };

/** Materials whose fumes and warping call for an enclosed, ventilated printer (common practice, no source). */
const NEEDS_ENCLOSURE = new Set(["ABS", "ASA"]);

const key = (material: string) => material.trim().toUpperCase();

/** Brim width around a part's footprint, mm: the part's own, else its material's default. */
export function brimOf(part: Pick<Part, "material" | "brim_mm">): number {
  return part.brim_mm ?? BRIM_MM[key(part.material)] ?? 0;
}

/** The footprint a part takes on the bed, its brim included. */
export function footprintWithBrim(part: Pick<Part, "material" | "brim_mm" | "footprint">): [number, number] {
  const b = 2 * brimOf(part);
  return [part.footprint[0] + b, part.footprint[1] + b];
}

export function needsEnclosure(material: string): boolean {
  return NEEDS_ENCLOSURE.has(key(material));
}

/**
 * May this printer print this material as far as its housing goes? A printer that does not say
 * (`enclosed` absent) is not restricted, so instances written before the field keep their meaning.
 */
export function housingAllows(printer: Pick<Printer, "enclosed">, material: string): boolean {
  return !(printer.enclosed === false && needsEnclosure(material));
}

/** Parts that may share a plate: same material and colour, same layer height and nozzle. */
export function groupKey(p: Pick<Part, "material" | "color" | "layer_height" | "nozzle">): string {
  return `${p.material}\u0000${p.color}\u0000${p.layer_height}\u0000${p.nozzle}`;
}

export const sameSpool = (a: Spool | null | undefined, b: Spool) => !!a && a.material === b.material && a.color === b.color;

/** Is a spool of this material and colour in the workshop? Without a spool list, assume so. */
export function spoolAtHand(inst: Pick<PlanInstance, "spools" | "printers">, s: Spool): boolean {
  if (!inst.spools) return true;
  return inst.spools.some((x) => sameSpool(x, s)) || inst.printers.some((p) => sameSpool(p.loaded, s));
}

/** Operator minutes a touch is worth against a later finish, when the instance does not say. */
export const DEFAULT_TOUCH_MINUTES = 30;
