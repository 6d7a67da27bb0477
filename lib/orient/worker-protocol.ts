/**
 * Messages between the page and the orientation worker, and the plain data it sends back. Pure:
 * the worker shell and the hook import only types and the helpers below.
 */
import { OVERHANG_DEG, surfaceFigures } from "@/lib/rules/surface";
import type { Quat, Rotation } from "./rotation";
import type { CutPlane } from "./split-planes";
import type { OrientationCandidate, Printer } from "./types";

export interface OrientJobOptions {
  units: "mm" | "in";
  printers: Printer[];
  layerHeight: number;
  overhangAngle?: number;
}

export type ToWorker =
  | { type: "orient"; id: number; buffer: ArrayBuffer; options: OrientJobOptions }
  | { type: "split"; id: number; buffer: ArrayBuffer; options: OrientJobOptions & { quaternion: Quat } }
  | { type: "cancel"; id: number };

/** One candidate's figures with its mesh turned into place and its own overhang mask, for a small 3D view. */
export interface CandidateView {
  down: [number, number, number];
  source: OrientationCandidate["source"];
  rotation: Rotation;
  overhangArea: number;
  supportVolume: number;
  height: number;
  layers: number;
  bedContactArea: number;
  footprint: [number, number];
  fits: { printerId: string; fits: boolean }[];
  fitsAny: boolean;
  score: number;
  stable: boolean;
  contactRequired: number;
  label: string;
  turn: string;
  positions: Float32Array;
  overhangMask: Uint8Array;
}

export interface OrientJobResult {
  candidates: CandidateView[];
  original: CandidateView;
  directionsEvaluated: number;
}

export interface SplitPieceView {
  volume: number;
  fitsAny: boolean;
  /** In the part's print frame, where the cut was made (for an exploded preview). */
  positions: Float32Array;
}

export interface SplitCandidateView {
  kind: "plane" | "to-fit";
  planes: CutPlane[];
  pieces: SplitPieceView[];
  supportBefore: number;
  supportAfter: number;
  supportSaved: number;
  cutArea: number;
  allPiecesFit: boolean;
}

export interface SplitJobResult {
  candidates: SplitCandidateView[];
  partFits: boolean;
  supportBefore: number;
}

export type FromWorker =
  | { type: "progress"; id: number; fraction: number }
  | { type: "orient-result"; id: number; result: OrientJobResult }
  | { type: "split-result"; id: number; result: SplitJobResult }
  | { type: "cancelled"; id: number }
  | { type: "error"; id: number; message: string };

/**
 * Per-facet overhang flags of a soup already in the print frame (Z up, resting on z = 0): the
 * facet's outward normal points down more steeply than the self-supporting angle allows, and it
 * is not resting on the bed: lib/rules/surface, measured by lib/mesh.
 */
export function overhangMaskFor(positions: Float32Array, overhangAngle = OVERHANG_DEG): Uint8Array {
  return surfaceFigures({ positions }, { overhangDeg: overhangAngle, mask: true }).overhangMask ?? new Uint8Array(positions.length / 9);
}

/** Buffers to hand over with a result, so nothing is copied between threads. */
export function orientTransferables(r: OrientJobResult): ArrayBuffer[] {
  return [...r.candidates, r.original].flatMap((c) => [c.positions.buffer, c.overhangMask.buffer]).filter((b, i, all): b is ArrayBuffer => b instanceof ArrayBuffer && all.indexOf(b) === i);
}

export function splitTransferables(r: SplitJobResult): ArrayBuffer[] {
  return r.candidates.flatMap((c) => c.pieces.map((p) => p.positions.buffer)).filter((b, i, all): b is ArrayBuffer => b instanceof ArrayBuffer && all.indexOf(b) === i);
}
