/**
 * Per-facet data the orientation and split code needs (normals, areas, centroids, corner reach).
 * Welding, bounds and volume are lib/mesh's (`weld`, `soupBounds`, `indexedVolume`).
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
  /** Farthest corner from the centroid, per facet (bounds how far a facet reaches up or down). */
  reach: Float64Array;
  /** The mesh's own triangle indices (3 per facet) and vertices, for exact per-corner checks. */
  indices: Uint32Array;
  vertices: Float32Array;
  totalArea: number;
}

/** Normals from the vertex order (counter-clockwise seen from outside), as the STL description says. */
export function facetData(mesh: IndexedMesh): FacetData {
  const { vertices: v, indices: ix } = mesh;
  const count = Math.floor(ix.length / 3);
  const normals = new Float64Array(count * 3);
  const areas = new Float64Array(count);
  const centroids = new Float64Array(count * 3);
  const reach = new Float64Array(count);
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
    const gx = (ax + bx + cx) / 3, gy = (ay + by + cy) / 3, gz = (az + bz + cz) / 3;
    centroids[3 * t] = gx;
    centroids[3 * t + 1] = gy;
    centroids[3 * t + 2] = gz;
    reach[t] = Math.sqrt(Math.max((ax - gx) ** 2 + (ay - gy) ** 2 + (az - gz) ** 2, (bx - gx) ** 2 + (by - gy) ** 2 + (bz - gz) ** 2, (cx - gx) ** 2 + (cy - gy) ** 2 + (cz - gz) ** 2));
  }
  return { count, normals, areas, centroids, reach, indices: ix, vertices: v, totalArea };
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

