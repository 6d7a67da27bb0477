import "server-only";
import { availableParallelism } from "node:os";
import path from "node:path";
import { Piscina } from "piscina";
import type { AnalyzeTask, AnalyzeTaskResult } from "./analyze-task";

/**
 * Uploaded meshes are read and analysed in worker threads, never on the request thread: a 3MF's
 * inflation and parsing take seconds of CPU for large files, and the server must keep answering
 * meanwhile. One thread per spare core (at least one, at most two), queued beyond that.
 */
const g = globalThis as unknown as { __pwMeshPool?: Piscina };

function pool(): Piscina {
  g.__pwMeshPool ??= new Piscina({
    // Resolved from the project root at run time (next start, next dev, vitest all run there).
    filename: path.join(process.cwd(), "lib/server/mesh-pool/analyze.worker.mjs"),
    minThreads: 0,
    maxThreads: Math.max(1, Math.min(2, availableParallelism() - 1)),
    idleTimeout: 120_000,
    // Per-user budgets (upload-budget.ts) keep the queue short; this is the last stop.
    maxQueue: 64,
  });
  return g.__pwMeshPool;
}

export async function analyzeInWorker(task: AnalyzeTask): Promise<AnalyzeTaskResult> {
  return (await pool().run(task)) as AnalyzeTaskResult;
}

/** Tasks the worker threads have completed in this process (for tests and the health figures). */
export function meshPoolCompleted(): number {
  return g.__pwMeshPool?.completed ?? 0;
}

/** For tests and shutdown. */
export async function closeMeshPool(): Promise<void> {
  const p = g.__pwMeshPool;
  g.__pwMeshPool = undefined;
  if (p) await p.destroy();
}

/**
 * How much a 3MF package may inflate to, from its size on disk: 64 × the compressed size, at least
 * 16 MiB and at most 256 MiB. 3MF model XML deflates about 4-10× (our own samples: 1.7× and 4.3×; common
 * practice, no source), so 64× leaves room for very regular meshes while a 200 KB package can no longer
 * expand to 200 MB. The reader also holds each entry to its declared size.
 */
export function inflateCapFor(compressedBytes: number): number {
  const MiB = 1024 * 1024;
  return Math.min(256 * MiB, Math.max(16 * MiB, 64 * compressedBytes));
}
