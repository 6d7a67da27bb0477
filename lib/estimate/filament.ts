/**
 * Filament length ↔ mass. A round filament of diameter d (mm) has a cross-section π d² / 4 mm²;
 * one metre of it is 1000 × that in mm³, i.e. the cross-section in cm³, so
 * grams per metre = cross-section (mm²) × density (g/cm³).
 */
import { requirePositive, requireNonNegative } from "./validate";

/** Common filament diameters, mm (common practice). */
export const FILAMENT_DIAMETERS_MM = Object.freeze([1.75, 2.85] as const);

export function filamentCrossSectionMm2(diameterMm: number): number {
  requirePositive("diameterMm", diameterMm);
  return (Math.PI * diameterMm * diameterMm) / 4;
}

export function filamentGramsPerMetre(diameterMm: number, densityGcm3: number): number {
  requirePositive("densityGcm3", densityGcm3);
  return filamentCrossSectionMm2(diameterMm) * densityGcm3;
}

export function filamentMetresPerKg(diameterMm: number, densityGcm3: number): number {
  return 1000 / filamentGramsPerMetre(diameterMm, densityGcm3);
}

/** Length of filament a job uses, e.g. to check it against what is left on a spool. */
export function filamentMetresForGrams(grams: number, diameterMm: number, densityGcm3: number): number {
  requireNonNegative("grams", grams);
  return grams / filamentGramsPerMetre(diameterMm, densityGcm3);
}
