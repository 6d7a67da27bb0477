// Runs inside a worker thread (see ./pool.ts): reads an uploaded file from disk and analyses it with
// lib/mesh, so the request thread never inflates or parses. Relative imports only: the worker loads
// this file through tsx, without the app's path aliases or bundler.
import { readFile } from "node:fs/promises";
import { analysisToJson, analyzeBytes, isMeshReadError, type AnalysisJson } from "../../mesh";
import type { StlUnits } from "../../mesh/read";

export interface AnalyzeTask {
  path: string;
  filename: string;
  units: StlUnits;
  maxUncompressedBytes: number;
}

export type AnalyzeTaskResult = { ok: true; format: string; json: AnalysisJson; warnings: string[] } | { ok: false; code: string; message: string };

export default async function analyzeTask(task: AnalyzeTask): Promise<AnalyzeTaskResult> {
  const bytes = new Uint8Array(await readFile(task.path));
  try {
    const r = analyzeBytes(bytes, { filename: task.filename, units: task.units, maxUncompressedBytes: task.maxUncompressedBytes });
    return { ok: true, format: r.format, json: analysisToJson(task.filename, r.format, r.analysis), warnings: r.warnings };
  } catch (e) {
    if (isMeshReadError(e)) return { ok: false, code: e.code, message: e.message };
    throw e;
  }
}
