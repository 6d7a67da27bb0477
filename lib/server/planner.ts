import "server-only";
import { and, asc, eq, inArray, sql } from "drizzle-orm";
import { db } from "@/db";
import {
  assemblies,
  attendedHours,
  materials,
  partFiles,
  partInstances,
  partOrientations,
  parts,
  plates,
  printerMaterials,
  printers,
  queueEntries,
  spools,
  workshopSettings,
  type MaterialType,
} from "@/db/schema";
import { BED_MARGIN_MM } from "@/lib/rules/fit";
import { materialKeyOf } from "@/lib/rules/materials";
import { DEFAULT_SETTINGS, estimatePart, MATERIALS, NO_CALIBRATION, type CalibrationFactor } from "@/lib/estimate";
import { parsePlanInstance, type PlanInstance, type PlanInstanceInput } from "@/lib/plan/schema";
import type { Executor } from "./mail";
import { calibrationFor } from "./printers";
import { colourFor, normColour, workshopSpools } from "./spool-stock";
import { LINE_WIDTH_PER_NOZZLE } from "./quotes";

/** Clear border on every side of the bed and the gap between parts, mm: common practice, no source. */
/** The bed margin and material keys are the workshop's rules (lib/rules); re-exported for this file's importers. */
export { BED_MARGIN_MM, materialKeyOf };
export const PART_GAP_MM = 3;
/**
 * Parts carry no nozzle choice yet, so every printer may print any of them: both sides of the
 * planner's nozzle match get the same value. The printer's own nozzle still sets the line width.
 */
export const ANY_NOZZLE = 1;
/** A printer under maintenance without an expected return is kept out of the plan this long. */
const UNKNOWN_RETURN_MS = 14 * 86_400_000;
/** A plate still printing past its planned end keeps its printer busy at least this much longer. */
const OVERRUN_MS = 15 * 60_000;

export interface PlanPrinter {
  id: number;
  name: string;
  bedX: number;
  bedY: number;
  height: number;
  nozzle: number;
  hourlyRateCents: number;
  volumetricFlowMm3s: number;
  perLayerSeconds: number;
  startupMinutes: number;
  enclosed: boolean;
  state: "available" | "busy" | "maintenance";
  expectedBackAt: Date | null;
  materials: MaterialType[];
  loaded: { type: MaterialType; colour: string; gramsRemaining: number } | null;
  calibration: CalibrationFactor;
}

/** Every printer with what the planner needs, read through the given executor. */
export async function planPrinters(d: Executor = db()): Promise<PlanPrinter[]> {
  const rows = await d
    .select({
      id: printers.id,
      name: printers.name,
      bedX: printers.bedXMm,
      bedY: printers.bedYMm,
      height: printers.heightMm,
      nozzle: printers.nozzleMm,
      hourlyRateCents: printers.hourlyRateCents,
      volumetricFlowMm3s: printers.volumetricFlowMm3s,
      perLayerSeconds: printers.perLayerSeconds,
      startupMinutes: printers.startupMinutes,
      enclosed: printers.enclosed,
      state: printers.state,
      expectedBackAt: printers.expectedBackAt,
    })
    .from(printers)
    .orderBy(asc(printers.name));
  const links = await d.select({ printerId: printerMaterials.printerId, type: printerMaterials.materialType }).from(printerMaterials);
  const loaded = await d
    .select({ printerId: spools.loadedPrinterId, type: materials.type, colour: spools.colour, grams: spools.gramsRemaining })
    .from(spools)
    .innerJoin(materials, eq(materials.id, spools.materialId))
    .where(sql`${spools.loadedPrinterId} IS NOT NULL`);
  const cal = rows.length ? await calibrationFor(rows.map((r) => r.id), undefined, d) : new Map<number, CalibrationFactor>();
  return rows.map((r) => {
    const l = loaded.find((s) => s.printerId === r.id);
    return {
      ...r,
      enclosed: r.enclosed === 1,
      materials: links.filter((x) => x.printerId === r.id).map((x) => x.type),
      loaded: l ? { type: l.type, colour: normColour(l.colour), gramsRemaining: l.grams } : null,
      calibration: cal.get(r.id) ?? NO_CALIBRATION,
    };
  });
}

export { normColour };

/** The material family of a part's free-text material ("PETG" → "petg"); null when unknown. */

