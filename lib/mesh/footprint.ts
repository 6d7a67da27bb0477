import type { Vec3 } from "./types";

/**
 * Footprint on the bed: the vertices projected onto the plane normal to `up`, their convex hull
 * (Andrew's monotone chain, after an Akl–Toussaint style polygon filter that drops points that cannot
 * be on the hull) and its area (shoelace formula), plus the axis-aligned rectangle in the same
 * plane coordinates. For up = +Z the plane axes are X and Y.
 */
export interface Footprint {
  /** Plane axes in model space: outline point (a, b) is a·axisU + b·axisV. */
  axisU: Vec3;
  axisV: Vec3;
  /** Hull corners, counter-clockwise seen from above: [a0, b0, a1, b1, …]. */
  outline: Float64Array;
  area: number;
  rect: { min: [number, number]; max: [number, number]; area: number };
}

export function planeAxes(up: Vec3): { u: Vec3; v: Vec3 } {
  const [x, y, z] = up;
  const ref: Vec3 = Math.abs(x) < 0.9 ? [1, 0, 0] : [0, 1, 0];
  const d = ref[0] * x + ref[1] * y + ref[2] * z;
  let u: Vec3 = [ref[0] - d * x, ref[1] - d * y, ref[2] - d * z];
  const l = Math.hypot(u[0], u[1], u[2]);
  u = [u[0] / l, u[1] / l, u[2] / l];
  const v: Vec3 = [y * u[2] - z * u[1], z * u[0] - x * u[2], x * u[1] - y * u[0]];
  return { u, v };
}

const cross = (ox: number, oy: number, ax: number, ay: number, bx: number, by: number) => (ax - ox) * (by - oy) - (ay - oy) * (bx - ox);

/** Convex hull of points given as [x0, y0, x1, y1, …]; counter-clockwise, no collinear points. */
export function convexHull2d(pts: Float64Array): Float64Array {
  const n = pts.length >>> 1;
  if (n === 0) return new Float64Array(0);
  // Polygon of the extreme points in K evenly spread directions (counter-clockwise order): points
  // strictly inside it cannot be hull corners and are dropped before sorting.
  const K = 32;
  const dx = new Float64Array(K), dy = new Float64Array(K);
  for (let k = 0; k < K; k++) { dx[k] = Math.cos((2 * Math.PI * k) / K); dy[k] = Math.sin((2 * Math.PI * k) / K); }
  const ext = new Int32Array(K);
  const best = new Float64Array(K).fill(-Infinity);
  for (let i = 0; i < n; i++) {
    const x = pts[2 * i]!, y = pts[2 * i + 1]!;
    for (let k = 0; k < K; k++) {
      const d = x * dx[k]! + y * dy[k]!;
      if (d > best[k]!) { best[k] = d; ext[k] = i; }
    }
  }
  const poly: number[] = [];
  for (let k = 0; k < K; k++) {
    const i = ext[k]!;
    const x = pts[2 * i]!, y = pts[2 * i + 1]!;
    if (poly.length >= 2 && poly[poly.length - 2] === x && poly[poly.length - 1] === y) continue;
    poly.push(x, y);
  }
  while (poly.length >= 4 && poly[0] === poly[poly.length - 2] && poly[1] === poly[poly.length - 1]) poly.length -= 2;
  const m = poly.length >>> 1;
  const keep: number[] = [];
  for (let i = 0; i < n; i++) {
    const x = pts[2 * i]!, y = pts[2 * i + 1]!;
    let inside = m >= 3;
    for (let k = 0; k < m && inside; k++) {
      const k2 = k + 1 === m ? 0 : k + 1;
      if (cross(poly[2 * k]!, poly[2 * k + 1]!, poly[2 * k2]!, poly[2 * k2 + 1]!, x, y) <= 0) inside = false;
    }
    if (!inside) keep.push(i);
  }
  keep.sort((a, b) => pts[2 * a]! - pts[2 * b]! || pts[2 * a + 1]! - pts[2 * b + 1]!);
  const h: number[] = [];
  const push = (i: number, floor: number) => {
    const x = pts[2 * i]!, y = pts[2 * i + 1]!;
    while (h.length >= 2 * (floor + 2) && cross(h[h.length - 4]!, h[h.length - 3]!, h[h.length - 2]!, h[h.length - 1]!, x, y) <= 0) h.length -= 2;
    h.push(x, y);
  };
  for (const i of keep) push(i, 0);
  const lower = h.length >>> 1;
  for (let j = keep.length - 2; j >= 0; j--) push(keep[j]!, lower - 1);
  h.length -= 2; // the last point repeats the first
  if (h.length === 0 && keep.length > 0) h.push(pts[2 * keep[0]!]!, pts[2 * keep[0]! + 1]!);
  return Float64Array.from(h);
}

export function polygonArea(p: Float64Array): number {
  let a = 0;
  const n = p.length >>> 1;
  for (let i = 0; i < n; i++) {
    const j = (i + 1) % n;
    a += p[2 * i]! * p[2 * j + 1]! - p[2 * j]! * p[2 * i + 1]!;
  }
  return a / 2;
}

/** Footprint of vertices given as a flat xyz array. */
export function footprint(vertices: Float32Array, up: Vec3): Footprint {
  const { u, v } = planeAxes(up);
  const n = Math.floor(vertices.length / 3);
  const pts = new Float64Array(2 * n);
  let amin = Infinity, amax = -Infinity, bmin = Infinity, bmax = -Infinity;
  for (let i = 0; i < n; i++) {
    const x = vertices[3 * i]!, y = vertices[3 * i + 1]!, z = vertices[3 * i + 2]!;
    const a = x * u[0] + y * u[1] + z * u[2], b = x * v[0] + y * v[1] + z * v[2];
    pts[2 * i] = a; pts[2 * i + 1] = b;
    if (a < amin) amin = a; if (a > amax) amax = a;
    if (b < bmin) bmin = b; if (b > bmax) bmax = b;
  }
  const outline = convexHull2d(pts);
  if (n === 0) { amin = amax = bmin = bmax = 0; }
  return {
    axisU: u,
    axisV: v,
    outline,
    area: Math.abs(polygonArea(outline)),
    rect: { min: [amin, bmin], max: [amax, bmax], area: (amax - amin) * (bmax - bmin) },
  };
}
