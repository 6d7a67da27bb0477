/**
 * The overhang rule, the one place it is written (lib/orient calls it too).
 *
 * A facet overhangs when the angle between its outward normal n and straight down is below
 * 90° − θ, θ the self-supporting angle from vertical (45° by common practice): n·down > sin θ·|n|.
 *
 * A facet at the limit prints without support (common practice: the 45° chamfer is how parts are
 * designed to need none), so the comparison is made against θ + τ with τ = 0.01°: a facet must lean
 * more than 0.01° past the limit to count. Float32 coordinates are rounded to 2^-24 of their size,
 * which tilts a facet's normal by about 2^-24·√2 × (coordinate size ÷ the facet's smallest height);
 * τ ≈ 1.7e-4 rad covers that for coordinates up to ~1,000× a facet's smallest height, twice rounded
 * (a file in inches scaled to millimetres, any turn about any axis). No printer tells 0.01° apart.
 */
export const OVERHANG_TOLERANCE_DEG = 0.01;

/** sin(θ + τ), capped at sin 90° = 1: the limit `isOverhang` compares with. θ in degrees. */
export function overhangLimit(selfSupportingDeg: number): number {
  const deg = Math.min(90, selfSupportingDeg + OVERHANG_TOLERANCE_DEG);
  return Math.sin((deg * Math.PI) / 180);
}

/** `down` = n·down for a normal n of length `len` (any length: pass 1 for a unit normal). */
export function isOverhang(down: number, len: number, limit: number): boolean {
  return down > limit * len;
}
