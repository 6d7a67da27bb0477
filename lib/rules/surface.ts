/**
 * The overhang and bed-contact rules. The geometry (normals, heights, areas) is lib/mesh's single
 * pass (`passSoup`); these are the thresholds and the tests every caller applies, so the part page,
 * the orientation search and the split planner count the same faces.
 */
import { passSoup } from "../mesh/analysis";
import { isOverhang as leansPastLimit, overhangLimit } from "../mesh/overhang";
import { DEFAULT_BED_TOLERANCE_MM, DEFAULT_OVERHANG_DEG } from "../mesh/options";
import type { TriangleSoup } from "../mesh/types";

/** Self-supporting angle from vertical, degrees: about 45° for FDM (common practice). */
export const OVERHANG_DEG = DEFAULT_OVERHANG_DEG;

/**
 * A facet rests on the bed when it faces down and every corner lies within this distance of the
 * part's lowest point, mm (lib/mesh's rule: float32 rounding of a turned flat face stays far below it).
 */
export const BED_TOLERANCE_MM = DEFAULT_BED_TOLERANCE_MM;

/**
 * The limit for the overhang test, n·down > it with n the unit outward normal: sin θ (θ from
 * vertical) with lib/mesh's tolerance, so a facet at the limit counts as self-supporting.
 */
export function overhangSine(overhangDeg = OVERHANG_DEG): number {
  return overhangLimit(overhangDeg);
}

/** A facet needs support when its unit outward normal points down past the limit and it is not on the bed. */
export function isOverhang(normalDotDown: number, sinTheta: number, onBed: boolean): boolean {
  return !onBed && leansPastLimit(normalDotDown, 1, sinTheta);
}

/** A facet rests on the bed when it faces down and its highest corner is within the tolerance of the lowest point. */
export function restsOnBed(normalDotDown: number, topAboveLowest: number, tolerance = BED_TOLERANCE_MM): boolean {
  return normalDotDown > 0 && topAboveLowest <= tolerance;
}

export interface SurfaceFigures {
  /** Facets needing support, mm². */
  overhangArea: number;
  /** Facets on the bed, mm². */
  bedContactArea: number;
  height: number;
  /** Per facet, 1 where it needs support (for the viewer), when asked. */
  overhangMask?: Uint8Array;
}

/** Overhang and bed contact of a soup already in the print frame (Z up), through lib/mesh. */
export function surfaceFigures(soup: TriangleSoup, opts: { overhangDeg?: number; mask?: boolean } = {}): SurfaceFigures {
  const r = passSoup(soup, { up: [0, 0, 1], overhangDeg: opts.overhangDeg ?? OVERHANG_DEG, bedTolerance: BED_TOLERANCE_MM, mask: opts.mask });
  return { overhangArea: r.overhangArea, bedContactArea: r.bedContactArea, height: r.heightMax - r.heightMin, overhangMask: r.overhangMask };
}
