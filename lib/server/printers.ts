import "server-only";
import { asc } from "drizzle-orm";
import { db } from "@/db";
import { printerMaterials, printers, type MaterialType } from "@/db/schema";
import { MATERIALS, MATERIAL_KEYS } from "@/lib/estimate";

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

/** Every printer's build volume and the materials it may print, for "which printers does this part fit". */
export async function listPrinterBeds(): Promise<PrinterBed[]> {
  const d = db();
  const rows = await d
    .select({ id: printers.id, name: printers.name, bedX: printers.bedXMm, bedY: printers.bedYMm, height: printers.heightMm })
    .from(printers)
    .orderBy(asc(printers.name));
  const links = await d
    .select({ printerId: printerMaterials.printerId, type: printerMaterials.materialType })
    .from(printerMaterials);
  return rows.map((r) => {
    const keys = MATERIAL_KEYS.filter((k) => links.some((l) => l.printerId === r.id && l.type === k));
    return { ...r, materials: keys.map((k) => MATERIALS[k].name), materialKeys: keys };
  });
}
