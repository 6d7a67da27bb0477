import "server-only";
import { and, eq, inArray, ne, sql } from "drizzle-orm";
import { db } from "@/db";
import { assemblies, attendedHours, materials, partInstances, parts, plateItems, plates, printHistory, printers, spools, statusEvents, workshopSettings, type MaterialType, type PlateStatus } from "@/db/schema";
import { createAttendedCalendar } from "@/lib/calendar/attended-hours";
import { machineCentsExact, materialCentsExact, quoteCost, roundCents, type CostBreakdown } from "@/lib/estimate";
import { can } from "@/lib/permissions";
import { FUMES_CAUTION, UNATTENDED_CAUTION } from "@/lib/plan/plan";
import { needsEnclosure } from "@/lib/plan/rules";
import type { SpoolChange } from "@/lib/plan/schema";
import type { PartStatus } from "@/lib/status";
import { plateStatusLabel, type PlateCancelInput, type PlateFailInput, type PlateFinishInput, type PlateStartInput } from "@/lib/validation/plates";
import { AppError } from "./errors";
import { addCharge } from "./ledger";
import { notify, type Executor, type Tx } from "./mail";
import { readySpool } from "./spool-change";
import type { SessionUser } from "./session";

/** The figures kept with a plate when it is planned (refreshed at start): what its members are charged. */
export interface PlateQuote {
  currency: string;
  materialName: string;
  pricePerKgCents: number;
  hourlyRateCents: number;
  feeCents: number;
  startupMinutes: number;
  items: { instanceId: number; memberId: number; grams: number; minutes: number }[];
  totalMinutes: number;
  totalGrams: number;
  cost: CostBreakdown;
}

type QuoteItem = PlateQuote["items"][number];

export function makeQuote(
  items: QuoteItem[],
  printer: { hourlyRateCents: number; startupMinutes: number },
  material: { name: string; pricePerKgCents: number },
  feeCents: number,
  currency: string,
): PlateQuote {
  const totalGrams = items.reduce((s, i) => s + i.grams, 0);
  const totalMinutes = printer.startupMinutes + items.reduce((s, i) => s + i.minutes, 0);
  const cost = quoteCost({ grams: totalGrams, minutes: totalMinutes }, printer, material, feeCents);
  return { currency, materialName: material.name, pricePerKgCents: material.pricePerKgCents, hourlyRateCents: printer.hourlyRateCents, feeCents, startupMinutes: printer.startupMinutes, items, totalMinutes, totalGrams, cost };
}

export interface MemberCharge {
  memberId: number;
  materialCents: number;
  machineCents: number;
  feeCents: number;
  totalCents: number;
}

/**
 * Each member's share of a plate: their grams at the kept price per kg, their share of the plate's
 * machine time (start-up included) in proportion to their print minutes, and the plate fee split
 * evenly between the members on it (the odd cents to the lowest member ids).
 */
export function memberCharges(q: PlateQuote): MemberCharge[] {
  const by = new Map<number, { grams: number; minutes: number }>();
  for (const i of q.items) {
    const m = by.get(i.memberId) ?? { grams: 0, minutes: 0 };
    m.grams += i.grams;
    m.minutes += i.minutes;
    by.set(i.memberId, m);
  }
  const ids = [...by.keys()].sort((a, b) => a - b);
  const printMinutes = q.items.reduce((s, i) => s + i.minutes, 0);
  const feeEach = ids.length ? Math.floor(q.feeCents / ids.length) : 0;
  const odd = ids.length ? q.feeCents - feeEach * ids.length : 0;
  return ids.map((memberId, k) => {
    const m = by.get(memberId)!;
    const share = printMinutes > 0 ? m.minutes / printMinutes : 1 / ids.length;
    const materialCents = roundCents(materialCentsExact(m.grams, q.pricePerKgCents));
    const machineCents = roundCents(machineCentsExact(q.totalMinutes * share, q.hourlyRateCents));
    const feeCents = feeEach + (k < odd ? 1 : 0);
    return { memberId, materialCents, machineCents, feeCents, totalCents: materialCents + machineCents + feeCents };
  });
}

