/**
 * Material volumes of one part from a handful of mesh measurements (no slicing).
 *
 * Model (documented in README.md):
 *   shell   = footprint × (top + bottom layers) × layer height, at most the volume
 *   wall    = wall count × line width × surface area, at most what the shells leave
 *   infill  = infill fraction × (volume − wall − shell)
 *   support = support region volume × support density (only when support is used)
 * so wall + shell + infill never exceeds the part's volume, and equals it at 100 % infill.
 */
import type { PartGeometry, PrintSettings, VolumeBreakdown } from "./types";
import {
  requireCount,
  requireFraction,
  requireNonNegative,
  requirePositive,
} from "./validate";

/**
 * Slack, in layers, absorbed before rounding up: floating-point division leaves 1.1 / 0.1 at
 * 11.000000000000002, which must count as 11 layers, not 12. A millionth of a layer is far below
 * any real height difference (0.2 nm at 0.2 mm layers).
 */
const LAYER_EPSILON = 1e-6;

/** ceil(height / layer height), tolerant of float noise on exact multiples; 0 for a flat part. */
export function layerCount(heightMm: number, layerHeightMm: number): number {
  requireNonNegative("heightMm", heightMm);
  requirePositive("layerHeightMm", layerHeightMm);
  if (heightMm === 0) return 0;
  return Math.max(1, Math.ceil(heightMm / layerHeightMm - LAYER_EPSILON));
}

export function validateGeometry(g: PartGeometry): void {
  requireNonNegative("volumeMm3", g.volumeMm3);
  requireNonNegative("areaMm2", g.areaMm2);
  requireNonNegative("heightMm", g.heightMm);
  if (g.footprintAreaMm2 !== undefined) requireNonNegative("footprintAreaMm2", g.footprintAreaMm2);
  if (g.supportVolumeMm3 !== undefined) requireNonNegative("supportVolumeMm3", g.supportVolumeMm3);
}

export function validateSettings(s: PrintSettings): void {
  requirePositive("layerHeightMm", s.layerHeightMm);
  requireCount("wallCount", s.wallCount);
  requireNonNegative("lineWidthMm", s.lineWidthMm);
  requireCount("topLayers", s.topLayers);
  requireCount("bottomLayers", s.bottomLayers);
  requireFraction("infill", s.infill);
  if (s.supportDensity !== undefined) requireFraction("supportDensity", s.supportDensity);
}

/**
 * Area covered by the top and bottom shells. Without a measured footprint we take half the
 * surface area: for a closed surface the area seen from above equals the area seen from below,
 * and the two together cannot exceed the whole surface, so A/2 is an upper bound that is exact
 * for a thin flat plate.
 */
export function shellArea(g: PartGeometry): number {
  return g.footprintAreaMm2 ?? g.areaMm2 / 2;
}

export function estimateVolumes(geometry: PartGeometry, settings: PrintSettings): VolumeBreakdown {
  validateGeometry(geometry);
  validateSettings(settings);
  const volume = geometry.volumeMm3;
  const layers = layerCount(geometry.heightMm, settings.layerHeightMm);

  const shellRaw =
    shellArea(geometry) * (settings.topLayers + settings.bottomLayers) * settings.layerHeightMm;
  const shellMm3 = Math.min(shellRaw, volume);

  const wallRaw = settings.wallCount * settings.lineWidthMm * geometry.areaMm2;
  const wallMm3 = Math.min(wallRaw, volume - shellMm3);

  // Clamp at zero: min() above keeps the difference non-negative up to rounding.
  const interior = Math.max(0, volume - shellMm3 - wallMm3);
  const infillMm3 = settings.infill * interior;

  const supportDensity = settings.supportDensity ?? 0;
  const supportMm3 = supportDensity * (geometry.supportVolumeMm3 ?? 0);

  return {
    wallMm3,
    shellMm3,
    infillMm3,
    supportMm3,
    extrudedMm3: wallMm3 + shellMm3 + infillMm3 + supportMm3,
    layers,
  };
}
