"use client";
// One hook owns the mesh worker: created in an effect, terminated on clean-up. The main thread
// never parses; it hands the file's bytes over (transferred, not copied) and awaits the result.
import { useCallback, useEffect, useRef } from "react";
import type { AnalyzeOptions, AnalyzeResult, FromWorker, ProgressPhase, ToWorker } from "@/lib/mesh/worker-protocol";

export interface MeshJobError extends Error {
  code: string;
}

export interface AnalyzeCall {
  promise: Promise<AnalyzeResult>;
  cancel(): void;
}

interface Pending {
  resolve(r: AnalyzeResult): void;
  reject(e: MeshJobError): void;
  onProgress?: (phase: ProgressPhase, fraction: number) => void;
  /** Inside the STEP tessellator: one synchronous call that no cancel message can interrupt. */
  tessellating?: boolean;
}

/** A STEP file still tessellating after this long is stopped by restarting the worker. */
const TESSELLATE_LIMIT_MS = 60_000;

function jobError(code: string, message: string): MeshJobError {
  return Object.assign(new Error(message), { name: "MeshJobError", code });
}

export function useMeshWorker() {
  const worker = useRef<Worker | null>(null);
  const pending = useRef(new Map<number, Pending>());
  const nextId = useRef(1);

  // Set by the effect: stop the worker (rejecting its jobs: `stuck` with `why`, the others as
  // interrupted) and start a fresh one. The only way out of a tessellation that runs away.
  const restart = useRef<(stuck: number, why: MeshJobError) => void>(() => undefined);

  useEffect(() => {
    const jobs = pending.current;
    let timer: ReturnType<typeof setTimeout> | undefined;
    let stopped = false;
    const start = () => {
      const w = new Worker(new URL("../../workers/mesh.worker.ts", import.meta.url), { type: "module" });
      w.onmessage = (ev: MessageEvent<FromWorker>) => {
        const m = ev.data;
        const p = jobs.get(m.id);
        if (!p) return;
        if (m.type === "progress") {
          const tessellating = m.phase === "tessellate" && m.fraction < 1;
          if (tessellating !== !!p.tessellating) {
            p.tessellating = tessellating;
            clearTimeout(timer);
            if (tessellating) {
              const id = m.id;
              timer = setTimeout(() => restart.current(id, jobError("BAD_STEP", `the STEP file took longer than ${TESSELLATE_LIMIT_MS / 1000} s to tessellate and was stopped`)), TESSELLATE_LIMIT_MS);
            }
          }
          p.onProgress?.(m.phase, m.fraction);
          return;
        }
        if (p.tessellating) clearTimeout(timer);
        jobs.delete(m.id);
        if (m.type === "result") p.resolve(m.result);
        else if (m.type === "error") p.reject(jobError(m.code, m.message));
        else p.reject(jobError("CANCELLED", "analysis cancelled"));
      };
      w.onerror = (ev) => {
        for (const p of jobs.values()) p.reject(jobError("INTERNAL", ev.message || "the mesh worker failed"));
        jobs.clear();
      };
      worker.current = w;
    };
    restart.current = (stuck, why) => {
      if (stopped) return;
      clearTimeout(timer);
      worker.current?.terminate();
      for (const [id, p] of jobs) p.reject(id === stuck ? why : jobError("CANCELLED", "the mesh worker was restarted; choose the file again"));
      jobs.clear();
      start();
    };
    start();
    return () => {
      stopped = true;
      clearTimeout(timer);
      worker.current?.terminate();
      worker.current = null;
      for (const p of jobs.values()) p.reject(jobError("CANCELLED", "the mesh worker was stopped"));
      jobs.clear();
    };
  }, []);

  /** Analyse a File or ArrayBuffer. An ArrayBuffer is transferred: the caller loses it. */
  const analyze = useCallback(
    (input: File | ArrayBuffer, options: AnalyzeOptions = {}, onProgress?: Pending["onProgress"]): AnalyzeCall => {
      const id = nextId.current++;
      let cancelled = false;
      const promise = new Promise<AnalyzeResult>((resolve, reject) => {
        pending.current.set(id, { resolve, reject, onProgress });
        const start = async () => {
          const w = worker.current;
          if (!w) throw jobError("INTERNAL", "the mesh worker is not running");
          const buffer = input instanceof ArrayBuffer ? input : await input.arrayBuffer();
          if (cancelled) return;
          const filename = options.filename ?? (input instanceof ArrayBuffer ? undefined : input.name);
          const msg: ToWorker = { type: "analyze", id, buffer, options: { ...options, filename } };
          w.postMessage(msg, [buffer]);
        };
        start().catch((e: unknown) => {
          pending.current.delete(id);
          reject(e instanceof Error && "code" in e ? (e as MeshJobError) : jobError("INTERNAL", "could not read the file"));
        });
      });
      const cancel = () => {
        if (cancelled) return;
        cancelled = true;
        // Inside the tessellator the worker cannot read a cancel message: restart it instead.
        if (pending.current.get(id)?.tessellating) return restart.current(id, jobError("CANCELLED", "analysis cancelled"));
        worker.current?.postMessage({ type: "cancel", id } satisfies ToWorker);
        const p = pending.current.get(id);
        pending.current.delete(id);
        p?.reject(jobError("CANCELLED", "analysis cancelled"));
      };
      return { promise, cancel };
    },
    [],
  );

  return { analyze };
}
