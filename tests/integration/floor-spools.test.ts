// The Floor's spool side on the real database: the workshop's unattended policy, enclosure, spools and
// assemblies reach the plan; the send check; re-plan keeps each plate's spool change; Start walks
// through the change in one transaction; Move lists and takes only printers that can take the plate;
// a failed plate's filament comes off its spool; "all parts printed by". Expected figures are the rows
// this file writes (common practice, no source).
import { and, eq, inArray, isNotNull } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db";
import { assemblies, attendedHours, materials, meshBlobs, partFiles, partInstances, parts, plateItems, plates, printerMaterials, printers, spools, workshopSettings } from "@/db/schema";
import { assemblyCompletion } from "@/lib/server/assembly-completion";
import { floorBoard } from "@/lib/server/floor-board";
import { plateExtent } from "@/lib/server/plate-fit";
import { movePlate } from "@/lib/server/plate-move";
import { buildPlanningInput } from "@/lib/server/planner";
import { failPlate, startPlate } from "@/lib/server/plates";
import { replan, sendToQueue } from "@/lib/server/queue";
import type { SessionUser } from "@/lib/server/session";
import { getWorkshopSettings, updateWorkshopSettings } from "@/lib/server/workshop";
import { queueSendInput } from "@/lib/validation/queue";
import { workshopSettingsInput } from "@/lib/validation/workshop";
import { outcome, user } from "./helpers";

let member: SessionUser, operator: SessionUser, admin: SessionUser;
const printer: Record<string, number> = {};
const spool: Record<string, number> = {};
let rootId = 0;
let subId = 0;

/** A part with a stored box "mesh" in the given assembly (volume w·d·h, area 2(wd+wh+dh)). */
async function boxPart(assemblyId: number, name: string, [w, d, h]: [number, number, number], qty: number, material: string, colour: string): Promise<number> {
  const [p] = await db().insert(parts).values({ assemblyId, name, quantity: qty, material, colour, layerHeightMm: 0.2, walls: 2, infillPercent: 15 }).$returningId();
  const sha = (name.replace(/[^a-f]/gi, "").toLowerCase() + "0".repeat(64)).slice(0, 64);
  await db().insert(meshBlobs).ignore().values({ sha256: sha, sizeBytes: 84 });
  const analysis = { size: [w, d, h], watertight: true, volume_reliable: true, volume_mm3: w * d * h, area_mm2: 2 * (w * d + w * h + d * h), footprint_area_mm2: w * d };
  const [f] = await db().insert(partFiles).values({ partId: p!.id, sha256: sha, versionNo: 1, originalName: `${name}.stl`, units: "mm", format: "stl-binary", sizeX: w, sizeY: d, sizeZ: h, volumeMm3: w * d * h, watertight: 1, analysis, uploadedBy: member.id }).$returningId();
  await db().update(parts).set({ currentFileId: f!.id }).where(eq(parts.id, p!.id));
  for (let c = 1; c <= qty; c++) await db().insert(partInstances).values({ partId: p!.id, copyNo: c, status: "ready" });
  return p!.id;
}

const send = (partId: number, quantity: number) => sendToQueue(member, queueSendInput.parse({ partId, quantity, wishedDate: null, priority: 0 }));
const planned = () => db().select({ id: plates.id, printerId: plates.printerId, version: plates.version, material: plates.material, colour: plates.colour, fromM: plates.changeFromMaterial, fromC: plates.changeFromColour, toM: plates.changeToMaterial, toC: plates.changeToColour }).from(plates).where(eq(plates.status, "planned"));
const loadedOn = async (printerId: number) => (await db().select({ id: spools.id }).from(spools).where(eq(spools.loadedPrinterId, printerId)))[0]?.id ?? null;

