import "server-only";
import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import { db } from "@/db";
import { materials, printerMaterials, printHistory, printers, spools, type MaterialType, type PrinterState } from "@/db/schema";
import { calibrationFactor, DEFAULT_CALIBRATION_WINDOW, MATERIALS, MATERIAL_KEYS, type CalibrationFactor } from "@/lib/estimate";
import { can } from "@/lib/permissions";
import type { FinishedPlateInput, PrinterInput, PrinterStateInput, PrinterUpdateInput } from "@/lib/validation/printers";
import { AppError } from "./errors";
import type { Executor } from "./mail";
import type { SessionUser } from "./session";

export interface PrinterBed {
  id: number;
  name: string;
  bedX: number;
  bedY: number;
  height: number;
  /** Display names of the material families it may print, as in lib/estimate's MATERIALS ("PLA", "PETG" …). */
  materials: string[];
  /** The same families as MATERIALS keys ("pla", "petg" …), for matching without string games. */
  materialKeys: MaterialType[];
}

async function materialsByPrinter(ids?: number[]): Promise<Map<number, MaterialType[]>> {
  const q = db().select({ printerId: printerMaterials.printerId, type: printerMaterials.materialType }).from(printerMaterials);
  const links = ids ? (ids.length ? await q.where(inArray(printerMaterials.printerId, ids)) : []) : await q;
  const out = new Map<number, MaterialType[]>();
  for (const l of links) out.set(l.printerId, [...(out.get(l.printerId) ?? []), l.type]);
  // Table order of lib/estimate, so every list reads the same way.
  for (const [k, v] of out) out.set(k, MATERIAL_KEYS.filter((m) => v.includes(m)));
  return out;
}

/** Every printer's build volume and the materials it may print, for "which printers does this part fit". */
export async function listPrinterBeds(): Promise<PrinterBed[]> {
  const rows = await db()
    .select({ id: printers.id, name: printers.name, bedX: printers.bedXMm, bedY: printers.bedYMm, height: printers.heightMm })
    .from(printers)
    .orderBy(asc(printers.name));
  const mats = await materialsByPrinter();
  return rows.map((r) => {
    const keys = mats.get(r.id) ?? [];
    return { ...r, materials: keys.map((k) => MATERIALS[k].name), materialKeys: keys };
  });
}

const columns = {
  id: printers.id,
  name: printers.name,
  bedXMm: printers.bedXMm,
  bedYMm: printers.bedYMm,
  heightMm: printers.heightMm,
  nozzleMm: printers.nozzleMm,
  enclosed: printers.enclosed,
  hourlyRateCents: printers.hourlyRateCents,
  volumetricFlowMm3s: printers.volumetricFlowMm3s,
  perLayerSeconds: printers.perLayerSeconds,
  startupMinutes: printers.startupMinutes,
  state: printers.state,
  maintenanceNote: printers.maintenanceNote,
  expectedBackAt: printers.expectedBackAt,
  version: printers.version,
};

export interface LoadedSpool {
  id: number;
  label: string;
  colour: string;
  materialId: number;
  materialName: string;
  materialType: MaterialType;
  gramsRemaining: number;
}

export interface Printer {
  id: number;
  name: string;
  bedXMm: number;
  bedYMm: number;
  heightMm: number;
  nozzleMm: number;
  hourlyRateCents: number;
  volumetricFlowMm3s: number;
  perLayerSeconds: number;
  startupMinutes: number;
  state: PrinterState;
  maintenanceNote: string;
  expectedBackAt: Date | null;
  version: number;
  enclosed: boolean;
  materials: MaterialType[];
  loadedSpool: LoadedSpool | null;
  calibration: CalibrationFactor;
}

