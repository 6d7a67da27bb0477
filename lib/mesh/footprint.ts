import type { Vec3 } from "./types";

/**
 * Footprint on the bed: the vertices projected onto the plane normal to `up`, their convex hull
 * and its area (shoelace formula), plus the axis-aligned rectangle in the same plane coordinates.
 * For up = +Z the plane axes are X and Y.
 *
 * Hull: Akl–Toussaint filter (points strictly inside the octagon of the extreme points along x, y,
 * x + y and y − x are dropped), then each region outside an octagon edge is narrowed by
 * quickhull-style splits (the farthest point is a corner; points strictly inside the triangle it
 * forms with the edge are dropped), then Andrew's monotone chain over the few survivors. Every
 * dropped point is strictly inside a triangle of input points, so it is no hull corner: the output
 * equals the monotone chain over all points (up to rounding of points within ~1e-16 of an edge).
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

/** Growable flat [x, y, …] buffer. */
class Points {
  xy: Float64Array;
  n = 0;
  constructor(cap = 64) { this.xy = new Float64Array(2 * cap); }
  push(x: number, y: number): void {
    if (2 * this.n + 2 > this.xy.length) {
      const next = new Float64Array(this.xy.length * 2);
      next.set(this.xy);
      this.xy = next;
    }
    this.xy[2 * this.n] = x;
    this.xy[2 * this.n + 1] = y;
    this.n++;
  }
}

/** Points as read by the hull's first two passes: point i is (pts[stride·i], pts[stride·i + 1]). */
type PointArray = Float64Array | Float32Array;

/** Indices of the extreme points at 0°, 45°, …, 315° (counter-clockwise): max x, x + y, y, y − x, then minima. */
function octagonCorners(pts: PointArray, n: number, stride: number): number[] {
  let i0 = 0, i1 = 0, i2 = 0, i3 = 0, i4 = 0, i5 = 0, i6 = 0, i7 = 0;
  let xHi = -Infinity, sHi = -Infinity, yHi = -Infinity, dHi = -Infinity, xLo = Infinity, sLo = Infinity, yLo = Infinity, dLo = Infinity;
  for (let i = 0, p = 0; i < n; i++, p += stride) {
    const x = pts[p]!, y = pts[p + 1]!, s = x + y, d = y - x;
    if (x > xHi) { xHi = x; i0 = i; }
    if (s > sHi) { sHi = s; i1 = i; }
    if (y > yHi) { yHi = y; i2 = i; }
    if (d > dHi) { dHi = d; i3 = i; }
    if (x < xLo) { xLo = x; i4 = i; }
    if (s < sLo) { sLo = s; i5 = i; }
    if (y < yLo) { yLo = y; i6 = i; }
    if (d < dLo) { dLo = d; i7 = i; }
  }
  return [i0, i1, i2, i3, i4, i5, i6, i7];
}

/**
 * Points not strictly inside the polygon of `corners` (input point ids, counter-clockwise), each in
 * the bucket of the first edge it is not strictly left of; `null` when the polygon is degenerate.
 */
