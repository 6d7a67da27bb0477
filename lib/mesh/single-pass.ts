import { MeshReadError } from "./errors";
import type { ResolvedOptions } from "./options";
import { isOverhang } from "./overhang";
import type { Vec3 } from "./types";

/**
 * Everything that needs no welding, gathered in one pass over the triangles: bounding box,
 * signed volume, surface area, overhang and bed-contact area (and the per-facet overhang mask).
 * The kernel reads 9 floats per triangle from any Float32Array at `base + k·stride`, so it runs
 * on a soup (stride 9) and directly on the aligned views of binary STL records (stride 25).
 */
export interface PassResult {
  triangles: number;
  bbox: { min: Vec3; max: Vec3 };
  /** Lowest and highest point along the up direction. */
  heightMin: number;
  heightMax: number;
  /** Signed divergence-theorem volume; only meaningful for a closed, consistently wound mesh. */
  volume: number;
  area: number;
  overhangArea: number;
  bedContactArea: number;
  overhangMask?: Uint8Array;
}

export class PassState {
  readonly o: ResolvedOptions;
  minX = Infinity; minY = Infinity; minZ = Infinity;
  maxX = -Infinity; maxY = -Infinity; maxZ = -Infinity;
  hMin = Infinity; hMax = -Infinity;
  area2 = 0; vol6 = 0; over2 = 0;
  /** Volume origin: the first vertex seen, to keep the triple products small. */
  ox = NaN; oy = NaN; oz = NaN;
  /** Down-facing facets that were near the running minimum: [tri, maxH, ±|n| (negative = not overhang)]. */
  cand: Float64Array = new Float64Array(3 * 256);
  nCand = 0;
  mask: Uint8Array | undefined;
  /**
   * When set, triangles of zero area within float32 precision get a 1: |e1 × e2| ≤ 2^-23·|e1|·|e2|
   * (the sine of the angle at the first corner at or below float32's machine epsilon, IEEE 754
   * binary32, or an edge of zero length). Collinear corners give 0 at every corner, so one is enough.
   */
  zeroArea: Uint8Array | undefined;
  readonly triangles: number;
  /** Every field gets its final kind here, so optimised code never sees a field change its representation. */
  constructor(o: ResolvedOptions, triangles: number, zeroArea?: Uint8Array) {
    this.o = o;
    this.triangles = triangles;
    this.mask = o.mask ? new Uint8Array(triangles) : undefined;
    this.zeroArea = zeroArea;
  }
  growCand(): Float64Array {
    const next = new Float64Array(this.cand.length * 2);
    next.set(this.cand);
    this.cand = next;
    return next;
  }
}

/** (2^-23)²: see PassState.zeroArea. */
const ZERO_SIN2 = 2 ** -46;

