import type { IndexedMesh, TriangleSoup } from "./types";
import { FRESH, type Lease } from "./workspace";

/**
 * Welding: vertices whose coordinates fall in the same cell of a grid of pitch `tolerance` become
 * one. Coordinates are quantised once to non-negative integer cells (offset from the bounding-box
 * minimum, rounded half up) and a cell is hashed with a multiply-xorshift mix. Bit-identical
 * coordinates always weld; two points closer than the pitch but in neighbouring cells do not.
 * When the model spans more than 2^30 cells along an axis the pitch is widened to fit (so cells
 * stay exact int32 and duplicates still weld). Vertex ids follow first appearance in the input.
 *
 * It runs in two phases, so that no step makes random reads over a vertex-sized table (on a shared
 * machine only about the L2 cache can be relied on, and a table of half a million vertices misses
 * it on nearly every probe):
 *  1. Streaming: each corner is looked up by its raw coordinate bits in a small direct-mapped
 *     cache of recently seen corners (bits + id, 512 KB). A hit takes that id (equal bits are the
 *     same cell, so nothing is quantised); a miss quantises the corner and appends a *tentative*
 *     vertex (its cell, hash and coordinates, written in order) and takes the new tentative id.
 *     Meshes list neighbouring triangles near each other, so most corners hit; a vertex that was
 *     evicted, or that comes back with other bits in the same cell, simply gets another tentative id.
 *     The same loop flags triangles of zero area (the edge census counts them as degenerate).
 *  2. Resolution: tentative vertices are bucketed by the top bits of their hash (a counting sort
 *     that keeps their order), and each bucket (~512 entries) is de-duplicated with a tiny hash
 *     table that stays in L1. Every duplicate points at the first tentative id of its cell, the
 *     survivors are numbered in order (= first appearance), and the corner ids are rewritten in one
 *     sequential pass.
 */
export class Welder {
  /** Direct-mapped cache of recent corners, 4 ints a slot: the x, y, z float bits and tentative id + 1 (0 = empty). */
  private readonly recent: Int32Array;
  /** Tentative vertices: their coordinates (3 floats per tentative id), in order of appearance. */
  private coords: Float32Array;
  private tentative = 0;
  readonly indices: Uint32Array;

  /**
   * `scratch` lends the working arrays; `out` the corner ids and vertex coordinates, which the
   * result returns (so `out` must be FRESH when the welded mesh outlives the caller's lease).
   */
  constructor(triangles: number, private readonly scratch: Lease = FRESH, private readonly out: Lease = FRESH) {
    // Closed meshes have about half as many vertices as triangles, plus some re-seen ones; grow past that.
    const cap = Math.max(16, (triangles >>> 1) + (triangles >>> 3) + 16);
    this.recent = scratch.int32("weld.recent", RECENT * 4, true);
    this.coords = out.float32("weld.coords", cap * 3);
    this.indices = out.uint32("weld.indices", triangles * 3);
  }

  private grow(): void {
    const c = this.out.float32("weld.coords", this.coords.length * 2);
    c.set(this.coords);
    this.coords = c;
  }

  /**
   * Weld `count` consecutive triangles of a soup-like array (9 floats each at base + k·stride,
   * triangle tri0 + k). Needs no bounding box: cells are only computed when the weld resolves.
   */
  addRange(f: Float32Array, base: number, stride: number, count: number, tri0: number): void {
    this.addPairs(f, base, f, base + stride, 2 * stride, (count + 1) >>> 1, count >>> 1, tri0);
  }

