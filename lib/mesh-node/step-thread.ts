import { createRequire } from "node:module";
import path from "node:path";
import { Worker } from "node:worker_threads";
import { MeshReadError } from "@/lib/mesh/errors";
import { STEP_PARAMS, type OcctResult } from "@/lib/mesh/step-read";

/**
 * The STEP tessellator in a worker thread, so that a file that makes it run away (some malformed
 * files loop for minutes inside the WebAssembly) can be stopped: each job has a time limit, after
 * which the thread is terminated (and a fresh one started for the next file). One job at a time;
 * the module stays loaded between files. The thread's code is plain JavaScript given as a string,
 * so it runs the same under the CLI, the tests and the Next server bundle.
 */
const THREAD = `
const { parentPort, workerData } = require("node:worker_threads");
const ready = require(workerData.modulePath)({ print() {}, printErr() {} });
parentPort.on("message", async ({ bytes, params }) => {
  try {
    const occt = await ready;
    const r = occt.ReadStepFile(bytes, params);
    const meshes = (r.meshes || []).map((m) => ({
      name: m.name || "",
      position: Float32Array.from(m.attributes.position.array),
      index: Uint32Array.from(m.index.array),
    }));
    parentPort.postMessage({ ok: true, success: !!r.success, meshes }, meshes.flatMap((m) => [m.position.buffer, m.index.buffer]));
  } catch (e) {
    parentPort.postMessage({ ok: false, message: String((e && e.message) || e).slice(0, 200) });
  }
});
`;

type Reply = { ok: true; success: boolean; meshes: { name: string; position: Float32Array; index: Uint32Array }[] } | { ok: false; message: string };

/** Default time limit for one file's tessellation (ms). */
export const STEP_TIME_LIMIT_MS = 60_000;

let worker: Worker | undefined;
let queue: Promise<unknown> = Promise.resolve();

function thread(): Worker {
  if (!worker) {
    const modulePath = createRequire(path.join(process.cwd(), "package.json")).resolve("occt-import-js");
    worker = new Worker(THREAD, { eval: true, workerData: { modulePath } });
    worker.unref();
  }
  return worker;
}

function stop(): void {
  const w = worker;
  worker = undefined;
  void w?.terminate();
}

function run(bytes: Uint8Array, limitMs: number): Promise<OcctResult> {
  return new Promise<OcctResult>((resolve, reject) => {
    const w = thread();
    const done = (f: () => void) => {
      clearTimeout(timer);
      w.off("message", onMessage);
      w.off("error", onError);
      w.off("exit", onExit);
      f();
    };
    const timer = setTimeout(() => {
      done(() => {
        stop();
        reject(new MeshReadError("BAD_STEP", `the STEP file took longer than ${Math.round(limitMs / 1000)} s to tessellate and was stopped (a malformed or very large file)`));
      });
    }, limitMs);
    const onMessage = (m: Reply) =>
      done(() => {
        if (!m.ok) return reject(new MeshReadError("BAD_STEP", `the STEP file could not be read (${m.message})`));
        resolve({ success: m.success, meshes: m.meshes.map((x) => ({ name: x.name, attributes: { position: { array: x.position } }, index: { array: x.index } })) });
      });
    const onError = (e: Error) =>
      done(() => {
        stop();
        reject(new MeshReadError("BAD_STEP", `the STEP reader failed (${e.message.slice(0, 120)})`));
      });
    const onExit = () => done(() => { worker = undefined; reject(new MeshReadError("BAD_STEP", "the STEP reader stopped unexpectedly")); });
    w.on("message", onMessage);
    w.on("error", onError);
    w.on("exit", onExit);
    w.postMessage({ bytes, params: STEP_PARAMS });
  });
}

/** Tessellate in the thread, one file at a time, within `limitMs`. */
export function tessellateStep(bytes: Uint8Array, limitMs = STEP_TIME_LIMIT_MS): Promise<OcctResult> {
  const job = queue.then(() => run(bytes, limitMs));
  queue = job.catch(() => undefined);
  return job;
}
