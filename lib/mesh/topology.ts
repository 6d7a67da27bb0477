import type { IndexedMesh } from "./types";

export interface Topology {
  /** Edges used by exactly one triangle. */
  boundaryEdges: number;
  /** Edges shared by more than two triangles. */
  nonManifoldEdges: number;
  /** Edges shared by two triangles that traverse it in the same direction (flipped neighbour). */
  inconsistentEdges: number;
  /** Triangles with a repeated vertex or zero area. */
  degenerateTriangles: number;
  /** Closed, manifold and consistently oriented: the signed volume can be trusted. */
  watertight: boolean;
}

/**
 * Edge census in one hash table keyed by the undirected edge (lo, hi). A slot stores the first
 * half-edge id (3·triangle + corner) seen for that edge, so the key is re-read from the index
 * array instead of being stored; two saturating byte counters hold uses lo→hi and hi→lo.
 */
export function topology(mesh: IndexedMesh): Topology {
  const idx = mesh.indices;
  const v = mesh.vertices;
  const nt = Math.floor(idx.length / 3);
  let size = 32;
  while (size < nt * 3) size *= 2; // ≈1.5·nt distinct edges → load below 0.5
  const mask = size - 1;
  const slot = new Int32Array(size).fill(-1);
  const fwd = new Uint8Array(size);
  const bwd = new Uint8Array(size);
  let degenerate = 0;
  let used = 0;
  // Zero-area test relative to the model's scale.
  let ext = 0;
  for (let i = 0; i < v.length; i++) { const a = Math.abs(v[i]!); if (a > ext) ext = a; }
  const areaEps = (ext * ext + 1e-30) * 1e-14;
  for (let t = 0; t < nt; t++) {
    const a = idx[3 * t]!, b = idx[3 * t + 1]!, c = idx[3 * t + 2]!;
    if (a === b || b === c || a === c) { degenerate++; continue; }
    const e1x = v[3 * b]! - v[3 * a]!, e1y = v[3 * b + 1]! - v[3 * a + 1]!, e1z = v[3 * b + 2]! - v[3 * a + 2]!;
    const e2x = v[3 * c]! - v[3 * a]!, e2y = v[3 * c + 1]! - v[3 * a + 1]!, e2z = v[3 * c + 2]! - v[3 * a + 2]!;
    const nx = e1y * e2z - e1z * e2y, ny = e1z * e2x - e1x * e2z, nz = e1x * e2y - e1y * e2x;
    if (Math.sqrt(nx * nx + ny * ny + nz * nz) <= areaEps) degenerate++;
    for (let k = 0; k < 3; k++) {
      const from = idx[3 * t + k]!, to = idx[3 * t + (k === 2 ? 0 : k + 1)]!;
      const lo = from < to ? from : to, hi = from < to ? to : from;
      let h = (Math.imul(lo, 0x9e3779b1) ^ Math.imul(hi, 0x85ebca77)) >>> 0;
      h = (h ^ (h >>> 16)) & mask;
      for (;;) {
        const s = slot[h]!;
        if (s === -1) { slot[h] = 3 * t + k; used++; break; }
        const sf = idx[s]!, st = idx[s - (s % 3) + (s % 3 === 2 ? 0 : (s % 3) + 1)]!;
        if ((sf === lo && st === hi) || (sf === hi && st === lo)) break;
        h = (h + 1) & mask;
      }
      if (from === lo) { const f = fwd[h]!; if (f < 255) fwd[h] = f + 1; } else { const b = bwd[h]!; if (b < 255) bwd[h] = b + 1; }
    }
  }
  let boundary = 0, nonManifold = 0, inconsistent = 0;
  for (let h = 0; h < size && used > 0; h++) {
    if (slot[h] === -1) continue;
    used--;
    const f = fwd[h]!, b = bwd[h]!, n = f + b;
    if (n === 1) boundary++;
    else if (n > 2) nonManifold++;
    else if (f !== 1) inconsistent++;
  }
  return {
    boundaryEdges: boundary,
    nonManifoldEdges: nonManifold,
    inconsistentEdges: inconsistent,
    degenerateTriangles: degenerate,
    watertight: nt > 0 && boundary === 0 && nonManifold === 0 && inconsistent === 0,
  };
}