/** Calibration per printer from its last finished plates (median of actual / estimated), read through `d` (a transaction passes itself). */
export async function calibrationFor(printerIds: number[], lastN = DEFAULT_CALIBRATION_WINDOW, d: Executor = db()): Promise<Map<number, CalibrationFactor>> {
  const out = new Map<number, CalibrationFactor>();
  for (const id of printerIds) {
    // Newest first from the database, then oldest first as calibrationFactor expects. Twice the
    // window so plates with unusable figures do not shrink it.
    const rows = await d
      .select({
        estimatedMinutes: printHistory.estimatedMinutes,
        actualMinutes: printHistory.actualMinutes,
        estimatedGrams: printHistory.estimatedGrams,
        actualGrams: printHistory.actualGrams,
      })
      .from(printHistory)
      .where(eq(printHistory.printerId, id))
      .orderBy(desc(printHistory.finishedAt), desc(printHistory.id))
      .limit(lastN * 2);
    const history = rows.reverse().map((r) => ({ ...r, actualGrams: r.actualGrams ?? undefined }));
    out.set(id, calibrationFactor(history, { lastN }));
  }
  return out;
}

/** All printers with state, loaded spool and calibration. Anyone signed in may read them (rates are part of a quote). */
export async function listPrinters(user: SessionUser, ids?: number[]): Promise<Printer[]> {
  if (!can(user.role, "printers:view")) throw new AppError("forbidden", "Your role may not see the printers.");
  const base = db().select(columns).from(printers);
  const rows = await (ids ? base.where(inArray(printers.id, ids.length ? ids : [-1])) : base).orderBy(asc(printers.name));
  const idList = rows.map((r) => r.id);
  const [mats, cal, loaded] = await Promise.all([
    materialsByPrinter(idList),
    calibrationFor(idList),
    idList.length
      ? db()
          .select({
            printerId: spools.loadedPrinterId,
            id: spools.id,
            label: spools.label,
            colour: spools.colour,
            materialId: spools.materialId,
            materialName: materials.name,
            materialType: materials.type,
            gramsRemaining: spools.gramsRemaining,
          })
          .from(spools)
          .innerJoin(materials, eq(materials.id, spools.materialId))
          .where(inArray(spools.loadedPrinterId, idList))
      : Promise.resolve([]),
  ]);
  return rows.map((r) => {
    const s = loaded.find((l) => l.printerId === r.id);
    return {
      ...r,
      enclosed: r.enclosed === 1,
      materials: mats.get(r.id) ?? [],
      loadedSpool: s ? { id: s.id, label: s.label, colour: s.colour, materialId: s.materialId, materialName: s.materialName, materialType: s.materialType, gramsRemaining: s.gramsRemaining } : null,
      calibration: cal.get(r.id) ?? calibrationFactor([]),
    };
  });
}

export async function getPrinter(user: SessionUser, id: number): Promise<Printer> {
  const [p] = await listPrinters(user, [id]);
  if (!p) throw new AppError("not_found", "There is no such printer.");
  return p;
}

function isDuplicate(e: unknown): boolean {
  const err = e as { code?: string; cause?: { code?: string } } | null;
  return err?.code === "ER_DUP_ENTRY" || err?.cause?.code === "ER_DUP_ENTRY";
}

const duplicateName = () => new AppError("conflict", "A printer of that name exists already.", { name: ["Another printer has this name."] });

function values(input: PrinterInput) {
  const { materials: _m, enclosed, ...rest } = input;
  return { ...rest, enclosed: enclosed ? 1 : 0 };
}

export async function createPrinter(user: SessionUser, input: PrinterInput): Promise<Printer> {
  if (!can(user.role, "printers:manage")) throw new AppError("forbidden", "Only an admin adds printers.");
  try {
    const id = await db().transaction(async (tx) => {
      const [res] = await tx.insert(printers).values(values(input)).$returningId();
      if (!res) throw new Error("insert returned no id");
      await tx.insert(printerMaterials).values(input.materials.map((m) => ({ printerId: res.id, materialType: m })));
      return res.id;
    });
    return getPrinter(user, id);
  } catch (e) {
    if (isDuplicate(e)) throw duplicateName();
    throw e;
  }
}

