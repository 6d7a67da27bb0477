/**
 * Messages between the page and the orientation worker, and the plain data it sends back. Pure:
 * the worker shell and the hook import only types and the helpers below.
 */
import { overhangLimit, isOverhang } from "@/lib/mesh/overhang";
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
 * is not resting on the bed. Same rule as the search (see README): n·down > sin θ, contact within 2°.
 */
export function overhangMaskFor(positions: Float32Array, overhangAngle = 45, layerHeight = 0.2): Uint8Array {
  const n = positions.length / 9;
  const mask = new Uint8Array(n);
  const sinT = overhangLimit(overhangAngle);
  const cosContact = Math.cos((2 * Math.PI) / 180);
  for (let t = 0; t < n; t++) {
    const o = 9 * t;
    const ax = positions[o + 3]! - positions[o]!, ay = positions[o + 4]! - positions[o + 1]!, az = positions[o + 5]! - positions[o + 2]!;
    const bx = positions[o + 6]! - positions[o]!, by = positions[o + 7]! - positions[o + 1]!, bz = positions[o + 8]! - positions[o + 2]!;
    const cx = ay * bz - az * by, cy = az * bx - ax * bz, cz = ax * by - ay * bx;
    const len = Math.hypot(cx, cy, cz);
    if (!(len > 0)) continue;
    const down = -cz / len;
    if (!isOverhang(down, 1, sinT)) continue;
    const zc = (positions[o + 2]! + positions[o + 5]! + positions[o + 8]!) / 3;
    if (down >= cosContact && zc <= layerHeight / 2) continue;
    mask[t] = 1;
  }
  return mask;
}

/** Buffers to hand over with a result, so nothing is copied between threads. */
export function orientTransferables(r: OrientJobResult): ArrayBuffer[] {
  return [...r.candidates, r.original].flatMap((c) => [c.positions.buffer, c.overhangMask.buffer]).filter((b, i, all): b is ArrayBuffer => b instanceof ArrayBuffer && all.indexOf(b) === i);
}

export function splitTransferables(r: SplitJobResult): ArrayBuffer[] {
  return r.candidates.flatMap((c) => c.pieces.map((p) => p.positions.buffer)).filter((b, i, all): b is ArrayBuffer => b instanceof ArrayBuffer && all.indexOf(b) === i);
}
