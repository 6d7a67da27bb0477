import { MeshReadError } from "./errors";

/**
 * A 3×4 affine transform in 3MF order "m00 m01 m02 m10 m11 m12 m20 m21 m22 m30 m31 m32":
 * x' = m00·x + m10·y + m20·z + m30 (likewise y', z'), per the 3MF Core Specification §3.4.3.
 * Rows 0–2 are the images of the unit axes, row 3 is the translation.
 */
export type Affine = [number, number, number, number, number, number, number, number, number, number, number, number];

export const IDENTITY: Affine = [1, 0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0];

export function applyAffine(m: Affine, x: number, y: number, z: number): [number, number, number] {
  return [m[0] * x + m[3] * y + m[6] * z + m[9], m[1] * x + m[4] * y + m[7] * z + m[10], m[2] * x + m[5] * y + m[8] * z + m[11]];
}

/** The transform that applies `first`, then `then`. */
export function composeAffine(first: Affine, then: Affine): Affine {
  const r = (i: number) => {
    const x = first[3 * i]!, y = first[3 * i + 1]!, z = first[3 * i + 2]!;
    return [then[0] * x + then[3] * y + then[6] * z, then[1] * x + then[4] * y + then[7] * z, then[2] * x + then[5] * y + then[8] * z];
  };
  const t = applyAffine(then, first[9], first[10], first[11]);
  return [...r(0), ...r(1), ...r(2), ...t] as Affine;
}

export function parseTransform(s: string): Affine {
  const parts = s.trim().split(/\s+/);
  const nums = parts.map(Number);
  if (parts.length !== 12 || nums.some((v) => !Number.isFinite(v))) {
    throw new MeshReadError("BAD_MODEL", `3MF model: transform '${s.slice(0, 80)}' is not 12 finite numbers`);
  }
  return nums as Affine;
}

export function formatTransform(m: Affine): string {
  return m.map((v) => String(v)).join(" ");
}
