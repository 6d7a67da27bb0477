/**
 * Automatic repair of the common mesh faults, as a new soup:
 *  1. weld (lib/mesh `weld`), then drop zero-area faces (a repeated corner, or corners in a line
 *     within float32 precision) and duplicate faces (the same three corners in any order);
 *  2. orient consistently: a walk over each connected piece turns every face to agree with the
 *     neighbour it was reached from across an edge shared by exactly two faces;
 *  3. close small holes: each loop of open edges with at most `maxHoleEdges` edges is filled with a
 *     fan of faces wound to match its rim;
 *  4. turn each closed piece whose signed volume is negative inside out (its faces pointed in),
 *     unless it lies inside another piece: then it is a hollow and pointing in is right.
 * What it cannot repair (edges shared by three or more faces, larger holes, solid pieces inside
 * each other) it reports, so the caller can say so. Plain maps and arrays: a repair is an explicit
 * action on one part, not the upload's hot path.
 */
import { MAX_NESTING_PIECES, rayCrossings } from "./shells";
import { weld } from "./weld";
import type { IndexedMesh, TriangleSoup } from "./types";

export interface RepairReport {
  zeroAreaDropped: number;
  duplicatesDropped: number;
  facesFlipped: number;
  holesClosed: number;
  facesAdded: number;
  /** Open-edge loops left open (longer than the limit, or running through a pinched vertex). */
  holesLeft: number;
  piecesTurnedOut: number;
  /** Separate closed pieces, and how many solid ones lie inside another (left as they are). */
  pieces: number;
  piecesInside: number;
}

export interface RepairOptions {
  /** Largest hole closed, in edges around its rim. Default 64. */
  maxHoleEdges?: number;
}

export const DEFAULT_MAX_HOLE_EDGES = 64;

const ZERO_SIN2 = 2 ** -46; // the zero-area test of lib/mesh's single pass (float32 epsilon squared)

function isZeroArea(v: Float32Array, a: number, b: number, c: number): boolean {
  const ax = v[3 * a]!, ay = v[3 * a + 1]!, az = v[3 * a + 2]!;
  const e1x = v[3 * b]! - ax, e1y = v[3 * b + 1]! - ay, e1z = v[3 * b + 2]! - az;
  const e2x = v[3 * c]! - ax, e2y = v[3 * c + 1]! - ay, e2z = v[3 * c + 2]! - az;
  const nx = e1y * e2z - e1z * e2y, ny = e1z * e2x - e1x * e2z, nz = e1x * e2y - e1y * e2x;
  return nx * nx + ny * ny + nz * nz <= ZERO_SIN2 * (e1x * e1x + e1y * e1y + e1z * e1z) * (e2x * e2x + e2y * e2y + e2z * e2z);
}

/** Vertex ids below 2^26 keep a·2^26 + b an exact double. */
const EDGE_BASE = 2 ** 26;
const edgeKey = (a: number, b: number) => (a < b ? a * EDGE_BASE + b : b * EDGE_BASE + a);

/** Half-edges by undirected edge: face ids using each edge. */
function edgeFaces(tris: Uint32Array[]): Map<number, number[]> {
  const m = new Map<number, number[]>();
  tris.forEach((t, f) => {
    for (let k = 0; k < 3; k++) {
      const key = edgeKey(t[k]!, t[(k + 1) % 3]!);
      const l = m.get(key);
      if (l) l.push(f);
      else m.set(key, [f]);
    }
  });
  return m;
}

/** Does face t traverse a→b (as opposed to b→a)? */
function runs(t: Uint32Array, a: number, b: number): boolean {
  return (t[0] === a && t[1] === b) || (t[1] === a && t[2] === b) || (t[2] === a && t[0] === b);
}

function flip(t: Uint32Array): void {
  const x = t[1]!;
  t[1] = t[2]!;
  t[2] = x;
}

function signedVolume(v: Float32Array, tris: Uint32Array[], faces: number[]): number {
  let s = 0;
  for (const f of faces) {
    const t = tris[f]!;
    const a = 3 * t[0]!, b = 3 * t[1]!, c = 3 * t[2]!;
    s += v[a]! * (v[b + 1]! * v[c + 2]! - v[b + 2]! * v[c + 1]!) + v[a + 1]! * (v[b + 2]! * v[c]! - v[b]! * v[c + 2]!) + v[a + 2]! * (v[b]! * v[c + 1]! - v[b + 1]! * v[c]!);
  }
  return s / 6;
}

/** Orient each piece by a walk across two-face edges; returns the pieces (face lists) and faces flipped. */
function orient(tris: Uint32Array[]): { pieces: number[][]; flipped: number } {
  const edges = edgeFaces(tris);
  const seen = new Uint8Array(tris.length);
  const pieces: number[][] = [];
  let flipped = 0;
  for (let s = 0; s < tris.length; s++) {
    if (seen[s]) continue;
    seen[s] = 1;
    const piece = [s];
    const stack = [s];
    while (stack.length) {
      const f = stack.pop()!;
      const t = tris[f]!;
      for (let k = 0; k < 3; k++) {
        const a = t[k]!, b = t[(k + 1) % 3]!;
        const users = edges.get(edgeKey(a, b))!;
        for (const g of users) {
          if (g === f || seen[g]) continue;
          seen[g] = 1;
          piece.push(g);
          stack.push(g);
          // Across a two-face edge the neighbour must run b→a; an edge of three or more faces is not followed for orientation.
          if (users.length === 2 && runs(tris[g]!, a, b)) {
            flip(tris[g]!);
            flipped++;
          }
        }
      }
    }
    pieces.push(piece);
  }
  return { pieces, flipped };
}

