import { describe, expect, it } from "vitest";
import { applyCalibration, calibrationFactor, median } from "@/lib/estimate";
import type { FinishedPlate } from "@/lib/estimate";
import { seededRandom } from "./fixtures";

/**
 * Simulated record of one printer (invented): the printer really takes `timeRatio` × the
 * estimate and uses `gramsRatio` × the grams, with ±5 % noise; a share of plates is 5× off
 * (a pause left overnight, a spool weighed with its purge).
 */
function history(seed: number, count: number, timeRatio: number, gramsRatio: number, outlierShare = 0.1): FinishedPlate[] {
  const rand = seededRandom(seed);
  const out: FinishedPlate[] = [];
  for (let i = 0; i < count; i++) {
    const estimatedMinutes = 20 + rand() * 600;
    const estimatedGrams = 5 + rand() * 300;
    const noise = () => 0.95 + rand() * 0.1;
    const off = rand() < outlierShare ? 5 : 1;
    out.push({
      estimatedMinutes,
      actualMinutes: estimatedMinutes * timeRatio * noise() * off,
      estimatedGrams,
      actualGrams: estimatedGrams * gramsRatio * noise() * off,
    });
  }
  return out;
}

describe("calibration factor", () => {
  it("is 1 resting on no plates when there is no history", () => {
    expect(calibrationFactor([])).toEqual({ timeFactor: 1, gramsFactor: 1, samples: 0, gramsSamples: 0 });
  });

  it("takes the middle of an even list as the mean of the two middle values", () => {
    // Definition of the median (common practice, no source).
    expect(median([4, 1, 3, 2])).toBe(2.5);
    expect(median([7, 1, 3])).toBe(3);
  });

  it("converges to the true ratio over many plates despite 10 % of them 5× off", () => {
    // Median of ratios: robust while fewer than half the entries are outliers (breakdown point
    // of the median, 50 %; statistics textbooks, from memory).
    for (let seed = 1; seed <= 10; seed++) {
      const h = history(seed, 500, 1.18, 0.93);
      const f = calibrationFactor(h, { lastN: 500 });
      expect(f.samples).toBe(500);
      expect(Math.abs(f.timeFactor / 1.18 - 1)).toBeLessThan(0.015);
      expect(Math.abs(f.gramsFactor / 0.93 - 1)).toBeLessThan(0.015);
      // The scenario is a real test: a plain mean is dragged far off by the outliers.
      const mean = h.reduce((s, p) => s + p.actualMinutes / p.estimatedMinutes, 0) / h.length;
      expect(mean / 1.18).toBeGreaterThan(1.2);
    }
  });

  it("stays close over the default window of the last 20 plates", () => {
    for (let seed = 11; seed <= 30; seed++) {
      const f = calibrationFactor(history(seed, 60, 0.85, 1.07));
      expect(f.samples).toBe(20);
      expect(Math.abs(f.timeFactor / 0.85 - 1)).toBeLessThan(0.06);
      expect(Math.abs(f.gramsFactor / 1.07 - 1)).toBeLessThan(0.06);
    }
  });

  it("follows the most recent plates after the printer changes", () => {
    // 100 plates at 1.5 (old hotend), then 30 at 1.0 (new one): the last 20 only see the new one.
    const old = history(7, 100, 1.5, 1, 0);
    const recent = history(8, 30, 1.0, 1, 0);
    const f = calibrationFactor([...old, ...recent], { lastN: 20 });
    expect(Math.abs(f.timeFactor - 1)).toBeLessThan(0.05);
  });

  it("ignores zero, negative, missing and non-finite entries without spending the window", () => {
    const good: FinishedPlate = { estimatedMinutes: 100, actualMinutes: 110, estimatedGrams: 50, actualGrams: 45 };
    const bad: FinishedPlate[] = [
      { estimatedMinutes: 0, actualMinutes: 90 },
      { estimatedMinutes: 100, actualMinutes: -5 },
      { estimatedMinutes: Number.NaN, actualMinutes: 100 },
      { estimatedMinutes: 100, actualMinutes: Number.POSITIVE_INFINITY, estimatedGrams: 0, actualGrams: 12 },
    ];
    const f = calibrationFactor([good, good, ...bad, ...bad], { lastN: 2 });
    expect(f).toEqual({ timeFactor: 1.1, gramsFactor: 0.9, samples: 2, gramsSamples: 2 });
  });

  it("counts grams samples apart from time samples", () => {
    const f = calibrationFactor([
      { estimatedMinutes: 60, actualMinutes: 66 },
      { estimatedMinutes: 60, actualMinutes: 66, estimatedGrams: 20, actualGrams: 22 },
    ]);
    expect(f.samples).toBe(2);
    expect(f.gramsSamples).toBe(1);
    expect(f.gramsFactor).toBeCloseTo(1.1, 12);
  });

  it("corrects a later estimate and says what it rests on", () => {
    const f = calibrationFactor(history(3, 40, 1.25, 0.9, 0));
    const c = applyCalibration({ minutes: 120, grams: 80 }, f);
    expect(c.minutes).toBeCloseTo(120 * f.timeFactor, 12);
    expect(c.grams).toBeCloseTo(80 * f.gramsFactor, 12);
    expect(c.samples).toBe(20);
    expect(applyCalibration({ minutes: 120, grams: 80 })).toEqual({ minutes: 120, grams: 80, samples: 0, gramsSamples: 0 });
  });

  it("refuses a window smaller than one plate", () => {
    expect(() => calibrationFactor([], { lastN: 0 })).toThrow(RangeError);
  });
});
