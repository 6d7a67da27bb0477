import { describe, expect, it } from "vitest";
import { analyzeSoup, analyzeSoupWithMesh, sharedWorkspace, Workspace } from "@/lib/mesh";
import { analysisSteps, soupSegments, type MeshAnalysis } from "@/lib/mesh/analysis";

// Reused working memory must never change an answer: every check compares an analysis run with
// kept memory against the same analysis run on fresh memory (common practice, no source).

/** A closed box of size a × b × c mm at (x, y, z), 12 triangles wound outward (common practice). */
function box(a: number, b: number, c: number, x = 0, y = 0, z = 0): number[] {
  const p = [[0, 0, 0], [a, 0, 0], [a, b, 0], [0, b, 0], [0, 0, c], [a, 0, c], [a, b, c], [0, b, c]].map(([u, v, w]) => [u! + x, v! + y, w! + z]);
  const f = [[0, 2, 1], [0, 3, 2], [4, 5, 6], [4, 6, 7], [0, 1, 5], [0, 5, 4], [1, 2, 6], [1, 6, 5], [2, 3, 7], [2, 7, 6], [3, 0, 4], [3, 4, 7]];
  return f.flatMap((t) => t.flatMap((i) => p[i]!));
}

/** Many separate boxes: a mesh big enough to fill the weld's caches. */
function boxes(n: number, size: number): Float32Array {
  const out: number[] = [];
  for (let i = 0; i < n; i++) out.push(...box(size, size * 0.5, size * 0.25, (i % 40) * 2 * size, Math.floor(i / 40) * 2 * size, 0));
  return new Float32Array(out);
}

const fresh = (positions: Float32Array) => {
  sharedWorkspace.drop();
  return analyzeSoup({ positions });
};

describe("shared workspace", () => {
  it("a small mesh after a large one gives the same analysis as on fresh memory", () => {
    const large = boxes(3000, 3), small = new Float32Array(box(10, 20, 30));
    const expected = fresh(small);
    analyzeSoup({ positions: large }); // leaves stale ids and cells in the kept buffers
    const again = analyzeSoup({ positions: small });
    expect(again).toEqual(expected);
    expect(again.vertices).toBe(8);
    expect(again.volume).toBeCloseTo(6000, 6); // a·b·c
    expect(sharedWorkspace.keptBytes).toBeGreaterThan(0);
  });

  it("two analyses stepped in turn (as two worker jobs) do not share memory", () => {
    const a = boxes(500, 2), b = boxes(700, 5);
    const ea = fresh(a), eb = fresh(b);
    const ga = analysisSteps(soupSegments(a), a.length / 9), gb = analysisSteps(soupSegments(b), b.length / 9);
    let ra: MeshAnalysis | undefined, rb: MeshAnalysis | undefined;
    for (;;) {
      const x = ra ? null : ga.next();
      const y = rb ? null : gb.next();
      if (x?.done) ra = x.value.analysis;
      if (y?.done) rb = y.value.analysis;
      if (ra && rb) break;
    }
    expect(ra).toEqual(ea);
    expect(rb).toEqual(eb);
  });

  it("a job stopped part-way hands the workspace back", () => {
    const m = boxes(200, 4);
    const g = analysisSteps(soupSegments(m), m.length / 9);
    g.next();
    g.return(undefined as never);
    const ws = new Workspace();
    const l1 = ws.lease(), l2 = ws.lease();
    l1.int32("k", 4)[0] = 7;
    expect(l2.int32("k", 4)[0]).toBe(0); // the second lease got fresh memory
    l1.release();
    expect(ws.lease().int32("k", 4)[0]).toBe(7); // kept buffer, not cleared unless asked
    // The shared one is free again: a kept buffer is reused by the next analysis.
    const kept = sharedWorkspace.keptBytes;
    analyzeSoup({ positions: m });
    expect(sharedWorkspace.keptBytes).toBe(kept);
  });

  it("results and a kept mesh are not changed by later analyses", () => {
    const m = boxes(400, 3);
    const r = analyzeSoupWithMesh({ positions: m });
    const outline = r.analysis.footprint.outline.slice();
    const v = r.mesh.vertices.slice(), ix = r.mesh.indices.slice();
    analyzeSoup({ positions: boxes(900, 7) });
    expect(r.analysis.footprint.outline).toEqual(outline);
    expect(r.mesh.vertices).toEqual(v);
    expect(r.mesh.indices).toEqual(ix);
  });

  it("does not keep buffers beyond its limit", () => {
    const ws = new Workspace(1024);
    const l = ws.lease();
    l.uint8("a", 1000);
    l.uint8("b", 1000);
    expect(ws.keptBytes).toBe(1000);
    l.release();
  });
});
