// Demo plates for the Floor of the invented Kettle Lane Workshop, laid out by lib/plan from the seeded
// copies: printing now, planned next, finished yesterday (parts on a shelf), one failed, one cancelled.
// Idempotent: nothing is written when any plate exists. Queue entries are added for copies in the workshop.
import { eq, inArray } from "drizzle-orm";
import type { MySql2Database } from "drizzle-orm/mysql2";
import { DEFAULT_SETTINGS, estimatePart, isMaterialKey, quoteCost } from "../../lib/estimate";
import { planWorkshop } from "../../lib/plan/plan";
import { planInstanceSchema } from "../../lib/plan/schema";
import * as schema from "../schema";

type D = MySql2Database<typeof schema>;
type Status = schema.PlateStatus;
const { assemblies, attendedHours, partFiles, partInstances, parts, plateItems, plates, printerMaterials, printers, queueEntries, statusEvents, workshopSettings } = schema;
const H = 3_600_000;

export async function seedPlates(d: D): Promise<void> {
  const [any] = await d.select({ id: plates.id }).from(plates).limit(1);
  if (any) return;
  const [ws] = await d.select({ tz: workshopSettings.timezone, fee: workshopSettings.plateFeeCents, currency: workshopSettings.currency }).from(workshopSettings).limit(1);
  const rows = await d
    .select({ id: partInstances.id, status: partInstances.status, reprints: partInstances.reprints, owner: assemblies.ownerId, name: parts.name, material: parts.material, colour: parts.colour, layer: parts.layerHeightMm, walls: parts.walls, infill: parts.infillPercent, sx: partFiles.sizeX, sy: partFiles.sizeY, sz: partFiles.sizeZ, vol: partFiles.volumeMm3, analysis: partFiles.analysis })
    .from(partInstances)
    .innerJoin(parts, eq(parts.id, partInstances.partId))
    .innerJoin(assemblies, eq(assemblies.id, parts.assemblyId))
    .innerJoin(partFiles, eq(partFiles.id, parts.currentFileId))
    .where(inArray(partInstances.status, ["queued", "plated", "printing", "printed", "accepted"]));
  if (!ws || !rows.length) return;
  for (const r of rows) await d.insert(queueEntries).ignore().values({ instanceId: r.id, memberId: r.owner, sentBy: r.owner, priority: 0 });
  const prs = await d.select({ id: printers.id, name: printers.name, x: printers.bedXMm, y: printers.bedYMm, h: printers.heightMm, rate: printers.hourlyRateCents, startup: printers.startupMinutes }).from(printers);
  const links = await d.select({ p: printerMaterials.printerId, t: printerMaterials.materialType }).from(printerMaterials);
  const hours = await d.select({ weekday: attendedHours.weekday, open: attendedHours.opensAt, close: attendedHours.closesAt }).from(attendedHours);
  const [op] = await d.select({ id: schema.users.id }).from(schema.users).where(eq(schema.users.email, "tomas@kettlelane.example"));
  if (!prs.length || !op) return;
  // Rough figures for the demo: the estimate on a 5 mm³/s, 3 s/layer printer (lib/estimate defaults).
  const est = (r: (typeof rows)[number]) => {
    const a = r.analysis as { area_mm2?: number; footprint_area_mm2?: number };
    const e = estimatePart({ volumeMm3: Math.max(r.vol, 1), areaMm2: Math.max(a.area_mm2 ?? 1, 1), heightMm: r.sz, footprintAreaMm2: a.footprint_area_mm2 || undefined }, { ...DEFAULT_SETTINGS, layerHeightMm: r.layer, wallCount: r.walls, infill: r.infill / 100 }, { volumetricFlowMm3s: 5, perLayerSeconds: 3, startupMinutes: 0, hourlyRateCents: 0 }, { densityGcm3: 1.25, pricePerKgCents: 0 });
    return { minutes: Math.max(e.time.minutes, 1), grams: e.grams };
  };

  async function place(subset: typeof rows, now: number, status: Status, extra: Partial<typeof plates.$inferInsert> = {}) {
    const usable = subset.filter((r) => isMaterialKey(r.material.toLowerCase()));
    if (!usable.length) return;
    const figures = new Map(usable.map((r) => [r.id, est(r)]));
    const inst = planInstanceSchema.parse({
      now: new Date(now).toISOString(),
      timezone: ws!.tz,
      attended: hours,
      margin_mm: 5,
      gap_mm: 3,
      printers: prs.map((p) => ({ id: String(p.id), bed: [p.x, p.y], height: p.h, materials: links.filter((l) => l.p === p.id).map((l) => l.t), nozzle: 1, startup_minutes: p.startup })).filter((p) => p.materials.length),
      parts: usable.map((r) => ({ id: `i${r.id}`, footprint: [r.sx, r.sy], height: r.sz, minutes: figures.get(r.id)!.minutes, material: r.material.toLowerCase(), color: r.colour.toLowerCase() || "any", layer_height: r.layer, nozzle: 1, quantity: 1, owner: `m${r.owner}` })),
    });
    const out = planWorkshop(inst);
    for (const plate of out.plates) {
      const pr = prs.find((p) => String(p.id) === plate.printer)!;
      const its = plate.items.map((it) => ({ it, r: usable.find((u) => `i${u.id}` === it.part)! }));
      const items = its.map(({ r }) => ({ instanceId: r.id, memberId: r.owner, ...figures.get(r.id)! }));
      const totalGrams = items.reduce((s, i) => s + i.grams, 0);
      const totalMinutes = pr.startup + items.reduce((s, i) => s + i.minutes, 0);
      const price = 2200;
      const quote = { currency: ws!.currency, materialName: plate.material.toUpperCase(), pricePerKgCents: price, hourlyRateCents: pr.rate, feeCents: ws!.fee, startupMinutes: pr.startup, items, totalMinutes, totalGrams, cost: quoteCost({ grams: totalGrams, minutes: totalMinutes }, { hourlyRateCents: pr.rate }, { pricePerKgCents: price }, ws!.fee) };
      const live = status === "planned" || status === "printing";
      const start = new Date(plate.start);
      const end = new Date(plate.end);
      const [res] = await d.insert(plates).values({ printerId: pr.id, status, material: plate.material, colour: plate.color, plannedStart: start, plannedEnd: end, startedAt: status === "planned" ? null : start, endedAt: live ? null : end, runsUnattended: plate.runs_unattended ? 1 : 0, caution: plate.caution, estimatedMinutes: totalMinutes, estimatedGrams: totalGrams, quote, quotedAt: start, ...extra }).$returningId();
      await d.insert(plateItems).values(its.map(({ it, r }) => ({ plateId: res!.id, instanceId: r.id, activeInstanceId: live ? r.id : null, memberId: r.owner, x: it.x, y: it.y, rotated: it.rotated ? 1 : 0, sizeX: r.sx, sizeY: r.sy, sizeZ: r.sz, minutes: figures.get(r.id)!.minutes, grams: figures.get(r.id)!.grams })));
      await d.insert(statusEvents).values(its.map(({ r }) => ({ instanceId: r.id, fromStatus: "queued" as const, toStatus: r.status === "queued" ? ("queued" as const) : ("plated" as const), byUserId: op!.id, reason: `Demo: ${status} plate ${res!.id}` })));
    }
  }

  const now = Date.now();
  const by = (s: string[]) => rows.filter((r) => s.includes(r.status));
  await place(by(["printing"]), now - 1 * H, "printing");
  await place(by(["plated"]), now, "planned");
  await place(by(["printed", "accepted"]), now - 30 * H, "finished", { shelfLabel: "Shelf A1", actualMinutes: null });
  // The copy that failed once, on its own plate two days ago; and two queued copies on a cancelled plate.
  await place(rows.filter((r) => r.status === "queued" && r.reprints > 0), now - 52 * H, "failed", { reason: "Came loose from the bed at layer 30" });
  const clips = rows.filter((r) => r.status === "queued" && r.name === "Drip tray clip").slice(0, 2);
  await place(clips, now - 50 * H, "cancelled", { reason: "Spool ran out before the start; back to the queue" });
}
