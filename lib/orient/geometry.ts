/**
 * Small typed-array helpers the orientation and split code needs: per-facet normals, areas and
 * centroids, welding a soup into an indexed mesh, bounds and volume. Kept in one file so they can
 * be merged with lib/mesh later.
 */
import type { IndexedMesh } from "@/lib/mesh/types";

/** Per-facet data computed once per part; every direction then costs a few dot products. */
export interface FacetData {
  count: number;
  /** Unit outward normals, 3 per facet (zero for degenerate facets). */
  normals: Float64Array;
  /** Facet areas in mm². */
  areas: Float64Array;
  /** Centroids, 3 per facet. */
  centroids: Float64Array;
  totalArea: number;
}

/** Normals from the vertex order (counter-clockwise seen from outside), as the STL description says. */
export function facetData(mesh: IndexedMesh): FacetData {
  const { vertices: v, indices: ix } = mesh;
  const count = Math.floor(ix.length / 3);
  const normals = new Float64Array(count * 3);
  const areas = new Float64Array(count);
  const centroids = new Float64Array(count * 3);
  let totalArea = 0;
  for (let t = 0; t < count; t++) {
    const a = ix[3 * t]! * 3, b = ix[3 * t + 1]! * 3, c = ix[3 * t + 2]! * 3;
    const ax = v[a]!, ay = v[a + 1]!, az = v[a + 2]!;
    const bx = v[b]!, by = v[b + 1]!, bz = v[b + 2]!;
    const cx = v[c]!, cy = v[c + 1]!, cz = v[c + 2]!;
    const ux = bx - ax, uy = by - ay, uz = bz - az;
    const wx = cx - ax, wy = cy - ay, wz = cz - az;
    const nx = uy * wz - uz * wy, ny = uz * wx - ux * wz, nz = ux * wy - uy * wx;
    const len = Math.sqrt(nx * nx + ny * ny + nz * nz);
    if (len > 0) {
      normals[3 * t] = nx / len;
      normals[3 * t + 1] = ny / len;
      normals[3 * t + 2] = nz / len;
    }
    areas[t] = len / 2;
    totalArea += len / 2;
    centroids[3 * t] = (ax + bx + cx) / 3;
    centroids[3 * t + 1] = (ay + by + cy) / 3;
    centroids[3 * t + 2] = (az + bz + cz) / 3;
  }
  return { count, normals, areas, centroids, totalArea };
}

/**
 * Welds identical (within `tolerance` mm) corners of a soup into shared vertices with an
 * open-addressing hash on quantised coordinates. Degenerate facets (two equal corners) are dropped,
 * since a closed-mesh library rejects them.
 */
export function weld(positions: Float32Array, tolerance = 1e-4): IndexedMesh {
  const corners = Math.floor(positions.length / 3);
  let size = 1;
  while (size < corners * 2) size <<= 1;
  const mask = size - 1;
  const table = new Int32Array(size).fill(-1);
  const keys = new Float64Array(corners * 3);
  const out = new Float32Array(corners * 3);
  const remap = new Uint32Array(corners);
  let n = 0;
  const inv = 1 / tolerance;
  for (let i = 0; i < corners; i++) {
    const x = positions[3 * i]!, y = positions[3 * i + 1]!, z = positions[3 * i + 2]!;
    const qx = Math.round(x * inv), qy = Math.round(y * inv), qz = Math.round(z * inv);
    let h = (Math.imul(qx | 0, 73856093) ^ Math.imul(qy | 0, 19349663) ^ Math.imul(qz | 0, 83492791)) & mask;
    for (;;) {
      const slot = table[h]!;
      if (slot < 0) {
        table[h] = n;
        keys[3 * n] = qx;
        keys[3 * n + 1] = qy;
        keys[3 * n + 2] = qz;
        out[3 * n] = x;
        out[3 * n + 1] = y;
        out[3 * n + 2] = z;
        remap[i] = n++;
        break;
      }
      if (keys[3 * slot] === qx && keys[3 * slot + 1] === qy && keys[3 * slot + 2] === qz) {
        remap[i] = slot;
        break;
      }
      h = (h + 1) & mask;
    }
  }
  const tris = Math.floor(corners / 3);
  const indices = new Uint32Array(tris * 3);
  let m = 0;
  for (let t = 0; t < tris; t++) {
    const a = remap[3 * t]!, b = remap[3 * t + 1]!, c = remap[3 * t + 2]!;
    if (a === b || b === c || a === c) continue;
    indices[m++] = a;
    indices[m++] = b;
    indices[m++] = c;
  }
  return { vertices: out.slice(0, n * 3), indices: indices.slice(0, m) };
}

/** Expands an indexed mesh back into a soup (9 floats per triangle). */
export function soupFromIndexed(vertices: ArrayLike<number>, indices: ArrayLike<number>): Float32Array {
  const out = new Float32Array(indices.length * 3);
  for (let i = 0; i < indices.length; i++) {
    const v = indices[i]! * 3;
    out[3 * i] = vertices[v]!;
    out[3 * i + 1] = vertices[v + 1]!;
    out[3 * i + 2] = vertices[v + 2]!;
  }
  return out;
}

export interface Bounds {
  min: [number, number, number];
  max: [number, number, number];
}

export function boundsOf(points: ArrayLike<number>): Bounds {
  const min: [number, number, number] = [Infinity, Infinity, Infinity];
  const max: [number, number, number] = [-Infinity, -Infinity, -Infinity];
  for (let i = 0; i + 2 < points.length; i += 3) {
    for (let k = 0; k < 3; k++) {
      const p = points[i + k]!;
      if (p < min[k]!) min[k] = p;
      if (p > max[k]!) max[k] = p;
    }
  }
  return { min, max };
}

/** Signed volume by the divergence theorem, V = (1/6) Σ a·(b × c) (Mirtich 1996). */
export function soupVolume(p: ArrayLike<number>): number {
  let v = 0;
  for (let i = 0; i + 8 < p.length; i += 9) {
    const ax = p[i]!, ay = p[i + 1]!, az = p[i + 2]!;
    const bx = p[i + 3]!, by = p[i + 4]!, bz = p[i + 5]!;
    const cx = p[i + 6]!, cy = p[i + 7]!, cz = p[i + 8]!;
    v += ax * (by * cz - bz * cy) + ay * (bz * cx - bx * cz) + az * (bx * cy - by * cx);
  }
  return v / 6;
}

/** The same volume for an indexed mesh, without expanding it. */
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