/** Admins change everything, the hourly rate included; the version guards against blind overwrites. */
export async function updatePrinter(user: SessionUser, id: number, input: PrinterUpdateInput): Promise<Printer> {
  if (!can(user.role, "printers:manage")) throw new AppError("forbidden", "Only an admin changes a printer or its rate.");
  const { version, ...rest } = input;
  try {
    await db().transaction(async (tx) => {
      const [res] = await tx
        .update(printers)
        .set({ ...values(rest), version: sql`${printers.version} + 1`, updatedAt: new Date() })
        .where(and(eq(printers.id, id), eq(printers.version, version)));
      if (res.affectedRows === 0) {
        const [exists] = await tx.select({ id: printers.id }).from(printers).where(eq(printers.id, id));
        if (!exists) throw new AppError("not_found", "There is no such printer.");
        throw new AppError("conflict", "Someone else saved this printer since you opened it. Reload to see their changes.");
      }
      await tx.delete(printerMaterials).where(eq(printerMaterials.printerId, id));
      await tx.insert(printerMaterials).values(rest.materials.map((m) => ({ printerId: id, materialType: m })));
    });
  } catch (e) {
    if (isDuplicate(e)) throw duplicateName();
    throw e;
  }
  return getPrinter(user, id);
}

export async function deletePrinter(user: SessionUser, id: number): Promise<void> {
  if (!can(user.role, "printers:manage")) throw new AppError("forbidden", "Only an admin removes printers.");
  const [res] = await db().delete(printers).where(eq(printers.id, id));
  if (res.affectedRows === 0) throw new AppError("not_found", "There is no such printer.");
}

/** Operators (and admins) mark a printer available, busy or under maintenance with a note and expected return. */
export async function setPrinterState(user: SessionUser, id: number, input: PrinterStateInput): Promise<Printer> {
  if (!can(user.role, "printers:set-state")) throw new AppError("forbidden", "Only operators and admins set a printer's state.");
  const maintenance = input.state === "maintenance";
  const [res] = await db()
    .update(printers)
    .set({
      state: input.state,
      maintenanceNote: maintenance ? input.maintenanceNote : "",
      expectedBackAt: maintenance ? input.expectedBackAt : null,
      version: sql`${printers.version} + 1`,
      updatedAt: new Date(),
    })
    .where(eq(printers.id, id));
  if (res.affectedRows === 0) throw new AppError("not_found", "There is no such printer.");
  return getPrinter(user, id);
}

/**
 * A plate came off the bed: keep its figures for the calibration, and take the filament it used
 * (weighed if given, else estimated) off the spool loaded on the printer.
 */
export async function recordFinishedPlate(user: SessionUser, printerId: number, input: FinishedPlateInput): Promise<{ historyId: number; spoolGramsRemaining: number | null }> {
  if (!can(user.role, "printers:set-state")) throw new AppError("forbidden", "Only operators and admins record finished plates.");
  return db().transaction(async (tx) => {
    const [p] = await tx.select({ id: printers.id }).from(printers).where(eq(printers.id, printerId)).for("update");
    if (!p) throw new AppError("not_found", "There is no such printer.");
    const [res] = await tx.insert(printHistory).values({ printerId, ...input, finishedAt: new Date() }).$returningId();
    if (!res) throw new Error("insert returned no id");
    const used = input.actualGrams ?? input.estimatedGrams;
    const [spool] = await tx
      .select({ id: spools.id, grams: spools.gramsRemaining })
      .from(spools)
      .where(eq(spools.loadedPrinterId, printerId))
      .for("update");
    if (!spool) return { historyId: res.id, spoolGramsRemaining: null };
    const left = Math.max(0, spool.grams - used);
    await tx.update(spools).set({ gramsRemaining: left, version: sql`${spools.version} + 1`, updatedAt: new Date() }).where(eq(spools.id, spool.id));
    return { historyId: res.id, spoolGramsRemaining: left };
  });
}

/** A route's [id] segment as a positive integer; anything else is a 404, not a 500. */
export function parseId(raw: string): number {
  const n = Number(raw);
  if (!Number.isSafeInteger(n) || n <= 0) throw new AppError("not_found", "There is no such record.");
  return n;
}