  /**
   * Weld triangles given as pairs in file order: triangle tri0 + 2k at fa[baseA + k·stride] and
   * triangle tri0 + 2k + 1 at fb[baseB + k·stride] (countA of the first kind, countB of the second,
   * countB = countA or countA − 1). Binary STL records alternate between two aligned views, and
   * taking them in file order keeps each vertex's uses close together, which is what the cache of
   * recent corners relies on.
   */
  addPairs(fa: Float32Array, baseA: number, fb: Float32Array, baseB: number, stride: number, countA: number, countB: number, tri0: number): void {
    const idx = this.indices, rc = this.recent;
    const ba = new Int32Array(fa.buffer, fa.byteOffset, fa.length);
    const bb = fb === fa ? ba : new Int32Array(fb.buffer, fb.byteOffset, fb.length);
    let coords = this.coords, t = this.tentative, cap = coords.length / 3;
    for (let k = 0, o = 3 * tri0; k < countA; k++) {
      for (let half = 0; half < 2; half++, o += 3) {
        if (half === 1 && k >= countB) break;
        const f = half === 0 ? fa : fb, bits = half === 0 ? ba : bb;
        const p = (half === 0 ? baseA : baseB) + k * stride;
        for (let c = 0; c < 3; c++) {
          const j = p + 3 * c;
          const bx = bits[j]!, by = bits[j + 1]!, bz = bits[j + 2]!;
          const r = recentSlot(bx, by, bz);
          if (rc[r] === bx && rc[r + 1] === by && rc[r + 2] === bz && rc[r + 3] !== 0) {
            idx[o + c] = rc[r + 3]! - 1;
            continue;
          }
          if (t === cap) {
            this.tentative = t;
            this.grow();
            coords = this.coords; cap = coords.length / 3;
          }
          const id = t++;
          coords[3 * id] = f[j]!; coords[3 * id + 1] = f[j + 1]!; coords[3 * id + 2] = f[j + 2]!;
          rc[r] = bx; rc[r + 1] = by; rc[r + 2] = bz; rc[r + 3] = id + 1;
          idx[o + c] = id;
        }
      }
    }
    this.tentative = t;
  }

  /**
   * Resolve tentative vertices into welded ones; call once, after the last addRange. With
   * `census`, the same pass that rewrites the corner ids also counts degenerate triangles and the
   * half-edges each vertex owns (as the lower id), which the edge census needs (see topology.ts).
   */
  result(grid: WeldGrid): IndexedMesh;
  result(grid: WeldGrid, census: { zeroArea: Uint8Array }): IndexedMesh & { census: CensusStart };
  result(grid: WeldGrid, census?: { zeroArea: Uint8Array }): IndexedMesh & { census?: CensusStart } {
    const n = this.tentative, coords = this.coords, idx = this.indices;
    if (n === 0) return { vertices: new Float32Array(0), indices: idx, ...(census ? { census: { start: new Uint32Array(1), degenerate: 0, scratch: new Int32Array(idx.length), scratch2: new Int32Array(1) } } : {}) };
    const { min, max } = grid;
    const span = Math.max(max[0]! - min[0]!, max[1]! - min[1]!, max[2]! - min[2]!, 0);
    const inv = 1 / Math.max(grid.tolerance, span / 2 ** 30), ox = +min[0]!, oy = +min[1]!, oz = +min[2]!;
    // Bucket by the cell hash's top bits (counting sort, stable), carrying each cell and its tentative id.
    let bits = 0;
    while (bits < 24 && n >>> bits > BUCKET_TARGET) bits++;
    const nb = 1 << bits;
    const start = new Int32Array(nb + 1);
    countBuckets(coords, n, inv, ox, oy, oz, HASH_BITS - bits, start);
    let largest = 0;
    for (let b = 0; b < nb; b++) { largest = Math.max(largest, start[b + 1]!); start[b + 1]! += start[b]!; }
    // Sized for the edge census too, which reuses it (see topology.ts).
    const sorted = this.scratch.int32("weld.sorted", Math.max(4 * n, census ? idx.length : 0));
    scatterCells(coords, n, inv, ox, oy, oz, HASH_BITS - bits, start.slice(0, nb), sorted);
    let size = 16;
    while (size < 2 * largest) size *= 2;
    const map = this.scratch.int32("weld.map", n); // tentative id → first tentative id of its cell, then → final id
    firstOfCells(sorted, start, nb, map, size);
    const count = numberSurvivors(map, coords, n);
    // A view when little is wasted (no copy, no fresh pages), else a tight copy.
    const vertices = 4 * 3 * count >= 3 * coords.length ? coords.subarray(0, 3 * count) : coords.slice(0, 3 * count);
    if (!census) {
      if (count < n) for (let i = 0; i < idx.length; i++) idx[i] = map[idx[i]!]!;
      return { vertices, indices: idx };
    }
    const own = this.scratch.uint32("weld.own", count + 1, true);
    const degenerate = rewriteAndCount(new Int32Array(idx.buffer, idx.byteOffset, idx.length), map, census.zeroArea, own);
    for (let i = 0; i < count; i++) own[i + 1]! += own[i]!;
    return { vertices, indices: idx, census: { start: own, degenerate, scratch: sorted, scratch2: map } };
  }
}

