import { numberAt, POW10 } from "./xml";

/**
 * The fast path of 3MF mesh reading: a byte-level loop over `<vertex x= y= z=/>` and
 * `<triangle v1= v2= v3=/>` elements that makes no string and no tag object per element. It takes
 * only the plain form (unprefixed name, quoted attributes, self-closing); at anything else it stops
 * and returns where it stopped, and the general scanner (xml.ts) reads that element, reports its
 * errors, and hands back. Attributes other than the coordinates or indices are skipped, as the
 * general path ignores them.
 */
export interface MeshSink {
  verts: Float64Array;
  nv: number;
  tris: Uint32Array;
  nt: number;
}

const isWs = (c: number | undefined) => c === 32 || c === 10 || c === 13 || c === 9;
const isNameEnd = (c: number | undefined) => c === undefined || isWs(c) || c === 61 || c === 62 || c === 47;

function grow<T extends Float64Array | Uint32Array>(a: T, need: number): T {
  if (need <= a.length) return a;
  const next = new (a.constructor as new (n: number) => T)(Math.max(need, a.length * 2, 1024));
  next.set(a);
  return next;
}

/**
 * The common number form at vs, `-?digits[.digits]` closed by quote q, at most 15 digits: the value
 * in out[0] and the index past the quote; -1 for any other form.
 */
function plainValue(b: Uint8Array, vs: number, q: number, out: Float64Array): number {
  let p = vs, ch = b[p], neg = false, m = 0, digits = 0, scale = 0;
  if (ch === 45) { neg = true; ch = b[++p]; }
  while (ch !== undefined && ch >= 48 && ch <= 57) { m = m * 10 + (ch - 48); digits++; ch = b[++p]; }
  if (ch === 46) {
    ch = b[++p];
    while (ch !== undefined && ch >= 48 && ch <= 57) { m = m * 10 + (ch - 48); digits++; scale++; ch = b[++p]; }
  }
  if (ch === q && digits > 0 && digits <= 15 && scale <= 22) {
    // Exactly rounded: an integer below 2^53 over an exact power of ten (Clinger 1990).
    out[0] = (neg ? -m : m) / POW10[scale]!;
    return p + 1;
  }
  return -1;
}

/** Index just past the value that starts at `vs` (its closing quote `q`), the number in `out[0]`; -1 if unterminated. */
function value(b: Uint8Array, vs: number, q: number, out: Float64Array): number {
  const fast = plainValue(b, vs, q, out);
  if (fast >= 0) return fast;
  const end = b.indexOf(q, vs);
  if (end < 0) return -1;
  out[0] = numberAt(b, vs, end);
  return end + 1;
}

const num = new Float64Array(1);

export function pushVertex(o: MeshSink, x: number, y: number, z: number): void {
  if (3 * o.nv + 3 > o.verts.length) o.verts = grow(o.verts, 3 * o.nv + 3);
  const p = 3 * o.nv++;
  o.verts[p] = x; o.verts[p + 1] = y; o.verts[p + 2] = z;
}

export function pushTriangle(o: MeshSink, a: number, b: number, c: number): void {
  if (3 * o.nt + 3 > o.tris.length) o.tris = grow(o.tris, 3 * o.nt + 3);
  const p = 3 * o.nt++;
  o.tris[p] = a; o.tris[p + 1] = b; o.tris[p + 2] = c;
}

/**
 * Read one plain self-closing element's attributes from i (just after its name). Calls `take(key,
 * value)` with key 1–3 for the wanted names (`a` + digit for triangles, one letter for vertices);
 * returns the index past `/>`, or -1 when the element is not in the plain form.
 */
function attrs(b: Uint8Array, i: number, tri: boolean, vals: Float64Array): number {
  let seen = 0;
  for (;;) {
    while (isWs(b[i])) i++;
    const c = b[i];
    if (c === 47) return b[i + 1] === 62 && seen === 7 ? i + 2 : -1;
    if (c === undefined || c === 62) return -1;
    const ns = i;
    while (!isNameEnd(b[i])) i++;
    const nl = i - ns;
    if (nl === 0) return -1;
    while (isWs(b[i])) i++;
    if (b[i] !== 61) return -1;
    i++;
    while (isWs(b[i])) i++;
    const q = b[i];
    if (q !== 34 && q !== 39) return -1;
    i = value(b, i + 1, q, num);
    if (i < 0) return -1;
    let k = -1;
    if (tri) { if (nl === 2 && b[ns] === 118) k = b[ns + 1]! - 49; } // v1, v2, v3
    else if (nl === 1) k = b[ns]! - 120; // x, y, z
    if (k >= 0 && k < 3) {
      if (seen & (1 << k)) return -1; // a repeated attribute: the general path decides
      seen |= 1 << k;
      vals[k] = num[0]!;
    }
  }
}

