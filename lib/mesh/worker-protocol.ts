import type { AnalysisJson } from "./json";
import type { MeshReadErrorCode } from "./errors";
import type { MeshFormat, StlUnits } from "./read";
import type { Phase } from "./analysis";
import type { Vec3 } from "./types";

/** Messages between the main thread and workers/mesh.worker.ts. Buffers travel as transferables. */
export interface AnalyzeOptions {
  filename?: string;
  units?: StlUnits;
  up?: Vec3;
  overhangDeg?: number;
}

export type ToWorker =
  | { type: "analyze"; id: number; buffer: ArrayBuffer; options: AnalyzeOptions }
  | { type: "cancel"; id: number };

/** "tessellate": a STEP file is being turned into triangles (one step: the tessellator reports nothing in between). */
export type ProgressPhase = "read" | "tessellate" | Phase;

/** Arrays for the viewer: the soup, a per-facet overhang mask and the footprint outline. */
export interface ViewerArrays {
  positions: Float32Array;
  overhangMask: Uint8Array;
  footprint: Float64Array;
}

export interface AnalyzeResult {
  json: AnalysisJson;
  format: MeshFormat;
  warnings: string[];
  arrays: ViewerArrays;
}

export type FromWorker =
  | { type: "progress"; id: number; phase: ProgressPhase; fraction: number }
  | { type: "result"; id: number; result: AnalyzeResult }
  | { type: "error"; id: number; code: MeshReadErrorCode | "INTERNAL"; message: string }
  | { type: "cancelled"; id: number };

/** Buffers to hand over with a result, so nothing is copied between threads. */
export function resultTransferables(r: AnalyzeResult): ArrayBuffer[] {
  const { positions, overhangMask, footprint } = r.arrays;
  return [positions.buffer, overhangMask.buffer, footprint.buffer].filter((b): b is ArrayBuffer => b instanceof ArrayBuffer);
}