/** The price list today for a plate on a printer: the loaded spool's material when it is of the plate's family, else the cheapest of the family. */
export async function currentPricing(d: Executor, printerId: number, type: MaterialType) {
  const [p] = await d.select({ hourlyRateCents: printers.hourlyRateCents, startupMinutes: printers.startupMinutes }).from(printers).where(eq(printers.id, printerId));
  const [onSpool] = await d
    .select({ name: materials.name, pricePerKgCents: materials.pricePerKgCents })
    .from(spools)
    .innerJoin(materials, eq(materials.id, spools.materialId))
    .where(and(eq(spools.loadedPrinterId, printerId), eq(materials.type, type)));
  const [cheapest] = await d.select({ name: materials.name, pricePerKgCents: materials.pricePerKgCents }).from(materials).where(eq(materials.type, type)).orderBy(materials.pricePerKgCents).limit(1);
  const [ws] = await d.select({ fee: workshopSettings.plateFeeCents, currency: workshopSettings.currency }).from(workshopSettings).where(eq(workshopSettings.id, 1));
  return {
    printer: p ?? { hourlyRateCents: 0, startupMinutes: 0 },
    material: onSpool ?? cheapest ?? { name: type.toUpperCase(), pricePerKgCents: 0 },
    feeCents: ws?.fee ?? 0,
    currency: ws?.currency ?? "EUR",
  };
}

/** The plan's spool change as the plate's columns (all NULL when the right spool is already on). */
export function spoolChangeColumns(c: SpoolChange | null) {
  return {
    changeFromMaterial: c?.from?.material ?? null,
    changeFromColour: c?.from?.color ?? null,
    changeToMaterial: c?.to.material ?? null,
    changeToColour: c?.to.color ?? null,
  };
}

export const plateLabel = (id: number, printerName?: string) => `Plate ${id}${printerName ? ` on ${printerName}` : ""}`;

/** Moves instances along status steps with one history row per step; only rows still in `from` move. */
export async function moveInstances(tx: Tx, ids: number[], from: PartStatus, steps: PartStatus[], by: number, reason: string, reprint = false): Promise<number> {
  if (!ids.length) return 0;
  const final = steps[steps.length - 1]!;
  const [res] = await tx
    .update(partInstances)
    .set({ status: final, reprints: reprint ? sql`${partInstances.reprints} + 1` : sql`${partInstances.reprints}`, version: sql`${partInstances.version} + 1`, updatedAt: new Date() })
    .where(and(inArray(partInstances.id, ids), eq(partInstances.status, from)));
  let prev = from;
  const rows: (typeof statusEvents.$inferInsert)[] = [];
  for (const [k, to] of steps.entries()) {
    for (const id of ids) rows.push({ instanceId: id, fromStatus: prev, toStatus: to, byUserId: by, reason: k === 0 ? reason : "Back to the queue for a reprint" });
    prev = to;
  }
  await tx.insert(statusEvents).values(rows);
  return res.affectedRows;
}

interface Locked {
  id: number;
  printerId: number;
  status: PlateStatus;
  version: number;
  material: string;
  colour: string;
  estimatedMinutes: number;
  estimatedGrams: number;
  quote: unknown;
}

/** Locks the plate row; a stale version or a status this action does not take is a 409 naming what happened. */
export async function lockPlate(tx: Tx, id: number, version: number, allowed: PlateStatus[], verb: string): Promise<Locked> {
  const [p] = await tx
    .select({ id: plates.id, printerId: plates.printerId, status: plates.status, version: plates.version, material: plates.material, colour: plates.colour, estimatedMinutes: plates.estimatedMinutes, estimatedGrams: plates.estimatedGrams, quote: plates.quote })
    .from(plates)
    .where(eq(plates.id, id))
    .for("update");
  if (!p) throw new AppError("not_found", "There is no such plate (a re-plan may have replaced it). Reload the Floor.");
  if (p.version !== version || !allowed.includes(p.status)) {
    const now = plateStatusLabel[p.status].toLowerCase();
    throw new AppError("conflict", `${plateLabel(id)} cannot ${verb}: someone else acted on it first and it is now ${now}. Reload to see it.`);
  }
  return p;
}

/** Whether a run from start to end is still going at the close of the spell it starts in (the planner's rule). */
export async function unattended(d: Executor, start: Date, end: Date, material?: string): Promise<{ runsUnattended: number; caution: string | null }> {
  const [ws] = await d.select({ tz: workshopSettings.timezone }).from(workshopSettings).where(eq(workshopSettings.id, 1));
  const hours = await d.select({ weekday: attendedHours.weekday, open: attendedHours.opensAt, close: attendedHours.closesAt }).from(attendedHours);
  const closing = createAttendedCalendar(ws?.tz ?? "UTC", hours).closingAfter(start.getTime());
  const late = closing !== null && end.getTime() > closing;
  // The same cautions the plan gives (lib/plan/plan.ts): running past closing, and ABS/ASA fumes.
  const cautions = [late ? UNATTENDED_CAUTION : null, material && needsEnclosure(material) ? FUMES_CAUTION : null].filter(Boolean);
  return { runsUnattended: late ? 1 : 0, caution: cautions.length ? cautions.join(" ") : null };
}