/**
 * Footprint and height of an instance as it will lie on the bed: the chosen orientation's (stored
 * in part_orientations for the current file) when there is one, else the file's box as uploaded (Z up).
 */
export function instanceGeometry(
  file: { sizeX: number; sizeY: number; sizeZ: number },
  oriented?: { footprint: [number, number]; height: number } | null,
): { footprint: [number, number]; height: number } {
  if (oriented) return { footprint: [oriented.footprint[0], oriented.footprint[1]], height: oriented.height };
  return { footprint: [file.sizeX, file.sizeY], height: file.sizeZ };
}

export interface PartForEstimate {
  layerHeightMm: number;
  walls: number;
  infillPercent: number;
  analysis: { volume_mm3?: number; area_mm2?: number; footprint_area_mm2?: number };
  sizeZ: number;
}

/**
 * Print minutes (without the plate's start-up, which the planner adds once per plate) and grams
 * of one copy, on the cheapest printer that takes the material, after its calibration.
 */
export function estimateInstance(part: PartForEstimate, printer: PlanPrinter, densityGcm3: number): { minutes: number; grams: number } {
  const volume = Math.max(part.analysis.volume_mm3 ?? 0, 1);
  const area = Math.max(part.analysis.area_mm2 ?? 0, 1);
  const e = estimatePart(
    { volumeMm3: volume, areaMm2: area, heightMm: Math.max(part.sizeZ, part.layerHeightMm), footprintAreaMm2: part.analysis.footprint_area_mm2 || undefined },
    { ...DEFAULT_SETTINGS, layerHeightMm: part.layerHeightMm, wallCount: part.walls, infill: part.infillPercent / 100, lineWidthMm: printer.nozzle * LINE_WIDTH_PER_NOZZLE },
    printer,
    { densityGcm3, pricePerKgCents: 0 },
    { calibration: printer.calibration },
  );
  const minutes = (e.time.rawMinutes - e.time.startupMinutes) * printer.calibration.timeFactor;
  return { minutes: Math.max(minutes, 0.5), grams: e.grams };
}

/** The printer whose timing prices an instance: the cheapest per hour that takes the material. */
export function timingPrinter(all: readonly PlanPrinter[], type: MaterialType): PlanPrinter | null {
  return [...all].filter((p) => p.materials.includes(type)).sort((a, b) => a.hourlyRateCents - b.hourlyRateCents || a.id - b.id)[0] ?? null;
}

/** Density of the cheapest priced material of a family, else the reference value. */
export async function densities(d: Executor = db()): Promise<Map<MaterialType, { densityGcm3: number; pricePerKgCents: number; name: string }>> {
  const rows = await d.select({ type: materials.type, density: materials.densityGcm3, price: materials.pricePerKgCents, name: materials.name }).from(materials).orderBy(asc(materials.pricePerKgCents), asc(materials.id));
  const out = new Map<MaterialType, { densityGcm3: number; pricePerKgCents: number; name: string }>();
  for (const r of rows) if (!out.has(r.type)) out.set(r.type, { densityGcm3: r.density, pricePerKgCents: r.price, name: r.name });
  return out;
}

export const densityOf = (m: Map<MaterialType, { densityGcm3: number }>, t: MaterialType) => m.get(t)?.densityGcm3 ?? MATERIALS[t].densityGcm3;

/** One queued copy as the planner sees it; `key` is its part id in the plan instance. */
export interface QueuedInstance {
  key: string;
  instanceId: number;
  /** The part's current mesh version when planned. */
  fileId: number | null;
  memberId: number;
  partName: string;
  type: MaterialType;
  colour: string;
  layerHeightMm: number;
  sizeX: number;
  sizeY: number;
  sizeZ: number;
  minutes: number;
  grams: number;
  due: string | null;
  priority: number;
  /** The part's root assembly id, as the plan's assembly key. */
  rootAssemblyId: number;
}