beforeAll(async () => {
  await db().insert(workshopSettings).ignore().values({ id: 1, name: "Floor spool shop", timezone: "UTC", currency: "EUR" });
  member = await user("fs-m@test.example", "member");
  operator = await user("fs-op@test.example", "operator");
  admin = await user("fs-admin@test.example", "admin");
  await db().delete(attendedHours);
  await db().insert(attendedHours).values([1, 2, 3, 4, 5, 6, 7].map((weekday) => ({ weekday, opensAt: "00:00", closesAt: "24:00" })));
  const add = async (name: string, bed: number, height: number, types: ("pla" | "petg" | "abs")[]) => {
    const [p] = await db().insert(printers).values({ name, bedXMm: bed, bedYMm: bed, heightMm: height, nozzleMm: 0.4, hourlyRateCents: 300, startupMinutes: 6 }).$returningId();
    printer[name] = p!.id;
    await db().insert(printerMaterials).values(types.map((materialType) => ({ printerId: p!.id, materialType })));
  };
  await add("FS Heron", 220, 200, ["pla", "petg"]);
  await add("FS Wren", 180, 180, ["pla", "petg"]);
  await add("FS Lark", 220, 200, ["pla", "abs"]);
  const mat = async (name: string, type: "pla" | "petg" | "abs") => (await db().insert(materials).values({ name, type, densityGcm3: 1.25, densitySource: "test", pricePerKgCents: 2000 }).$returningId())[0]!.id;
  const pla = await mat("FS PLA", "pla");
  const petg = await mat("FS PETG", "petg");
  const abs = await mat("FS ABS", "abs");
  const sp = async (label: string, materialId: number, colour: string, grams: number, on: number | null) => {
    spool[label] = (await db().insert(spools).values({ materialId, label, colour, gramsInitial: 1000, gramsRemaining: grams, loadedPrinterId: on }).$returningId())[0]!.id;
  };
  await sp("FS-PLA-W", pla, "White", 900, printer["FS Heron"]!);
  await sp("FS-PLA-W2", pla, "White", 900, printer["FS Wren"]!);
  await sp("FS-PETG-G", petg, "Green", 800, null);
  await sp("FS-PETG-G-LOW", petg, "Green", 5, null);
  await sp("FS-ABS-GR", abs, "Grey", 700, printer["FS Lark"]!);
  const [root] = await db().insert(assemblies).values({ ownerId: member.id, name: "FS Trolley" }).$returningId();
  rootId = root!.id;
  await db().update(assemblies).set({ rootId }).where(eq(assemblies.id, rootId));
  const [sub] = await db().insert(assemblies).values({ ownerId: member.id, name: "FS Wheel", parentId: rootId, rootId }).$returningId();
  subId = sub!.id;
});
afterAll(closeDb);

describe("what the plan is given", () => {
  it("the unattended policy is saved by the admin and passed on, with enclosure, spools and root assemblies", async () => {
    const s = await getWorkshopSettings();
    expect(s.unattendedAllowed).toBe(true);
    const input = workshopSettingsInput.parse({ name: s.name, timezone: s.timezone, currency: s.currency, contactEmail: "", defaultLayerHeightMm: 0.2, defaultWalls: 3, defaultInfillPercent: 15, plateFeeCents: 0, safetyNote: "", version: s.version, unattendedAllowed: false, unattendedMaxHours: "" });
    expect((await outcome(updateWorkshopSettings(operator, input))).code).toBe("forbidden");
    const saved = await updateWorkshopSettings(admin, input);
    expect(saved).toMatchObject({ unattendedAllowed: false, unattendedMaxHours: null });
    expect(workshopSettingsInput.safeParse({ ...input, unattendedMaxHours: -2 }).success).toBe(false);
    const again = await updateWorkshopSettings(admin, { ...input, version: saved.version, unattendedAllowed: true, unattendedMaxHours: 10 });
    expect(again).toMatchObject({ unattendedAllowed: true, unattendedMaxHours: 10 });

    const wheel = await boxPart(subId, "Hub cap", [40, 40, 10], 2, "PETG", "Green");
    await send(wheel, 2);
    const built = await buildPlanningInput(db(), new Date());
    if ("error" in built) throw new Error(built.error);
    expect(built.instance.unattended).toEqual({ allowed: true, max_hours: 10 });
    expect(built.instance.printers.map((p) => p.enclosed)).toEqual([false, false, false]);
    expect(built.instance.spools).toEqual(expect.arrayContaining([{ material: "petg", color: "green" }, { material: "pla", color: "white" }, { material: "abs", color: "grey" }]));
    // A copy of a sub-assembly's part is counted under its root assembly.
    expect(built.instance.parts.map((p) => p.assembly)).toEqual([String(rootId), String(rootId)]);
  });
});

