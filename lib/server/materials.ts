import "server-only";
import { and, asc, eq, isNotNull, sql } from "drizzle-orm";
import { db } from "@/db";
import { materials, printerMaterials, printers, spools, type MaterialType } from "@/db/schema";
import { cautionsFor, type Caution } from "@/lib/estimate";
import { can } from "@/lib/permissions";
import type { MaterialInput, MaterialUpdateInput, SpoolGramsInput, SpoolInput } from "@/lib/validation/materials";
import { AppError } from "./errors";
import type { Executor } from "./mail";
import type { SessionUser } from "./session";

/**
 * Spare filament asked for on top of a plate's estimate before it may start on a spool: purge,
 * skirt and estimate error. 10 %: common practice, no source.
 */
export const SPOOL_MARGIN = 1.1;

export interface Spool {
  id: number;
  label: string;
  colour: string;
  gramsInitial: number;
  gramsRemaining: number;
  loadedPrinterId: number | null;
  loadedPrinterName: string | null;
  loadedAt: Date | null;
  low: boolean;
  version: number;
}

export interface Material {
  id: number;
  name: string;
  type: MaterialType;
  densityGcm3: number;
  densitySource: string;
  pricePerKgCents: number;
  lowStockGrams: number;
  version: number;
  /** Distinct colours of its spools. */
  colours: string[];
  spools: Spool[];
  gramsInStock: number;
  /** Some spool is below the low-stock mark. */
  lowStock: boolean;
  cautions: Caution[];
}

const materialColumns = {
  id: materials.id,
  name: materials.name,
  type: materials.type,
  densityGcm3: materials.densityGcm3,
  densitySource: materials.densitySource,
  pricePerKgCents: materials.pricePerKgCents,
  lowStockGrams: materials.lowStockGrams,
  version: materials.version,
};

/** Materials with prices only, for quotes (no role check: the caller has checked). */
export async function materialPrices(type?: MaterialType) {
  const q = db().select(materialColumns).from(materials);
  return (type ? q.where(eq(materials.type, type)) : q).orderBy(asc(materials.pricePerKgCents), asc(materials.id));
}

/** Materials with their spools in stock, low-stock flags and cautions: operators and admins. */
export async function listMaterials(user: SessionUser): Promise<Material[]> {
  if (!can(user.role, "materials:view")) throw new AppError("forbidden", "Your role may not see the stock.");
  const d = db();
  const mats = await d.select(materialColumns).from(materials).orderBy(asc(materials.type), asc(materials.name));
  const sp = await d
    .select({
      materialId: spools.materialId,
      id: spools.id,
      label: spools.label,
      colour: spools.colour,
      gramsInitial: spools.gramsInitial,
      gramsRemaining: spools.gramsRemaining,
      loadedPrinterId: spools.loadedPrinterId,
      loadedPrinterName: printers.name,
      loadedAt: spools.loadedAt,
      version: spools.version,
    })
    .from(spools)
    .leftJoin(printers, eq(printers.id, spools.loadedPrinterId))
    .orderBy(asc(spools.label));
  return mats.map((m) => {
    const own = sp
      .filter((s) => s.materialId === m.id)
      .map(({ materialId: _m, ...s }) => ({ ...s, low: s.gramsRemaining < m.lowStockGrams }));
    return {
      ...m,
      colours: [...new Set(own.map((s) => s.colour))],
      spools: own,
      gramsInStock: own.reduce((a, s) => a + s.gramsRemaining, 0),
      lowStock: own.some((s) => s.low),
      cautions: cautionsFor(m.type),
    };
  });
}

function isDuplicate(e: unknown): boolean {
  const err = e as { code?: string; cause?: { code?: string } } | null;
  return err?.code === "ER_DUP_ENTRY" || err?.cause?.code === "ER_DUP_ENTRY";
}

async function oneMaterial(user: SessionUser, id: number): Promise<Material> {
  const m = (await listMaterials(user)).find((x) => x.id === id);
  if (!m) throw new AppError("not_found", "There is no such material.");
  return m;
}

export async function createMaterial(user: SessionUser, input: MaterialInput): Promise<Material> {
  if (!can(user.role, "materials:manage")) throw new AppError("forbidden", "Only an admin adds materials and sets prices.");
  try {
    const [res] = await db().insert(materials).values(input).$returningId();
    if (!res) throw new Error("insert returned no id");
    return oneMaterial(user, res.id);
  } catch (e) {
    if (isDuplicate(e)) throw new AppError("conflict", "A material of that name exists already.", { name: ["Another material has this name."] });
    throw e;
  }
}

/** Prices change only forward: quotes kept with past plates hold their own figures. */
export async function updateMaterial(user: SessionUser, id: number, input: MaterialUpdateInput): Promise<Material> {
  if (!can(user.role, "materials:manage")) throw new AppError("forbidden", "Only an admin changes materials and prices.");
  const { version, ...rest } = input;
  try {
    const [res] = await db()
      .update(materials)
      .set({ ...rest, version: sql`${materials.version} + 1`, updatedAt: new Date() })
      .where(and(eq(materials.id, id), eq(materials.version, version)));
    if (res.affectedRows === 0) {
      const [exists] = await db().select({ id: materials.id }).from(materials).where(eq(materials.id, id));
      if (!exists) throw new AppError("not_found", "There is no such material.");
      throw new AppError("conflict", "Someone else saved this material since you opened it. Reload to see their changes.");
    }
  } catch (e) {
    if (isDuplicate(e)) throw new AppError("conflict", "A material of that name exists already.", { name: ["Another material has this name."] });
    throw e;
  }
  return oneMaterial(user, id);
}

