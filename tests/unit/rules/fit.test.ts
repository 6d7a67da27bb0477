// The one fit rule (lib/rules/fit) against hand-worked sizes. The 5 mm margin on every side is the
// workshop's documented choice (common practice, no source); the rest is arithmetic on the definition.
import { describe, expect, it } from "vitest";
import { BED_MARGIN_MM, fitOnPrinter, fitPrinters, fitVerdict, footprintFit, materialKeyOf, usableBed, type PrinterEnvelope } from "@/lib/rules";

const small: PrinterEnvelope = { id: "1", name: "Small", bed: [180, 180], height: 180, materials: ["pla", "petg"] };
const long: PrinterEnvelope = { id: "2", name: "Long", bed: [300, 200], height: 250, materials: ["pla", "abs"] };
const bare: PrinterEnvelope = { id: "3", name: "Bare", bed: [300, 300], height: 300, materials: [] };

describe("fit of a part on a printer", () => {
  it("keeps the margin on every side: 180 mm bed → 170 mm usable", () => {
    expect(BED_MARGIN_MM).toBe(5);
    expect(usableBed([180, 180])).toEqual([170, 170]);
    expect(footprintFit([170, 170], [180, 180]).fits).toBe(true);
    expect(footprintFit([170.1, 10], [180, 180]).fits).toBe(false);
  });
  it("turns the footprint a quarter when that makes it fit (worked by hand)", () => {
    // 150 × 250 on a 300 × 200 bed: usable 290 × 190; 250 > 190 as placed, turned 250 ≤ 290 and 150 ≤ 190.
    const r = fitOnPrinter({ footprint: [150, 250], height: 100 }, long, "pla");
    expect(r).toMatchObject({ fits: true, turned: true, reason: "" });
    // 250 × 150 fits as placed.
    expect(fitOnPrinter({ footprint: [250, 150], height: 100 }, long, "pla")).toMatchObject({ fits: true, turned: false });
  });
  it("checks height and material and says why not", () => {
    expect(fitOnPrinter({ footprint: [50, 50], height: 190 }, small, "pla").reason).toMatch(/height 190 mm is over its 180 mm build height/);
    expect(fitOnPrinter({ footprint: [50, 50], height: 50 }, small, "abs").reason).toBe("it does not print ABS");
    expect(fitOnPrinter({ footprint: [50, 50], height: 50 }, bare, "pla").reason).toBe("no materials are set up for it");
    expect(fitOnPrinter({ footprint: [50, 50], height: 50 }, long, null, "Wood fill").reason).toBe("the workshop does not print Wood fill");
    expect(fitPrinters({ footprint: [175, 50], height: 50 }, [small, long], "pla").map((f) => f.fits)).toEqual([false, true]);
  });
  it("gives the queue one reason, in the order a member can act on", () => {
    expect(fitVerdict({ footprint: [50, 50], height: 50 }, [small, long], "pla")).toEqual({ ok: true, printers: ["1", "2"] });
    expect(fitVerdict({ footprint: [50, 50], height: 50 }, [small], "abs")).toEqual({ ok: false, reason: "no printer takes ABS" });
    expect(fitVerdict({ footprint: [295, 100], height: 50 }, [small, long], "pla")).toMatchObject({ ok: false, reason: expect.stringMatching(/largest usable: 290 mm × 190 mm/) });
    expect(fitVerdict({ footprint: [100, 100], height: 200 }, [small], "pla")).toMatchObject({ ok: false, reason: expect.stringMatching(/height 200 mm/) });
  });
});

describe("material keys", () => {
  it("reads what members write", () => {
    expect(materialKeyOf("PLA")).toBe("pla");
    expect(materialKeyOf(" petg ")).toBe("petg");
    expect(materialKeyOf("TPU 95A")).toBe("tpu");
    expect(materialKeyOf("Nylon PA6")).toBe("nylon");
    expect(materialKeyOf("Nylon (PA6)")).toBe("nylon");
    expect(materialKeyOf("PLA Matte")).toBe("pla");
    expect(materialKeyOf("Wood fill")).toBeNull();
    expect(materialKeyOf("")).toBeNull();
  });
});
