import { describe, expect, it } from "vitest";
import { isMeshReadError, isStep, readMesh, readStepWith, STEP_ANGULAR_DEFLECTION_RAD, type MeshReadErrorCode } from "@/lib/mesh";
import { analyzeFile, loadOcct } from "@/lib/mesh-node/step";
import { boxSolid, cylinderSolid, stepFile, type StepUnit } from "@/tests/fixtures/step";

// STEP files written by tests/fixtures/step.ts (ISO 10303-21 exchange structure, AP214 shapes, ISO
// 10303-41 units), read through occt-import-js (OpenCascade in WebAssembly) in Node. Expected
// figures are the solids' closed forms: box a·b·c and 2(ab + bc + ca); cylinder πr²h. Facet corners
// lie on the true surface, so the cylinder's tessellated volume is at most πr²h and at least
// πr²h · sin(a)/a for the angular deflection a (an inscribed polygon whose sides turn by at most a).
const enc = (s: string) => new TextEncoder().encode(s);
const MM: Record<StepUnit, number> = { mm: 1, m: 1000, in: 25.4 };
const sinc = Math.sin(STEP_ANGULAR_DEFLECTION_RAD) / STEP_ANGULAR_DEFLECTION_RAD;

async function code(f: () => Promise<unknown>): Promise<MeshReadErrorCode | "none"> {
  try { await f(); return "none"; } catch (e) { if (isMeshReadError(e)) return e.code; throw e; }
}

describe("STEP import (ISO 10303-21): the WebAssembly tessellator loads in Node", () => {
  it("loads and reads", async () => {
    const occt = await loadOcct();
    expect(typeof occt.ReadStepFile).toBe("function");
  });

  // The same solids drawn in millimetres, metres and inches: a box and a cylinder beside it.
  const sizes: Record<StepUnit, { a: number; b: number; c: number; r: number; h: number; x: number }> = {
    mm: { a: 20, b: 10, c: 5, r: 4, h: 12, x: 40 },
    m: { a: 0.02, b: 0.01, c: 0.005, r: 0.004, h: 0.012, x: 0.04 },
    in: { a: 0.8, b: 0.4, c: 0.2, r: 0.15, h: 0.5, x: 1.6 },
  };
  it.each(["mm", "m", "in"] as const)("a box and a cylinder in %s: one body each, millimetres out, closed-form figures", async (unit) => {
    const { a, b, c, r, h, x } = sizes[unit];
    const k = MM[unit];
    const bytes = enc(stepFile(unit, (w) => [boxSolid(w, a, b, c), cylinderSolid(w, r, h, [x, 0, 0])]));
    const res = await analyzeFile(bytes);
    expect(res.format).toBe("step");
    expect(res.parts!.length).toBe(2);
    const [box, cyl] = res.parts!;
    const p = res.soup!.positions;
    const sub = (part: { firstTriangle: number; triangleCount: number }) => p.subarray(9 * part.firstTriangle, 9 * (part.firstTriangle + part.triangleCount));
    const { analyzeSoup } = await import("@/lib/mesh");
    const boxA = analyzeSoup({ positions: sub(box!) });
    const A = a * k, B = b * k, C = c * k, R = r * k, H = h * k;
    expect(boxA.volume / (A * B * C)).toBeCloseTo(1, 5); // planes tessellate exactly (float32 corners)
    expect(boxA.area / (2 * (A * B + B * C + C * A))).toBeCloseTo(1, 5);
    expect(boxA.topology.watertight).toBe(true);
    const cylA = analyzeSoup({ positions: sub(cyl!) });
    const exact = Math.PI * R * R * H;
    expect(cylA.volume).toBeLessThanOrEqual(exact * (1 + 1e-6));
    expect(cylA.volume).toBeGreaterThanOrEqual(exact * sinc * (1 - 1e-6));
    expect(cylA.topology.watertight).toBe(true);
    expect(cylA.bbox.max[2]).toBeCloseTo(H, 3);
    expect(res.analysis.bbox.max[0]).toBeCloseTo(x * k + R, 3);
  });

  it("a file without solids is a clear error; so is a broken one", async () => {
    const noSolid = stepFile("mm", (w) => [w.add("CARTESIAN_POINT('',(1.,2.,3.))")]);
    expect(await code(() => analyzeFile(enc(noSolid)))).toBe("NO_SOLIDS");
    await analyzeFile(enc(noSolid)).catch((e: Error) => expect(e.message).toMatch(/no solid or surface to print/));
    expect(await code(() => analyzeFile(enc("ISO-10303-21;\nHEADER;\nthis is not a step file\n")))).toBe("BAD_STEP");
    const occt = await loadOcct();
    expect(() => readStepWith(occt, enc("solid x\nendsolid x\n"))).toThrow(/does not begin with 'ISO-10303-21;'/);
  });

  it("is recognised by its first line; the synchronous reader points to the STEP reader", () => {
    const s = stepFile("mm", (w) => [boxSolid(w, 1, 1, 1)]);
    expect(isStep(enc(s))).toBe(true);
    expect(isStep(enc("\uFEFF  " + s))).toBe(true);
    expect(isStep(enc("solid ISO-10303-21;"))).toBe(false);
    try {
      readMesh(enc(s));
      expect.unreachable();
    } catch (e) {
      expect(isMeshReadError(e) && e.code).toBe("NEEDS_STEP_READER");
    }
  });

  it("refuses an instance name defined twice before tessellating (ISO 10303-21; it can send the tessellator into a loop)", async () => {
    const s = stepFile("mm", (w) => [boxSolid(w, 1, 1, 1)]).replace("#20=", "#12=");
    expect(await code(() => analyzeFile(enc(s)))).toBe("BAD_STEP");
    await analyzeFile(enc(s)).catch((e: Error) => expect(e.message).toMatch(/defines instance #12 twice/));
    // '#12=' inside a string or a comment is not a definition.
    const quoted = stepFile("mm", (w) => [boxSolid(w, 1, 1, 1)]).replace("PRODUCT('part','part','',", "PRODUCT('part #12=x','part','', /* #12= */");
    expect((await analyzeFile(enc(quoted))).format).toBe("step");
  });

  it("stops a tessellation that runs past its time limit, then reads the next file in a fresh thread", async () => {
    const s = enc(stepFile("mm", (w) => [cylinderSolid(w, 5, 10)]));
    const e = await analyzeFile(s, { stepTimeLimitMs: 1 }).catch((x: unknown) => x);
    expect(isMeshReadError(e) && e.code).toBe("BAD_STEP");
    expect((e as Error).message).toMatch(/took longer than/);
    expect((await analyzeFile(s)).analysis.triangles).toBeGreaterThan(0);
  });
});
