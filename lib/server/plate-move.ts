import "server-only";
import { and, eq, inArray, sql } from "drizzle-orm";
import { db } from "@/db";
import { attendedHours, plateItems, plates, printerMaterials, printers, workshopSettings, type MaterialType } from "@/db/schema";
import { createAttendedCalendar } from "@/lib/calendar/attended-hours";
import type { PlateMoveInput } from "@/lib/validation/plates";
import { AppError } from "./errors";
import type { Executor } from "./mail";
import { plateExtent, recentre, whyNot, type FitItem, type FitPrinter } from "./plate-fit";
import { bump, currentPricing, lockPlate, makeQuote, requireAct, unattended, type PlateQuote } from "./plates";
import { BED_MARGIN_MM } from "./planner";
import type { SessionUser } from "./session";

/** Printers as the move rule sees them (plate-fit.ts), through the given executor. */
export async function fitPrinters(d: Executor, ids?: number[]): Promise<FitPrinter[]> {
  const rows = await d
    .select({ id: printers.id, name: printers.name, bedX: printers.bedXMm, bedY: printers.bedYMm, height: printers.heightMm, enclosed: printers.enclosed, state: printers.state, materials: sql<string | null>`(SELECT GROUP_CONCAT(pm.material_type) FROM ${printerMaterials} pm WHERE pm.printer_id = ${printers.id})` })
    .from(printers)
    .where(ids ? inArray(printers.id, ids) : undefined)
    .orderBy(printers.name);
  return rows.map((r) => ({ ...r, enclosed: r.enclosed === 1, materials: r.materials ? r.materials.split(",") : [] }));
}

export async function plateFitItems(d: Executor, plateId: number): Promise<(FitItem & { id: number })[]> {
  const rows = await d.select({ id: plateItems.id, x: plateItems.x, y: plateItems.y, rotated: plateItems.rotated, sizeX: plateItems.sizeX, sizeY: plateItems.sizeY, sizeZ: plateItems.sizeZ }).from(plateItems).where(eq(plateItems.plateId, plateId));
  return rows.map((r) => ({ ...r, rotated: r.rotated === 1 }));
}

/**
 * Move a planned plate to another printer that can take it (plate-fit.ts: material, housing, bed
 * and height; the same rule lists the targets on the Floor). The layout is re-centred on the new
 * bed; the plate goes after that printer's last live plate, at the next attended time.
 */
export async function movePlate(user: SessionUser, id: number, input: PlateMoveInput): Promise<{ version: number }> {
  requireAct(user);
  return db().transaction(async (tx) => {
    const p = await lockPlate(tx, id, input.version, ["planned"], "be moved");
    await tx.select({ id: printers.id }).from(printers).where(eq(printers.id, input.printerId)).for("update");
    const [t] = await fitPrinters(tx, [input.printerId]);
    if (!t) throw new AppError("invalid", "Pick a printer that exists.", { printerId: ["There is no such printer."] });
    const items = await plateFitItems(tx, id);
    const extent = plateExtent(p.material, items);
    const why = whyNot({ printerId: p.printerId, material: p.material }, extent, t, BED_MARGIN_MM);
    if (why) throw new AppError("invalid", why, { printerId: [why] });
    const { dx, dy } = recentre(extent, t);
    await tx.update(plateItems).set({ x: sql`${plateItems.x} + ${dx}`, y: sql`${plateItems.y} + ${dy}` }).where(eq(plateItems.plateId, id));
    const [last] = await tx.select({ end: sql<Date | null>`MAX(${plates.plannedEnd})` }).from(plates).where(and(eq(plates.printerId, t.id), inArray(plates.status, ["planned", "printing"])));
    const lastEnd = last?.end ? new Date(last.end).getTime() : 0;
    const old = p.quote as PlateQuote;
    const price = await currentPricing(tx, t.id, p.material as MaterialType);
    const quote = makeQuote(old.items, price.printer, price.material, price.feeCents, price.currency);
    // Someone must be there to start it: the next attended moment after the printer is free.
    const [ws] = await tx.select({ tz: workshopSettings.timezone }).from(workshopSettings).where(eq(workshopSettings.id, 1));
    const hours = await tx.select({ weekday: attendedHours.weekday, open: attendedHours.opensAt, close: attendedHours.closesAt }).from(attendedHours);
    const free = Math.max(Date.now(), lastEnd);
    const start = new Date(createAttendedCalendar(ws?.tz ?? "UTC", hours).nextOpening(free) ?? free);
    const end = new Date(start.getTime() + quote.totalMinutes * 60_000);
    await tx
      .update(plates)
      .set({ printerId: t.id, plannedStart: start, plannedEnd: end, quote, quotedAt: new Date(), estimatedMinutes: quote.totalMinutes, ...(await unattended(tx, start, end, p.material)), ...bump })
      .where(eq(plates.id, id));
    return { version: p.version + 1 };
  });
}
