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
}

function jobError(code: string, message: string): MeshJobError {
  return Object.assign(new Error(message), { name: "MeshJobError", code });
}

export function useMeshWorker() {
  const worker = useRef<Worker | null>(null);
  const pending = useRef(new Map<number, Pending>());
  const nextId = useRef(1);

  useEffect(() => {
    const jobs = pending.current;
    const w = new Worker(new URL("../../workers/mesh.worker.ts", import.meta.url), { type: "module" });
    w.onmessage = (ev: MessageEvent<FromWorker>) => {
      const m = ev.data;
      const p = jobs.get(m.id);
      if (!p) return;
      if (m.type === "progress") { p.onProgress?.(m.phase, m.fraction); return; }
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
    return () => {
      w.terminate();
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
