import occtimportjs from "occt-import-js";
import { analyzeBytes, analyzeSoup, isStep, readStepWith, type AnalysisOptions, type MeshAnalysis, type MeshFormat, type OcctModule, type ReadOptions, type TriangleSoup } from "@/lib/mesh";
import { nodeInflateRaw } from "./inflate";

/**
 * The STEP tessellator (occt-import-js, OpenCascade in WebAssembly) for Node: the server and the
 * CLI. Loaded once, on the first STEP file (~7 MB of WebAssembly, about a second to compile).
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

/** Analyse any file the engine reads: STL and 3MF with Node's inflater, STEP through the tessellator. */
export async function analyzeFile(bytes: Uint8Array, opts: AnalysisOptions & ReadOptions = {}): Promise<FileAnalysis> {
  if (!isStep(bytes)) return analyzeBytes(bytes, { ...opts, inflateRaw: opts.inflateRaw ?? nodeInflateRaw });
  const occt = await loadOcct();
  let r;
  try {
    r = readStepWith(occt, bytes, opts);
  } catch (e) {
    // A trap inside the module (an abort) can leave it unusable: load a fresh one next time.
    if (e instanceof Error && e.name === "MeshReadError" && /could not be read \(/.test(e.message)) loading = undefined;
    throw e;
  }
  return { format: "step", analysis: analyzeSoup(r.soup, opts), warnings: r.warnings, soup: r.soup, parts: r.parts };
}
