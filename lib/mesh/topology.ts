import type { IndexedMesh } from "./types";
import type { CensusStart } from "./weld";

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
 * Edge census by a counting sort of half-edges on their lower vertex id (a CSR layout), then a
 * scan of each vertex's short list. Welded ids follow first appearance in the file, so ids of
 * neighbouring triangles are close and the sort's writes stay local: no hash-table cache misses.
 * Each entry packs the higher vertex id and the direction: 2·hi + (from > to). Triangles with a
 * repeated vertex add no edges.
 *
 * The counting half (offsets per vertex, degenerate triangles) can come from the weld, which
 * computes it in the pass that writes the final ids (`Welder.result({ census: true })`); without
 * it, it is computed here, with the zero-area test on the welded coordinates.
 */
export function topology(mesh: IndexedMesh, census?: CensusStart): Topology {
  const idx = mesh.indices;
  const nv = Math.floor(mesh.vertices.length / 3);
  const nt = Math.floor(idx.length / 3);
  const ix = new Int32Array(idx.buffer, idx.byteOffset, 3 * nt);
  const { start, degenerate, scratch, scratch2 } = census ?? countHalfEdges(mesh);
  const fill = scratch2.length >= nv ? scratch2 : new Int32Array(nv);
  const entry = scratch.length >= start[nv]! ? scratch : new Int32Array(start[nv]!);
  fillHalfEdges(ix, start, nv, fill, entry);
  const counts = new Int32Array(3); // boundary, non-manifold, inconsistent
  scanEdges(start, nv, entry, counts);
  const boundary = counts[0]!, nonManifold = counts[1]!, inconsistent = counts[2]!;
  return {
    boundaryEdges: boundary,
    nonManifoldEdges: nonManifold,
    inconsistentEdges: inconsistent,
    degenerateTriangles: degenerate,
    watertight: nt > 0 && boundary === 0 && nonManifold === 0 && inconsistent === 0,
  };
}

// One function per long loop, so that each is optimised on its own (see weld.ts).

/** Place each live triangle's half-edges in their lower vertex's slots: entry = 2·hi + (from > to). */
function fillHalfEdges(ix: Int32Array, start: Uint32Array, nv: number, fill: Int32Array, entry: Int32Array): void {
  for (let i = 0; i < nv; i++) fill[i] = start[i]!;
  for (let o = 0; o < ix.length; o += 3) {
    const a = ix[o]!, b = ix[o + 1]!, c = ix[o + 2]!;
    if (a === b || b === c || a === c) continue;
    // Branch-free: d = −1 when the edge runs from the higher id, m moves the lower end into place.
    let d = (b - a) >> 31, m = (b - a) & d;
    entry[fill[a + m]!++] = 2 * (b - m) - d;
    d = (c - b) >> 31; m = (c - b) & d;
    entry[fill[b + m]!++] = 2 * (c - m) - d;
    d = (a - c) >> 31; m = (a - c) & d;
    entry[fill[c + m]!++] = 2 * (a - m) - d;
  }
}

/** Per vertex: insertion sort of its short list, then each run of equal hi is one edge; counts go to out[0..2]. */
function scanEdges(start: Uint32Array, nv: number, entry: Int32Array, out: Int32Array): void {
  let boundary = 0, nonManifold = 0, inconsistent = 0;
  for (let lo = 0; lo < nv; lo++) {
    const s = start[lo]!, e = start[lo + 1]!;
    for (let i = s + 1; i < e; i++) {
      const x = entry[i]!;
      let j = i - 1;
      while (j >= s && entry[j]! > x) { entry[j + 1] = entry[j]!; j--; }
      entry[j + 1] = x;
    }
    for (let i = s; i < e; ) {
      const hi = entry[i]! >>> 1;
      let f = 0, b = 0;
      while (i < e && entry[i]! >>> 1 === hi) { b += entry[i]! & 1; f++; i++; }
      // f counts all half-edges here, b the ones running from the higher id.
      if (f === 1) boundary++;
      else if (f > 2) nonManifold++;
      else if (b !== 1) inconsistent++;
    }
  }
  out[0] = boundary; out[1] = nonManifold; out[2] = inconsistent;
}

/** Offsets of each vertex's owned half-edges and the degenerate count, from an indexed mesh alone. */
function countHalfEdges(mesh: IndexedMesh): CensusStart {
  const idx = mesh.indices, v = mesh.vertices;
  const nv = Math.floor(v.length / 3);
  const nt = Math.floor(idx.length / 3);
  const start = new Uint32Array(nv + 1);
  let ext = 0;
  for (let i = 0; i < v.length; i++) { const a = Math.abs(v[i]!); if (a > ext) ext = a; }
  const areaEps = (ext * ext + 1e-30) * 1e-14; // zero-area test relative to the model's scale
  let degenerate = 0;
  for (let t = 0; t < nt; t++) {
    const a = idx[3 * t]!, b = idx[3 * t + 1]!, c = idx[3 * t + 2]!;
    if (a === b || b === c || a === c) { degenerate++; continue; }
    const e1x = v[3 * b]! - v[3 * a]!, e1y = v[3 * b + 1]! - v[3 * a + 1]!, e1z = v[3 * b + 2]! - v[3 * a + 2]!;
    const e2x = v[3 * c]! - v[3 * a]!, e2y = v[3 * c + 1]! - v[3 * a + 1]!, e2z = v[3 * c + 2]! - v[3 * a + 2]!;
    const nx = e1y * e2z - e1z * e2y, ny = e1z * e2x - e1x * e2z, nz = e1x * e2y - e1y * e2x;
    if (Math.sqrt(nx * nx + ny * ny + nz * nz) <= areaEps) degenerate++;
    start[(a < b ? a : b) + 1]!++;
    start[(b < c ? b : c) + 1]!++;
    start[(c < a ? c : a) + 1]!++;
  }
  for (let i = 0; i < nv; i++) start[i + 1]! += start[i]!;
  return { start, degenerate, scratch: new Int32Array(start[nv]!), scratch2: new Int32Array(nv) };
}
