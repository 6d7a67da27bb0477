/** Candidate "down" directions: the file's own, the six axes, large flat regions, and a sphere spread. */
import type { Vec3 } from "@/lib/mesh/types";
import type { FacetData } from "./geometry";
import type { DirectionSource } from "./types";

export interface CandidateDirection {
  dir: Vec3;
  source: DirectionSource;
}

/**
 * n nearly even points on the unit sphere: the golden-angle (Fibonacci) spiral, z evenly spaced
 * and longitude stepping by π(3 − √5). Common practice, no source.
 */
export function fibonacciSphere(n: number): Vec3[] {
  const out: Vec3[] = [];
  const golden = Math.PI * (3 - Math.sqrt(5));
  for (let i = 0; i < n; i++) {
    const z = 1 - (2 * (i + 0.5)) / n;
    const r = Math.sqrt(Math.max(0, 1 - z * z));
    const phi = golden * i;
    out.push([r * Math.cos(phi), r * Math.sin(phi), z]);
  }
  return out;
}

export const AXIS_DIRECTIONS: readonly Vec3[] = [
  [0, 0, -1], [0, 0, 1], [1, 0, 0], [-1, 0, 0], [0, 1, 0], [0, -1, 0],
];

/**
 * Outward normals of the largest flat regions. Facets are grouped by their normal quantised to
 * about 0.6°; a group's direction is its area-weighted mean normal. Grouping by normal alone merges
 * parallel faces at different heights, which is what a down-direction candidate needs.
 */
export function flatRegionDirections(f: FacetData, maxCount: number): { dir: Vec3; area: number }[] {
  const q = 100; // 1/q rad ≈ 0.57°
  // Open-addressing hash on the quantised normal: a smooth part has a group per facet, where a
  // Map of objects would cost more than the whole fast stage.
  let size = 1;
  while (size < f.count * 2) size <<= 1;
  const mask = size - 1;
  const keys = new Int32Array(size).fill(-1);
  const acc = new Float64Array(size * 4); // Σ n·a (3), Σ a
  for (let t = 0; t < f.count; t++) {
    const a = f.areas[t]!;
    if (!(a > 0)) continue;
    const nx = f.normals[3 * t]!, ny = f.normals[3 * t + 1]!, nz = f.normals[3 * t + 2]!;
    const key = (Math.round(nx * q) + 128) * 65536 + (Math.round(ny * q) + 128) * 256 + (Math.round(nz * q) + 128);
    let h = Math.imul(key, 0x9e3779b1) >>> 0 & mask;
    while (keys[h] !== -1 && keys[h] !== key) h = (h + 1) & mask;
    keys[h] = key;
    acc[4 * h] = acc[4 * h]! + nx * a;
    acc[4 * h + 1] = acc[4 * h + 1]! + ny * a;
    acc[4 * h + 2] = acc[4 * h + 2]! + nz * a;
    acc[4 * h + 3] = acc[4 * h + 3]! + a;
  }
  // Keep the maxCount largest groups (insertion into a short sorted list).
  const top: number[] = [];
  for (let h = 0; h < size; h++) {
    if (keys[h] === -1) continue;
    const a = acc[4 * h + 3]!;
    if (top.length === maxCount && a <= acc[4 * top[top.length - 1]! + 3]!) continue;
    let k = top.length;
    while (k > 0 && acc[4 * top[k - 1]! + 3]! < a) k--;
    top.splice(k, 0, h);
    if (top.length > maxCount) top.pop();
  }
  return top.map((h) => {
    const x = acc[4 * h]!, y = acc[4 * h + 1]!, z = acc[4 * h + 2]!;
    const l = Math.hypot(x, y, z);
    return { dir: [x / l, y / l, z / l] as Vec3, area: acc[4 * h + 3]! };
  });
}

/** Drops directions within `minAngle` radians of one kept earlier (earlier sources win). */
export function dedupeDirections(list: CandidateDirection[], minAngle = 0.01): CandidateDirection[] {
  const cos = Math.cos(minAngle);
  const kept: CandidateDirection[] = [];
  for (const c of list) {
    const [x, y, z] = c.dir;
    if (kept.some((k) => k.dir[0] * x + k.dir[1] * y + k.dir[2] * z > cos)) continue;
    kept.push(c);
  }
  return kept;
}

export function candidateDirections(f: FacetData, sphereCount: number, flatCount: number): CandidateDirection[] {
  const list: CandidateDirection[] = [{ dir: [0, 0, -1], source: "original" }];
  for (const d of AXIS_DIRECTIONS) list.push({ dir: [...d] as Vec3, source: "axis" });
  for (const r of flatRegionDirections(f, flatCount)) list.push({ dir: r.dir, source: "flat" });
  for (const d of fibonacciSphere(sphereCount)) list.push({ dir: d, source: "sphere" });
  return dedupeDirections(list);
}