// updated_at is the database's clock at each update (a Date here would be the time this module loaded).
export const bump = { version: sql`${plates.version} + 1`, updatedAt: sql`CURRENT_TIMESTAMP(3)` };

async function itemsOf(tx: Tx, plateId: number) {
  return tx
    .select({ instanceId: plateItems.instanceId, memberId: plateItems.memberId, partName: parts.name, assemblyName: assemblies.name })
    .from(plateItems)
    .innerJoin(partInstances, eq(partInstances.id, plateItems.instanceId))
    .innerJoin(parts, eq(parts.id, partInstances.partId))
    .innerJoin(assemblies, eq(assemblies.id, parts.assemblyId))
    .where(eq(plateItems.plateId, plateId));
}

export const requireAct = (user: SessionUser) => {
  if (!can(user.role, "plates:act")) throw new AppError("forbidden", "Only operators and admins act on plates.");
};

/** Start a planned plate: the printer must be free and its spool hold the plate's grams; the quote is refreshed. */
export async function startPlate(user: SessionUser, id: number, input: PlateStartInput): Promise<{ version: number }> {
  requireAct(user);
  return db().transaction(async (tx) => {
    const p = await lockPlate(tx, id, input.version, ["planned"], "start");
    await tx.select({ id: printers.id }).from(printers).where(eq(printers.id, p.printerId)).for("update");
    const [busy] = await tx.select({ id: plates.id }).from(plates).where(and(eq(plates.printerId, p.printerId), eq(plates.status, "printing"), ne(plates.id, id)));
    if (busy) throw new AppError("conflict", `The printer is still printing ${plateLabel(busy.id)}. Finish or fail it first.`);
    // The spool change the plate needs, if the operator picked a spool for it, then the spool check (same transaction).
    await readySpool(tx, p, input.spoolId ?? null);
    const old = p.quote as PlateQuote;
    const price = await currentPricing(tx, p.printerId, p.material as MaterialType);
    const quote = makeQuote(old.items, price.printer, price.material, price.feeCents, price.currency);
    const now = new Date();
    const end = new Date(now.getTime() + quote.totalMinutes * 60_000);
    await tx
      .update(plates)
      .set({ status: "printing", startedAt: now, plannedStart: now, plannedEnd: end, quote, quotedAt: now, estimatedMinutes: quote.totalMinutes, ...(await unattended(tx, now, end, p.material)), ...bump })
      .where(eq(plates.id, id));
    const items = await itemsOf(tx, id);
    await moveInstances(tx, items.map((i) => i.instanceId), "plated", ["printing"], user.id, `Started on ${plateLabel(id)}`);
    return { version: p.version + 1 };
  });
}

/**
 * Finish a printing plate: its parts are printed and wait at the shelf label; the figures feed the
 * printer's calibration, the spool is lowered, each member is charged their share of the kept
 * quote once, and each member hears that their parts are ready.
 */
export async function finishPlate(user: SessionUser, id: number, input: PlateFinishInput): Promise<{ version: number; charges: MemberCharge[] }> {
  requireAct(user);
  return db().transaction(async (tx) => {
    const p = await lockPlate(tx, id, input.version, ["printing"], "be finished");
    const now = new Date();
    await tx
      .update(plates)
      .set({ status: "finished", endedAt: now, actualMinutes: input.actualMinutes, actualGrams: input.actualGrams, shelfLabel: input.shelfLabel, ...bump })
      .where(eq(plates.id, id));
    await tx.update(plateItems).set({ activeInstanceId: null }).where(eq(plateItems.plateId, id));
    const items = await itemsOf(tx, id);
    await moveInstances(tx, items.map((i) => i.instanceId), "printing", ["printed"], user.id, `Printed on ${plateLabel(id)}; waiting at ${input.shelfLabel}`);
    // Same rules as recordFinishedPlate, inside this transaction so the plate, history and spool change together.
    await tx.insert(printHistory).values({ printerId: p.printerId, plateId: id, estimatedMinutes: p.estimatedMinutes, actualMinutes: input.actualMinutes, estimatedGrams: p.estimatedGrams, actualGrams: input.actualGrams, finishedAt: now });
    const [spool] = await tx.select({ id: spools.id, grams: spools.gramsRemaining }).from(spools).where(eq(spools.loadedPrinterId, p.printerId)).for("update");
    if (spool) {
      const left = Math.max(0, spool.grams - (input.actualGrams ?? p.estimatedGrams));
      await tx.update(spools).set({ gramsRemaining: left, version: sql`${spools.version} + 1`, updatedAt: now }).where(eq(spools.id, spool.id));
    }
    const quote = p.quote as PlateQuote;
    const charges = memberCharges(quote);
    for (const c of charges) {
      await addCharge(tx, { memberId: c.memberId, plateId: id, amountCents: c.totalCents, currency: quote.currency, description: `${plateLabel(id)}: material ${c.materialCents}, machine ${c.machineCents}, fee ${c.feeCents} (cents)`, idempotencyKey: `plate:${id}:member:${c.memberId}` });
    }
    const told = new Set<string>();
    for (const it of items) {
      const key = `${it.memberId}:${it.partName}:${it.assemblyName}`;
      if (told.has(key)) continue;
      told.add(key);
      await notify("part_printed", { userId: it.memberId, partName: it.partName, assemblyName: it.assemblyName, plateLabel: `${plateLabel(id)} (collect at ${input.shelfLabel})` }, tx);
    }
    return { version: p.version + 1, charges };
  });
}

