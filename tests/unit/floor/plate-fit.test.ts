// The Move rule (lib/server/plate-fit.ts) and the Floor's spool-change words. Expected values are
// worked by hand from the rectangles given (common practice, no source); the ABS brim is the plan's
// 5 mm rule (lib/plan/rules.ts, itself common practice, no source).
import { describe, expect, it } from "vitest";
import { spoolChangeWords } from "@/components/floor/format";
import { failedGrams } from "@/lib/server/plates";
import { moveTargets, plateExtent, recentre, whyNot, type FitPrinter } from "@/lib/server/plate-fit";

const printer = (id: number, name: string, bed: number, height: number, materials: string[], enclosed = false, state = "available"): FitPrinter => ({ id, name, bedX: bed, bedY: bed, height, enclosed, materials, state });
const printers = [
  printer(1, "Heron", 220, 250, ["pla", "petg"]),
  printer(2, "Wren", 180, 180, ["pla", "petg", "tpu"]),
  printer(3, "Osprey", 256, 256, ["pla", "petg", "abs"], true),
  printer(4, "Kite", 220, 120, ["pla", "petg"]),
  printer(5, "Lark", 220, 250, ["pla", "abs"]),
  printer(6, "Owl", 220, 250, ["pla", "petg"], false, "maintenance"),
];

describe("which printers can take a plate", () => {
  // Two 60 × 40 × 130 mm parts centred on Heron's 220 mm bed: extent 123 × 40 (3 mm gap), 130 high.
  const items = [
    { x: 48.5, y: 90, rotated: false, sizeX: 60, sizeY: 40, sizeZ: 130 },
    { x: 111.5, y: 90, rotated: false, sizeX: 60, sizeY: 40, sizeZ: 130 },
  ];
  it("measures the layout's extent, not where it sat on the old bed", () => {
    expect(plateExtent("petg", items)).toEqual({ minX: 48.5, minY: 90, width: 123, depth: 40, height: 130 });
  });
  it("lists printers by material, enclosure, maintenance, bed and height", () => {
    const plate = { printerId: 1, material: "petg" };
    expect(moveTargets(plate, items, printers, 5).map((p) => p.name)).toEqual(["Wren", "Osprey"]);
    const ext = plateExtent("petg", items);
    expect(whyNot(plate, ext, printers[0]!, 5)).toMatch(/already/);
    expect(whyNot(plate, ext, printers[3]!, 5)).toMatch(/does not fit Kite/);
    expect(whyNot(plate, ext, printers[4]!, 5)).toMatch(/does not print PETG/);
    expect(whyNot(plate, ext, printers[5]!, 5)).toMatch(/maintenance/);
  });
  it("keeps ABS to enclosed printers and counts its brim in the extent", () => {
    // 165 mm wide + 2 × 5 mm brim = 175 mm: not within Wren's 170 mm (180 less 2 × 5 mm margin).
    const wide = [{ x: 20, y: 20, rotated: false, sizeX: 165, sizeY: 30, sizeZ: 10 }];
    expect(plateExtent("abs", wide).width).toBe(175);
    expect(moveTargets({ printerId: 3, material: "abs" }, wide, printers, 5).map((p) => p.name)).toEqual([]);
    expect(whyNot({ printerId: 3, material: "abs" }, plateExtent("abs", wide), printers[4]!, 5)).toMatch(/needs an enclosed printer/);
  });
  it("a turned item counts with its sides swapped; recentring puts the extent mid-bed", () => {
    const turned = [{ x: 0, y: 0, rotated: true, sizeX: 100, sizeY: 20, sizeZ: 5 }];
    const ext = plateExtent("pla", turned);
    expect([ext.width, ext.depth]).toEqual([20, 100]);
    expect(recentre(ext, { bedX: 180, bedY: 180 })).toEqual({ dx: 80, dy: 40 });
  });
});

describe("the spool change in words", () => {
  it("says what to load and what to take off", () => {
    expect(spoolChangeWords({ from: { material: "abs", colour: "grey" }, to: { material: "petg", colour: "green" } })).toBe("Load PETG green; take ABS grey off first");
    expect(spoolChangeWords({ from: null, to: { material: "pla", colour: "any" } })).toBe("Load PLA (no spool on the printer now)");
    expect(spoolChangeWords(null)).toBe("Spool already on");
  });
});

describe("filament a failed plate used", () => {
  it("is the estimate times the share of the run done, at most all of it", () => {
    const start = new Date("2026-03-02T09:00:00Z");
    expect(failedGrams(80, 120, start, new Date("2026-03-02T09:30:00Z"))).toBe(20);
    expect(failedGrams(80, 120, start, new Date("2026-03-02T13:00:00Z"))).toBe(80);
    expect(failedGrams(80, 120, null, new Date())).toBe(0);
  });
});