/** Accumulate `count` triangles read from f at base + k·stride; triangle index = tri0 + k·triStep. */
export function passRange(s: PassState, f: Float32Array, base: number, stride: number, count: number, tri0: number, triStep: number): void {
  if (count <= 0) return;
  const [ux, uy, uz] = s.o.up;
  const sinT = s.o.sinTheta;
  const tol = s.o.bedTolerance;
  const mask = s.mask, zero = s.zeroArea;
  if (Number.isNaN(s.ox)) { s.ox = f[base]!; s.oy = f[base + 1]!; s.oz = f[base + 2]!; }
  const ox = s.ox, oy = s.oy, oz = s.oz;
  let minX = s.minX, minY = s.minY, minZ = s.minZ, maxX = s.maxX, maxY = s.maxY, maxZ = s.maxZ;
  let hMin = s.hMin, hMax = s.hMax, area2 = s.area2, vol6 = s.vol6, over2 = s.over2;
  let cand = s.cand, nCand = s.nCand;
  let p = base, t = tri0;
  for (let k = 0; k < count; k++, p += stride, t += triStep) {
    const ax = f[p]!, ay = f[p + 1]!, az = f[p + 2]!;
    const bx = f[p + 3]!, by = f[p + 4]!, bz = f[p + 5]!;
    const cx = f[p + 6]!, cy = f[p + 7]!, cz = f[p + 8]!;
    if (ax < minX) minX = ax; if (ax > maxX) maxX = ax;
    if (bx < minX) minX = bx; if (bx > maxX) maxX = bx;
    if (cx < minX) minX = cx; if (cx > maxX) maxX = cx;
    if (ay < minY) minY = ay; if (ay > maxY) maxY = ay;
    if (by < minY) minY = by; if (by > maxY) maxY = by;
    if (cy < minY) minY = cy; if (cy > maxY) maxY = cy;
    if (az < minZ) minZ = az; if (az > maxZ) maxZ = az;
    if (bz < minZ) minZ = bz; if (bz > maxZ) maxZ = bz;
    if (cz < minZ) minZ = cz; if (cz > maxZ) maxZ = cz;
    const e1x = bx - ax, e1y = by - ay, e1z = bz - az;
    const e2x = cx - ax, e2y = cy - ay, e2z = cz - az;
    const nx = e1y * e2z - e1z * e2y, ny = e1z * e2x - e1x * e2z, nz = e1x * e2y - e1y * e2x;
    const nn = nx * nx + ny * ny + nz * nz;
    const n = Math.sqrt(nn);
    area2 += n;
    if (zero !== undefined && nn <= ZERO_SIN2 * (e1x * e1x + e1y * e1y + e1z * e1z) * (e2x * e2x + e2y * e2y + e2z * e2z)) zero[t] = 1;
    // (a−o)·((b−o)×(c−o)) = (a−o)·(e1×e2): the divergence-theorem term about origin o.
    vol6 += (ax - ox) * nx + (ay - oy) * ny + (az - oz) * nz;
    const ha = ax * ux + ay * uy + az * uz, hb = bx * ux + by * uy + bz * uz, hc = cx * ux + cy * uy + cz * uz;
    let lo = ha < hb ? ha : hb; if (hc < lo) lo = hc;
    let hi = ha > hb ? ha : hb; if (hc > hi) hi = hc;
    if (lo < hMin) hMin = lo;
    if (hi > hMax) hMax = hi;
    const down = -(nx * ux + ny * uy + nz * uz);
    if (down > 0) {
      const over = isOverhang(down, n, sinT);
      if (over) { over2 += n; if (mask) mask[t] = 1; }
      // A facet on the final bed is within tol of every running minimum seen so far.
      if (hi <= hMin + tol) {
        if (3 * nCand + 3 > cand.length) { s.nCand = nCand; cand = s.growCand(); }
        const q = 3 * nCand++;
        cand[q] = t; cand[q + 1] = hi; cand[q + 2] = over ? n : -n;
      }
    }
  }
  s.minX = minX; s.minY = minY; s.minZ = minZ; s.maxX = maxX; s.maxY = maxY; s.maxZ = maxZ;
  s.hMin = hMin; s.hMax = hMax; s.area2 = area2; s.vol6 = vol6; s.over2 = over2; s.nCand = nCand;
}

/** Close the pass: settle the bed facets and check that every coordinate was finite. */
export function finishPass(s: PassState, locate: () => number): PassResult {
  if (!Number.isFinite(s.area2) || !Number.isFinite(s.vol6)) {
    const t = locate();
    throw new MeshReadError("NON_FINITE", `triangle ${t} has a coordinate that is not a finite number (NaN or infinity)`);
  }
  let bed2 = 0, overOnBed2 = 0;
  const limit = s.hMin + s.o.bedTolerance;
  for (let i = 0; i < s.nCand; i++) {
    const q = 3 * i;
    if (s.cand[q + 1]! > limit) continue;
    const n = s.cand[q + 2]!;
    bed2 += Math.abs(n);
    if (n > 0) {
      overOnBed2 += n;
      if (s.mask) s.mask[s.cand[q]!] = 0;
    }
  }
  const empty = s.triangles === 0;
  const r: PassResult = {
    triangles: s.triangles,
    bbox: empty ? { min: [0, 0, 0], max: [0, 0, 0] } : { min: [s.minX, s.minY, s.minZ], max: [s.maxX, s.maxY, s.maxZ] },
    heightMin: empty ? 0 : s.hMin,
    heightMax: empty ? 0 : s.hMax,
    volume: s.vol6 / 6,
    area: s.area2 / 2,
    overhangArea: Math.max(0, s.over2 - overOnBed2) / 2,
    bedContactArea: bed2 / 2,
  };
  if (s.mask) r.overhangMask = s.mask;
  return r;
}

/** Index of the first triangle with a non-finite coordinate in a strided layout, or -1. */
export function findNonFinite(f: Float32Array, base: number, stride: number, count: number, tri0: number, triStep: number): number {
  for (let k = 0, p = base; k < count; k++, p += stride) {
    for (let j = 0; j < 9; j++) if (!Number.isFinite(f[p + j]!)) return tri0 + k * triStep;
  }
  return -1;
}
