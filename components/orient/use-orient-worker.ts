"use client";
// One hook owns the orientation worker: created in an effect, terminated on clean-up. The page
// hands the file's bytes over (transferred) and gets ranked candidates back; cancel flags the job.
import { useCallback, useEffect, useRef } from "react";
import type { Quat } from "@/lib/orient/rotation";
import type { FromWorker, OrientJobOptions, OrientJobResult, SplitJobResult, ToWorker } from "@/lib/orient/worker-protocol";

export class PlannerCancelled extends Error {
  constructor() {
    super("cancelled");
    this.name = "PlannerCancelled";
  }
}

export interface PlannerCall<T> {
  promise: Promise<T>;
  cancel(): void;
}

interface Pending {
  resolve(r: OrientJobResult | SplitJobResult): void;
  reject(e: Error): void;
  onProgress?: (fraction: number) => void;
}

export function useOrientWorker() {
  const worker = useRef<Worker | null>(null);
  const pending = useRef(new Map<number, Pending>());
  const nextId = useRef(1);

  useEffect(() => {
    const jobs = pending.current;
    const w = new Worker(new URL("../../workers/orient.worker.ts", import.meta.url), { type: "module" });
    w.onmessage = (ev: MessageEvent<FromWorker>) => {
      const m = ev.data;
      const p = jobs.get(m.id);
      if (!p) return;
      if (m.type === "progress") { p.onProgress?.(m.fraction); return; }
      jobs.delete(m.id);
      if (m.type === "orient-result" || m.type === "split-result") p.resolve(m.result);
      else if (m.type === "error") p.reject(new Error(m.message));
      else p.reject(new PlannerCancelled());
    };
    w.onerror = (ev) => {
      for (const p of jobs.values()) p.reject(new Error(ev.message || "the planner stopped unexpectedly"));
      jobs.clear();
    };
    worker.current = w;
    return () => {
      w.terminate();
      worker.current = null;
      for (const p of jobs.values()) p.reject(new PlannerCancelled());
      jobs.clear();
    };
  }, []);

  const start = useCallback(<T,>(build: (id: number) => ToWorker, buffer: ArrayBuffer, onProgress?: (f: number) => void): PlannerCall<T> => {
    const id = nextId.current++;
    const promise = new Promise<T>((resolve, reject) => {
      const w = worker.current;
      if (!w) return reject(new Error("the planner is not running"));
      pending.current.set(id, { resolve: resolve as Pending["resolve"], reject, onProgress });
      w.postMessage(build(id), [buffer]);
    });
    const cancel = () => {
      const p = pending.current.get(id);
      if (!p) return;
      worker.current?.postMessage({ type: "cancel", id } satisfies ToWorker);
      pending.current.delete(id);
      p.reject(new PlannerCancelled());
    };
    return { promise, cancel };
  }, []);

  /** Ranks orientations of the file in `buffer` (transferred: the caller loses it). */
  const orient = useCallback(
    (buffer: ArrayBuffer, options: OrientJobOptions, onProgress?: (f: number) => void) => start<OrientJobResult>((id) => ({ type: "orient", id, buffer, options }), buffer, onProgress),
    [start],
  );

  /** Ranks split planes of the file in the given orientation. */
  const split = useCallback(
    (buffer: ArrayBuffer, options: OrientJobOptions & { quaternion: Quat }, onProgress?: (f: number) => void) => start<SplitJobResult>((id) => ({ type: "split", id, buffer, options }), buffer, onProgress),
    [start],
  );

  return { orient, split };
}