function outsideOctagon(pts: PointArray, n: number, stride: number, corners: number[]): { c: number[]; buckets: Points[] } | null {
  const c: number[] = [];
  for (const i of corners) {
    const x = pts[stride * i]!, y = pts[stride * i + 1]!;
    if (c.length >= 2 && c[c.length - 2] === x && c[c.length - 1] === y) continue; // zero-length edge
    c.push(x, y);
  }
  while (c.length >= 4 && c[0] === c[c.length - 2] && c[1] === c[c.length - 1]) c.length -= 2;
  const m = c.length >>> 1;
  if (m < 3) return null;
  // Edge k runs from (ax, ay) along (ex, ey). Short polygons repeat edge 0 up to eight edges: a
  // point reaching a copy has already passed the original, so buckets are unchanged.
  const e = new Float64Array(32);
  for (let k = 0; k < 8; k++) {
    const k1 = k < m ? k : 0, k2 = k1 + 1 === m ? 0 : k1 + 1;
    e[4 * k] = c[2 * k1]!; e[4 * k + 1] = c[2 * k1 + 1]!;
    e[4 * k + 2] = c[2 * k2]! - c[2 * k1]!; e[4 * k + 3] = c[2 * k2 + 1]! - c[2 * k1 + 1]!;
  }
  const buckets = Array.from({ length: m }, () => new Points(256));
  // A box strictly inside the octagon (its four corners are strictly inside, so by convexity all of
  // it is) drops most interior points with four comparisons; the box spans the octagon's corners
  // between the diagonal ones. Degenerate octagons just get an empty box.
  let bx0 = Infinity, bx1 = -Infinity, by0 = Infinity, by1 = -Infinity;
  {
    const xs: number[] = [], ys: number[] = [];
    for (let k = 0; k < m; k++) { xs.push(c[2 * k]!); ys.push(c[2 * k + 1]!); }
    const sx = [...xs].sort((a, b) => a - b), sy = [...ys].sort((a, b) => a - b);
    // The middle of the sorted corner coordinates, pulled in a little so that corners lying on the
    // octagon's own corners (a regular octagon's 45° ones) come strictly inside.
    const mx0 = sx[Math.floor(m / 4)]!, mx1 = sx[Math.ceil((3 * m) / 4) - 1]!, my0 = sy[Math.floor(m / 4)]!, my1 = sy[Math.ceil((3 * m) / 4) - 1]!;
    const sxh = ((mx1 - mx0) / 2) * (1 - 1e-6), syh = ((my1 - my0) / 2) * (1 - 1e-6);
    const qx0 = (mx0 + mx1) / 2 - sxh, qx1 = (mx0 + mx1) / 2 + sxh, qy0 = (my0 + my1) / 2 - syh, qy1 = (my0 + my1) / 2 + syh;
    const inside = (x: number, y: number) => {
      for (let k = 0; k < 8; k++) if (!(e[4 * k + 2]! * (y - e[4 * k + 1]!) - e[4 * k + 3]! * (x - e[4 * k]!) > 0)) return false;
      return true;
    };
    if (qx0 < qx1 && qy0 < qy1 && inside(qx0, qy0) && inside(qx1, qy0) && inside(qx1, qy1) && inside(qx0, qy1)) {
      bx0 = qx0; bx1 = qx1; by0 = qy0; by1 = qy1;
    }
  }
  classify(pts, n, stride, e, bx0, bx1, by0, by1, buckets);
  return { c, buckets };
}

/** Put each point not strictly inside the octagon (edges in `e`) in the bucket of the first edge it is not left of. */
function classify(pts: PointArray, n: number, stride: number, e: Float64Array, bx0: number, bx1: number, by0: number, by1: number, buckets: Points[]): void {
  const a0x = e[0]!, a0y = e[1]!, e0x = e[2]!, e0y = e[3]!;
  const a1x = e[4]!, a1y = e[5]!, e1x = e[6]!, e1y = e[7]!;
  const a2x = e[8]!, a2y = e[9]!, e2x = e[10]!, e2y = e[11]!;
  const a3x = e[12]!, a3y = e[13]!, e3x = e[14]!, e3y = e[15]!;
  const a4x = e[16]!, a4y = e[17]!, e4x = e[18]!, e4y = e[19]!;
  const a5x = e[20]!, a5y = e[21]!, e5x = e[22]!, e5y = e[23]!;
  const a6x = e[24]!, a6y = e[25]!, e6x = e[26]!, e6y = e[27]!;
  const a7x = e[28]!, a7y = e[29]!, e7x = e[30]!, e7y = e[31]!;
  for (let i = 0, p = 0; i < n; i++, p += stride) {
    const x = pts[p]!, y = pts[p + 1]!;
    if (x > bx0 && x < bx1 && y > by0 && y < by1) continue;
    // Strictly left of all eight edges (unrolled): inside, dropped.
    if (e0x * (y - a0y) - e0y * (x - a0x) > 0 && e1x * (y - a1y) - e1y * (x - a1x) > 0 &&
      e2x * (y - a2y) - e2y * (x - a2x) > 0 && e3x * (y - a3y) - e3y * (x - a3x) > 0 &&
      e4x * (y - a4y) - e4y * (x - a4x) > 0 && e5x * (y - a5y) - e5y * (x - a5x) > 0 &&
      e6x * (y - a6y) - e6y * (x - a6x) > 0 && e7x * (y - a7y) - e7y * (x - a7x) > 0) continue;
    let k = 0;
    while (e[k + 2]! * (y - e[k + 1]!) - e[k + 3]! * (x - e[k]!) > 0) k += 4;
    buckets[k >>> 2]!.push(x, y);
  }
}

/** Pockets this small go to the chain as they are. */
const SMALL_POCKET = 12;

/**
 * Narrow the points right of (or on) edge a→b, all in xy[lo, hi) as pairs, into `keep`.
 * In-place partitions like a quicksort; an explicit stack instead of recursion.
 */