/**
 * Grams a failed run used when the operator did not weigh it: the plate's estimate times the share
 * of its estimated minutes that had passed since the start (a plate fails part-way; at most all of it).
 */
export function failedGrams(estimatedGrams: number, estimatedMinutes: number, startedAt: Date | null, endedAt: Date): number {
  if (!startedAt || estimatedMinutes <= 0) return 0;
  const share = Math.min(1, Math.max(0, (endedAt.getTime() - startedAt.getTime()) / 60_000 / estimatedMinutes));
  return Math.round(estimatedGrams * share * 10) / 10;
}

async function failedRunGrams(tx: Tx, id: number, p: Locked, now: Date): Promise<number> {
  const [row] = await tx.select({ startedAt: plates.startedAt }).from(plates).where(eq(plates.id, id));
  return failedGrams(p.estimatedGrams, p.estimatedMinutes, row?.startedAt ?? null, now);
}

/** A failed plate: its parts go back to the queue with one more reprint counted; members are told. */
export async function failPlate(user: SessionUser, id: number, input: PlateFailInput): Promise<{ version: number }> {
  requireAct(user);
  return db().transaction(async (tx) => {
    const p = await lockPlate(tx, id, input.version, ["printing"], "be marked failed");
    const now = new Date();
    const used = input.usedGrams ?? (await failedRunGrams(tx, id, p, now));
    await tx.update(plates).set({ status: "failed", endedAt: now, reason: input.reason, actualGrams: used, ...bump }).where(eq(plates.id, id));
    // The filament the failed run used came off the spool that fed it.
    const [spool] = await tx.select({ id: spools.id, grams: spools.gramsRemaining }).from(spools).where(eq(spools.loadedPrinterId, p.printerId)).for("update");
    if (spool && used > 0) await tx.update(spools).set({ gramsRemaining: Math.max(0, spool.grams - used), version: sql`${spools.version} + 1`, updatedAt: now }).where(eq(spools.id, spool.id));
    await tx.update(plateItems).set({ activeInstanceId: null }).where(eq(plateItems.plateId, id));
    const items = await itemsOf(tx, id);
    await moveInstances(tx, items.map((i) => i.instanceId), "printing", ["failed", "queued"], user.id, `${plateLabel(id)} failed: ${input.reason}`, true);
    const byMember = new Map<number, string[]>();
    for (const it of items) byMember.set(it.memberId, [...new Set([...(byMember.get(it.memberId) ?? []), it.partName])]);
    for (const [userId, partNames] of byMember) await notify("plate_failed", { userId, plateLabel: plateLabel(id), partNames, reason: input.reason }, tx);
    return { version: p.version + 1 };
  });
}

/** Cancel a planned or printing plate: its parts go back to the queue (no reprint counted). */
export async function cancelPlate(user: SessionUser, id: number, input: PlateCancelInput): Promise<{ version: number }> {
  requireAct(user);
  return db().transaction(async (tx) => {
    const p = await lockPlate(tx, id, input.version, ["planned", "printing"], "be cancelled");
    await tx.update(plates).set({ status: "cancelled", endedAt: new Date(), reason: input.reason, ...bump }).where(eq(plates.id, id));
    await tx.update(plateItems).set({ activeInstanceId: null }).where(eq(plateItems.plateId, id));
    const ids = (await itemsOf(tx, id)).map((i) => i.instanceId);
    await moveInstances(tx, ids, p.status === "printing" ? "printing" : "plated", ["queued"], user.id, `${plateLabel(id)} cancelled: ${input.reason}`);
    return { version: p.version + 1 };
  });
}