/** Close open-edge loops of at most maxEdges edges with fans; returns faces added, loops closed and left. */
function closeHoles(tris: Uint32Array[], maxEdges: number): { closed: number; left: number; added: Uint32Array[] } {
  const edges = edgeFaces(tris);
  // The rim of a hole runs against its faces: a boundary half-edge a→b becomes b→a in the patch.
  const next = new Map<number, number>();
  const pinched = new Set<number>();
  for (const [key, users] of edges) {
    if (users.length !== 1) continue;
    const t = tris[users[0]!]!;
    const lo = Math.floor(key / EDGE_BASE), hi = key % EDGE_BASE;
    const [a, b] = runs(t, lo, hi) ? [lo, hi] : [hi, lo];
    if (next.has(b)) pinched.add(b);
    next.set(b, a);
  }
  const added: Uint32Array[] = [];
  const done = new Set<number>();
  let closed = 0, left = 0;
  for (const start of next.keys()) {
    if (done.has(start)) continue;
    const loop = [start];
    done.add(start);
    let v = next.get(start)!;
    let ok = !pinched.has(start);
    while (v !== start && loop.length <= maxEdges + 1) {
      if (done.has(v) || pinched.has(v) || !next.has(v)) { ok = false; break; }
      loop.push(v);
      done.add(v);
      v = next.get(v)!;
    }
    if (!ok || v !== start || loop.length > maxEdges || loop.length < 3) {
      // Mark the rest of this rim so it is counted once.
      let w = next.get(v);
      while (w !== undefined && !done.has(w)) { done.add(w); w = next.get(w); }
      left++;
      continue;
    }
    for (let i = 1; i + 1 < loop.length; i++) added.push(Uint32Array.of(loop[0]!, loop[i]!, loop[i + 1]!));
    closed++;
  }
  return { closed, left, added };
}

/** Repairs what it can; the returned soup is new memory. */
export function repairMesh(soup: TriangleSoup, opts: RepairOptions = {}): { soup: TriangleSoup; mesh: IndexedMesh; report: RepairReport } {
  const maxHoleEdges = opts.maxHoleEdges ?? DEFAULT_MAX_HOLE_EDGES;
  const welded = weld(soup);
  const v = welded.vertices;
  const ix = welded.indices;
  const report: RepairReport = { zeroAreaDropped: 0, duplicatesDropped: 0, facesFlipped: 0, holesClosed: 0, facesAdded: 0, holesLeft: 0, piecesTurnedOut: 0, pieces: 0, piecesInside: 0 };
  const tris: Uint32Array[] = [];
  const seenFaces = new Set<string>();
  for (let t = 0; t + 2 < ix.length; t += 3) {
    const a = ix[t]!, b = ix[t + 1]!, c = ix[t + 2]!;
    if (a === b || b === c || a === c || isZeroArea(v, a, b, c)) { report.zeroAreaDropped++; continue; }
    const key = [a, b, c].sort((x, y) => x - y).join(",");
    if (seenFaces.has(key)) { report.duplicatesDropped++; continue; }
    seenFaces.add(key);
    tris.push(Uint32Array.of(a, b, c));
  }
  const original = tris.map((t) => Uint32Array.from(t));
  orient(tris);
  const holes = closeHoles(tris, maxHoleEdges);
  report.holesClosed = holes.closed;
  report.holesLeft = holes.left;
  report.facesAdded = holes.added.length;
  tris.push(...holes.added);
  // Orient again so the patches and any piece they joined agree, then turn inward pieces out.
  const { pieces } = orient(tris);
  report.pieces = pieces.length;
  const inside = insideCounts(v, tris, pieces);
  pieces.forEach((piece, i) => {
    const vol = signedVolume(v, tris, piece);
    if (inside[i]! > 0) {
      if (vol > 0) report.piecesInside++;
      return;
    }
    if (vol < 0) {
      for (const f of piece) flip(tris[f]!);
      report.piecesTurnedOut++;
    }
  });
  report.facesFlipped = original.filter((o, f) => !runs(tris[f]!, o[0]!, o[1]!)).length;
  const indices = new Uint32Array(tris.length * 3);
  tris.forEach((t, i) => indices.set(t, 3 * i));
  const positions = new Float32Array(indices.length * 3);
  for (let i = 0; i < indices.length; i++) positions.set(v.subarray(3 * indices[i]!, 3 * indices[i]! + 3), 3 * i);
  return { soup: { positions }, mesh: { vertices: v, indices }, report };
}

/** For each piece, how many other pieces contain its first corner (ray parity, lib/mesh/shells). */
function insideCounts(v: Float32Array, tris: Uint32Array[], pieces: number[][]): number[] {
  const out = pieces.map(() => 0);
  if (pieces.length < 2 || pieces.length > MAX_NESTING_PIECES) return out;
  const flat = new Uint32Array(tris.length * 3);
  tris.forEach((t, f) => flat.set(t, 3 * f));
  pieces.forEach((p, i) => {
    const c = tris[p[0]!]![0]! * 3;
    const o = [v[c]!, v[c + 1]!, v[c + 2]!] as const;
    pieces.forEach((q, j) => {
      if (i !== j && rayCrossings(v, flat, q, o) % 2 === 1) out[i]!++;
    });
  });
  return out;
}
