import { and, eq, inArray } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { targetFromEnv } from "../../db/migrate";
import { seed } from "../../db/seed";
import { closeDb, db } from "@/db";
import { parts, partInstances, plateItems, plates, printers, users } from "@/db/schema";
import { packExact } from "@/lib/plan/pack";
import type { PartInstance } from "@/lib/plan/fair-share";
import { BED_MARGIN_MM, PART_GAP_MM } from "@/lib/server/planner";
import { replan } from "@/lib/server/queue";

afterAll(closeDb);

// The demo check: the seeded workshop, re-planned, puts work that fits one bed on one plate
// per printer and material-colour. Where a printer has two or more plates of one material and
// colour, their copies together must not fit one of its beds (laid out by the same packer), or the
// merge would have made a copy late or the plan's cost higher (then the plan says late copies).
describe("the seeded demo, re-planned", () => {
  it("has at most one plate per printer and material-colour for work that fits one bed", async () => {
    await seed(targetFromEnv(process.env.DB_NAME!));
    const [op] = await db().select({ id: users.id, email: users.email, name: users.name, role: users.role }).from(users).where(eq(users.role, "operator")).limit(1);
    const result = await replan({ ...op!, sessionVersion: 0 } as never);
    expect(result.plates).toBeGreaterThan(0);
    const planned = await db().select({ id: plates.id, printerId: plates.printerId, material: plates.material, colour: plates.colour }).from(plates).where(eq(plates.status, "planned"));
    const groups = new Map<string, number[]>();
    for (const p of planned) {
      const k = `${p.printerId}|${p.material}|${p.colour}`;
      groups.set(k, [...(groups.get(k) ?? []), p.id]);
    }
    for (const [k, ids] of groups) {
      if (ids.length < 2) continue;
      const [printerId] = k.split("|");
      const [pr] = await db().select({ bedX: printers.bedXMm, bedY: printers.bedYMm, height: printers.heightMm }).from(printers).where(eq(printers.id, Number(printerId)));
      const items = await db().select({ sx: plateItems.sizeX, sy: plateItems.sizeY, sz: plateItems.sizeZ, material: parts.material }).from(plateItems).innerJoin(partInstances, eq(partInstances.id, plateItems.instanceId)).innerJoin(parts, eq(parts.id, partInstances.partId)).where(and(inArray(plateItems.plateId, ids)));
      const copies = items.map((it, i) => ({ part: { id: `c${i}`, footprint: [it.sx, it.sy], height: it.sz, minutes: 1, material: it.material.toUpperCase(), color: "x", layer_height: 0.2, nozzle: 1, quantity: 1, due: null, priority: 0 }, instance: 1, owner: "o", rank: i, fairTag: 0, atRisk: false, target: null }) as unknown as PartInstance);
      const printer = { id: "p", bed: [pr!.bedX, pr!.bedY] as [number, number], height: pr!.height, materials: [], nozzle: 1, startup_minutes: 0, unavailable: [], changeover_minutes: 0 };
      const together = packExact(copies, printer, { marginMm: BED_MARGIN_MM, gapMm: PART_GAP_MM });
      expect(together === null || result.metrics.late_instances > 0, `${k}: plates ${ids.join(", ")} fit one bed`).toBe(true);
    }
  }, 60_000);
});
