/**
 * Orientations named in words a maker uses, from the "down" direction (file frame): how the part is
 * turned from the way it was drawn (drawn Z up, front towards −Y). The vector stays available as a detail.
 */
import type { Vec3 } from "../mesh/types";

const DEG = 180 / Math.PI;
const near = (a: number, b: number, tolDeg = 1) => Math.abs(a - b) <= tolDeg;

/** The turn from the drawing that makes `down` face the bed, in words. */
export function turnInWords(down: readonly number[]): string {
  const l = Math.hypot(down[0]!, down[1]!, down[2]!) || 1;
  const [x, y, z] = [down[0]! / l, down[1]! / l, down[2]! / l];
  // Angle between the drawing's "down" (−Z) and this one.
  const tilt = Math.acos(Math.max(-1, Math.min(1, -z))) * DEG;
  if (near(tilt, 0)) return "standing as drawn";
  if (near(tilt, 180)) return "upside down, 180° about X";
  const axial = (v: number) => Math.abs(Math.abs(v) - 1) < 0.0002; // within about 1°
  if (near(tilt, 90)) {
    if (axial(y)) return y < 0 ? "tipped onto its front, 90° about X" : "tipped onto its back, 90° about X";
    if (axial(x)) return x < 0 ? "turned onto its left side, 90° about Y" : "turned onto its right side, 90° about Y";
  }
  // The turn runs about the axis (−Z) × down, which lies in the X–Y plane.
  const ax = y, ay = -x;
  const heading = Math.atan2(ay, ax) * DEG; // of the axis, from +X
  const deg = Math.round(tilt);
  const h = ((heading % 180) + 180) % 180;
  if (h < 5 || h > 175) return `tilted ${deg}° about X`;
  if (Math.abs(h - 90) < 5) return `tilted ${deg}° about Y`;
  return `tilted ${deg}° about an axis ${Math.round(h)}° from X`;
}

export interface OrientationName {
  /** Short name: "Lying on its largest flat face", "Turned onto its left side, 90° about Y". */
  label: string;
  /** The turn in words, when the label does not already say it. */
  turn: string;
}

/** Names an orientation; `largestFlat` when it rests on the largest contact any shown orientation has. */
export function nameOrientation(down: readonly number[], largestFlat: boolean): OrientationName {
  const turn = turnInWords(down);
  const cap = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);
  return largestFlat ? { label: "Lying on its largest flat face", turn } : { label: cap(turn), turn };
}

/** The vector as a detail: "down (0.00, −1.00, 0.00)". */
export function downDetail(down: Vec3 | readonly number[]): string {
  return `down (${Array.from(down, (v) => (Math.abs(v) < 0.005 ? 0 : v).toFixed(2).replace("-", "−")).join(", ")})`;
}