// The resolution's loops, one function each: a function holding several long loops is optimised
// loop by loop as each gets hot, and runs the others unoptimised (boxing every number) meanwhile.

// Cell of a coordinate: offsets from the minimum (ox, oy, oz) are ≥ 0, so truncating v + 0.5 rounds
// half up (as Math.round); inv is 1 / pitch. Cells are recomputed in each pass rather than stored:
// fresh memory costs more than the arithmetic.

function countBuckets(coords: Float32Array, n: number, inv: number, ox: number, oy: number, oz: number, shift: number, start: Int32Array): void {
  if (shift >= HASH_BITS) { start[1] = n; return; }
  for (let i = 0; i < n; i++) {
    const qx = ((coords[3 * i]! - ox) * inv + 0.5) | 0, qy = ((coords[3 * i + 1]! - oy) * inv + 0.5) | 0, qz = ((coords[3 * i + 2]! - oz) * inv + 0.5) | 0;
    start[(hash3(qx, qy, qz) >>> shift) + 1]!++;
  }
}

function scatterCells(coords: Float32Array, n: number, inv: number, ox: number, oy: number, oz: number, shift: number, fill: Int32Array, sorted: Int32Array): void {
  const one = shift >= HASH_BITS;
  for (let i = 0; i < n; i++) {
    const qx = ((coords[3 * i]! - ox) * inv + 0.5) | 0, qy = ((coords[3 * i + 1]! - oy) * inv + 0.5) | 0, qz = ((coords[3 * i + 2]! - oz) * inv + 0.5) | 0;
    const s = 4 * (one ? fill[0]!++ : fill[hash3(qx, qy, qz) >>> shift]!++);
    sorted[s] = qx; sorted[s + 1] = qy; sorted[s + 2] = qz; sorted[s + 3] = i;
  }
}

/** Per bucket, the first tentative id of each cell (entries are in id order, so the first seen is the smallest). */
function firstOfCells(sorted: Int32Array, start: Int32Array, nb: number, map: Int32Array, size: number): void {
  const mask = size - 1;
  const slotOf = new Int32Array(size);
  const stamp = new Int32Array(size);
  for (let b = 0; b < nb; b++) {
    const gen = b + 1;
    for (let e = start[b]!, end = start[b + 1]!; e < end; e++) {
      const qx = sorted[4 * e]!, qy = sorted[4 * e + 1]!, qz = sorted[4 * e + 2]!, id = sorted[4 * e + 3]!;
      let s = hash3(qx, qy, qz) & mask;
      let first = id;
      while (stamp[s] === gen) {
        const j = 4 * slotOf[s]!;
        if (sorted[j] === qx && sorted[j + 1] === qy && sorted[j + 2] === qz) { first = sorted[j + 3]!; break; }
        s = (s + 1) & mask;
      }
      if (first === id) { stamp[s] = gen; slotOf[s] = e; }
      map[id] = first;
    }
  }
}

/**
 * Number the survivors in order (a duplicate's first id is smaller, so already renumbered) and
 * compact their coordinates in place (a survivor's new slot is never after its old one).
 */
function numberSurvivors(map: Int32Array, coords: Float32Array, n: number): number {
  let count = 0;
  for (let i = 0; i < n; i++) {
    if (map[i] === i) {
      coords[3 * count] = coords[3 * i]!; coords[3 * count + 1] = coords[3 * i + 1]!; coords[3 * count + 2] = coords[3 * i + 2]!;
      map[i] = count++;
    } else map[i] = map[map[i]!]!;
  }
  return count;
}

/** Rewrite corner ids and count, per vertex, the half-edges whose lower end it is (branch-free min); returns the degenerate count. */
function rewriteAndCount(ix: Int32Array, map: Int32Array, zero: Uint8Array, own: Uint32Array): number {
  let degenerate = 0;
  for (let t = 0, o = 0; o < ix.length; t++, o += 3) {
    const a = map[ix[o]!]!, b = map[ix[o + 1]!]!, c = map[ix[o + 2]!]!;
    ix[o] = a; ix[o + 1] = b; ix[o + 2] = c;
    if (a === b || b === c || a === c) { degenerate++; continue; }
    degenerate += zero[t]!;
    own[a + ((b - a) & ((b - a) >> 31)) + 1]!++;
    own[b + ((c - b) & ((c - b) >> 31)) + 1]!++;
    own[c + ((a - c) & ((a - c) >> 31)) + 1]!++;
  }
  return degenerate;
}

