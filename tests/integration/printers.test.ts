// Printers on the real database: who may change what, validation, state, calibration from history.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db";
import { spools, materials, workshopSettings } from "@/db/schema";
import { AppError } from "@/lib/server/errors";
import type { SessionUser } from "@/lib/server/session";
import {
  createPrinter,
  deletePrinter,
  getPrinter,
  listPrinterBeds,
  listPrinters,
  recordFinishedPlate,
  setPrinterState,
  updatePrinter,
} from "@/lib/server/printers";
import { printerInput, printerStateInput, printerUpdateInput } from "@/lib/validation/printers";

const admin: SessionUser = { id: 9001, email: "a@test.example", name: "Test Admin", role: "admin" };
const operator: SessionUser = { id: 9002, email: "o@test.example", name: "Test Operator", role: "operator" };
const member: SessionUser = { id: 9003, email: "m@test.example", name: "Test Member", role: "member" };

const base = printerInput.parse({
  name: "PT Alder",
  bedXMm: 220,
  bedYMm: 220,
  heightMm: 250,
  nozzleMm: 0.4,
  enclosed: false,
  hourlyRateCents: 300,
  materials: ["petg", "pla"],
});

async function code(p: Promise<unknown>): Promise<string> {
  try {
    await p;
    return "ok";
  } catch (e) {
    if (e instanceof AppError) return e.code;
    throw e;
  }
}

beforeAll(async () => {
  await db().insert(workshopSettings).ignore().values({ id: 1, name: "Test Workshop", timezone: "Europe/Berlin", currency: "EUR", plateFeeCents: 150 });
});
afterAll(closeDb);

describe("printers: roles", () => {
  let id = 0;
  it("an admin adds a printer; members and operators may not (403)", async () => {
    expect(await code(createPrinter(member, { ...base, name: "PT by member" }))).toBe("forbidden");
    expect(await code(createPrinter(operator, { ...base, name: "PT by operator" }))).toBe("forbidden");
    const p = await createPrinter(admin, base);
    id = p.id;
    expect(p).toMatchObject({ name: "PT Alder", bedXMm: 220, heightMm: 250, enclosed: false, hourlyRateCents: 300, state: "available" });
    // Stored in lib/estimate's table order, not the order sent.
    expect(p.materials).toEqual(["pla", "petg"]);
    expect(await code(createPrinter(admin, base))).toBe("conflict");
  });

  it("only an admin changes the rate; a stale version is refused", async () => {
    const p = await getPrinter(member, id);
    const change = printerUpdateInput.parse({ ...base, hourlyRateCents: 450, version: p.version });
    expect(await code(updatePrinter(member, id, change))).toBe("forbidden");
    expect(await code(updatePrinter(operator, id, change))).toBe("forbidden");
    const saved = await updatePrinter(admin, id, change);
    expect(saved.hourlyRateCents).toBe(450);
    expect(saved.version).toBe(p.version + 1);
    expect(await code(updatePrinter(admin, id, change))).toBe("conflict");
  });

  it("an operator sets the state with a maintenance note and expected return; a member may not", async () => {
    const back = "2026-03-02T08:00:00.000Z";
    const input = printerStateInput.parse({ state: "maintenance", maintenanceNote: "Replacing the hotend", expectedBackAt: back });
    expect(await code(setPrinterState(member, id, input))).toBe("forbidden");
    const p = await setPrinterState(operator, id, input);
    expect(p).toMatchObject({ state: "maintenance", maintenanceNote: "Replacing the hotend" });
    expect(p.expectedBackAt?.toISOString()).toBe(back);
    // Back to available clears the note, so a stale note never shows.
    const again = await setPrinterState(operator, id, printerStateInput.parse({ state: "available" }));
    expect(again).toMatchObject({ state: "available", maintenanceNote: "", expectedBackAt: null });
  });

  it("members read printers, rate included, and the beds list for fitting parts", async () => {
    const list = await listPrinters(member);
    expect(list.find((p) => p.id === id)?.hourlyRateCents).toBe(450);
    const bed = (await listPrinterBeds()).find((b) => b.id === id);
    expect(bed).toEqual({ id, name: "PT Alder", bedX: 220, bedY: 220, height: 250, materials: ["PLA", "PETG"], materialKeys: ["pla", "petg"] });
  });

  it("only an admin removes a printer", async () => {
    const p = await createPrinter(admin, { ...base, name: "PT Short-lived" });
    expect(await code(deletePrinter(operator, p.id))).toBe("forbidden");
    await deletePrinter(admin, p.id);
    expect(await code(getPrinter(admin, p.id))).toBe("not_found");
  });
});