const xyz = new Float64Array(3);

/**
 * The form writers use, ` x="…" y="…" z="…"/>` (or v1 v2 v3) with single spaces, from i just
 * after the element name: values in vals, index past `/>`; -1 for anything else.
 */
function plainAttrs(b: Uint8Array, i: number, n0: number, n1: number, vals: Float64Array): number {
  for (let k = 0; k < 3; k++) {
    if (b[i] !== 32 || b[i + 1] !== n0) return -1;
    let j = i + 2;
    if (n1 !== 0) { if (b[j] !== n1 + k) return -1; j++; }
    if (b[j] !== 61 || b[j + 1] !== 34) return -1;
    i = plainValue(b, j + 2, 34, num);
    if (i < 0) return -1;
    vals[k] = num[0]!;
    if (n1 === 0) n0++;
  }
  return b[i] === 47 && b[i + 1] === 62 ? i + 2 : -1;
}

/** `<vertex` followed by white space at i? (Written out: this runs once per element.) */
function atVertex(b: Uint8Array, i: number): boolean {
  return b[i] === 60 && b[i + 1] === 118 && b[i + 2] === 101 && b[i + 3] === 114 && b[i + 4] === 116 && b[i + 5] === 101 && b[i + 6] === 120 && isWs(b[i + 7]);
}

/** `<triangle` followed by white space at i? */
function atTriangle(b: Uint8Array, i: number): boolean {
  return b[i] === 60 && b[i + 1] === 116 && b[i + 2] === 114 && b[i + 3] === 105 && b[i + 4] === 97 && b[i + 5] === 110 && b[i + 6] === 103 && b[i + 7] === 108 && b[i + 8] === 101 && isWs(b[i + 9]);
}

/** Read plain vertex elements from i on into `o`; returns where the general scanner resumes. */
export function scanVertices(b: Uint8Array, i: number, o: MeshSink): number {
  let verts = o.verts, nv = o.nv;
  for (;;) {
    while (isWs(b[i])) i++;
    if (!atVertex(b, i)) break;
    let e = plainAttrs(b, i + 7, 120, 0, xyz);
    if (e < 0) e = attrs(b, i + 7, false, xyz);
    const x = xyz[0]!, y = xyz[1]!, z = xyz[2]!;
    // Not plain, or a value that is not a finite number: the general path reports it.
    if (e < 0 || !Number.isFinite(x) || !Number.isFinite(y) || !Number.isFinite(z)) break;
    if (3 * nv + 3 > verts.length) verts = grow(verts, 3 * nv + 3);
    const p = 3 * nv++;
    verts[p] = x; verts[p + 1] = y; verts[p + 2] = z;
    i = e;
  }
  o.verts = verts; o.nv = nv;
  return i;
}

/** Read plain triangle elements from i on into `o`, indices checked against its vertex count. */
export function scanTriangles(b: Uint8Array, i: number, o: MeshSink): number {
  let tris = o.tris, nt = o.nt;
  const nv = o.nv;
  for (;;) {
    while (isWs(b[i])) i++;
    if (!atTriangle(b, i)) break;
    let e = plainAttrs(b, i + 9, 118, 49, xyz);
    if (e < 0) e = attrs(b, i + 9, true, xyz);
    const a = xyz[0]!, c1 = xyz[1]!, c2 = xyz[2]!;
    // Indices must be integers in 0…nv−1; anything else goes to the general path's error.
    // (x >>> 0) === x: a whole number in 0…2^32 − 1 (an integer test without a float remainder).
    if (e < 0 || !(a < nv && c1 < nv && c2 < nv) || a >>> 0 !== a || c1 >>> 0 !== c1 || c2 >>> 0 !== c2) break;
    if (3 * nt + 3 > tris.length) tris = grow(tris, 3 * nt + 3);
    const p = 3 * nt++;
    tris[p] = a; tris[p + 1] = c1; tris[p + 2] = c2;
    i = e;
  }
  o.tris = tris; o.nt = nt;
  return i;
}
