import { analysisSteps, chunkSegments, soupSegments, type MeshAnalysis } from "./analysis";
import { isMeshReadError, MeshReadError } from "./errors";
import { analysisToJson } from "./json";
import { readMesh, type ReadResult } from "./read";
import { isStep, readStepWith, type OcctModule } from "./step-read";
import type { AnalyzeOptions, AnalyzeResult, FromWorker, ProgressPhase } from "./worker-protocol";

/**
 * The worker's job, kept here so it is tested in Node without a worker: read, then run the
 * analysis in chunks, yielding to the event loop between them so a cancel message can arrive.
 */
export interface JobHooks {
  progress(phase: ProgressPhase, fraction: number): void;
  cancelled(): boolean;
  /** Let pending messages in; defaults to a zero timeout. */
  pause?: () => Promise<void>;
  /** Load the STEP tessellator (the host knows where its WebAssembly is); without it STEP is refused. */
  loadStep?: () => Promise<OcctModule>;
}

const CHUNK_TRIANGLES = 1 << 17;

const defaultPause = () => new Promise<void>((r) => setTimeout(r, 0));

export async function runAnalyzeJob(bytes: Uint8Array, options: AnalyzeOptions, hooks: JobHooks): Promise<AnalyzeResult> {
  const pause = hooks.pause ?? defaultPause;
  const check = async () => {
    await pause();
    if (hooks.cancelled()) throw new MeshReadError("CANCELLED", "analysis cancelled");
  };
  hooks.progress("read", 0);
  await check();
  let read: ReadResult;
  if (isStep(bytes)) {
    if (!hooks.loadStep) throw new MeshReadError("NEEDS_STEP_READER", "STEP files cannot be read here");
    hooks.progress("tessellate", 0);
    let occt: OcctModule;
    try {
      occt = await hooks.loadStep();
    } catch (e) {
      throw new MeshReadError("NEEDS_STEP_READER", `the STEP reader could not be loaded (${e instanceof Error ? e.message.slice(0, 160) : String(e).slice(0, 160)})`);
    }
    await check();
    read = readStepWith(occt, bytes);
    hooks.progress("tessellate", 1);
  } else {
    read = readMesh(bytes, { filename: options.filename, units: options.units });
  }
  hooks.progress("read", 1);
  await check();
  const p = read.soup.positions;
  const steps = analysisSteps(chunkSegments(soupSegments(p), CHUNK_TRIANGLES), p.length / 9, { up: options.up, overhangDeg: options.overhangDeg, mask: true });
  let analysis: MeshAnalysis;
  try {
    for (;;) {
      const r = steps.next();
      if (r.done) { analysis = r.value.analysis; break; }
      hooks.progress(r.value.phase, r.value.fraction);
      await check();
    }
  } finally {
    steps.return(undefined as never); // a cancelled job hands its working memory back
  }
  return {
    json: analysisToJson(options.filename ?? "mesh", read.format, analysis),
    format: read.format,
    warnings: read.warnings,
    arrays: { positions: p, overhangMask: analysis.overhangMask ?? new Uint8Array(0), footprint: analysis.footprint.outline },
  };
}

/** Map any failure to the protocol's error or cancelled message. */
export function failureMessage(id: number, e: unknown): FromWorker {
  if (isMeshReadError(e)) return e.code === "CANCELLED" ? { type: "cancelled", id } : { type: "error", id, code: e.code, message: e.message };
  if (e instanceof RangeError) return { type: "error", id, code: "INTERNAL", message: e.message };
  return { type: "error", id, code: "INTERNAL", message: "the analysis failed unexpectedly" };
}