/** The weld grid: cells of pitch `tolerance` from the bounding-box minimum (widened to keep 2^30 cells an axis). */
export interface WeldGrid {
  min: readonly number[];
  max: readonly number[];
  tolerance: number;
}

/** What the weld's last pass hands the edge census: per-vertex half-edge offsets and the degenerate count. */
export interface CensusStart {
  /** start[v]…start[v+1]: slots of the half-edges whose lower vertex id is v (prefix sums, length vertices + 1). */
  start: Uint32Array;
  /** Triangles with a repeated vertex or zero area. */
  degenerate: number;
  /** Free working memory for the census: at least 3 ints per triangle, and at least one per vertex. */
  scratch: Int32Array;
  scratch2: Int32Array;
}

const RECENT_BITS = 15;
const RECENT = 1 << RECENT_BITS;
const RECENT_SHIFT = 32 - RECENT_BITS;
/**
 * Slot of a corner in the recent cache (4 ints a slot), from its raw float bits: the words are
 * rotated apart before they are summed, so sign bits (which mirror images flip) never cancel, then
 * one multiply spreads them into the top bits. Cheaper than hash3; it only has to spread a few
 * thousand live corners over the cache.
 */
function recentSlot(x: number, y: number, z: number): number {
  return (Math.imul(x + ((y << 11) | (y >>> 21)) + ((z << 22) | (z >>> 10)), 0x9e3779b1) >>> RECENT_SHIFT) << 2;
}

/** Tentative vertices per resolution bucket: small enough that a bucket's table sits in L1. */
const BUCKET_TARGET = 512;

/**
 * Hash of three int32 (cell ints or raw float bits): each word is folded in after an xorshift and
 * a multiply of what came before. Raw float bits of symmetric models differ only in sign bits and
 * in a few mantissa bits, which an xor of three products maps onto few values (mirror pairs and
 * rotated copies shared cache slots); this keeps them spread like random keys.
 */
function hash3(x: number, y: number, z: number): number {
  let h = Math.imul(x, 0x9e3779b1);
  h = Math.imul(h ^ (h >>> 16) ^ y, 0x85ebca77);
  h = Math.imul(h ^ (h >>> 16) ^ z, 0xc2b2ae3d);
  // 30 bits, so the value is always a small integer to the engine: a full 32-bit result returned
  // from a call that is not inlined becomes a heap-allocated number.
  return (h ^ (h >>> 16)) >>> (32 - HASH_BITS);
}

/** Bits of hash3's result. */
const HASH_BITS = 30;

/** Default pitch: one millionth of the bounding-box diagonal (keeps cells within int32). */
export function defaultWeldTolerance(min: readonly number[], max: readonly number[]): number {
  const d = Math.hypot(max[0]! - min[0]!, max[1]! - min[1]!, max[2]! - min[2]!);
  return d > 0 ? d * 1e-6 : 1e-9;
}

export function soupBounds(p: Float32Array): { min: [number, number, number]; max: [number, number, number] } {
  const min: [number, number, number] = [Infinity, Infinity, Infinity];
  const max: [number, number, number] = [-Infinity, -Infinity, -Infinity];
  for (let i = 0; i < p.length; i += 3) {
    for (let a = 0; a < 3; a++) {
      const v = p[i + a]!;
      if (v < min[a]!) min[a] = v;
      if (v > max[a]!) max[a] = v;
    }
  }
  return { min, max };
}

export function weld(soup: TriangleSoup, tolerance?: number): IndexedMesh {
  const n = Math.floor(soup.positions.length / 9);
  if (n === 0) return { vertices: new Float32Array(0), indices: new Uint32Array(0) };
  const { min, max } = soupBounds(soup.positions);
  const w = new Welder(n);
  w.addRange(soup.positions, 0, 9, n, 0);
  return w.result({ min, max, tolerance: tolerance ?? defaultWeldTolerance(min, max) });
}
