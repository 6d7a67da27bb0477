/**
 * The ranking score of an orientation; lower is better. Every term is a ratio, so parts of any size
 * score alike (see README.md for the reasoning):
 *
 *   score = w.support     · supportVolume / partVolume
 *         + w.overhang    · overhangArea  / surfaceArea
 *         + w.height      · height        / diameter
 *         + w.instability · max(0, 1 − bedContact / bestBedContact)
 *         + w.noFit       · (printers were given and none fits ? 1 : 0)
 *
 * `diameter` is the bounding-box diagonal; `bestBedContact` the largest contact any evaluated
 * direction reached. The weights are a judgement, not a standard (common practice, no source).
 */
import type { ScoreWeights } from "./types";

export const DEFAULT_WEIGHTS: ScoreWeights = {
  support: 1,
  overhang: 0.5,
  height: 0.25,
  instability: 0.25,
  noFit: 10,
};

export interface ScoreInputs {
  supportVolume: number;
  overhangArea: number;
  height: number;
  bedContactArea: number;
  /** null when no printers were given. */
  fitsAny: boolean | null;
}

export interface ScoreScale {
  volume: number;
  surfaceArea: number;
  diameter: number;
  bestBedContact: number;
}

export function orientationScore(m: ScoreInputs, s: ScoreScale, w: ScoreWeights = DEFAULT_WEIGHTS): number {
  const vol = s.volume > 0 ? s.volume : 1;
  const area = s.surfaceArea > 0 ? s.surfaceArea : 1;
  const dia = s.diameter > 0 ? s.diameter : 1;
  const instability = s.bestBedContact > 0 ? Math.max(0, 1 - m.bedContactArea / s.bestBedContact) : 0;
  return (
    (w.support * m.supportVolume) / vol +
    (w.overhang * m.overhangArea) / area +
    (w.height * m.height) / dia +
    w.instability * instability +
    (m.fitsAny === false ? w.noFit : 0)
  );
}
