import occtimportjs from "occt-import-js";
import { checkStepText, stepResultToRead } from "@/lib/mesh/step-read";
import { analyzeBytes, analyzeSoup, isStep, type AnalysisOptions, type MeshAnalysis, type MeshFormat, type OcctModule, type ReadOptions, type TriangleSoup } from "@/lib/mesh";
import { nodeInflateRaw } from "./inflate";
import { tessellateStep } from "./step-thread";

/**
 * The STEP tessellator (occt-import-js, OpenCascade in WebAssembly) for Node: the server and the
 * CLI run it in a worker thread with a time limit (step-thread.ts); `loadOcct` loads it in this
 * thread (tests, and hosts that trust their files). Loaded once (~7 MB of WebAssembly, about a second).
 */
let loading: Promise<OcctModule> | undefined;

export function loadOcct(): Promise<OcctModule> {
  // The module's own console output (parser complaints about a user's file) is not logged.
  loading ??= occtimportjs({ print: () => undefined, printErr: () => undefined }).catch((e: unknown) => {
    loading = undefined;
    throw e;
  });
  return loading;
}

export interface FileAnalysis {
  format: MeshFormat;
  analysis: MeshAnalysis;
  warnings: string[];
  /** The soup analysed, when it had to be made (STEP); undefined for STL and 3MF. */
  soup?: TriangleSoup;
  parts?: { objectId: string; name: string | undefined; firstTriangle: number; triangleCount: number }[];
}

/** Analyse any file the engine reads: STL and 3MF with Node's inflater, STEP through the tessellator's thread. */
export async function analyzeFile(bytes: Uint8Array, opts: AnalysisOptions & ReadOptions & { stepTimeLimitMs?: number } = {}): Promise<FileAnalysis> {
  if (!isStep(bytes)) return analyzeBytes(bytes, { ...opts, inflateRaw: opts.inflateRaw ?? nodeInflateRaw });
  checkStepText(bytes);
  const r = stepResultToRead(await tessellateStep(bytes, opts.stepTimeLimitMs), opts);
  return { format: "step", analysis: analyzeSoup(r.soup, opts), warnings: r.warnings, soup: r.soup, parts: r.parts };
}