function narrowPocket(xy: Float64Array, lo0: number, hi0: number, a0x: number, a0y: number, b0x: number, b0y: number, keep: Points): void {
  const stack: number[] = [lo0, hi0, a0x, a0y, b0x, b0y];
  while (stack.length > 0) {
    const by = stack.pop()!, bx = stack.pop()!, ay = stack.pop()!, ax = stack.pop()!, hi = stack.pop()!, lo = stack.pop()!;
    if (hi - lo <= SMALL_POCKET) { for (let i = lo; i < hi; i++) keep.push(xy[2 * i]!, xy[2 * i + 1]!); continue; }
    // Cross products written out (the same as cross()): a call passing six numbers that is not
    // inlined allocates them, and these loops run over every point left outside the octagon.
    const abx = bx - ax, aby = by - ay;
    let far = -1, best = 0;
    for (let i = lo; i < hi; i++) {
      const d = abx * (xy[2 * i + 1]! - ay) - aby * (xy[2 * i]! - ax);
      if (d < best) { best = d; far = i; }
    }
    if (far < 0) { for (let i = lo; i < hi; i++) keep.push(xy[2 * i]!, xy[2 * i + 1]!); continue; }
    swap(xy, lo, far);
    const px = xy[2 * lo]!, py = xy[2 * lo + 1]!;
    keep.push(px, py);
    const apx = px - ax, apy = py - ay, pbx = bx - px, pby = by - py;
    let w = lo + 1;
    for (let i = lo + 1; i < hi; i++) if (apx * (xy[2 * i + 1]! - ay) - apy * (xy[2 * i]! - ax) <= 0) swap(xy, w++, i);
    const mid = w;
    for (let i = mid; i < hi; i++) {
      const x = xy[2 * i]!, y = xy[2 * i + 1]!;
      if (pbx * (y - py) - pby * (x - px) <= 0) swap(xy, w++, i);
      else if (abx * (y - ay) - aby * (x - ax) === 0) keep.push(x, y); // on a→b itself: not strictly inside
      // else strictly inside triangle a, p, b: dropped
    }
    if (8 * (hi - w) < hi - lo) {
      // Under an eighth dropped: the pocket is mostly hull corners (a fine polygon), so stop narrowing.
      for (let i = lo + 1; i < w; i++) keep.push(xy[2 * i]!, xy[2 * i + 1]!);
      continue;
    }
    stack.push(lo + 1, mid, ax, ay, px, py, mid, w, px, py, bx, by);
  }
}

function swap(xy: Float64Array, i: number, j: number): void {
  const x = xy[2 * i]!, y = xy[2 * i + 1]!;
  xy[2 * i] = xy[2 * j]!; xy[2 * i + 1] = xy[2 * j + 1]!;
  xy[2 * j] = x; xy[2 * j + 1] = y;
}

const after = (xy: Float64Array, i: number, j: number) => xy[2 * i]! > xy[2 * j]! || (xy[2 * i]! === xy[2 * j]! && xy[2 * i + 1]! > xy[2 * j + 1]!);

/**
 * Sort n points of xy in place by x, then y: quicksort on the pairs themselves (median of three,
 * Hoare partition so runs of equal keys split evenly), insertion sort below 16 points.
 */
function sortPoints(xy: Float64Array, n: number): void {
  const stack: number[] = [0, n - 1];
  while (stack.length > 0) {
    let hi = stack.pop()!, lo = stack.pop()!;
    while (hi - lo > 16) {
      const mid = (lo + hi) >>> 1;
      if (after(xy, lo, mid)) swap(xy, lo, mid);
      if (after(xy, mid, hi)) { swap(xy, mid, hi); if (after(xy, lo, mid)) swap(xy, lo, mid); }
      const px = xy[2 * mid]!, py = xy[2 * mid + 1]!;
      let i = lo, j = hi;
      for (;;) {
        do i++; while (xy[2 * i]! < px || (xy[2 * i]! === px && xy[2 * i + 1]! < py));
        do j--; while (xy[2 * j]! > px || (xy[2 * j]! === px && xy[2 * j + 1]! > py));
        if (i >= j) break;
        swap(xy, i, j);
      }
      if (j - lo < hi - j) { stack.push(j + 1, hi); hi = j; } else { stack.push(lo, j); lo = j + 1; }
    }
    for (let i = lo + 1; i <= hi; i++) {
      const x = xy[2 * i]!, y = xy[2 * i + 1]!;
      let j = i - 1;
      while (j >= lo && (xy[2 * j]! > x || (xy[2 * j]! === x && xy[2 * j + 1]! > y))) { xy[2 * j + 2] = xy[2 * j]!; xy[2 * j + 3] = xy[2 * j + 1]!; j--; }
      xy[2 * j + 2] = x; xy[2 * j + 3] = y;
    }
  }
}