/** The end of the wished day in the workshop's zone, as an instant. */
export function dueInstant(date: string | null, timezone: string): string | null {
  if (!date) return null;
  const [y, m, dd] = date.split("-").map(Number);
  const guess = Date.UTC(y!, m! - 1, dd!, 23, 59, 0);
  // Offset of the zone at that moment (Intl, ECMA-402): shift the UTC guess to local wall time.
  const parts = new Intl.DateTimeFormat("en-US", { timeZone: timezone, hourCycle: "h23", year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit" }).formatToParts(new Date(guess));
  const get = (t: string) => Number(parts.find((p) => p.type === t)?.value);
  const local = Date.UTC(get("year"), get("month") - 1, get("day"), get("hour"), get("minute"));
  return new Date(guess - (local - guess)).toISOString();
}

/** Queued copies and copies on plates not yet started: what a re-plan places again. */
export async function loadQueue(d: Executor, all: readonly PlanPrinter[], timezone: string): Promise<{ ready: QueuedInstance[]; refused: { instanceId: number; reason: string }[] }> {
  const rows = await d
    .select({
      instanceId: partInstances.id,
      memberId: queueEntries.memberId,
      priority: queueEntries.priority,
      wishedDate: queueEntries.wishedDate,
      partName: parts.name,
      rootAssemblyId: sql<number>`COALESCE(${assemblies.rootId}, ${assemblies.id})`,
      material: parts.material,
      colour: parts.colour,
      layerHeightMm: parts.layerHeightMm,
      walls: parts.walls,
      infillPercent: parts.infillPercent,
      fileId: partFiles.id,
      sizeX: partFiles.sizeX,
      sizeY: partFiles.sizeY,
      sizeZ: partFiles.sizeZ,
      analysis: partFiles.analysis,
      orientX: partOrientations.footprintX,
      orientY: partOrientations.footprintY,
      orientZ: partOrientations.heightMm,
    })
    .from(queueEntries)
    .innerJoin(partInstances, eq(partInstances.id, queueEntries.instanceId))
    .innerJoin(parts, eq(parts.id, partInstances.partId))
    .innerJoin(assemblies, eq(assemblies.id, parts.assemblyId))
    .leftJoin(partFiles, eq(partFiles.id, parts.currentFileId))
    .leftJoin(partOrientations, and(eq(partOrientations.partId, parts.id), eq(partOrientations.fileId, parts.currentFileId), eq(partOrientations.kind, "chosen")))
    .where(inArray(partInstances.status, ["queued", "plated"]))
    .orderBy(asc(queueEntries.sentAt), asc(partInstances.id));
  const dens = await densities(d);
  const ready: QueuedInstance[] = [];
  const refused: { instanceId: number; reason: string }[] = [];
  for (const r of rows) {
    const type = materialKeyOf(r.material);
    const timing = type ? timingPrinter(all, type) : null;
    if (!type || !timing || r.sizeX === null || r.sizeY === null || r.sizeZ === null) {
      refused.push({ instanceId: r.instanceId, reason: !type ? `unknown material ${r.material}` : !timing ? `no printer takes ${r.material}` : "the part has no mesh" });
      continue;
    }
    const oriented = r.orientX !== null && r.orientY !== null && r.orientZ !== null ? { footprint: [r.orientX, r.orientY] as [number, number], height: r.orientZ } : null;
    const geo = instanceGeometry({ sizeX: r.sizeX, sizeY: r.sizeY, sizeZ: r.sizeZ }, oriented);
    const est = estimateInstance({ ...r, sizeZ: geo.height, analysis: (r.analysis ?? {}) as PartForEstimate["analysis"] }, timing, densityOf(dens, type));
    ready.push({
      key: `i${r.instanceId}`,
      instanceId: r.instanceId,
      fileId: r.fileId,
      memberId: r.memberId,
      partName: r.partName,
      type,
      colour: normColour(r.colour),
      layerHeightMm: r.layerHeightMm,
      sizeX: geo.footprint[0],
      sizeY: geo.footprint[1],
      sizeZ: geo.height,
      minutes: est.minutes,
      grams: est.grams,
      due: dueInstant(r.wishedDate, timezone),
      priority: r.priority,
      rootAssemblyId: Number(r.rootAssemblyId),
    });
  }
  return { ready, refused };
}

/** A printer as lib/plan sees it; `unavailable` covers maintenance and plates already printing. */
export function toPlanPrinter(p: PlanPrinter, busy: { from: Date; to: Date }[], now: Date): PlanInstance["printers"][number] {
  const unavailable = busy.filter((b) => b.to > b.from).map((b) => ({ from: b.from.toISOString(), to: b.to.toISOString() }));
  if (p.state === "maintenance") {
    const back = p.expectedBackAt && p.expectedBackAt > now ? p.expectedBackAt : new Date(now.getTime() + UNKNOWN_RETURN_MS);
    unavailable.push({ from: new Date(now.getTime() - 60_000).toISOString(), to: back.toISOString() });
  }
  return {
    id: String(p.id),
    bed: [p.bedX, p.bedY],
    height: p.height,
    materials: p.materials,
    nozzle: ANY_NOZZLE,
    startup_minutes: p.startupMinutes,
    unavailable,
    loaded: p.loaded ? { material: p.loaded.type, color: p.loaded.colour } : undefined,
    // Swapping a spool and purging: common practice, no source.
    changeover_minutes: 10,
    enclosed: p.enclosed,
  };
}

export interface PlanningInput {
  instance: PlanInstance;
  queue: QueuedInstance[];
  refused: { instanceId: number; reason: string }[];
  printers: PlanPrinter[];
  timezone: string;
}

/** Reads everything a plan needs through one executor (the re-plan's transaction) and validates it with lib/plan's schema. */
export async function buildPlanningInput(d: Executor, now: Date): Promise<PlanningInput | { error: string }> {
  const [ws] = await d
    .select({ timezone: workshopSettings.timezone, allowed: workshopSettings.unattendedAllowed, maxHours: workshopSettings.unattendedMaxHours })
    .from(workshopSettings)
    .where(eq(workshopSettings.id, 1));
  const timezone = ws?.timezone ?? "UTC";
  const hours = await d.select({ weekday: attendedHours.weekday, open: attendedHours.opensAt, close: attendedHours.closesAt }).from(attendedHours);
  const all = (await planPrinters(d)).filter((p) => p.materials.length > 0);
  if (!all.length) return { error: "The workshop has no printers with materials set up, so nothing can be planned." };
  const printing = await d.select({ printerId: plates.printerId, startedAt: plates.startedAt, plannedEnd: plates.plannedEnd }).from(plates).where(eq(plates.status, "printing"));
  const { ready, refused } = await loadQueue(d, all, timezone);
  const stock = await workshopSpools(d);
  for (const q of ready) q.colour = colourFor(q.type, q.colour, stock);
  const raw: PlanInstanceInput = {
    now: now.toISOString(),
    timezone,
    attended: hours,
    margin_mm: BED_MARGIN_MM,
    gap_mm: PART_GAP_MM,
    printers: all.map((p) =>
      toPlanPrinter(
        p,
        printing.filter((x) => x.printerId === p.id).map((x) => ({ from: new Date(Math.min((x.startedAt ?? now).getTime(), now.getTime() - 60_000)), to: new Date(Math.max(x.plannedEnd.getTime(), now.getTime() + OVERRUN_MS)) })),
        now,
      ),
    ),
    parts: ready.map((q) => ({
      id: q.key,
      footprint: [q.sizeX, q.sizeY],
      height: q.sizeZ,
      minutes: q.minutes,
      material: q.type,
      color: q.colour,
      layer_height: q.layerHeightMm,
      nozzle: ANY_NOZZLE,
      quantity: 1,
      due: q.due,
      priority: q.priority,
      owner: `m${q.memberId}`,
      assembly: String(q.rootAssemblyId),
    })),
    unattended: { allowed: (ws?.allowed ?? 1) === 1, max_hours: ws?.maxHours ?? null },
    spools: [...new Map(stock.map((s) => [`${s.type}/${s.colour}`, { material: s.type, color: s.colour }])).values()],
  };
  const parsed = parsePlanInstance(raw);
  if (!parsed.ok) return { error: `The planning data is not valid: ${parsed.errors.slice(0, 3).join("; ")}` };
  return { instance: parsed.instance, queue: ready, refused, printers: all, timezone };
}

/** Used by the send check: the plan printers of lib/plan's part check, from the same source as the plan. */
export async function planPrinterShapes(d: Executor = db()) {
  const all = (await planPrinters(d)).filter((p) => p.materials.length > 0);
  return { all, shapes: all.map((p) => ({ id: String(p.id), bed: [p.bedX, p.bedY] as [number, number], height: p.height, materials: p.materials as string[], nozzle: ANY_NOZZLE, enclosed: p.enclosed })) };
}

