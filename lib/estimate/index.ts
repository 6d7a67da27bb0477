/** Public surface of the estimates: mass, time, cost, calibration and material reference data. */
export * from "./types";
export { layerCount, estimateVolumes, shellArea } from "./volumes";
export { estimatePart, estimatePlate, gramsOf } from "./estimate";
export type { EstimateOptions, LayerOverhead, PlatePart, PlateEstimate, PlatePartEstimate, PlateOptions } from "./estimate";
export { calibrationFactor, applyCalibration, median, NO_CALIBRATION, DEFAULT_CALIBRATION_WINDOW } from "./calibration";
export type { FinishedPlate, CalibrationOptions, Calibrated } from "./calibration";
export { quoteCost, quoteAssembly, roundCents, materialCentsExact, machineCentsExact } from "./quote";
export type { AssemblyLine, AssemblyQuote } from "./quote";
export { MATERIALS, MATERIAL_KEYS, CAUTIONS, cautionsFor, isMaterialKey } from "./materials";
export type { MaterialKey, MaterialReference, Caution, CautionKey } from "./materials";
export {
  filamentCrossSectionMm2,
  filamentGramsPerMetre,
  filamentMetresPerKg,
  filamentMetresForGrams,
  FILAMENT_DIAMETERS_MM,
} from "./filament";
export { DEFAULT_SETTINGS, DEFAULT_SUPPORT_DENSITY, DEFAULT_PRINTER_TIMING } from "./defaults";
