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
  const groups = new Map<number, { x: number; y: number; z: number; area: number }>();
  for (let t = 0; t < f.count; t++) {
    const a = f.areas[t]!;
    if (!(a > 0)) continue;
    const nx = f.normals[3 * t]!, ny = f.normals[3 * t + 1]!, nz = f.normals[3 * t + 2]!;
    const key = (Math.round(nx * q) + 128) * 65536 + (Math.round(ny * q) + 128) * 256 + (Math.round(nz * q) + 128);
    const g = groups.get(key);
    if (g) {
      g.x += nx * a;
      g.y += ny * a;
      g.z += nz * a;
      g.area += a;
    } else groups.set(key, { x: nx * a, y: ny * a, z: nz * a, area: a });
  }
  const list = [...groups.values()].sort((p, r) => r.area - p.area).slice(0, maxCount);
  return list.map((g) => {
    const l = Math.hypot(g.x, g.y, g.z);
    return { dir: [g.x / l, g.y / l, g.z / l] as Vec3, area: g.area };
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
