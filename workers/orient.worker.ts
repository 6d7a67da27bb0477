/// <reference lib="webworker" />
// Thin shell: receives a part's file bytes, runs the orientation search or the split planner from
// lib/orient, posts progress and the result back. A cancel flags the job; the search checks it.
import Module from "manifold-3d";
import { readMesh } from "@/lib/mesh";
import { applyOrientation, matrixFromQuaternion, planSplits, rotationFromMatrix, searchOrientations, SearchCancelledError, type ManifoldWasm, type OrientationCandidate } from "@/lib/orient";
import { orientTransferables, overhangMaskFor, splitTransferables, type CandidateView, type FromWorker, type OrientJobOptions, type ToWorker } from "@/lib/orient/worker-protocol";

const scope = self as unknown as DedicatedWorkerGlobalScope;
const flags = new Map<number, { aborted: boolean }>();
const post = (m: FromWorker, transfer: Transferable[] = []) => scope.postMessage(m, transfer);
let wasm: Promise<ManifoldWasm> | null = null;

function view(c: OrientationCandidate, soup: { positions: Float32Array }, o: OrientJobOptions): CandidateView {
  const turned = applyOrientation(soup, c.rotation);
  return {
    down: c.down, source: c.source, rotation: c.rotation, overhangArea: c.overhangArea, supportVolume: c.supportVolume, height: c.height, layers: c.layers,
    bedContactArea: c.bedContactArea, footprint: c.footprint, fits: c.fits.map((f) => ({ printerId: f.printerId, fits: f.fits })), fitsAny: c.fitsAny, score: c.score,
    stable: c.stable, contactRequired: c.contactRequired, label: c.label, turn: c.turn,
    positions: turned.positions, overhangMask: overhangMaskFor(turned.positions, o.overhangAngle),
  };
}

scope.onmessage = async (ev: MessageEvent<ToWorker>) => {
  const msg = ev.data;
  if (msg.type === "cancel") {
    const f = flags.get(msg.id);
    if (f) f.aborted = true;
    return;
  }
  const { id, options: o } = msg;
  const signal = { aborted: false };
  flags.set(id, signal);
  const progress = (fraction: number) => post({ type: "progress", id, fraction });
  try {
    const soup = readMesh(new Uint8Array(msg.buffer), { units: o.units }).soup;
    if (msg.type === "orient") {
      const r = await searchOrientations(soup, { printers: o.printers, layerHeight: o.layerHeight, overhangAngle: o.overhangAngle, onProgress: progress, signal });
      const result = { candidates: r.candidates.map((c) => view(c, soup, o)), original: view(r.original, soup, o), directionsEvaluated: r.directionsEvaluated };
      post({ type: "orient-result", id, result }, orientTransferables(result));
    } else {
      wasm ??= Module().then((w) => {
        w.setup();
        return w;
      });
      const rotation = rotationFromMatrix(matrixFromQuaternion(msg.options.quaternion));
      const plan = await planSplits(await wasm, soup, { rotation, printers: o.printers, layerHeight: o.layerHeight, overhangAngle: o.overhangAngle, onProgress: progress, signal });
      const result = {
        partFits: plan.partFits,
        supportBefore: plan.supportBefore,
        candidates: plan.candidates.map((c) => ({
          kind: c.kind, planes: c.planes, supportBefore: c.supportBefore, supportAfter: c.supportAfter, supportSaved: c.supportSaved, cutArea: c.cutArea, allPiecesFit: c.allPiecesFit,
          pieces: c.pieces.map((p) => ({ volume: p.volume, fitsAny: p.orientation.fitsAny, positions: p.soup.positions })),
        })),
      };
      post({ type: "split-result", id, result }, splitTransferables(result));
    }
  } catch (e) {
    if (e instanceof SearchCancelledError || signal.aborted) post({ type: "cancelled", id });
    else post({ type: "error", id, message: e instanceof Error ? e.message : "the planner failed" });
  } finally {
    flags.delete(id);
  }
};
