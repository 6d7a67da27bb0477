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
  /** Open-addressing table, 4 ints a slot: the cell's qx, qy, qz and its vertex id + 1 (0 = empty). */
  private table: Int32Array;
  private mask: number;
  vertices: Float32Array;
  count = 0;
  readonly indices: Uint32Array;
  /**
   * A direct-mapped cache of recently seen cells sits in front of the big table, holding the
   * cell's three ints beside its id + 1 so that a hit reads nothing else: consecutive triangles
   * share vertices, so most lookups end here (512 KB, in cache) and never pay the big table's
   * random access. The table keeps its keys in the slot too, so a probe costs one cache miss.
   */
  private readonly recent = new Int32Array(RECENT * 4);

  constructor(triangles: number, min: readonly number[], max: readonly number[], tolerance: number) {
    const span = Math.max(max[0]! - min[0]!, max[1]! - min[1]!, max[2]! - min[2]!, 0);
    const pitch = Math.max(tolerance, span / 2 ** 30);
    this.inv = 1 / pitch;
    this.ox = min[0]!; this.oy = min[1]!; this.oz = min[2]!;
    // Closed meshes have about half as many vertices as triangles; start there and grow.
    const cap = Math.max(16, (triangles >>> 1) + 16);
    let size = 32;
    while (size < cap * 2) size *= 2;
    this.table = new Int32Array(size * 4);
    this.mask = size - 1;
    this.vertices = new Float32Array(cap * 3);
    this.indices = new Uint32Array(triangles * 3);
  }

  private grow(): void {
    const cap = (this.vertices.length / 3) * 2;
    const v = new Float32Array(cap * 3);
    v.set(this.vertices);
    this.vertices = v;
    const old = this.table;
    if (old.length / 4 < cap * 2) {
      const size = (old.length / 4) * 2;
      const t = new Int32Array(size * 4);
      const m = size - 1;
      for (let s = 0; s < old.length; s += 4) {
        if (old[s + 3] === 0) continue;
        let h = hash3(old[s]!, old[s + 1]!, old[s + 2]!) & m;
        while (t[4 * h + 3] !== 0) h = (h + 1) & m;
        t.set(old.subarray(s, s + 4), 4 * h);
      }
      this.table = t;
      this.mask = m;
    }
  }

  /** Weld `count` triangles read from f at base + k·stride (9 floats each); triangle = tri0 + k·triStep. */
  addRange(f: Float32Array, base: number, stride: number, count: number, tri0: number, triStep: number): void {
    const inv = this.inv, ox = this.ox, oy = this.oy, oz = this.oz, idx = this.indices, rc = this.recent;
    let table = this.table, mask = this.mask, verts = this.vertices, n = this.count;
    for (let k = 0, p = base, o = 3 * tri0; k < count; k++, p += stride, o += 3 * triStep) {
      for (let c = 0; c < 3; c++) {
        const x = f[p + 3 * c]!, y = f[p + 3 * c + 1]!, z = f[p + 3 * c + 2]!;
        // Offsets from the minimum are ≥ 0, so truncating v + 0.5 rounds half up (as Math.round).
        const qx = ((x - ox) * inv + 0.5) | 0, qy = ((y - oy) * inv + 0.5) | 0, qz = ((z - oz) * inv + 0.5) | 0;
        const hh = hash3(qx, qy, qz);
        const r = (hh >>> RECENT_SHIFT) << 2;
        if (rc[r + 3] !== 0 && rc[r] === qx && rc[r + 1] === qy && rc[r + 2] === qz) {
          idx[o + c] = rc[r + 3]! - 1;
          continue;
        }
        let h = hh & mask;
        let s = h << 2;
        let e = table[s + 3]!;
        while (e !== 0) {
          if (table[s] === qx && table[s + 1] === qy && table[s + 2] === qz) break;
          h = (h + 1) & mask;
          s = h << 2;
          e = table[s + 3]!;
        }
        let id: number;
        if (e === 0) {
          if (3 * n + 3 > verts.length) {
            this.count = n;
            this.grow();
            table = this.table; mask = this.mask; verts = this.vertices;
            h = hh & mask;
            while (table[(h << 2) + 3] !== 0) h = (h + 1) & mask;
            s = h << 2;
          }
          id = n++;
          table[s] = qx; table[s + 1] = qy; table[s + 2] = qz; table[s + 3] = id + 1;
          const j = 3 * id;
          verts[j] = x; verts[j + 1] = y; verts[j + 2] = z;
        } else id = e - 1;
        rc[r] = qx; rc[r + 1] = qy; rc[r + 2] = qz; rc[r + 3] = id + 1;
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
