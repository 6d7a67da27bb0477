import type { IndexedMesh, TriangleSoup } from "./types";

/**
 * Welding: vertices whose coordinates fall in the same cell of a grid of pitch `tolerance` become
 * one. Coordinates are quantised once to non-negative integer cells (offset from the bounding-box
 * minimum, rounded half up), hashed with a multiply-xorshift mix into a power-of-two open-addressing
 * table of Int32 vertex ids + 1 (0 = empty, linear probing); each vertex keeps its three cell ints,
 * so a probe compares integers, never floats. Bit-identical coordinates always weld; two points
 * closer than the pitch but in neighbouring cells do not. When the model spans more than 2^30
 * cells along an axis the pitch is widened to fit (so cells stay exact int32 and duplicates still
 * weld). Vertex ids follow first appearance in the input.
 */
export class Welder {
  private readonly inv: number;
  private readonly ox: number;
  private readonly oy: number;
  private readonly oz: number;
  private table: Int32Array;
  private mask: number;
  private q: Int32Array;
  vertices: Float32Array;
  count = 0;
  readonly indices: Uint32Array;
  /**
   * A direct-mapped cache of recently seen cells' ids sits in front of the big table: consecutive
   * triangles share vertices, so most lookups hit it (128 KB, in cache) and never touch the big
   * table, whose random accesses cost a cache miss each. A hit is confirmed against q.
   */
  private readonly recent = new Int32Array(RECENT).fill(-1);

  constructor(triangles: number, min: readonly number[], max: readonly number[], tolerance: number) {
    const span = Math.max(max[0]! - min[0]!, max[1]! - min[1]!, max[2]! - min[2]!, 0);
    const pitch = Math.max(tolerance, span / 2 ** 30);
    this.inv = 1 / pitch;
    this.ox = min[0]!; this.oy = min[1]!; this.oz = min[2]!;
    // Closed meshes have about half as many vertices as triangles; start there and grow.
    const cap = Math.max(16, (triangles >>> 1) + 16);
    let size = 32;
    while (size < cap * 2) size *= 2;
    this.table = new Int32Array(size);
    this.mask = size - 1;
    this.q = new Int32Array(cap * 3);
    this.vertices = new Float32Array(cap * 3);
    this.indices = new Uint32Array(triangles * 3);
  }

  private grow(): void {
    const cap = (this.q.length / 3) * 2;
    const q = new Int32Array(cap * 3);
    q.set(this.q);
    this.q = q;
    const v = new Float32Array(cap * 3);
    v.set(this.vertices);
    this.vertices = v;
    if (this.table.length < cap * 2) {
      const size = this.table.length * 2;
      const t = new Int32Array(size);
      const m = size - 1;
      for (let id = 0; id < this.count; id++) {
        let h = hash3(q[3 * id]!, q[3 * id + 1]!, q[3 * id + 2]!) & m;
        while (t[h] !== 0) h = (h + 1) & m;
        t[h] = id + 1;
      }
      this.table = t;
      this.mask = m;
    }
  }

  /** Weld `count` triangles read from f at base + k·stride (9 floats each); triangle = tri0 + k·triStep. */
  addRange(f: Float32Array, base: number, stride: number, count: number, tri0: number, triStep: number): void {
    const inv = this.inv, ox = this.ox, oy = this.oy, oz = this.oz, idx = this.indices, rc = this.recent;
    let table = this.table, mask = this.mask, q = this.q, verts = this.vertices, n = this.count;
    for (let k = 0, p = base, o = 3 * tri0; k < count; k++, p += stride, o += 3 * triStep) {
      for (let c = 0; c < 3; c++) {
        const x = f[p + 3 * c]!, y = f[p + 3 * c + 1]!, z = f[p + 3 * c + 2]!;
        // Offsets from the minimum are ≥ 0, so truncating v + 0.5 rounds half up (as Math.round).
        const qx = ((x - ox) * inv + 0.5) | 0, qy = ((y - oy) * inv + 0.5) | 0, qz = ((z - oz) * inv + 0.5) | 0;
        const hh = hash3(qx, qy, qz);
        const r = hh >>> RECENT_SHIFT;
        let id = rc[r]!;
        if (id >= 0 && q[3 * id] === qx && q[3 * id + 1] === qy && q[3 * id + 2] === qz) {
          idx[o + c] = id;
          continue;
        }
        let h = hh & mask;
        let e = table[h]!;
        while (e !== 0) {
          const j = 3 * e - 3;
          if (q[j] === qx && q[j + 1] === qy && q[j + 2] === qz) break;
          h = (h + 1) & mask;
          e = table[h]!;
        }
        if (e === 0) {
          if (3 * n + 3 > q.length) {
            this.count = n;
            this.grow();
            table = this.table; mask = this.mask; q = this.q; verts = this.vertices;
            h = hh & mask;
            while (table[h] !== 0) h = (h + 1) & mask;
          }
          id = n++;
          table[h] = id + 1;
          const j = 3 * id;
          q[j] = qx; q[j + 1] = qy; q[j + 2] = qz;
          verts[j] = x; verts[j + 1] = y; verts[j + 2] = z;
        } else id = e - 1;
        rc[r] = id;
        idx[o + c] = id;
      }
    }
    this.count = n;
  }

  result(): IndexedMesh {
    return { vertices: this.vertices.slice(0, this.count * 3), indices: this.indices };
  }
}

const RECENT_BITS = 15;
const RECENT = 1 << RECENT_BITS;
const RECENT_SHIFT = 32 - RECENT_BITS;

function hash3(x: number, y: number, z: number): number {
  let h = Math.imul(x, 0x9e3779b1) ^ Math.imul(y, 0x85ebca77) ^ Math.imul(z, 0xc2b2ae3d);
  h ^= h >>> 15;
  return Math.imul(h, 0x2c1b3c6d) ^ (h >>> 12);
}

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
  const w = new Welder(n, min, max, tolerance ?? defaultWeldTolerance(min, max));
  w.addRange(soup.positions, 0, 9, n, 0, 1);
  return w.result();
}
