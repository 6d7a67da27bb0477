/**
 * Fast per-direction measures: a few dot products per facet and one per vertex. The support figure
 * here is only a proxy (each overhang facet's column reaches the bed); the height field in
 * support.ts refines the best directions.
 */
import { isOverhang, restsOnBed } from "@/lib/rules/surface";
import type { FacetData } from "./geometry";
import type { Mat3 } from "./rotation";

/** Height of a facet's highest corner along (ux, uy, uz). */
function topOf(f: FacetData, t: number, ux: number, uy: number, uz: number): number {
  const v = f.vertices;
  let top = -Infinity;
  for (let k = 0; k < 3; k++) {
    const i = f.indices[3 * t + k]! * 3;
    const h = ux * v[i]! + uy * v[i + 1]! + uz * v[i + 2]!;
    if (h > top) top = h;
  }
  return top;
}

export interface QuickMetrics {
  overhangArea: number;
  bedContactArea: number;
  height: number;
  /** Σ overhang area projected on the bed × centroid height: support if nothing lay below. */
  supportProxy: number;
  /** Vertices lowest and highest along the up axis (extreme points, reused for footprints). */
  lowVertex: number;
  highVertex: number;
  /** Height of the lowest point along the up axis (the bed in the turned frame). */
  lowest: number;
  /** Facets on the bed (for the stance check). */
  contactFacets: number[];
}

/**
 * `m` is the rotation into the print frame; its third row is "up" in the file's frame. Bed contact
 * and overhang follow lib/rules/surface (a facet is on the bed when its highest corner is within
 * `bedEps` of the lowest point; only facets whose centroid is within reach are checked corner by corner).
 */
export function quickMetrics(
  f: FacetData,
  vertices: Float32Array,
  m: Mat3,
  sinTheta: number,
  bedEps: number,
): QuickMetrics {
  const ux = m[6], uy = m[7], uz = m[8];
  let lo = Infinity, hi = -Infinity, lowVertex = 0, highVertex = 0;
  const nv = vertices.length / 3;
  for (let i = 0; i < nv; i++) {
    const h = ux * vertices[3 * i]! + uy * vertices[3 * i + 1]! + uz * vertices[3 * i + 2]!;
    if (h < lo) { lo = h; lowVertex = i; }
    if (h > hi) { hi = h; highVertex = i; }
  }
  let overhangArea = 0, bedContactArea = 0, supportProxy = 0;
  const N = f.normals, C = f.centroids, A = f.areas;
  const R = f.reach;
  const contactFacets: number[] = [];
  for (let t = 0; t < f.count; t++) {
    // n · down, with down = −up.
    const nd = -(ux * N[3 * t]! + uy * N[3 * t + 1]! + uz * N[3 * t + 2]!);
    if (nd <= 0) continue;
    const hc = ux * C[3 * t]! + uy * C[3 * t + 1]! + uz * C[3 * t + 2]!;
    const onBed = hc - R[t]! <= lo + bedEps && restsOnBed(nd, topOf(f, t, ux, uy, uz) - lo, bedEps);
    const a = A[t]!;
    if (onBed) {
      bedContactArea += a;
      contactFacets.push(t);
    }
    else if (isOverhang(nd, sinTheta, false)) {
      overhangArea += a;
      supportProxy += a * nd * (hc - lo);
    }
  }
  return { overhangArea, bedContactArea, height: hi - lo, supportProxy, lowVertex, highVertex, lowest: lo, contactFacets };
}

/** Print-frame x, y of the corners of the given facets, turned by m. */
export function facetCornersXY(f: FacetData, facets: readonly number[], m: Mat3): number[] {
  const v = f.vertices, out: number[] = [];
  for (const t of facets) {
    for (let k = 0; k < 3; k++) {
      const i = f.indices[3 * t + k]! * 3;
      out.push(m[0] * v[i]! + m[1] * v[i + 1]! + m[2] * v[i + 2]!, m[3] * v[i]! + m[4] * v[i + 1]! + m[5] * v[i + 2]!);
    }
  }
  return out;
}

/**
 * The turn about Z (0 to 90°, in `steps` steps) giving the smallest bounding rectangle of
 * `pointIdx` after rotation by m. Turn 0 is kept unless another saves more than 1 % of area, so
 * boxy parts keep the file's own alignment.
 */
export function bestSpin(vertices: Float32Array, pointIdx: ArrayLike<number>, m: Mat3, steps = 30): { spin: number; footprint: [number, number] } {
  const k = pointIdx.length;
  const xs = new Float64Array(k), ys = new Float64Array(k);
  for (let j = 0; j < k; j++) {
    const i = pointIdx[j]! * 3;
    const x = vertices[i]!, y = vertices[i + 1]!, z = vertices[i + 2]!;
    xs[j] = m[0] * x + m[1] * y + m[2] * z;
    ys[j] = m[3] * x + m[4] * y + m[5] * z;
  }
  let best = { spin: 0, footprint: [0, 0] as [number, number] };
  let bestArea = Infinity;
  for (let s = 0; s < steps; s++) {
    const a = (s * Math.PI) / 2 / steps;
    const c = Math.cos(a), sn = Math.sin(a);
    let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity;
    for (let j = 0; j < k; j++) {
      const px = c * xs[j]! - sn * ys[j]!, py = sn * xs[j]! + c * ys[j]!;
      if (px < x0) x0 = px;
      if (px > x1) x1 = px;
      if (py < y0) y0 = py;
      if (py > y1) y1 = py;
    }
    const area = (x1 - x0) * (y1 - y0);
    if (s === 0 || area < bestArea * 0.99) {
      bestArea = area;
      best = { spin: a, footprint: [x1 - x0, y1 - y0] };
    }
  }
  return best;
}

/** Exact bounding rectangle of all vertices after rotation by m. */
export function footprintOf(vertices: Float32Array, m: Mat3): [number, number] {
  let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity;
  for (let i = 0; i + 2 < vertices.length; i += 3) {
    const x = vertices[i]!, y = vertices[i + 1]!, z = vertices[i + 2]!;
    const px = m[0] * x + m[1] * y + m[2] * z, py = m[3] * x + m[4] * y + m[5] * z;
    if (px < x0) x0 = px;
    if (px > x1) x1 = px;
    if (py < y0) y0 = py;
    if (py > y1) y1 = py;
  }
  return [x1 - x0, y1 - y0];
}
