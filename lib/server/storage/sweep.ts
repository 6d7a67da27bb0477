import "server-only";
import { lstat, readdir, rm } from "node:fs/promises";
import path from "node:path";
import { tempDir } from "./index";

/**
 * Temporary files older than this are left over from a process that died mid-upload (or mid-split):
 * nothing in a live process keeps one for more than the time a single upload takes.
 */
export const TEMP_MAX_AGE_MS = 30 * 60_000;

/**
 * Deletes files in the storage temp folder last written more than `maxAgeMs` ago and returns their
 * names. Younger files may belong to an upload still under way (in this or another process) and stay.
 * Run once when the server starts (instrumentation.ts). Stored files live outside the temp folder and
 * are never touched.
 */
export async function sweepTempFiles(opts: { maxAgeMs?: number; now?: number; dir?: string } = {}): Promise<string[]> {
  const dir = opts.dir ?? tempDir();
  const cutoff = (opts.now ?? Date.now()) - (opts.maxAgeMs ?? TEMP_MAX_AGE_MS);
  const names = await readdir(dir).catch((e: NodeJS.ErrnoException) => {
    if (e.code === "ENOENT") return [] as string[];
    throw e;
  });
  const removed: string[] = [];
  for (const name of names) {
    const p = path.join(dir, name);
    const st = await lstat(p).catch(() => null);
    if (!st || st.isDirectory() || st.mtimeMs >= cutoff) continue;
    await rm(p, { force: true });
    removed.push(name);
  }
  return removed;
}

/** How often a running server sweeps, so files of uploads that died with their process do not pile up. */
export const TEMP_SWEEP_INTERVAL_MS = 10 * 60_000;

const g = globalThis as unknown as { __pwTempSweeper?: () => void };

/**
 * Sweeps now and then every `intervalMs` for as long as the process runs (the timer does not keep it
 * alive). Once per process: a second call returns the first one's stop function.
 */
export function startTempSweeper(opts: { intervalMs?: number; dir?: string; maxAgeMs?: number; onRemoved?: (names: string[]) => void } = {}): () => void {
  if (g.__pwTempSweeper) return g.__pwTempSweeper;
  const once = () =>
    sweepTempFiles({ dir: opts.dir, maxAgeMs: opts.maxAgeMs }).then(
      (removed) => {
        if (removed.length) opts.onRemoved?.(removed);
      },
      (e: unknown) => console.error("[platewright] temp sweep:", e instanceof Error ? e.message : e),
    );
  void once();
  const timer = setInterval(() => void once(), opts.intervalMs ?? TEMP_SWEEP_INTERVAL_MS);
  timer.unref();
  const stop = () => {
    clearInterval(timer);
    g.__pwTempSweeper = undefined;
  };
  g.__pwTempSweeper = stop;
  return stop;
}
