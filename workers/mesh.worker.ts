/// <reference lib="webworker" />
// Thin shell: receives a file's bytes, runs lib/mesh, posts progress and the result back.
import type { OcctModule } from "@/lib/mesh/step-read";
import { failureMessage, runAnalyzeJob } from "@/lib/mesh/worker-job";
import { resultTransferables, type FromWorker, type ToWorker } from "@/lib/mesh/worker-protocol";

const scope = self as unknown as DedicatedWorkerGlobalScope;

// The STEP tessellator (OpenCascade in WebAssembly), loaded on the first STEP file. The bundler
// emits the .wasm as a static asset for this URL; its bytes are handed to the module directly, so
// the module never has to guess where it was served from.
const OCCT_WASM = new URL("../node_modules/occt-import-js/dist/occt-import-js.wasm", import.meta.url);
let occt: Promise<OcctModule> | undefined;
function loadStep(): Promise<OcctModule> {
  occt ??= (async () => {
    const [{ default: factory }, wasm] = await Promise.all([
      import("occt-import-js"),
      fetch(OCCT_WASM).then((r) => (r.ok ? r.arrayBuffer() : Promise.reject(new Error(`the STEP reader could not be loaded (${r.status})`)))),
    ]);
    return factory({ wasmBinary: wasm, print: () => undefined, printErr: () => undefined });
  })().catch((e: unknown) => {
    occt = undefined;
    throw e;
  });
  return occt;
}
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
      loadStep,
    });
    post({ type: "result", id, result }, resultTransferables(result));
  } catch (e) {
    post(failureMessage(id, e));
  } finally {
    cancelled.delete(id);
  }
};
