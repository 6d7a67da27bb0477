// Automatic repair (lib/mesh/repair.ts). Volumes against closed forms (cube a³; REFERENCES.md,
// "Geometry") and against manifold-3d, which only accepts a closed, consistently wound mesh.
import { describe, expect, it } from "vitest";
import { analyzeSoup } from "@/lib/mesh";
import { repairMesh } from "@/lib/mesh/repair";
import { box, concat, flipTriangles } from "../../fixtures/meshes";
import { loadWasm } from "../orient/fixtures";

const a = 20;
const dropTriangle = (p: Float32Array, t: number) => {
  const out = new Float32Array(p.length - 9);
  out.set(p.subarray(0, 9 * t));
  out.set(p.subarray(9 * t + 9), 9 * t);
  return { positions: out };
};

describe("repairMesh", () => {
  it("a cube with one flipped face and one missing triangle comes back watertight with the cube's volume", async () => {
    const broken = dropTriangle(flipTriangles(box(a, a, a), (t) => t === 2).positions, 7);
    const before = analyzeSoup(broken);
    expect(before.topology.watertight).toBe(false);
    expect(before.topology.boundaryEdges).toBe(3);
    expect(before.topology.inconsistentEdges).toBeGreaterThan(0);
    const { soup, mesh, report } = repairMesh(broken);
    const after = analyzeSoup(soup);
    expect(after.topology).toMatchObject({ watertight: true, boundaryEdges: 0, inconsistentEdges: 0, nonManifoldEdges: 0 });
    expect(after.volume).toBeCloseTo(a ** 3, 6); // a³ (closed form)
    expect(report).toMatchObject({ holesClosed: 1, facesAdded: 1, holesLeft: 0, facesFlipped: 1, pieces: 1, piecesInside: 0 });
    // manifold-3d builds a solid from it and measures the same volume.
    const wasm = await loadWasm();
    const solid = wasm.Manifold.ofMesh(new wasm.Mesh({ numProp: 3, vertProperties: mesh.vertices, triVerts: mesh.indices }));
    try {
      expect(solid.volume()).toBeCloseTo(a ** 3, 3);
    } finally {
      solid.delete();
    }
  });

  it("turns an inside-out cube the right way and drops duplicate and zero-area faces", () => {
    const inside = flipTriangles(box(a, a, a), () => true).positions;
    const sliver = Float32Array.of(0, 0, 0, 10, 0, 0, 20, 0, 0); // three corners on a line
    const dup = inside.subarray(0, 9);
    const { soup, report } = repairMesh({ positions: Float32Array.from([...inside, ...sliver, ...dup]) });
    expect(report).toMatchObject({ zeroAreaDropped: 1, duplicatesDropped: 1, piecesTurnedOut: 1, facesFlipped: 12 });
    expect(analyzeSoup(soup).volume).toBeCloseTo(a ** 3, 6);
  });

  it("keeps a hollow as a hollow and reports a solid piece inside another", () => {
    const outer = box(40, 40, 40);
    const innerVoid = flipTriangles(box(10, 10, 10, [15, 15, 15]), () => true);
    const hollow = repairMesh(concat(outer, innerVoid));
    expect(hollow.report).toMatchObject({ pieces: 2, piecesInside: 0, piecesTurnedOut: 0 });
    expect(analyzeSoup(hollow.soup).volume).toBeCloseTo(40 ** 3 - 10 ** 3, 3);
    const nested = repairMesh(concat(outer, box(10, 10, 10, [15, 15, 15])));
    expect(nested.report).toMatchObject({ pieces: 2, piecesInside: 1 });
  });

  it("leaves a hole larger than the limit open and says so", () => {
    // An open-topped box: removing the two top triangles leaves a 4-edge rim.
    const cube = box(a, a, a);
    const { report } = repairMesh(dropTriangle(dropTriangle(cube.positions, 11).positions, 10), { maxHoleEdges: 3 });
    expect(report.holesLeft).toBe(1);
    expect(report.holesClosed).toBe(0);
  });
});

describe("shellReport", () => {
  it("counts pieces and finds a solid one inside another, but not a hollow", async () => {
    const { shellReport } = await import("@/lib/mesh/shells");
    const { weld } = await import("@/lib/mesh/weld");
    expect(shellReport(weld(box(a, a, a)))).toEqual({ pieces: 1, solidInside: 0, checked: true });
    expect(shellReport(weld(concat(box(40, 40, 40), box(10, 10, 10, [15, 15, 15]))))).toEqual({ pieces: 2, solidInside: 1, checked: true });
    expect(shellReport(weld(concat(box(40, 40, 40), flipTriangles(box(10, 10, 10, [15, 15, 15]), () => true))))).toEqual({ pieces: 2, solidInside: 0, checked: true });
    // Two cubes side by side: two pieces, neither inside the other.
    expect(shellReport(weld(concat(box(10, 10, 10), box(10, 10, 10, [20, 0, 0]))))).toEqual({ pieces: 2, solidInside: 0, checked: true });
  });
});
