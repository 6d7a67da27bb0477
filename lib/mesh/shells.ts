/**
 * Separate pieces of a closed mesh and whether a solid piece lies inside another (ray parity from
 * one corner of each piece, Möller–Trumbore). A piece inside another with its faces pointing out is
 * printed merged with it and counts its volume twice; one pointing in is a hollow and is fine.
 */
import type { IndexedMesh } from "./types";

function find(parent: Int32Array, i: number): number {
  while (parent[i] !== i) {
    parent[i] = parent[parent[i]!]!;
    i = parent[i]!;
  }
  return i;
}

/** Pieces beyond this many are not checked for nesting. */
export const MAX_NESTING_PIECES = 64;

// A ray direction unlikely to run exactly along an edge or through a vertex of a drawn part.
const RAY = [0.8017837257372732, 0.5345224838248488, 0.2672612419124244] as const;

/** Faces of the listed triangles (indices into mesh.indices / 3) the ray from o crosses. */
export function rayCrossings(v: ArrayLike<number>, ix: ArrayLike<number>, faces: ArrayLike<number>, o: readonly [number, number, number]): number {
  let n = 0;
  const [dx, dy, dz] = RAY;
  for (let k = 0; k < faces.length; k++) {
    const f = faces[k]!;
    const a = 3 * ix[3 * f]!, b = 3 * ix[3 * f + 1]!, c = 3 * ix[3 * f + 2]!;
    const e1x = v[b]! - v[a]!, e1y = v[b + 1]! - v[a + 1]!, e1z = v[b + 2]! - v[a + 2]!;
    const e2x = v[c]! - v[a]!, e2y = v[c + 1]! - v[a + 1]!, e2z = v[c + 2]! - v[a + 2]!;
    const px = dy * e2z - dz * e2y, py = dz * e2x - dx * e2z, pz = dx * e2y - dy * e2x;
    const det = e1x * px + e1y * py + e1z * pz;
    if (Math.abs(det) < 1e-12) continue;
    const inv = 1 / det;
    const sx = o[0] - v[a]!, sy = o[1] - v[a + 1]!, sz = o[2] - v[a + 2]!;
    const u = (sx * px + sy * py + sz * pz) * inv;
    if (u < 0 || u > 1) continue;
    const qx = sy * e1z - sz * e1y, qy = sz * e1x - sx * e1z, qz = sx * e1y - sy * e1x;
    const w = (dx * qx + dy * qy + dz * qz) * inv;
    if (w < 0 || u + w > 1) continue;
    if ((e2x * qx + e2y * qy + e2z * qz) * inv > 1e-9) n++;
  }
  return n;
}

export interface ShellReport {
  pieces: number;
  /** Solid pieces (positive volume) inside another piece. */
  solidInside: number;
  /** False when there were too many pieces to check. */
  checked: boolean;
}

/** Pieces by shared vertices (union-find over the welded mesh), then nesting by ray parity. */
export function shellReport(mesh: IndexedMesh): ShellReport {
  const ix = mesh.indices, v = mesh.vertices;
  const nv = v.length / 3, nt = Math.floor(ix.length / 3);
  const parent = new Int32Array(nv);
  for (let i = 0; i < nv; i++) parent[i] = i;
  for (let t = 0; t < nt; t++) {
    const a = find(parent, ix[3 * t]!), b = find(parent, ix[3 * t + 1]!), c = find(parent, ix[3 * t + 2]!);
    if (a !== b) parent[b] = a;
    const a2 = find(parent, a);
    if (a2 !== find(parent, c)) parent[find(parent, c)] = a2;
  }
  const pieceOf = new Map<number, number[]>();
  for (let t = 0; t < nt; t++) {
    const r = find(parent, ix[3 * t]!);
    const l = pieceOf.get(r);
    if (l) l.push(t);
    else pieceOf.set(r, [t]);
  }
  const pieces = [...pieceOf.values()];
  if (pieces.length < 2) return { pieces: pieces.length, solidInside: 0, checked: true };
  if (pieces.length > MAX_NESTING_PIECES) return { pieces: pieces.length, solidInside: 0, checked: false };
  let solidInside = 0;
  pieces.forEach((p, i) => {
    let vol = 0;
    for (const f of p) {
      const a = 3 * ix[3 * f]!, b = 3 * ix[3 * f + 1]!, c = 3 * ix[3 * f + 2]!;
      vol += v[a]! * (v[b + 1]! * v[c + 2]! - v[b + 2]! * v[c + 1]!) + v[a + 1]! * (v[b + 2]! * v[c]! - v[b]! * v[c + 2]!) + v[a + 2]! * (v[b]! * v[c + 1]! - v[b + 1]! * v[c]!);
    }
    if (vol <= 0) return;
    const c = 3 * ix[3 * p[0]!]!;
    const o = [v[c]!, v[c + 1]!, v[c + 2]!] as const;
    if (pieces.some((q, j) => j !== i && rayCrossings(v, ix, q, o) % 2 === 1)) solidInside++;
  });
  return { pieces: pieces.length, solidInside, checked: true };
}
