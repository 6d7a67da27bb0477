// Materials and spools on the real database: prices by admins only, loading and unloading by
// operators, low stock, cautions, and a plate refused on a spool that holds too little.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db";
import { workshopSettings } from "@/db/schema";
import { AppError } from "@/lib/server/errors";
import type { SessionUser } from "@/lib/server/session";
import { assertSpoolHolds, createMaterial, createSpool, deleteMaterial, listMaterials, loadSpool, setSpoolGrams, SPOOL_MARGIN, updateMaterial } from "@/lib/server/materials";
import { createPrinter, getPrinter } from "@/lib/server/printers";
import { materialInput, materialUpdateInput, spoolInput } from "@/lib/validation/materials";
import { printerInput } from "@/lib/validation/printers";

const admin: SessionUser = { id: 9101, email: "a@test.example", name: "Test Admin", role: "admin" };
const operator: SessionUser = { id: 9102, email: "o@test.example", name: "Test Operator", role: "operator" };
const member: SessionUser = { id: 9103, email: "m@test.example", name: "Test Member", role: "member" };

async function code(p: Promise<unknown>): Promise<string> {
  try {
    await p;
    return "ok";
  } catch (e) {
    if (e instanceof AppError) return e.code;
    throw e;
  }
}

const abs = materialInput.parse({ name: "MT ABS Black", type: "abs", densityGcm3: 1.05, densitySource: "producers' datasheets", pricePerKgCents: 2400 });

beforeAll(async () => {
  await db().insert(workshopSettings).ignore().values({ id: 1, name: "Test Workshop", timezone: "Europe/Berlin", currency: "EUR", plateFeeCents: 150 });
});
afterAll(closeDb);

describe("materials: prices", () => {
  it("only an admin adds a material or changes its price (403 otherwise)", async () => {
    expect(await code(createMaterial(member, abs))).toBe("forbidden");
    expect(await code(createMaterial(operator, abs))).toBe("forbidden");
    const m = await createMaterial(admin, abs);
    const change = materialUpdateInput.parse({ ...abs, pricePerKgCents: 2600, version: m.version });
    expect(await code(updateMaterial(member, m.id, change))).toBe("forbidden");
    expect(await code(updateMaterial(operator, m.id, change))).toBe("forbidden");
    expect((await updateMaterial(admin, m.id, change)).pricePerKgCents).toBe(2600);
    expect(await code(updateMaterial(admin, m.id, change))).toBe("conflict");
    // Members see prices only through quotes.
    expect(await code(listMaterials(member))).toBe("forbidden");
  });

  it("shows the cautions that apply: ventilation and enclosure for ABS, drying for nylon, none for PLA", async () => {
    // Cautions: DESIGN.md (fumes of ABS/ASA, enclosure, dry nylon), common practice, no source.
    const nylon = await createMaterial(admin, materialInput.parse({ name: "MT PA6", type: "nylon", densityGcm3: 1.13, densitySource: "BASF Ultramid B40 datasheet", pricePerKgCents: 4500 }));
    const pla = await createMaterial(admin, materialInput.parse({ name: "MT PLA", type: "pla", densityGcm3: 1.24, densitySource: "NatureWorks Ingeo datasheets", pricePerKgCents: 2000 }));
    const all = await listMaterials(operator);
    const keys = (id: number) => all.find((m) => m.id === id)?.cautions.map((c) => c.key);
    expect(keys(all.find((m) => m.name === "MT ABS Black")!.id)).toEqual(["ventilate", "enclosure"]);
    expect(keys(nylon.id)).toEqual(["dry-first"]);
    expect(keys(pla.id)).toEqual([]);
  });

  it("refuses a density outside 0.5–3 g/cm³, a missing source and unknown fields", () => {
    expect(materialInput.safeParse({ ...abs, densityGcm3: 0 }).error?.issues[0]?.path).toEqual(["densityGcm3"]);
    expect(materialInput.safeParse({ ...abs, densitySource: "" }).error?.issues[0]?.path).toEqual(["densitySource"]);
    expect(materialInput.safeParse({ ...abs, colour: "red" }).success).toBe(false);
    expect(spoolInput.safeParse({ materialId: 1, label: "x", colour: "Red", gramsInitial: 1000, gramsRemaining: 1200 }).error?.issues[0]?.path).toEqual(["gramsRemaining"]);
  });
});

