/**
 * Moving meshes in and out of manifold-3d. The caller loads and initialises the WASM module and
 * passes it in, so the same code runs in a browser worker and in Node.
 */
import type { Manifold, ManifoldToplevel } from "manifold-3d";
import type { IndexedMesh, TriangleSoup } from "@/lib/mesh/types";
import { withoutRepeatedCorners } from "@/lib/mesh/volume";
import { weld } from "@/lib/mesh/weld";

export type ManifoldWasm = ManifoldToplevel;
export type Solid = Manifold;

/** Welds the soup with lib/mesh (the library needs shared vertices) and builds a solid; throws when not closed. */
export function solidFromSoup(wasm: ManifoldWasm, soup: TriangleSoup, weldTolerance?: number): Solid {
  return solidFromIndexed(wasm, weldForSolid(soup, weldTolerance));
}

/** lib/mesh's weld without the triangles that collapse onto one vertex (manifold-3d rejects them). */
export function weldForSolid(soup: TriangleSoup, weldTolerance?: number): IndexedMesh {
  return withoutRepeatedCorners(weld(soup, weldTolerance));
}

export function solidFromIndexed(wasm: ManifoldWasm, mesh: IndexedMesh): Solid {
  const m = new wasm.Mesh({ numProp: 3, vertProperties: mesh.vertices, triVerts: mesh.indices });
  return wasm.Manifold.ofMesh(m);
}

/** The solid's own indexed mesh (positions only). */
export function indexedFromSolid(solid: Solid): IndexedMesh {
  const m = solid.getMesh();
  const np = m.numProp;
  let vertices: Float32Array;
  if (np === 3) vertices = Float32Array.from(m.vertProperties);
  else {
    const n = m.vertProperties.length / np;
    vertices = new Float32Array(n * 3);
    for (let i = 0; i < n; i++) for (let k = 0; k < 3; k++) vertices[3 * i + k] = m.vertProperties[np * i + k]!;
  }
  return { vertices, indices: Uint32Array.from(m.triVerts) };
}

export function soupFromSolid(solid: Solid): TriangleSoup {
  const { vertices, indices } = indexedFromSolid(solid);
  const positions = new Float32Array(indices.length * 3);
  for (let i = 0; i < indices.length; i++) {
    const v = indices[i]! * 3;
    positions[3 * i] = vertices[v]!;
    positions[3 * i + 1] = vertices[v + 1]!;
    positions[3 * i + 2] = vertices[v + 2]!;
  }
  return { positions };
}

/** Cuts a solid by the plane normal · p = offset into its connected pieces (both sides). */
export function cutIntoPieces(solid: Solid, normal: [number, number, number], offset: number): Solid[] {
  const [above, below] = solid.splitByPlane(normal, offset);
  const out: Solid[] = [];
  for (const side of [above, below]) {
    if (side.isEmpty()) {
      side.delete();
      continue;
    }
    const parts = side.decompose();
    side.delete();
    for (const p of parts) {
      if (p.isEmpty()) p.delete();
      else out.push(p);
    }
  }
  return out;
}