describe("printers: validation", () => {
  it("refuses unknown fields, sizes of zero and a maintenance state without a note", () => {
    expect(printerInput.safeParse({ ...base, owner: "me" }).success).toBe(false);
    const zero = printerInput.safeParse({ ...base, bedXMm: 0 });
    expect(zero.success).toBe(false);
    expect(zero.error?.issues[0]?.path).toEqual(["bedXMm"]);
    const none = printerInput.safeParse({ ...base, materials: [] });
    expect(none.error?.issues[0]?.message).toMatch(/at least one material/);
    const bad = printerStateInput.safeParse({ state: "maintenance", maintenanceNote: "" });
    expect(bad.error?.issues[0]?.path).toEqual(["maintenanceNote"]);
    // An operator's state change cannot smuggle in a rate.
    expect(printerStateInput.safeParse({ state: "busy", hourlyRateCents: 1 }).success).toBe(false);
    expect(printerStateInput.safeParse({ state: "asleep" }).success).toBe(false);
  });
});

describe("printers: calibration from finished plates", () => {
  it("uses the median of actual / estimated, and takes the grams off the loaded spool", async () => {
    const p = await createPrinter(admin, { ...base, name: "PT Birch" });
    const [m] = await db().insert(materials).values({ name: "PT PLA", type: "pla", densityGcm3: 1.24, densitySource: "test", pricePerKgCents: 2000 }).$returningId();
    await db().insert(spools).values({ materialId: m!.id, label: "PT-S1", colour: "Grey", gramsInitial: 1000, gramsRemaining: 500, loadedPrinterId: p.id });
    // Ratios 1.1, 1.3, 5.0 (a plate paused overnight), 1.2, 1.15: sorted 1.1 1.15 1.2 1.3 5.0, so the
    // median is 1.2 (definition of the median; the outlier does not move it, the mean would be 1.95).
    const ratios = [1.1, 1.3, 5.0, 1.2, 1.15];
    for (const r of ratios) {
      await recordFinishedPlate(operator, p.id, { plateId: null, estimatedMinutes: 100, actualMinutes: 100 * r, estimatedGrams: 40, actualGrams: null });
    }
    const got = await getPrinter(member, p.id);
    expect(got.calibration.samples).toBe(5);
    expect(got.calibration.timeFactor).toBeCloseTo(1.2, 12);
    expect(got.calibration.gramsSamples).toBe(0);
    expect(got.calibration.gramsFactor).toBe(1);
    // 5 plates × 40 estimated grams (none weighed) = 200 g off 500 g.
    expect(got.loadedSpool?.gramsRemaining).toBeCloseTo(300, 9);
    const weighed = await recordFinishedPlate(operator, p.id, { plateId: null, estimatedMinutes: 60, actualMinutes: 66, estimatedGrams: 40, actualGrams: 44 });
    expect(weighed.spoolGramsRemaining).toBeCloseTo(256, 9);
    expect(await code(recordFinishedPlate(member, p.id, { plateId: null, estimatedMinutes: 1, actualMinutes: 1, estimatedGrams: 1, actualGrams: null }))).toBe("forbidden");
  });
});