describe("spools", () => {
  it("an operator loads, swaps and unloads spools; the printer must take the material", async () => {
    const pla = (await listMaterials(admin)).find((m) => m.name === "MT PLA")!;
    const absM = (await listMaterials(admin)).find((m) => m.name === "MT ABS Black")!;
    const p = await createPrinter(admin, printerInput.parse({ name: "MT Cedar", bedXMm: 180, bedYMm: 180, heightMm: 180, nozzleMm: 0.4, enclosed: false, hourlyRateCents: 200, materials: ["pla"] }));
    expect(await code(createSpool(member, { materialId: pla.id, label: "MT-1", colour: "White", gramsInitial: 1000, gramsRemaining: 1000 }))).toBe("forbidden");
    const s1 = await createSpool(operator, { materialId: pla.id, label: "MT-1", colour: "White", gramsInitial: 1000, gramsRemaining: 1000 });
    const s2 = await createSpool(operator, { materialId: pla.id, label: "MT-2", colour: "Orange", gramsInitial: 1000, gramsRemaining: 150 });
    const s3 = await createSpool(operator, { materialId: absM.id, label: "MT-3", colour: "Black", gramsInitial: 1000, gramsRemaining: 900 });

    expect(await code(loadSpool(member, s1.id, p.id))).toBe("forbidden");
    await loadSpool(operator, s1.id, p.id);
    expect((await getPrinter(member, p.id)).loadedSpool?.label).toBe("MT-1");
    // ABS on a printer set up for PLA only: refused with the reason on the field.
    expect(await code(loadSpool(operator, s3.id, p.id))).toBe("invalid");
    // Loading another spool is a filament change: the first goes back to the shelf.
    await loadSpool(operator, s2.id, p.id);
    const after = (await listMaterials(operator)).find((m) => m.id === pla.id)!;
    expect(after.spools.find((s) => s.id === s1.id)?.loadedPrinterId).toBeNull();
    expect(after.spools.find((s) => s.id === s2.id)).toMatchObject({ loadedPrinterId: p.id, loadedPrinterName: "MT Cedar", low: true });
    // Low stock: 150 g is under the default mark of 200 g; the material says so.
    expect(after.lowStock).toBe(true);
    expect(after.colours.sort()).toEqual(["Orange", "White"]);
    expect(after.gramsInStock).toBe(1150);

    // A plate of 140 g needs 154 g with the spare: 150 g is too little; 130 g (143 g) starts.
    expect(140 * SPOOL_MARGIN).toBeGreaterThan(150);
    expect(await code(assertSpoolHolds(p.id, 140))).toBe("conflict");
    expect(await assertSpoolHolds(p.id, 130, "pla")).toEqual({ spoolId: s2.id, gramsRemaining: 150 });
    expect(await code(assertSpoolHolds(p.id, 10, "petg"))).toBe("conflict");

    await loadSpool(operator, s2.id, null);
    expect((await getPrinter(member, p.id)).loadedSpool).toBeNull();
    expect(await code(assertSpoolHolds(p.id, 1))).toBe("conflict");
  });

  it("an operator weighs a spool, guarded by its version; a material with spools is not removed", async () => {
    const pla = (await listMaterials(operator)).find((m) => m.name === "MT PLA")!;
    const s = pla.spools.find((x) => x.label === "MT-1")!;
    expect(await code(setSpoolGrams(member, s.id, { gramsRemaining: 800, version: s.version }))).toBe("forbidden");
    await setSpoolGrams(operator, s.id, { gramsRemaining: 800, version: s.version });
    expect(await code(setSpoolGrams(operator, s.id, { gramsRemaining: 700, version: s.version }))).toBe("conflict");
    expect(await code(deleteMaterial(admin, pla.id))).toBe("conflict");
  });
});