/** Andrew's monotone chain over n points sorted by x, then y. */
function monotoneChain(s: Float64Array, m: number): Float64Array {
  const h = new Float64Array(2 * (2 * m + 1));
  let len = 0;
  const push = (x: number, y: number, floor: number) => {
    while (len >= 2 * (floor + 2) && cross(h[len - 4]!, h[len - 3]!, h[len - 2]!, h[len - 1]!, x, y) <= 0) len -= 2;
    h[len++] = x; h[len++] = y;
  };
  for (let i = 0; i < m; i++) push(s[2 * i]!, s[2 * i + 1]!, 0);
  const lower = len >>> 1;
  for (let j = m - 2; j >= 0; j--) push(s[2 * j]!, s[2 * j + 1]!, lower - 1);
  len -= 2; // the last point repeats the first
  if (len <= 0) return s.slice(0, 2);
  return h.slice(0, len);
}

function hullWith(pts: PointArray, n: number, stride: number, corners: number[]): Float64Array {
  if (n === 0) return new Float64Array(0);
  const out = outsideOctagon(pts, n, stride, corners);
  let cand: Float64Array, m: number;
  if (!out) {
    // All points on a line or one point: copy them (never reorder the caller's array).
    cand = new Float64Array(2 * n);
    for (let i = 0; i < n; i++) { cand[2 * i] = pts[stride * i]!; cand[2 * i + 1] = pts[stride * i + 1]!; }
    m = n;
  } else {
    const keep = new Points(1024);
    const { c, buckets } = out;
    const k = c.length >>> 1;
    for (let j = 0; j < k; j++) {
      const j2 = j + 1 === k ? 0 : j + 1;
      narrowPocket(buckets[j]!.xy, 0, buckets[j]!.n, c[2 * j]!, c[2 * j + 1]!, c[2 * j2]!, c[2 * j2 + 1]!, keep);
    }
    for (let j = 0; j < k; j++) keep.push(c[2 * j]!, c[2 * j + 1]!);
    cand = keep.xy;
    m = keep.n;
  }
  sortPoints(cand, m);
  return monotoneChain(cand, m);
}

/** Convex hull of points given as [x0, y0, x1, y1, …]; counter-clockwise, no collinear points. */
export function convexHull2d(pts: Float64Array): Float64Array {
  const n = pts.length >>> 1;
  return hullWith(pts, n, 2, n ? octagonCorners(pts, n, 2) : []);
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

/**
 * Footprint of vertices given as a flat xyz array. For up = +Z the plane coordinates are x and y
 * themselves, so the hull reads the vertex array in place (stride 3); other directions are
 * projected into a new array first.
 */
export function footprint(vertices: Float32Array, up: Vec3): Footprint {
  const { u, v } = planeAxes(up);
  const n = Math.floor(vertices.length / 3);
  const inPlace = u[0] === 1 && u[1] === 0 && u[2] === 0 && v[0] === 0 && v[1] === 1 && v[2] === 0;
  let pts: PointArray, stride: number;
  if (inPlace) { pts = vertices; stride = 3; }
  else {
    const q = new Float64Array(2 * n);
    for (let i = 0; i < n; i++) {
      const x = vertices[3 * i]!, y = vertices[3 * i + 1]!, z = vertices[3 * i + 2]!;
      q[2 * i] = x * u[0] + y * u[1] + z * u[2]; q[2 * i + 1] = x * v[0] + y * v[1] + z * v[2];
    }
    pts = q; stride = 2;
  }
  if (n === 0) return { axisU: u, axisV: v, outline: new Float64Array(0), area: 0, rect: { min: [0, 0], max: [0, 0], area: 0 } };
  const corners = octagonCorners(pts, n, stride);
  // The octagon's corners include the extremes in a (max, min: corners 0 and 4) and b (2 and 6).
  const amax = pts[stride * corners[0]!]!, amin = pts[stride * corners[4]!]!;
  const bmax = pts[stride * corners[2]! + 1]!, bmin = pts[stride * corners[6]! + 1]!;
  const outline = hullWith(pts, n, stride, corners);
  return {
    axisU: u,
    axisV: v,
    outline,
    area: Math.abs(polygonArea(outline)),
    rect: { min: [amin, bmin], max: [amax, bmax], area: (amax - amin) * (bmax - bmin) },
  };
}
