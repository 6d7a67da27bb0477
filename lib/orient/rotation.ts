/**
 * The stored choice of orientation: a rotation from the file's frame to the print frame, in which
 * the chosen "down" direction is −Z and the part rests on z = 0.
 */
import type { TriangleSoup, Vec3 } from "@/lib/mesh/types";

/** Row-major 3×3 matrix: p' = M·p, so x' = m[0]·x + m[1]·y + m[2]·z. */
export type Mat3 = [number, number, number, number, number, number, number, number, number];
/** Unit quaternion [x, y, z, w], the same rotation as the matrix. */
export type Quat = [number, number, number, number];

export interface Rotation {
  matrix: Mat3;
  quaternion: Quat;
}

export const IDENTITY_MATRIX: Mat3 = [1, 0, 0, 0, 1, 0, 0, 0, 1];

export function normalize(v: Vec3): Vec3 {
  const l = Math.hypot(v[0], v[1], v[2]);
  if (!(l > 0)) throw new Error("zero-length direction");
  return [v[0] / l, v[1] / l, v[2] / l];
}

export function multiply(a: Mat3, b: Mat3): Mat3 {
  const r = new Array<number>(9).fill(0) as Mat3;
  for (let i = 0; i < 3; i++)
    for (let j = 0; j < 3; j++) r[3 * i + j] = a[3 * i]! * b[j]! + a[3 * i + 1]! * b[3 + j]! + a[3 * i + 2]! * b[6 + j]!;
  return r;
}

export function applyMat(m: Mat3, v: Vec3): Vec3 {
  return [
    m[0] * v[0] + m[1] * v[1] + m[2] * v[2],
    m[3] * v[0] + m[4] * v[1] + m[5] * v[2],
    m[6] * v[0] + m[7] * v[1] + m[8] * v[2],
  ];
}

/** Rotation by `angle` radians about the unit axis k (Rodrigues' formula). */
export function axisAngle(k: Vec3, angle: number): Mat3 {
  const [x, y, z] = k;
  const c = Math.cos(angle), s = Math.sin(angle), t = 1 - c;
  return [
    t * x * x + c, t * x * y - s * z, t * x * z + s * y,
    t * x * y + s * z, t * y * y + c, t * y * z - s * x,
    t * x * z - s * y, t * y * z + s * x, t * z * z + c,
  ];
}

/** Shepperd's method: picks the largest of w, x, y, z first for numerical stability. */
export function quaternionFromMatrix(m: Mat3): Quat {
  const tr = m[0] + m[4] + m[8];
  let q: Quat;
  if (tr > 0) {
    const s = Math.sqrt(tr + 1) * 2;
    q = [(m[7] - m[5]) / s, (m[2] - m[6]) / s, (m[3] - m[1]) / s, s / 4];
  } else if (m[0] > m[4] && m[0] > m[8]) {
    const s = Math.sqrt(1 + m[0] - m[4] - m[8]) * 2;
    q = [s / 4, (m[1] + m[3]) / s, (m[2] + m[6]) / s, (m[7] - m[5]) / s];
  } else if (m[4] > m[8]) {
    const s = Math.sqrt(1 + m[4] - m[0] - m[8]) * 2;
    q = [(m[1] + m[3]) / s, s / 4, (m[5] + m[7]) / s, (m[2] - m[6]) / s];
  } else {
    const s = Math.sqrt(1 + m[8] - m[0] - m[4]) * 2;
    q = [(m[2] + m[6]) / s, (m[5] + m[7]) / s, s / 4, (m[3] - m[1]) / s];
  }
  // One sign per rotation, so equal rotations compare equal.
  return q[3] < 0 ? [-q[0], -q[1], -q[2], -q[3]] : q;
}

export function matrixFromQuaternion(q: Quat): Mat3 {
  const [x, y, z, w] = q;
  return [
    1 - 2 * (y * y + z * z), 2 * (x * y - z * w), 2 * (x * z + y * w),
    2 * (x * y + z * w), 1 - 2 * (x * x + z * z), 2 * (y * z - x * w),
    2 * (x * z - y * w), 2 * (y * z + x * w), 1 - 2 * (x * x + y * y),
  ];
}

export function rotationFromMatrix(matrix: Mat3): Rotation {
  return { matrix, quaternion: quaternionFromMatrix(matrix) };
}

/**
 * The shortest rotation that takes `down` (file frame) to −Z, followed by a turn of `spin`
 * radians about Z (used to shrink or turn the footprint on the bed).
 */
export function rotationForDown(down: Vec3, spin = 0): Rotation {
  const d = normalize(down);
  const c = -d[2]; // d · (0,0,−1)
  let base: Mat3;
  if (c > 1 - 1e-12) base = [...IDENTITY_MATRIX];
  else if (c < -1 + 1e-12) base = [1, 0, 0, 0, -1, 0, 0, 0, -1]; // half turn about X
  else {
    // axis = d × (0,0,−1) = (−dy, dx, 0)
    const axis = normalize([-d[1], d[0], 0]);
    base = axisAngle(axis, Math.acos(Math.max(-1, Math.min(1, c))));
  }
  const m = spin === 0 ? base : multiply(axisAngle([0, 0, 1], spin), base);
  return rotationFromMatrix(m);
}

/** Rotates every corner of a soup (or a vertex array) by the matrix, into a new array. */
export function rotatePoints(points: Float32Array, m: Mat3): Float32Array {
  const out = new Float32Array(points.length);
  for (let i = 0; i + 2 < points.length; i += 3) {
    const x = points[i]!, y = points[i + 1]!, z = points[i + 2]!;
    out[i] = m[0] * x + m[1] * y + m[2] * z;
    out[i + 1] = m[3] * x + m[4] * y + m[5] * z;
    out[i + 2] = m[6] * x + m[7] * y + m[8] * z;
  }
  return out;
}

/**
 * Applies a stored orientation: rotates the soup into the print frame and moves it so its
 * bounding box starts at the origin (it rests on z = 0, with x, y ≥ 0 for the packer).
 */
export function applyOrientation(soup: TriangleSoup, rotation: Rotation): TriangleSoup {
  const m = rotation.matrix;
  const p = soup.positions;
  const out = new Float32Array(p.length);
  let mx = Infinity, my = Infinity, mz = Infinity;
  const tmp = new Float64Array(p.length);
  for (let i = 0; i + 2 < p.length; i += 3) {
    const x = p[i]!, y = p[i + 1]!, z = p[i + 2]!;
    const rx = m[0] * x + m[1] * y + m[2] * z;
    const ry = m[3] * x + m[4] * y + m[5] * z;
    const rz = m[6] * x + m[7] * y + m[8] * z;
    tmp[i] = rx;
    tmp[i + 1] = ry;
    tmp[i + 2] = rz;
    if (rx < mx) mx = rx;
    if (ry < my) my = ry;
    if (rz < mz) mz = rz;
  }
  for (let i = 0; i + 2 < p.length; i += 3) {
    out[i] = tmp[i]! - mx;
    out[i + 1] = tmp[i + 1]! - my;
    out[i + 2] = tmp[i + 2]! - mz;
  }
  return { positions: out };
}