export async function deleteMaterial(user: SessionUser, id: number): Promise<void> {
  if (!can(user.role, "materials:manage")) throw new AppError("forbidden", "Only an admin removes materials.");
  const [inUse] = await db().select({ n: sql<number>`count(*)` }).from(spools).where(eq(spools.materialId, id));
  if (Number(inUse?.n ?? 0) > 0) throw new AppError("conflict", "This material still has spools. Remove them first.");
  const [res] = await db().delete(materials).where(eq(materials.id, id));
  if (res.affectedRows === 0) throw new AppError("not_found", "There is no such material.");
}

/** Operators and admins put new spools into stock. */
export async function createSpool(user: SessionUser, input: SpoolInput): Promise<{ id: number }> {
  if (!can(user.role, "spools:manage")) throw new AppError("forbidden", "Only operators and admins record spools.");
  const [m] = await db().select({ id: materials.id }).from(materials).where(eq(materials.id, input.materialId));
  if (!m) throw new AppError("invalid", "Pick a material that exists.", { materialId: ["There is no such material."] });
  try {
    const [res] = await db().insert(spools).values(input).$returningId();
    if (!res) throw new Error("insert returned no id");
    return { id: res.id };
  } catch (e) {
    if (isDuplicate(e)) throw new AppError("conflict", "A spool with that label exists already.", { label: ["Another spool has this label."] });
    throw e;
  }
}

/** The operator weighs a spool; the version guards against a plate's deduction landing in between. */
export async function setSpoolGrams(user: SessionUser, id: number, input: SpoolGramsInput): Promise<void> {
  if (!can(user.role, "spools:manage")) throw new AppError("forbidden", "Only operators and admins record spool weights.");
  const [res] = await db()
    .update(spools)
    .set({ gramsRemaining: input.gramsRemaining, version: sql`${spools.version} + 1`, updatedAt: new Date() })
    .where(and(eq(spools.id, id), eq(spools.version, input.version)));
  if (res.affectedRows === 0) {
    const [exists] = await db().select({ id: spools.id }).from(spools).where(eq(spools.id, id));
    if (!exists) throw new AppError("not_found", "There is no such spool.");
    throw new AppError("conflict", "This spool changed since you opened it (a plate may have finished). Reload and weigh again.");
  }
}

/**
 * Loads a spool on a printer (taking off whatever was on it: a filament change) or, with
 * printerId null, puts it back on the shelf. The printer must be allowed that material.
 */
export async function loadSpool(user: SessionUser, spoolId: number, printerId: number | null): Promise<void> {
  if (!can(user.role, "spools:manage")) throw new AppError("forbidden", "Only operators and admins load and unload spools.");
  await db().transaction(async (tx) => {
    const [s] = await tx
      .select({ id: spools.id, type: materials.type })
      .from(spools)
      .innerJoin(materials, eq(materials.id, spools.materialId))
      .where(eq(spools.id, spoolId))
      .for("update");
    if (!s) throw new AppError("not_found", "There is no such spool.");
    if (printerId === null) {
      await tx.update(spools).set({ loadedPrinterId: null, loadedAt: null, updatedAt: new Date() }).where(eq(spools.id, spoolId));
      return;
    }
    const [p] = await tx.select({ id: printers.id, name: printers.name }).from(printers).where(eq(printers.id, printerId)).for("update");
    if (!p) throw new AppError("invalid", "Pick a printer that exists.", { printerId: ["There is no such printer."] });
    const [allowed] = await tx
      .select({ t: printerMaterials.materialType })
      .from(printerMaterials)
      .where(and(eq(printerMaterials.printerId, printerId), eq(printerMaterials.materialType, s.type)));
    if (!allowed) throw new AppError("invalid", `${p.name} is not set up to print this material.`, { printerId: ["This printer may not print this material."] });
    await tx
      .update(spools)
      .set({ loadedPrinterId: null, loadedAt: null, updatedAt: new Date() })
      .where(and(eq(spools.loadedPrinterId, printerId), isNotNull(spools.loadedPrinterId)));
    await tx.update(spools).set({ loadedPrinterId: printerId, loadedAt: new Date(), updatedAt: new Date() }).where(eq(spools.id, spoolId));
  });
}

/**
 * May a plate needing `grams` start on this printer's loaded spool? Refuses with a reason when no
 * spool is loaded, it is another material, or it holds less than the plate plus SPOOL_MARGIN.
 */
export async function assertSpoolHolds(printerId: number, grams: number, type?: MaterialType, d: Executor = db()): Promise<{ spoolId: number; gramsRemaining: number }> {
  const [s] = await d
    .select({ id: spools.id, label: spools.label, grams: spools.gramsRemaining, type: materials.type })
    .from(spools)
    .innerJoin(materials, eq(materials.id, spools.materialId))
    .where(eq(spools.loadedPrinterId, printerId));
  if (!s) throw new AppError("conflict", "No spool is loaded on this printer.");
  if (type && s.type !== type) throw new AppError("conflict", `Spool ${s.label} is another material: change the filament first.`);
  const need = grams * SPOOL_MARGIN;
  if (s.grams < need) {
    throw new AppError("conflict", `Spool ${s.label} holds ${Math.floor(s.grams)} g; this plate needs about ${Math.ceil(need)} g with spare. Load a fuller spool.`);
  }
  return { spoolId: s.id, gramsRemaining: s.grams };
}
