import type { IndexedMesh, TriangleSoup } from "./types";

/**
 * Welding: vertices whose coordinates fall in the same cell of a grid of pitch `tolerance` become
 * one. Cells are hashed into an open-addressing table of Int32 vertex ids (linear probing), the
 * quantised cell kept beside each vertex so a probe compares three integers. Bit-identical
 * coordinates always weld; two points closer than the pitch but in neighbouring cells do not.
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

  constructor(triangles: number, origin: [number, number, number], tolerance: number) {
    this.inv = 1 / tolerance;
    [this.ox, this.oy, this.oz] = origin;
    // Closed meshes have about half as many vertices as triangles; start there and grow.
    const cap = Math.max(16, (triangles >>> 1) + 16);
    let size = 32;
    while (size < cap * 2) size *= 2;
    this.table = new Int32Array(size).fill(-1);
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
      const t = new Int32Array(size).fill(-1);
      const m = size - 1;
      for (let id = 0; id < this.count; id++) {
        let h = hash3(q[3 * id]!, q[3 * id + 1]!, q[3 * id + 2]!) & m;
        while (t[h] !== -1) h = (h + 1) & m;
        t[h] = id;
      }
      this.table = t;
      this.mask = m;
    }
  }

  /**
   * A small direct-mapped cache of recently seen cells sits in front of the big table: consecutive
   * triangles share vertices, so most lookups hit it and never touch the big table (whose random
   * accesses cost a cache miss each).
   */
  private readonly recent = new Int32Array(RECENT * 4).fill(-1);

  /** Weld `count` triangles read from f at base + k·stride (9 floats each); triangle = tri0 + k·triStep. */
  addRange(f: Float32Array, base: number, stride: number, count: number, tri0: number, triStep: number): void {
    const inv = this.inv, ox = this.ox, oy = this.oy, oz = this.oz, idx = this.indices, rc = this.recent;
    let table = this.table, mask = this.mask, q = this.q, verts = this.vertices;
    for (let k = 0, p = base, t = tri0; k < count; k++, p += stride, t += triStep) {
      for (let c = 0; c < 3; c++) {
        const x = f[p + 3 * c]!, y = f[p + 3 * c + 1]!, z = f[p + 3 * c + 2]!;
        const qx = Math.round((x - ox) * inv), qy = Math.round((y - oy) * inv), qz = Math.round((z - oz) * inv);
        const hh = hash3(qx, qy, qz);
        const r4 = ((hh >>> 17) & (RECENT - 1)) << 2;
        if (rc[r4] === qx && rc[r4 + 1] === qy && rc[r4 + 2] === qz && rc[r4 + 3]! >= 0) {
          idx[3 * t + c] = rc[r4 + 3]!;
          continue;
        }
        let h = hh & mask;
        let id = table[h]!;
        while (id !== -1) {
          const r = 3 * id;
          if (q[r] === qx && q[r + 1] === qy && q[r + 2] === qz) break;
          h = (h + 1) & mask;
          id = table[h]!;
        }
        if (id === -1) {
          if (3 * this.count + 3 > q.length) {
            this.grow();
            table = this.table; mask = this.mask; q = this.q; verts = this.vertices;
            h = hh & mask;
            while (table[h] !== -1) h = (h + 1) & mask;
          }
          id = this.count++;
          table[h] = id;
          const r = 3 * id;
          q[r] = qx; q[r + 1] = qy; q[r + 2] = qz;
          verts[r] = x; verts[r + 1] = y; verts[r + 2] = z;
        }
        rc[r4] = qx; rc[r4 + 1] = qy; rc[r4 + 2] = qz; rc[r4 + 3] = id;
        idx[3 * t + c] = id;
      }
    }
  }

  result(): IndexedMesh {
    return { vertices: this.vertices.slice(0, this.count * 3), indices: this.indices };
  }
}

const RECENT = 1 << 15;

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
  const w = new Welder(n, min, tolerance ?? defaultWeldTolerance(min, max));
  w.addRange(soup.positions, 0, 9, n, 0, 1);
  return w.result();
}
