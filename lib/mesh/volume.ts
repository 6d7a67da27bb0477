/**
 * Signed volume of an indexed mesh, V = (1/6) Σ a·(b × c) over its triangles (divergence theorem;
 * Mirtich 1996), without expanding it into a soup. Positive for a closed mesh wound
 * counter-clockwise seen from outside.
 */
import type { IndexedMesh } from "./types";

export function indexedVolume(mesh: IndexedMesh): number {
  const v = mesh.vertices, ix = mesh.indices;
  let s = 0;
  for (let t = 0; t + 2 < ix.length; t += 3) {
    const a = ix[t]! * 3, b = ix[t + 1]! * 3, c = ix[t + 2]! * 3;
    const ax = v[a]!, ay = v[a + 1]!, az = v[a + 2]!;
    const bx = v[b]!, by = v[b + 1]!, bz = v[b + 2]!;
    const cx = v[c]!, cy = v[c + 1]!, cz = v[c + 2]!;
    s += ax * (by * cz - bz * cy) + ay * (bz * cx - bx * cz) + az * (bx * cy - by * cx);
  }
  return s / 6;
}

/** Drops triangles that use one vertex twice (a closed-solid library such as manifold-3d rejects them). */
export function withoutRepeatedCorners(mesh: IndexedMesh): IndexedMesh {
  const ix = mesh.indices;
  const out = new Uint32Array(ix.length);
  let m = 0;
  for (let t = 0; t + 2 < ix.length; t += 3) {
    const a = ix[t]!, b = ix[t + 1]!, c = ix[t + 2]!;
    if (a === b || b === c || a === c) continue;
    out[m++] = a;
    out[m++] = b;
    out[m++] = c;
  }
  return m === ix.length ? mesh : { vertices: mesh.vertices, indices: out.slice(0, m) };
}
