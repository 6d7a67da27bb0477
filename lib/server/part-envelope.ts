import "server-only";
import { and, eq, inArray } from "drizzle-orm";
import { db } from "@/db";
import { partFiles, partOrientations, parts } from "@/db/schema";
import type { PartEnvelope, PrinterEnvelope } from "@/lib/rules/fit";
import { listPrinterBeds, type PrinterBed } from "./printers";

/** A part as it will lie on the bed: the chosen orientation for its current file, else the file as drawn (Z up). */
export interface PlacedEnvelope extends PartEnvelope {
  footprint: [number, number];
  source: "chosen" | "file";
  /** Support to be filled in that orientation, mm³ (height-field estimate), when it was measured. */
  supportVolumeMm3?: number;
}

/** The printer as lib/rules sees it. */
export function printerEnvelope(b: Pick<PrinterBed, "id" | "name" | "bedX" | "bedY" | "height" | "materialKeys">): PrinterEnvelope {
  return { id: String(b.id), name: b.name, bed: [b.bedX, b.bedY], height: b.height, materials: b.materialKeys };
}

/** Every printer with its envelope. Printers may not be set up yet: that is "no printers", not an error. */
export async function workshopPrinters(): Promise<{ beds: PrinterBed[]; envelopes: PrinterEnvelope[] }> {
  const beds = await listPrinterBeds().catch(() => [] as PrinterBed[]);
  return { beds, envelopes: beds.map(printerEnvelope) };
}

const supportOf = (summary: unknown): number | undefined => {
  const s = (typeof summary === "string" ? JSON.parse(summary) : summary) as { supportVolume?: number } | null;
  return typeof s?.supportVolume === "number" ? s.supportVolume : undefined;
};

/** Envelopes of several parts at once (parts without a mesh are left out). */
export async function partEnvelopes(partIds: readonly number[]): Promise<Map<number, PlacedEnvelope>> {
  const out = new Map<number, PlacedEnvelope>();
  if (partIds.length === 0) return out;
  const rows = await db()
    .select({ partId: parts.id, sizeX: partFiles.sizeX, sizeY: partFiles.sizeY, sizeZ: partFiles.sizeZ, ox: partOrientations.footprintX, oy: partOrientations.footprintY, oh: partOrientations.heightMm, summary: partOrientations.summary })
    .from(parts)
    .innerJoin(partFiles, eq(partFiles.id, parts.currentFileId))
    .leftJoin(partOrientations, and(eq(partOrientations.partId, parts.id), eq(partOrientations.fileId, parts.currentFileId), eq(partOrientations.kind, "chosen")))
    .where(inArray(parts.id, [...partIds]));
  for (const r of rows) {
    out.set(
      r.partId,
      r.ox !== null && r.oy !== null && r.oh !== null
        ? { footprint: [r.ox, r.oy], height: r.oh, source: "chosen", supportVolumeMm3: supportOf(r.summary) }
        : { footprint: [r.sizeX, r.sizeY], height: r.sizeZ, source: "file" },
    );
  }
  return out;
}

export async function partEnvelope(partId: number): Promise<PlacedEnvelope | null> {
  return (await partEnvelopes([partId])).get(partId) ?? null;
}
