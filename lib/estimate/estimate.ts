/**
 * Mass, time and cost of a part printed alone, and of a plate of several parts.
 *
 * Time model: extruded volume / effective flow + per-layer overhead × layers + start-up.
 * A plate pays the start-up once. Layers of parts on one plate: see `LayerOverhead`.
 */
import { applyCalibration, NO_CALIBRATION } from "./calibration";
import { quoteCost } from "./quote";
import type {
  CalibrationFactor,
  CostBreakdown,
  MaterialPricing,
  PartEstimate,
  PartGeometry,
  PrintSettings,
  PrinterProfile,
  TimeBreakdown,
  VolumeBreakdown,
} from "./types";
import { requireCount, requireNonNegative, requirePositive } from "./validate";
import { estimateVolumes } from "./volumes";

export interface EstimateOptions {
  calibration?: CalibrationFactor;
  /** Workshop fee added to the cost; default 0. */
  feeCents?: number;
}

export function validatePrinter(p: PrinterProfile): void {
  requirePositive("volumetricFlowMm3s", p.volumetricFlowMm3s);
  requireNonNegative("perLayerSeconds", p.perLayerSeconds);
  requireNonNegative("startupMinutes", p.startupMinutes);
  requireNonNegative("hourlyRateCents", p.hourlyRateCents);
}

export function validateMaterial(m: MaterialPricing): void {
  requirePositive("densityGcm3", m.densityGcm3);
  requireNonNegative("pricePerKgCents", m.pricePerKgCents);
}

/** mm³ × g/cm³ → g (1 cm³ = 1000 mm³). */
export function gramsOf(volumeMm3: number, densityGcm3: number): number {
  return (volumeMm3 / 1000) * densityGcm3;
}

function timeOf(
  extrudedMm3: number,
  layers: number,
  printer: PrinterProfile,
  factor: number,
): TimeBreakdown {
  const extrusionMinutes = extrudedMm3 / printer.volumetricFlowMm3s / 60;
  const layerMinutes = (layers * printer.perLayerSeconds) / 60;
  const startupMinutes = printer.startupMinutes;
  const rawMinutes = extrusionMinutes + layerMinutes + startupMinutes;
  return { extrusionMinutes, layerMinutes, startupMinutes, rawMinutes, minutes: rawMinutes * factor };
}

/** One part printed alone on a plate: start-up included. */
export function estimatePart(
  geometry: PartGeometry,
  settings: PrintSettings,
  printer: PrinterProfile,
  material: MaterialPricing,
  { calibration = NO_CALIBRATION, feeCents = 0 }: EstimateOptions = {},
): PartEstimate {
  validatePrinter(printer);
  validateMaterial(material);
  const volumes = estimateVolumes(geometry, settings);
  const rawGrams = gramsOf(volumes.extrudedMm3, material.densityGcm3);
  const time = timeOf(volumes.extrudedMm3, volumes.layers, printer, calibration.timeFactor);
  const { grams } = applyCalibration({ minutes: time.rawMinutes, grams: rawGrams }, calibration);
  const cost = quoteCost({ grams, minutes: time.minutes }, printer, material, feeCents);
  return { volumes, rawGrams, grams, time, calibration, cost };
}

/**
 * How the per-layer overhead is counted for several parts on one plate.
 * - "per-part" (default): every copy pays its own layers, as if the head changed layer once per
 *   part. It overstates the shared z move but stands in for the travel and retraction between
 *   parts that each layer costs; calibration absorbs the rest.
 * - "shared": the plate pays the overhead once per layer of its tallest part.
 */
export type LayerOverhead = "per-part" | "shared";

export interface PlatePart {
  geometry: PartGeometry;
  /** Copies of this part on the plate; default 1. */
  quantity?: number;
  /** Overrides the plate's settings for this part (same layer height is assumed by "shared"). */
  settings?: PrintSettings;
}

export interface PlatePartEstimate {
  volumes: VolumeBreakdown;
  quantity: number;
  /** Raw grams and minutes of all copies together, without start-up (and, when the layer
   * overhead is "shared", without layer overhead, which then belongs to the plate). */
  rawGrams: number;
  rawPrintMinutes: number;
}

export interface PlateEstimate {
  parts: PlatePartEstimate[];
  extrudedMm3: number;
  /** Layers of the tallest part. */
  layers: number;
  rawGrams: number;
  grams: number;
  time: TimeBreakdown;
  calibration: CalibrationFactor;
  cost: CostBreakdown;
}

export interface PlateOptions extends EstimateOptions {
  layerOverhead?: LayerOverhead;
}

/** A plate: start-up once + the sum of each part's print time. */
export function estimatePlate(
  parts: readonly PlatePart[],
  settings: PrintSettings,
  printer: PrinterProfile,
  material: MaterialPricing,
  { calibration = NO_CALIBRATION, feeCents = 0, layerOverhead = "per-part" }: PlateOptions = {},
): PlateEstimate {
  validatePrinter(printer);
  validateMaterial(material);
  const estimates: PlatePartEstimate[] = [];
  let extrudedMm3 = 0;
  let countedLayers = 0;
  let tallest = 0;
  for (const part of parts) {
    const quantity = requireCount("quantity", part.quantity ?? 1);
    const volumes = estimateVolumes(part.geometry, part.settings ?? settings);
    const partExtruded = volumes.extrudedMm3 * quantity;
    const partLayers = volumes.layers * quantity;
    extrudedMm3 += partExtruded;
    countedLayers += partLayers;
    if (quantity > 0) tallest = Math.max(tallest, volumes.layers);
    estimates.push({
      volumes,
      quantity,
      rawGrams: gramsOf(partExtruded, material.densityGcm3),
      rawPrintMinutes:
        partExtruded / printer.volumetricFlowMm3s / 60 +
        (layerOverhead === "per-part" ? (partLayers * printer.perLayerSeconds) / 60 : 0),
    });
  }
  const layersForOverhead = layerOverhead === "per-part" ? countedLayers : tallest;
  const time = timeOf(extrudedMm3, layersForOverhead, printer, calibration.timeFactor);
  if (extrudedMm3 === 0 && layersForOverhead === 0) {
    // An empty plate does not heat up: nothing to print, nothing to charge.
    time.startupMinutes = 0;
    time.rawMinutes = 0;
    time.minutes = 0;
  }
  const rawGrams = gramsOf(extrudedMm3, material.densityGcm3);
  const grams = rawGrams * calibration.gramsFactor;
  const cost = quoteCost({ grams, minutes: time.minutes }, printer, material, feeCents);
  return { parts: estimates, extrudedMm3, layers: tallest, rawGrams, grams, time, calibration, cost };
}
