// Quotes on the real database against hand-worked examples: material + machine time + fee, with
// each printer's rate and calibration and the material's price and density.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { closeDb, db } from "@/db";
import { materials, workshopSettings } from "@/db/schema";
import { AppError } from "@/lib/server/errors";
import { createPrinter, getPrinter, recordFinishedPlate, updatePrinter } from "@/lib/server/printers";
import { partQuoteInput, quoteAssemblyParts, quotePart } from "@/lib/server/quotes";
import type { SessionUser } from "@/lib/server/session";
import { materialKeyOf, printerInput, printerUpdateInput, quoteAssemblyInput, quotePartInput } from "@/lib/validation/printers";

const admin: SessionUser = { id: 9301, email: "a@test.example", name: "Test Admin", role: "admin" };
const operator: SessionUser = { id: 9302, email: "o@test.example", name: "Test Operator", role: "operator" };
const member: SessionUser = { id: 9303, email: "m@test.example", name: "Test Member", role: "member" };

let materialId = 0;
let cheap = 0;
let dear = 0;
let small = 0;
const printer = (name: string, rate: number, height = 250) =>
  printerInput.parse({ name, bedXMm: 220, bedYMm: 220, heightMm: height, nozzleMm: 0.4, enclosed: false, hourlyRateCents: rate, materials: ["pla", "tpu"] });

/** A 20 mm cube standing on one face, 0.2 mm layers, 2 walls, 15 % infill. */
const cube = () =>
  quotePartInput.parse({ volumeMm3: 8000, areaMm2: 2400, heightMm: 20, footprintAreaMm2: 400, layerHeightMm: 0.2, wallCount: 2, infillPercent: 15, material: "pla", materialId });

beforeAll(async () => {
  await db().insert(workshopSettings).ignore().values({ id: 1, name: "Test Workshop", timezone: "Europe/Berlin", currency: "EUR", plateFeeCents: 150 });
  await db().update(workshopSettings).set({ plateFeeCents: 150 }).where(eq(workshopSettings.id, 1));
  const [m] = await db().insert(materials).values({ name: "QT PLA", type: "pla", densityGcm3: 1.24, densitySource: "NatureWorks Ingeo 2003D and 4032D datasheets", pricePerKgCents: 2500 }).$returningId();
  materialId = m!.id;
  cheap = (await createPrinter(admin, printer("QT Low rate", 300))).id;
  dear = (await createPrinter(admin, printer("QT High rate", 900))).id;
  small = (await createPrinter(admin, printer("QT Short", 100, 15))).id;
});
afterAll(closeDb);

