/**
 * Per-printer correction learnt from finished plates.
 *
 * Each finished plate gives a ratio actual / estimated. The median of the most recent ratios is
 * the factor: unlike a mean, one plate that was paused overnight or weighed with its skirt and
 * purge does not drag it, as long as fewer than half the plates are off (breakdown point 50 %).
 */
import type { CalibrationFactor } from "./types";

export interface FinishedPlate {
  estimatedMinutes: number;
  actualMinutes: number;
  estimatedGrams?: number;
  actualGrams?: number;
}

export interface CalibrationOptions {
  /** How many of the most recent usable plates count (history is oldest first). Default 20. */
  lastN?: number;
}

export const DEFAULT_CALIBRATION_WINDOW = 20;

export const NO_CALIBRATION: CalibrationFactor = Object.freeze({
  timeFactor: 1,
  gramsFactor: 1,
  samples: 0,
  gramsSamples: 0,
});

/** Median of a non-empty list; the mean of the two middle values for an even count. */
export function median(values: readonly number[]): number {
  if (values.length === 0) throw new RangeError("median of an empty list");
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  const upper = sorted[mid] as number;
  return sorted.length % 2 === 1 ? upper : ((sorted[mid - 1] as number) + upper) / 2;
}

function usable(value: number | undefined): value is number {
  return value !== undefined && Number.isFinite(value) && value > 0;
}

/** Ratios actual / estimated of the last `n` plates where both numbers are usable. */
function recentRatios(
  history: readonly FinishedPlate[],
  n: number,
  pick: (p: FinishedPlate) => [number | undefined, number | undefined],
): number[] {
  const ratios: number[] = [];
  for (let i = history.length - 1; i >= 0 && ratios.length < n; i--) {
    const [estimated, actual] = pick(history[i] as FinishedPlate);
    if (usable(estimated) && usable(actual)) {
      const ratio = actual / estimated;
      if (Number.isFinite(ratio) && ratio > 0) ratios.push(ratio);
    }
  }
  return ratios;
}

/**
 * Factors that bring later estimates in line with this printer's record. Entries with a missing,
 * zero, negative or non-finite number are skipped (they do not use up the window). With no
 * usable history the factors are 1 and the sample counts 0.
 */
export function calibrationFactor(
  history: readonly FinishedPlate[],
  { lastN = DEFAULT_CALIBRATION_WINDOW }: CalibrationOptions = {},
): CalibrationFactor {
  if (!Number.isInteger(lastN) || lastN < 1) {
    throw new RangeError(`lastN must be a whole number of at least 1, got ${lastN}`);
  }
  const time = recentRatios(history, lastN, (p) => [p.estimatedMinutes, p.actualMinutes]);
  const grams = recentRatios(history, lastN, (p) => [p.estimatedGrams, p.actualGrams]);
  return {
    timeFactor: time.length > 0 ? median(time) : 1,
    gramsFactor: grams.length > 0 ? median(grams) : 1,
    samples: time.length,
    gramsSamples: grams.length,
  };
}

export interface Calibrated {
  minutes: number;
  grams: number;
  /** How many finished plates the time correction rests on (0: uncorrected). */
  samples: number;
  gramsSamples: number;
}

/** Corrects a raw estimate; the sample counts travel with it so the UI can show them. */
export function applyCalibration(
  estimate: { minutes: number; grams: number },
  factor: CalibrationFactor = NO_CALIBRATION,
): Calibrated {
  return {
    minutes: estimate.minutes * factor.timeFactor,
    grams: estimate.grams * factor.gramsFactor,
    samples: factor.samples,
    gramsSamples: factor.gramsSamples,
  };
}