describe("sending", () => {
  it("refuses ABS when no printer that takes it is enclosed; accepts a colour not in stock, saying it waits", async () => {
    const abs = await boxPart(rootId, "Hot cover", [30, 30, 10], 1, "ABS", "Grey");
    const r = await outcome(send(abs, 1));
    expect(r.code).toBe("invalid");
    expect(r.message).toMatch(/enclosed printer/);
    await db().update(printers).set({ enclosed: 1 }).where(eq(printers.id, printer["FS Lark"]!));
    expect(await send(abs, 1)).toMatchObject({ queued: 1, waitingFor: null });
    const purple = await boxPart(rootId, "Bezel", [30, 20, 6], 1, "PETG", "Purple");
    const sent = await send(purple, 1);
    expect(sent.queued).toBe(1);
    expect(sent.waitingFor).toMatch(/no PETG Purple spool/);
  });
});

describe("re-plan, start through the change, move, fail", () => {
  it("re-plan keeps each plate's spool change and the copy without a spool waits with that reason", async () => {
    const out = await replan(operator);
    const green = (await planned()).find((p) => p.material === "petg");
    expect(green).toBeDefined();
    // No printer holds PETG green: the plate asks for it, from whatever its printer holds.
    expect(green).toMatchObject({ colour: "green", toM: "petg", toC: "green", fromM: "pla", fromC: "white" });
    const abs = (await planned()).find((p) => p.material === "abs");
    expect(abs).toMatchObject({ printerId: printer["FS Lark"], toM: null });
    expect(out.unplaced.map((u) => u.reason).join(" ")).toMatch(/petg purple spool/i);
    const board = await floorBoard(operator);
    const onBoard = board.lanes.flatMap((l) => l.plates).find((p) => p.id === green!.id);
    expect(onBoard?.change).toEqual({ from: { material: "pla", colour: "white" }, to: { material: "petg", colour: "green" } });
    // Nothing runs before it on that printer, so Start needs the same change against the spool on now.
    expect(onBoard?.startChange).toEqual(onBoard?.change);
    expect(board.spools.map((s) => s.label)).toContain("FS-PETG-G");
  });

  it("Start refuses without the change, refuses a spool too light or of another colour, then loads the picked spool and starts", async () => {
    const green = (await planned()).find((p) => p.material === "petg")!;
    const before = await loadedOn(green.printerId);
    const r = await outcome(startPlate(operator, green.id, { version: green.version }));
    expect(r.code).toBe("conflict");
    expect(r.message).toMatch(/needs PETG green/);
    expect((await outcome(startPlate(operator, green.id, { version: green.version, spoolId: spool["FS-PETG-G-LOW"]! }))).message).toMatch(/holds 5 g/);
    // The refused start rolled back: the old spool is still on.
    expect(await loadedOn(green.printerId)).toBe(before);
    expect((await outcome(startPlate(operator, green.id, { version: green.version, spoolId: spool["FS-PLA-W"]! }))).code).toBe("invalid");
    expect(await startPlate(operator, green.id, { version: green.version, spoolId: spool["FS-PETG-G"]! })).toEqual({ version: green.version + 1 });
    expect(await loadedOn(green.printerId)).toBe(spool["FS-PETG-G"]);
    const [old] = await db().select({ on: spools.loadedPrinterId }).from(spools).where(eq(spools.id, before!));
    expect(old!.on).toBeNull();
    const [row] = await db().select({ status: plates.status }).from(plates).where(eq(plates.id, green.id));
    expect(row!.status).toBe("printing");
  });

  it("Move lists only printers that can take the plate, and moves it there re-centred", async () => {
    const lead = await boxPart(rootId, "Axle washer", [150, 20, 4], 1, "PLA", "White");
    await send(lead, 1);
    await replan(operator);
    const pla = (await planned()).find((p) => p.material === "pla")!;
    const board = await floorBoard(operator);
    const onBoard = board.lanes.flatMap((l) => l.plates).find((p) => p.id === pla.id)!;
    const others = ["FS Heron", "FS Wren", "FS Lark"].filter((n) => printer[n] !== pla.printerId);
    expect(onBoard.moveTo.map((p) => p.name).sort()).toEqual(others.sort());
    // Heron is printing PETG and FS Lark holds ABS: move to whichever listed printer comes first.
    const target = onBoard.moveTo[0]!;
    expect(await movePlate(operator, pla.id, { version: pla.version, printerId: target.id })).toEqual({ version: pla.version + 1 });
    const items = await db().select({ x: plateItems.x, y: plateItems.y, rotated: plateItems.rotated, sizeX: plateItems.sizeX, sizeY: plateItems.sizeY, sizeZ: plateItems.sizeZ }).from(plateItems).where(eq(plateItems.plateId, pla.id));
    const ext = plateExtent("pla", items.map((i) => ({ ...i, rotated: i.rotated === 1 })));
    const [t] = await db().select({ x: printers.bedXMm }).from(printers).where(eq(printers.id, target.id));
    expect(ext.minX * 2 + ext.width).toBeCloseTo(t!.x, 6);
    const same = await outcome(movePlate(operator, pla.id, { version: pla.version + 1, printerId: target.id }));
    expect(same).toMatchObject({ code: "invalid" });
  });

  it("a failed plate's filament comes off the spool that fed it (the operator's figure when given)", async () => {
    const [printing] = await db().select({ id: plates.id, version: plates.version, printerId: plates.printerId }).from(plates).where(and(eq(plates.status, "printing"), eq(plates.material, "petg")));
    await failPlate(operator, printing!.id, { version: printing!.version, reason: "Lifted at the corner", usedGrams: 12.5 });
    const [s] = await db().select({ grams: spools.gramsRemaining }).from(spools).where(eq(spools.id, spool["FS-PETG-G"]!));
    expect(s!.grams).toBeCloseTo(787.5, 6);
  });
});

describe("all parts printed by", () => {
  it("is the latest planned end over the assembly's copies on live plates, naming those not planned", async () => {
    await replan(operator);
    const c = await assemblyCompletion(member, rootId);
    const ids = (await db().select({ id: partInstances.id }).from(partInstances).innerJoin(parts, eq(parts.id, partInstances.partId)).where(inArray(parts.assemblyId, [rootId, subId]))).map((r) => r.id);
    const ends = await db().select({ end: plates.plannedEnd }).from(plateItems).innerJoin(plates, eq(plates.id, plateItems.plateId)).where(and(inArray(plateItems.instanceId, ids), isNotNull(plateItems.activeInstanceId)));
    expect(c.allPrintedBy).toBe(new Date(Math.max(...ends.map((e) => e.end.getTime()))).toISOString());
    expect(c.onPlates).toBe(ends.length);
    expect(c.notPlanned.map((n) => n.partName)).toContain("Bezel");
    expect(c.copies).toBe(ids.length);
    const stranger = await user("fs-other@test.example", "member");
    expect((await outcome(assemblyCompletion(stranger, rootId))).code).toBe("not_found");
  });
});
