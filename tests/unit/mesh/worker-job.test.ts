import { describe, expect, it } from "vitest";
import { analysisToJson, analyzeBytes, writeStl } from "@/lib/mesh";
import { failureMessage, runAnalyzeJob } from "@/lib/mesh/worker-job";
import { resultTransferables } from "@/lib/mesh/worker-protocol";
import { analyzeFile, loadOcct } from "@/lib/mesh-node/step";
import { uvSphere } from "@/tests/fixtures/meshes";
import { boxSolid, cylinderSolid, stepFile } from "@/tests/fixtures/step";

// The worker is a thin shell over runAnalyzeJob; its contract is checked here in Node.
describe("worker job", () => {
  const bytes = writeStl(uvSphere(64, 32, 10));

  it("reports progress through every phase and returns the CLI's numbers with viewer arrays", async () => {
    const phases: string[] = [];
    const r = await runAnalyzeJob(bytes, { filename: "s.stl" }, { progress: (p) => phases.push(p), cancelled: () => false, pause: async () => {} });
    expect(new Set(phases)).toEqual(new Set(["read", "analyse", "weld", "topology", "footprint"]));
    const cli = analyzeBytes(bytes);
    expect(r.json).toEqual(analysisToJson("s.stl", cli.format, cli.analysis));
    expect(r.arrays.positions.length).toBe(r.json.triangles * 9);
    expect(r.arrays.overhangMask.length).toBe(r.json.triangles);
    expect(resultTransferables(r)).toHaveLength(3);
  });

  it("stops at the next yield once cancelled", async () => {
    let calls = 0;
    const job = runAnalyzeJob(bytes, {}, { progress: () => {}, cancelled: () => ++calls > 2, pause: async () => {} });
    await expect(job).rejects.toMatchObject({ code: "CANCELLED" });
    const e = await job.catch((x: unknown) => x);
    expect(failureMessage(7, e)).toEqual({ type: "cancelled", id: 7 });
  });

  it("turns a read failure into an error message with its code", async () => {
    const e = await runAnalyzeJob(new Uint8Array(10), {}, { progress: () => {}, cancelled: () => false, pause: async () => {} }).catch((x: unknown) => x);
    expect(failureMessage(1, e)).toMatchObject({ type: "error", id: 1, code: "TOO_SMALL" });
  });

  it("tessellates a STEP file with the host's loader, reports it, and gives the CLI's numbers", async () => {
    const step = new TextEncoder().encode(stepFile("in", (w) => [boxSolid(w, 1, 2, 0.5), cylinderSolid(w, 0.25, 1, [2, 0, 0])]));
    const phases: string[] = [];
    const r = await runAnalyzeJob(step, { filename: "p.step" }, { progress: (p, f) => phases.push(`${p}:${f}`), cancelled: () => false, pause: async () => {}, loadStep: loadOcct });
    expect(phases.slice(0, 3)).toEqual(["read:0", "tessellate:0", "tessellate:1"]);
    expect(r.format).toBe("step");
    const cli = await analyzeFile(step);
    expect(r.json).toEqual(analysisToJson("p.step", "step", cli.analysis));
    // Without a loader (a host that has none), a clear error.
    const e = await runAnalyzeJob(step, {}, { progress: () => {}, cancelled: () => false, pause: async () => {} }).catch((x: unknown) => x);
    expect(failureMessage(2, e)).toMatchObject({ type: "error", code: "NEEDS_STEP_READER" });
  });
});