// Hand-worked from the formulas in lib/estimate/README.md for the cube above (0.45 mm lines for a
// 0.4 mm nozzle, 4 top and 3 bottom layers, flow 5 mm³/s, 3 s per layer, 6 min start-up):
//   shell  = 400 × 7 × 0.2 = 560 mm³;  wall = 2 × 0.45 × 2400 = 2160 mm³
//   infill = 0.15 × (8000 − 560 − 2160) = 792 mm³;  extruded = 3512 mm³
//   grams  = 3.512 cm³ × 1.24 g/cm³ = 4.35488 g  → material 4.35488 × 2500 / 1000 = 10.887 → 11 cents
//   time   = 3512 / 5 / 60 + 100 × 3 / 60 + 6 = 11.70667 + 5 + 6 = 22.70667 min
//   machine at 300 c/h = 22.70667 / 60 × 300 = 113.53 → 114 cents;  at 900 c/h = 340.6 → 341 cents
describe("quotes", () => {
  it("prices a part on each printer that takes the material, cheapest first, with the fee", async () => {
    const q = await quotePart(member, cube());
    expect(q.currency).toBe("EUR");
    expect(q.material).toMatchObject({ id: materialId, pricePerKgCents: 2500, densityGcm3: 1.24 });
    const low = q.options.find((o) => o.printerId === cheap)!;
    expect(low.grams).toBeCloseTo(4.35488, 9);
    expect(low.minutes).toBeCloseTo(22.706667, 5);
    expect(low.cost).toEqual({ materialCents: 11, machineCents: 114, feeCents: 150, totalCents: 275 });
    expect(q.options.find((o) => o.printerId === dear)!.cost).toEqual({ materialCents: 11, machineCents: 341, feeCents: 150, totalCents: 502 });
    // A 15 mm build height cannot take a 20 mm part: listed, marked, and last despite its low rate.
    const short = q.options.find((o) => o.printerId === small)!;
    expect(short.fits).toBe(false);
    expect(q.options.at(-1)?.printerId).toBe(small);
    const fitting = q.options.filter((o) => o.fits).map((o) => o.cost.totalCents);
    expect(fitting).toEqual([...fitting].sort((a, b) => a - b));
  });

  it("changes when an admin changes the printer's rate", async () => {
    const p = await getPrinter(admin, cheap);
    await updatePrinter(admin, cheap, printerUpdateInput.parse({ ...printer("QT Low rate", 600), version: p.version }));
    const q = await quotePart(member, cube());
    // 22.70667 / 60 × 600 = 227.07 → 227 cents; 11 + 227 + 150 = 388.
    expect(q.options.find((o) => o.printerId === cheap)!.cost).toEqual({ materialCents: 11, machineCents: 227, feeCents: 150, totalCents: 388 });
  });

  it("applies the printer's calibration and says how many plates it rests on", async () => {
    // Three plates that ran 1.5 × their estimate: median 1.5. 22.70667 × 1.5 = 34.06 min at
    // 600 c/h = 340.6 → 341 cents. Weighed grams 1.1 × → 4.790368 g × 2.5 = 11.98 → 12 cents.
    for (let i = 0; i < 3; i++) {
      await recordFinishedPlate(operator, cheap, { plateId: null, estimatedMinutes: 60, actualMinutes: 90, estimatedGrams: 50, actualGrams: 55 });
    }
    const o = (await quotePart(member, cube())).options.find((x) => x.printerId === cheap)!;
    expect(o).toMatchObject({ samples: 3, gramsSamples: 3 });
    expect(o.timeFactor).toBeCloseTo(1.5, 12);
    expect(o.minutes).toBeCloseTo(34.06, 2);
    expect(o.cost).toEqual({ materialCents: 12, machineCents: 341, feeCents: 150, totalCents: 503 });
  });

  it("prices an assembly as the sum of its parts' lines with the fee once", async () => {
    const { materialId: _m, ...rest } = cube();
    const q = await quoteAssemblyParts(member, quoteAssemblyInput.parse({ parts: [{ ...rest, materialId, label: "Corner block", quantity: 2 }] }));
    // Each part goes on the cheapest printer that fits (the first fitting option of its own
    // quote); the assembly is 2 × that part's lines, and the fee once (quoteAssembly's rule).
    const best = (await quotePart(member, cube())).options.find((o) => o.fits)!;
    const line = q.lines[0]!;
    expect(q.choices[0]?.printerName).toBe(best.printerName);
    expect(line).toMatchObject({ label: "Corner block", quantity: 2, materialCents: 2 * best.cost.materialCents, machineCents: 2 * best.cost.machineCents });
    expect(q.feeCents).toBe(150);
    expect(q.totalCents).toBe(2 * (best.cost.totalCents - 150) + 150);
  });

  it("refuses a material nobody prints, and bad geometry with field messages", async () => {
    await expect(quotePart(member, { ...cube(), material: "pc", materialId: undefined })).rejects.toBeInstanceOf(AppError);
    const bad = quotePartInput.safeParse({ ...cube(), volumeMm3: -1, infillPercent: 120 });
    expect(bad.error?.issues.map((i) => i.path[0]).sort()).toEqual(["infillPercent", "volumeMm3"]);
    expect(quotePartInput.safeParse({ ...cube(), price: 1 }).success).toBe(false);
  });

  it("reads a stored analysis into the same quote, and says why when it cannot", async () => {
    // The cube's analysis as analysisToJson writes it (size, volume, area, footprint).
    const analysis = { size: [20, 20, 20], volume_mm3: 8000, volume_reliable: true, area_mm2: 2400, footprint_area_mm2: 400 };
    const r = partQuoteInput(analysis, { material: "PLA", layerHeightMm: 0.2, walls: 2, infillPercent: 15 });
    expect("input" in r).toBe(true);
    if (!("input" in r)) return;
    const fromStored = await quotePart(member, { ...r.input, materialId });
    const direct = await quotePart(member, cube());
    expect(fromStored.options.map((o) => o.cost)).toEqual(direct.options.map((o) => o.cost));
    // As text, the way MariaDB's JSON column may come back from the driver.
    const asText = partQuoteInput(JSON.stringify(analysis), { material: "PLA", layerHeightMm: 0.2, walls: 2, infillPercent: 15 });
    expect(asText).toEqual(r);
    expect(partQuoteInput(null, { material: "PLA", layerHeightMm: 0.2, walls: 2, infillPercent: 15 })).toEqual({ problem: "no mesh uploaded" });
    expect(partQuoteInput({ ...analysis, volume_reliable: false }, { material: "PLA", layerHeightMm: 0.2, walls: 2, infillPercent: 15 })).toEqual({ problem: "mesh not closed" });
    expect(materialKeyOf("PETG")).toBe("petg");
    expect(materialKeyOf("Nylon")).toBe("nylon");
    expect(materialKeyOf("tpu")).toBe("tpu");
    expect(materialKeyOf("Wood fill")).toBeNull();
  });
});
