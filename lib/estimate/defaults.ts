/**
 * Starting values for a workshop that has not set its own. Every one is common practice with
 * no normative source; calibration from finished plates corrects the time and mass they give.
 */
import type { PrintSettings, PrinterProfile } from "./types";

/** For a 0.4 mm nozzle: 0.2 mm layers stay under ~75–80 % of the nozzle (common practice). */
export const DEFAULT_SETTINGS: Readonly<PrintSettings> = Object.freeze({
  layerHeightMm: 0.2,
  wallCount: 2,
  lineWidthMm: 0.45,
  topLayers: 4,
  bottomLayers: 3,
  infill: 0.15,
});

/** Share of the region under overhangs that support actually fills, when support is switched on. */
export const DEFAULT_SUPPORT_DENSITY = 0.15;

/**
 * Timing of a typical desktop printer. The effective flow is an average over the whole print,
 * well below a standard hotend's melt limit of roughly 8–15 mm³/s, because of acceleration,
 * slower outer walls and travel (common practice, no source).
 */
export const DEFAULT_PRINTER_TIMING: Readonly<Omit<PrinterProfile, "hourlyRateCents">> = Object.freeze({
  volumetricFlowMm3s: 5,
  perLayerSeconds: 3,
  startupMinutes: 6,
});
