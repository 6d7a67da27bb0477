import { overhangLimit } from "./overhang";
import type { Vec3 } from "./types";

/** Options shared by every analysis entry point. */
export interface AnalysisOptions {
  /** Build direction; normalised internally. Default +Z. */
  up?: Vec3;
  /**
   * Self-supporting angle θ from vertical, degrees. A facet is an overhang when the angle between
   * its outward normal and straight down is below 90° − θ. Default 45° (common practice). A facet
   * at the limit is self-supporting, within a tolerance of 0.01° (see overhang.ts).
   */
  overhangDeg?: number;
  /** Facets whose highest vertex is within this distance (mm) of the lowest point rest on the bed. */
  bedTolerance?: number;
  /** Return a per-facet overhang mask (1 = overhang) for the viewer. */
  mask?: boolean;
  /** Weld distance in mm; default 1e-6 × bounding-box diagonal. */
  weldTolerance?: number;
}

export interface ResolvedOptions {
  up: Vec3;
  /** sin(θ + τ): the overhang limit of overhang.ts, tolerance included. */
  sinTheta: number;
  bedTolerance: number;
  mask: boolean;
  weldTolerance: number | undefined;
}

export const DEFAULT_OVERHANG_DEG = 45;
export const DEFAULT_BED_TOLERANCE_MM = 0.01;

export function resolveOptions(o: AnalysisOptions = {}): ResolvedOptions {
  const u = o.up ?? [0, 0, 1];
  const len = Math.hypot(u[0], u[1], u[2]);
  if (!(len > 0) || !Number.isFinite(len)) throw new RangeError("up direction must be a non-zero finite vector");
  const deg = o.overhangDeg ?? DEFAULT_OVERHANG_DEG;
  if (!Number.isFinite(deg) || deg < 0 || deg > 90) throw new RangeError("overhang angle must be between 0 and 90 degrees");
  const tol = o.bedTolerance ?? DEFAULT_BED_TOLERANCE_MM;
  if (!Number.isFinite(tol) || tol < 0) throw new RangeError("bed tolerance must be a non-negative number");
  return {
    up: [u[0] / len, u[1] / len, u[2] / len],
    // n·down > cos(90° − θ)·|n| = sin θ·|n|, θ widened by the tolerance at the limit
    sinTheta: overhangLimit(deg),
    bedTolerance: tol,
    mask: o.mask ?? false,
    weldTolerance: o.weldTolerance,
  };
}
