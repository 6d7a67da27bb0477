/**
 * Prices in integer cents (the smallest unit of the workshop's currency).
 *
 * Rounding rule: every cost line (material, machine time) is rounded on its own to the nearest
 * cent, halves up (all amounts are non-negative); the total is the sum of the rounded lines, so
 * the lines shown always add up to the total shown. Float noise below a millionth of a cent is
 * trimmed first, so 787.4999999999 and 787.5 both give 788.
 */
import type { CostBreakdown, MaterialPricing, PrinterProfile } from "./types";
import { requireCount, requireNonNegative } from "./validate";

/** Nearest whole cent, halves up, after trimming float noise. */
export function roundCents(amount: number): number {
  requireNonNegative("amount", amount);
  const trimmed = Math.round(amount * 1e6) / 1e6;
  return Math.floor(trimmed + 0.5);
}

/** Unrounded material cost: grams × price per kg / 1000. */
export function materialCentsExact(grams: number, pricePerKgCents: number): number {
  requireNonNegative("grams", grams);
  requireNonNegative("pricePerKgCents", pricePerKgCents);
  return (grams * pricePerKgCents) / 1000;
}

/** Unrounded machine cost: minutes / 60 × hourly rate. */
export function machineCentsExact(minutes: number, hourlyRateCents: number): number {
  requireNonNegative("minutes", minutes);
  requireNonNegative("hourlyRateCents", hourlyRateCents);
  return (minutes * hourlyRateCents) / 60;
}

/**
 * Cost of one job (a part or a plate): material + machine time + the workshop fee if set.
 * Pass calibrated grams and minutes when a calibration exists.
 */
export function quoteCost(
  usage: { grams: number; minutes: number },
  printer: Pick<PrinterProfile, "hourlyRateCents">,
  material: Pick<MaterialPricing, "pricePerKgCents">,
  feeCents = 0,
): CostBreakdown {
  requireCount("feeCents", feeCents);
  const materialCents = roundCents(materialCentsExact(usage.grams, material.pricePerKgCents));
  const machineCents = roundCents(machineCentsExact(usage.minutes, printer.hourlyRateCents));
  return { materialCents, machineCents, feeCents, totalCents: materialCents + machineCents + feeCents };
}

export interface AssemblyLine {
  /** Free text for display, e.g. the part's name. */
  label?: string;
  /** Cost of one copy, without fee (quoteCost with feeCents 0). */
  cost: CostBreakdown;
  /** Copies needed in the assembly; default 1. */
  quantity?: number;
}

export interface AssemblyQuote {
  lines: { label?: string; quantity: number; materialCents: number; machineCents: number; totalCents: number }[];
  materialCents: number;
  machineCents: number;
  feeCents: number;
  totalCents: number;
}

/**
 * Cost of a whole assembly: the sum of its parts' rounded lines × quantity, plus the workshop fee
 * once for the assembly (any fee on the lines themselves is ignored). Because each part is
 * rounded before it is multiplied, the assembly equals what the parts show, cent for cent.
 */
export function quoteAssembly(lines: readonly AssemblyLine[], feeCents = 0): AssemblyQuote {
  requireCount("feeCents", feeCents);
  let materialCents = 0;
  let machineCents = 0;
  const out: AssemblyQuote["lines"] = [];
  for (const line of lines) {
    const quantity = requireCount("quantity", line.quantity ?? 1);
    const m = requireCount("materialCents", line.cost.materialCents) * quantity;
    const t = requireCount("machineCents", line.cost.machineCents) * quantity;
    materialCents += m;
    machineCents += t;
    out.push({ label: line.label, quantity, materialCents: m, machineCents: t, totalCents: m + t });
  }
  return {
    lines: out,
    materialCents,
    machineCents,
    feeCents,
    totalCents: materialCents + machineCents + feeCents,
  };
}
