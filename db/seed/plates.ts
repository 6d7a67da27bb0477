// Demo plates for the Floor of the invented Kettle Lane Workshop, laid out by lib/plan from the seeded
// copies: printing now, planned next, finished yesterday (parts on a shelf), one failed, one cancelled.
// Every time is counted from the moment the seed runs: a printing plate started in the past and ends
// in the future, planned plates start after it, ended plates ended hours or days ago.
// Idempotent: nothing is written when any plate exists. Queue entries are added for copies in the workshop.
import { eq, inArray } from "drizzle-orm";
import type { MySql2Database } from "drizzle-orm/mysql2";
import { DEFAULT_SETTINGS, estimatePart, isMaterialKey, quoteCost } from "../../lib/estimate";
import { planWorkshop } from "../../lib/plan/plan";
import { planInstanceSchema } from "../../lib/plan/schema";
import * as schema from "../schema";

type D = MySql2Database<typeof schema>;
type Status = schema.PlateStatus;
const { assemblies, attendedHours, materials, partFiles, partInstances, parts, plannerState, plateItems, plates, printerMaterials, printers, queueEntries, spools, statusEvents, workshopSettings } = schema;
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
  const prs = await d.select({ id: printers.id, name: printers.name, x: printers.bedXMm, y: printers.bedYMm, h: printers.heightMm, rate: printers.hourlyRateCents, startup: printers.startupMinutes, enclosed: printers.enclosed }).from(printers);
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

  const spoolRows = async () =>
    d.select({ id: spools.id, type: materials.type, colour: spools.colour, on: spools.loadedPrinterId, grams: spools.gramsRemaining }).from(spools).innerJoin(materials, eq(materials.id, spools.materialId));
  const norm = (c: string) => c.trim().toLowerCase() || "any";
  /** Printers kept busy by the demo's printing plates, until their end. */
  const busy = new Map<number, number>();
  const metrics: { value: unknown } = { value: null };

  /**
   * Plans a subset of the copies with lib/plan and writes the plates. `when` places them in time:
   * "plan" keeps the plan's times from now; "running" starts each a share of its run ago; a number
   * is the instant the plates ended (each starts its own run earlier).
   */
  async function place(subset: typeof rows, now: number, status: Status, when: "plan" | "running" | number, extra: Partial<typeof plates.$inferInsert> = {}) {
    const usable = subset.filter((r) => isMaterialKey(r.material.toLowerCase()));
    if (!usable.length) return;
    const figures = new Map(usable.map((r) => [r.id, est(r)]));
    const stock = await spoolRows();
    const inst = planInstanceSchema.parse({
      now: new Date(now).toISOString(),
      timezone: ws!.tz,
      attended: hours,
      margin_mm: 5,
      gap_mm: 3,
      printers: prs
        .map((p) => {
          const on = stock.find((s) => s.on === p.id);
          const until = busy.get(p.id);
          return {
            id: String(p.id),
            bed: [p.x, p.y],
            height: p.h,
            materials: links.filter((l) => l.p === p.id).map((l) => l.t),
            nozzle: 1,
            startup_minutes: p.startup,
            enclosed: p.enclosed === 1,
            loaded: on ? { material: on.type, color: norm(on.colour) } : undefined,
            changeover_minutes: 10,
            unavailable: until && until > now ? [{ from: new Date(now - 60_000).toISOString(), to: new Date(until).toISOString() }] : [],
          };
        })
        .filter((p) => p.materials.length),
      spools: stock.filter((s) => s.grams > 0).map((s) => ({ material: s.type, color: norm(s.colour) })),
      parts: usable.map((r) => ({ id: `i${r.id}`, footprint: [r.sx, r.sy], height: r.sz, minutes: figures.get(r.id)!.minutes, material: r.material.toLowerCase(), color: r.colour.toLowerCase() || "any", layer_height: r.layer, nozzle: 1, quantity: 1, owner: `m${r.owner}` })),
    });
    const out = planWorkshop(inst);
    if (status === "planned") metrics.value = out.metrics;
    for (const plate of out.plates) {
      const pr = prs.find((p) => String(p.id) === plate.printer)!;
      const its = plate.items.map((it) => ({ it, r: usable.find((u) => `i${u.id}` === it.part)! }));
      const items = its.map(({ r }) => ({ instanceId: r.id, memberId: r.owner, ...figures.get(r.id)! }));
      const totalGrams = items.reduce((s, i) => s + i.grams, 0);
      const totalMinutes = pr.startup + items.reduce((s, i) => s + i.minutes, 0);
      const price = 2200;
      const quote = { currency: ws!.currency, materialName: plate.material.toUpperCase(), pricePerKgCents: price, hourlyRateCents: pr.rate, feeCents: ws!.fee, startupMinutes: pr.startup, items, totalMinutes, totalGrams, cost: quoteCost({ grams: totalGrams, minutes: totalMinutes }, { hourlyRateCents: pr.rate }, { pricePerKgCents: price }, ws!.fee) };
      const live = status === "planned" || status === "printing";
      const run = Date.parse(plate.end) - Date.parse(plate.start);
      // A running plate is a third of the way through (at most three hours in); an ended one ended at `when`.
      const startMs = when === "plan" ? Date.parse(plate.start) : when === "running" ? now - Math.min(run / 3, 3 * H) : when - run;
      const start = new Date(startMs);
      const end = new Date(startMs + run);
      if (status === "printing") busy.set(pr.id, Math.max(busy.get(pr.id) ?? 0, end.getTime()));
      const change = status === "planned" && plate.spool_change ? { changeFromMaterial: plate.spool_change.from?.material ?? null, changeFromColour: plate.spool_change.from?.color ?? null, changeToMaterial: plate.spool_change.to.material, changeToColour: plate.spool_change.to.color } : {};
      const [res] = await d.insert(plates).values({ printerId: pr.id, status, material: plate.material, colour: plate.color, plannedStart: start, plannedEnd: end, startedAt: status === "planned" ? null : start, endedAt: live ? null : end, runsUnattended: plate.runs_unattended ? 1 : 0, caution: plate.caution, estimatedMinutes: totalMinutes, estimatedGrams: totalGrams, quote, quotedAt: start, ...change, ...extra }).$returningId();
      // The spool feeding a running plate is on its printer.
      if (status === "printing") {
        const feed = (await spoolRows()).find((s) => s.type === plate.material && norm(s.colour) === plate.color && s.on === null);
        if (feed) {
          await d.update(spools).set({ loadedPrinterId: null, loadedAt: null }).where(eq(spools.loadedPrinterId, pr.id));
          await d.update(spools).set({ loadedPrinterId: pr.id, loadedAt: start }).where(eq(spools.id, feed.id));
        }
      }
      await d.insert(plateItems).values(its.map(({ it, r }) => ({ plateId: res!.id, instanceId: r.id, activeInstanceId: live ? r.id : null, memberId: r.owner, x: it.x, y: it.y, rotated: it.rotated ? 1 : 0, sizeX: r.sx, sizeY: r.sy, sizeZ: r.sz, minutes: figures.get(r.id)!.minutes, grams: figures.get(r.id)!.grams })));
      await d.insert(statusEvents).values(its.map(({ r }) => ({ instanceId: r.id, fromStatus: "queued" as const, toStatus: r.status === "queued" ? ("queued" as const) : ("plated" as const), byUserId: op!.id, reason: `Demo: ${status} plate ${res!.id}` })));
    }
  }

  const now = Date.now();
  const by = (s: string[]) => rows.filter((r) => s.includes(r.status));
  await place(by(["printing"]), now, "printing", "running");
  await place(by(["plated"]), now, "planned", "plan");
  await place(by(["printed", "accepted"]), now - 40 * H, "finished", now - 20 * H, { shelfLabel: "Shelf A1", actualMinutes: null });
  // The copy that failed once, on its own plate two days ago; and two queued copies on a cancelled plate.
  await place(rows.filter((r) => r.status === "queued" && r.reprints > 0), now - 60 * H, "failed", now - 50 * H, { reason: "Came loose from the bed at layer 30" });
  const clips = rows.filter((r) => r.status === "queued" && r.name === "Drip tray clip").slice(0, 2);
  await place(clips, now - 60 * H, "cancelled", now - 48 * H, { reason: "Spool ran out before the start; back to the queue" });
  // The Floor's status line reads the last plan: the demo's planned plates are that plan.
  await d.insert(plannerState).ignore().values({ id: 1 });
  await d.update(plannerState).set({ lastRunAt: new Date(now), lastMetrics: metrics.value, unplaced: [] }).where(eq(plannerState.id, 1));
}
