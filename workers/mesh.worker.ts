/// <reference lib="webworker" />
// Thin shell: receives a file's bytes, runs lib/mesh, posts progress and the result back.
import { failureMessage, runAnalyzeJob } from "@/lib/mesh/worker-job";
import { resultTransferables, type FromWorker, type ToWorker } from "@/lib/mesh/worker-protocol";

const scope = self as unknown as DedicatedWorkerGlobalScope;
const cancelled = new Set<number>();
const post = (m: FromWorker, transfer: Transferable[] = []) => scope.postMessage(m, transfer);

scope.onmessage = async (ev: MessageEvent<ToWorker>) => {
  const msg = ev.data;
  if (msg.type === "cancel") {
    cancelled.add(msg.id);
    return;
  }
  const { id } = msg;
  try {
    const result = await runAnalyzeJob(new Uint8Array(msg.buffer), msg.options, {
      progress: (phase, fraction) => post({ type: "progress", id, phase, fraction }),
      cancelled: () => cancelled.has(id),
    });
    post({ type: "result", id, result }, resultTransferables(result));
  } catch (e) {
    post(failureMessage(id, e));
  } finally {
    cancelled.delete(id);
  }
};
