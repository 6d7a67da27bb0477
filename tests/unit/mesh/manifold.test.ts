import Module from "manifold-3d";
import { beforeAll, describe, expect, it } from "vitest";
import { analyzeBytes, analyzeSoupWithMesh, readMesh, weld, type IndexedMesh } from "@/lib/mesh";
import { icosahedron, prism, tetrahedron, uvSphere } from "@/tests/fixtures/meshes";
import { sharedMesh } from "./helpers";

// Independent cross-check: manifold-3d (npm) computes volume and surface area of an indexed mesh.
let wasm: Awaited<ReturnType<typeof Module>>;
beforeAll(async () => {
  wasm = await Module();
  wasm.setup();
});

function manifoldFigures(m: IndexedMesh): { volume: number; area: number } {
  const mesh = new wasm.Mesh({ numProp: 3, vertProperties: m.vertices, triVerts: m.indices });
  const solid = new wasm.Manifold(mesh);
  try {
    return { volume: solid.volume(), area: solid.surfaceArea() };
  } finally {
    solid.delete();
  }
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe("volume and area agree with manifold-3d", () => {
  it.each([
    ["tetrahedron", tetrahedron(12)],
    ["icosahedron", icosahedron(4)],
    ["13-gon prism", prism(13, 6, 2.5)],
    ["UV sphere 40×20", uvSphere(40, 20, 9, [3, -2, 9])],
  ])("%s (generated)", (_n, soup) => {
    const { analysis, mesh } = analyzeSoupWithMesh(soup);
    const ref = manifoldFigures(mesh);
    expect(rel(analysis.volume, ref.volume)).toBeLessThan(1e-6);
    expect(rel(analysis.area, ref.area)).toBeLessThan(1e-6);
  });

  it.each([
    "numpy-stl/tests/stl_ascii/HalfDonut.stl",
    "numpy-stl/tests/stl_binary/StarWithEmptyHeader.stl",
    "trimesh/models/unit_cube.STL",
    "3mf-samples/examples/core/box.3mf",
    "3mf-samples/examples/core/multiple_cylinders.3mf",
  ])("%s (real file)", (f) => {
    const bytes = sharedMesh(f);
    const ours = analyzeBytes(bytes).analysis;
    const ref = manifoldFigures(weld(readMesh(bytes).soup));
    expect(rel(ours.volume, ref.volume)).toBeLessThan(1e-6);
    expect(rel(ours.area, ref.area)).toBeLessThan(1e-6);
  });
});
