import { describe, expect, it } from "vitest";
import { CAUTIONS, MATERIALS, MATERIAL_KEYS, cautionsFor, isMaterialKey } from "@/lib/estimate";
import type { MaterialKey } from "@/lib/estimate";

// Densities in g/cm³ as REFERENCES.md "Materials" gives them, copied here by hand so the table
// is checked against the sources, not against itself.
const PUBLISHED: Record<MaterialKey, { range: [number, number]; source: string }> = {
  pla: { range: [1.24, 1.24], source: "NatureWorks Ingeo 2003D and 4032D datasheets" },
  asa: { range: [1.07, 1.07], source: "INEOS Luran S 778T datasheet" },
  nylon: { range: [1.12, 1.15], source: "BASF Ultramid B40 datasheet (PA6)" },
  tpu: { range: [1.12, 1.23], source: "Elastollan and Pellethane datasheets" },
  pc: { range: [1.2, 1.22], source: "encyclopaedic value" },
  abs: { range: [1.04, 1.08], source: "producers' datasheets" },
  petg: { range: [1.27, 1.27], source: "Eastar 6763 datasheet, value from memory" },
};

describe("materials reference table", () => {
  it("holds the seven families the workshop stocks", () => {
    expect([...MATERIAL_KEYS].sort()).toEqual(Object.keys(PUBLISHED).sort());
  });

  it.each(Object.entries(PUBLISHED))("%s default density lies in the published range", (key, ref) => {
    const m = MATERIALS[key as MaterialKey];
    const [lo, hi] = ref.range;
    expect(m.densityGcm3).toBeGreaterThanOrEqual(lo - 1e-9);
    expect(m.densityGcm3).toBeLessThanOrEqual(hi + 1e-9);
    expect(m.densityRangeGcm3[0]).toBeCloseTo(lo, 9);
    expect(m.densityRangeGcm3[1]).toBeCloseTo(hi, 9);
    expect(m.densitySource.length).toBeGreaterThan(0);
  });

  // Cautions: fumes of ABS/ASA, enclosure for ABS/ASA/PC, drying nylon (common practice, no source).
  it("flags ventilation for ABS and ASA only", () => {
    const flagged = MATERIAL_KEYS.filter((k) => MATERIALS[k].cautions.includes("ventilate"));
    expect(flagged.sort()).toEqual(["abs", "asa"]);
  });

  it("recommends an enclosure for ABS, ASA and PC", () => {
    const flagged = MATERIAL_KEYS.filter((k) => MATERIALS[k].cautions.includes("enclosure"));
    expect(flagged.sort()).toEqual(["abs", "asa", "pc"]);
  });

  it("asks to dry nylon before use", () => {
    expect(MATERIALS.nylon.cautions).toContain("dry-first");
    expect(cautionsFor("nylon").map((c) => c.message)).toEqual([CAUTIONS["dry-first"].message]);
  });

  it("defers to the workshop's rules in the ventilation text", () => {
    expect(cautionsFor("abs")[0]?.message).toMatch(/workshop's rules and local codes/);
    expect(cautionsFor("pla")).toEqual([]);
  });

  it("recognises its own keys only", () => {
    expect(isMaterialKey("petg")).toBe(true);
    expect(isMaterialKey("toString")).toBe(false);
    expect(isMaterialKey("PLA")).toBe(false);
  });
});
