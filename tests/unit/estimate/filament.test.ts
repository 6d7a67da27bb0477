import { describe, expect, it } from "vitest";
import {
  MATERIALS,
  filamentCrossSectionMm2,
  filamentGramsPerMetre,
  filamentMetresForGrams,
  filamentMetresPerKg,
} from "@/lib/estimate";

// Worked check from REFERENCES.md "Materials": 1.75 mm filament has a 2.40528 mm² cross-section,
// so PLA (1.24 g/cm³, NatureWorks Ingeo 2003D/4032D datasheets) weighs 2.9825 g/m, 335.3 m/kg.
describe("filament helper", () => {
  it("gives the cross-section of 1.75 mm filament", () => {
    expect(filamentCrossSectionMm2(1.75)).toBeCloseTo(2.40528, 5);
  });

  it("gives grams per metre of 1.75 mm PLA from its datasheet density", () => {
    expect(filamentGramsPerMetre(1.75, 1.24)).toBeCloseTo(2.9825, 4);
    expect(filamentGramsPerMetre(1.75, MATERIALS.pla.densityGcm3)).toBeCloseTo(2.9825, 4);
  });

  it("gives metres per kilogram of 1.75 mm PLA", () => {
    expect(filamentMetresPerKg(1.75, 1.24)).toBeCloseTo(335.3, 1);
  });

  it("turns a job's grams back into metres of filament", () => {
    // 100 g of 1.75 mm PLA: 100 / 2.9825 = 33.53 m (same worked check).
    expect(filamentMetresForGrams(100, 1.75, 1.24)).toBeCloseTo(33.53, 2);
  });

  it("scales with the square of the diameter", () => {
    // Area of a circle ∝ d² (elementary geometry): 2.85 mm vs 1.75 mm, both common sizes.
    const ratio = filamentGramsPerMetre(2.85, 1.24) / filamentGramsPerMetre(1.75, 1.24);
    expect(ratio).toBeCloseTo((2.85 / 1.75) ** 2, 10);
  });

  it("refuses a zero diameter or density", () => {
    expect(() => filamentGramsPerMetre(0, 1.24)).toThrow(RangeError);
    expect(() => filamentGramsPerMetre(1.75, 0)).toThrow(RangeError);
  });
});
