// Queue, re-plan and plate actions on the real database: send checks, concurrency, finish and fail.
import { and, eq, inArray, isNotNull, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db";
import {
  assemblies,
  attendedHours,
  charges,
  mailOutbox,
  materials,
  meshBlobs,
  partFiles,
  partInstances,
  parts,
  plateItems,
  plates,
  printerMaterials,
  printers,
  printHistory,
  spools,
  workshopSettings,
} from "@/db/schema";
import { cancelPlate, failPlate, finishPlate, startPlate } from "@/lib/server/plates";
import { partSchedule, replan, sendToQueue } from "@/lib/server/queue";
import type { SessionUser } from "@/lib/server/session";
import { queueSendInput } from "@/lib/validation/queue";
import { plateFinishInput } from "@/lib/validation/plates";
import { outcome, user } from "./helpers";

let member: SessionUser, member2: SessionUser, operator: SessionUser;
let printerId = 0;
let spoolId = 0;

/** A part with a stored box "mesh": volume and area of a w × d × h box by the closed forms (w·d·h, 2(wd+wh+dh)). */
async function boxPart(owner: SessionUser, name: string, w: number, d: number, h: number, qty: number, material = "PLA"): Promise<number> {
  const [a] = await db().insert(assemblies).values({ ownerId: owner.id, name: `${name} assembly` }).$returningId();
  const [p] = await db().insert(parts).values({ assemblyId: a!.id, name, quantity: qty, material, colour: "white", layerHeightMm: 0.2, walls: 2, infillPercent: 15 }).$returningId();
  const sha = (name.replace(/[^a-z]/gi, "").toLowerCase() + "0".repeat(64)).slice(0, 64).replace(/[^0-9a-f]/g, "a");
  await db().insert(meshBlobs).ignore().values({ sha256: sha, sizeBytes: 84 });
  const analysis = { size: [w, d, h], watertight: true, volume_reliable: true, volume_mm3: w * d * h, area_mm2: 2 * (w * d + w * h + d * h), footprint_area_mm2: w * d };
  const [f] = await db().insert(partFiles).values({ partId: p!.id, sha256: sha, versionNo: 1, originalName: `${name}.stl`, units: "mm", format: "stl-binary", sizeX: w, sizeY: d, sizeZ: h, volumeMm3: w * d * h, watertight: 1, analysis, uploadedBy: owner.id }).$returningId();
  await db().update(parts).set({ currentFileId: f!.id }).where(eq(parts.id, p!.id));
  for (let c = 1; c <= qty; c++) await db().insert(partInstances).values({ partId: p!.id, copyNo: c, status: "ready" });
  return p!.id;
}

const send = (u: SessionUser, partId: number, quantity: number) => sendToQueue(u, queueSendInput.parse({ partId, quantity, wishedDate: null, priority: 0 }));

async function livePlates() {
  // Only this file's printer: other test files share the database.
  return db().select({ id: plates.id, version: plates.version, status: plates.status, quote: plates.quote }).from(plates).where(and(eq(plates.printerId, printerId), inArray(plates.status, ["planned", "printing"])));
}

beforeAll(async () => {
  await db().insert(workshopSettings).ignore().values({ id: 1, name: "Plate test shop", timezone: "Europe/Berlin", currency: "EUR", plateFeeCents: 151 });
  member = await user("plates-m1@test.example", "member");
  member2 = await user("plates-m2@test.example", "member");
  operator = await user("plates-op@test.example", "operator");
  // Open round the clock, so every plate can start now and none runs unattended.
  await db().delete(attendedHours);
  await db().insert(attendedHours).values([1, 2, 3, 4, 5, 6, 7].map((weekday) => ({ weekday, opensAt: "00:00", closesAt: "24:00" })));
  const [pr] = await db().insert(printers).values({ name: "PL Test Finch", bedXMm: 200, bedYMm: 200, heightMm: 150, nozzleMm: 0.4, hourlyRateCents: 300, startupMinutes: 6 }).$returningId();
  printerId = pr!.id;
  await db().insert(printerMaterials).values([{ printerId, materialType: "pla" }]);
  const [m] = await db().insert(materials).values({ name: "PL Test PLA", type: "pla", densityGcm3: 1.24, densitySource: "test", pricePerKgCents: 2000 }).$returningId();
  const [s] = await db().insert(spools).values({ materialId: m!.id, label: "PL-T-01", colour: "White", gramsInitial: 1000, gramsRemaining: 1000, loadedPrinterId: printerId }).$returningId();
  spoolId = s!.id;
});
afterAll(closeDb);

describe("sending parts", () => {
  it("refuses a part that fits no printer, naming the reason", async () => {
    const wide = await boxPart(member, "Wide panel", 260, 40, 5, 1);
    const r = await outcome(send(member, wide, 1));
    expect(r.code).toBe("invalid");
    // 260 mm cannot fit a 200 mm bed less 2 × 5 mm margin either way (190 mm usable).
    expect(r.message).toMatch(/footprint 260 mm × 40 mm does not fit/);
    const tall = await boxPart(member, "Tall mast", 20, 20, 170, 1);
    expect((await outcome(send(member, tall, 1))).message).toMatch(/height 170 mm exceeds/);
    const abs = await boxPart(member, "Hot box", 20, 20, 20, 1, "ABS");
    expect((await outcome(send(member, abs, 1))).message).toMatch(/no printer takes ABS/);
  });

  it("refuses another member and the workshop; refuses more copies than are free", async () => {
    const p = await boxPart(member, "Small clip", 20, 10, 8, 2);
    expect((await outcome(send(member2, p, 1))).code).toBe("not_found");
    expect((await outcome(send(operator, p, 1))).code).toBe("forbidden");
    expect((await outcome(send(member, p, 3))).code).toBe("invalid");
    expect(await send(member, p, 2)).toMatchObject({ queued: 2 });
  });
});

describe("re-planning", () => {
  it("two concurrent re-plans never put one instance on two live plates", async () => {
    const p2 = await boxPart(member2, "Hinge leaf", 40, 30, 6, 4);
    await send(member2, p2, 4);
    const results = await Promise.allSettled([replan(operator), replan(operator), replan(operator)]);
    expect(results.every((r) => r.status === "fulfilled")).toBe(true);
    const dup = await db()
      .select({ i: plateItems.instanceId, n: sql<number>`COUNT(*)` })
      .from(plateItems)
      .innerJoin(plates, eq(plates.id, plateItems.plateId))
      .where(inArray(plates.status, ["planned", "printing"]))
      .groupBy(plateItems.instanceId)
      .having(sql`COUNT(*) > 1`);
    expect(dup).toEqual([]);
    const mine = inArray(plateItems.memberId, [member.id, member2.id]);
    const plated = await db().select({ id: partInstances.id }).from(partInstances).innerJoin(plateItems, eq(plateItems.instanceId, partInstances.id)).where(and(eq(partInstances.status, "plated"), mine, isNotNull(plateItems.activeInstanceId)));
    const active = await db().select({ id: plateItems.activeInstanceId }).from(plateItems).where(and(isNotNull(plateItems.activeInstanceId), mine));
    expect(active.map((a) => a.id).sort()).toEqual(plated.map((p) => p.id).sort());
    expect(plated.length).toBe(6);
  });

  it("the schema itself refuses a second live row for an instance", async () => {
    const [item] = await db().select({ plateId: plateItems.plateId, instanceId: plateItems.instanceId }).from(plateItems).where(isNotNull(plateItems.activeInstanceId)).limit(1);
    const dup = db().insert(plateItems).values({ plateId: item!.plateId, instanceId: item!.instanceId, activeInstanceId: item!.instanceId, memberId: member.id, x: 0, y: 0, sizeX: 1, sizeY: 1, sizeZ: 1, minutes: 1, grams: 1 });
    await expect(dup).rejects.toThrow();
  });
});

describe("plate actions", () => {
  it("two concurrent starts: exactly one wins, the other gets a clear conflict", async () => {
    const [p] = await livePlates();
    const r = await Promise.all([outcome(startPlate(operator, p!.id, { version: p!.version })), outcome(startPlate(operator, p!.id, { version: p!.version }))]);
    expect(r.map((x) => x.code).sort()).toEqual(["conflict", "ok"]);
    expect(r.find((x) => x.code === "conflict")!.message).toMatch(/someone else acted on it first and it is now printing/);
  });

  it("two concurrent finishes: one wins; history, spool, kept-quote charges and messages follow", async () => {
    const [p] = (await livePlates()).filter((x) => x.status === "printing");
    // A price rise after the start must not change what this plate charges.
    await db().update(materials).set({ pricePerKgCents: 9900 }).where(eq(materials.name, "PL Test PLA"));
    const input = plateFinishInput.parse({ version: p!.version, actualMinutes: 50, actualGrams: 12.5, shelfLabel: "Shelf B2" });
    const r = await Promise.all([outcome(finishPlate(operator, p!.id, input)), outcome(finishPlate(operator, p!.id, input))]);
    expect(r.map((x) => x.code).sort()).toEqual(["conflict", "ok"]);
    const hist = await db().select({ a: printHistory.actualMinutes, g: printHistory.actualGrams }).from(printHistory).where(eq(printHistory.plateId, p!.id));
    expect(hist).toEqual([{ a: 50, g: 12.5 }]);
    const [sp] = await db().select({ g: spools.gramsRemaining }).from(spools).where(eq(spools.id, spoolId));
    expect(sp!.g).toBeCloseTo(1000 - 12.5, 6);
    // Hand-worked from the kept figures: grams × 2000/1000 cents, minutes share × 300/60 cents,
    // the 151-cent fee split evenly (odd cent to the lower member id). Rounding half up (common practice, no source).
    const items = await db().select({ memberId: plateItems.memberId, grams: plateItems.grams, minutes: plateItems.minutes }).from(plateItems).where(eq(plateItems.plateId, p!.id));
    const members = [...new Set(items.map((i) => i.memberId))].sort((a, b) => a - b);
    const printMin = items.reduce((s, i) => s + i.minutes, 0);
    const expected = members.map((m, k) => {
      const mine = items.filter((i) => i.memberId === m);
      const g = mine.reduce((s, i) => s + i.grams, 0);
      const min = mine.reduce((s, i) => s + i.minutes, 0);
      const fee = Math.floor(151 / members.length) + (k < 151 % members.length ? 1 : 0);
      return Math.round((g * 2000) / 1000) + Math.round((((6 + printMin) * min) / printMin) * 300 / 60) + fee;
    });
    const got = await db().select({ memberId: charges.memberId, amount: charges.amountCents }).from(charges).where(eq(charges.plateId, p!.id)).orderBy(charges.memberId);
    expect(got.map((c) => c.amount)).toEqual(expected);
    const printed = await db().select({ s: partInstances.status }).from(partInstances).where(inArray(partInstances.id, (await db().select({ i: plateItems.instanceId }).from(plateItems).where(eq(plateItems.plateId, p!.id))).map((x) => x.i)));
    expect(printed.every((x) => x.s === "printed")).toBe(true);
    const mails = await db().select({ kind: mailOutbox.kind, userId: mailOutbox.userId }).from(mailOutbox).where(and(eq(mailOutbox.kind, "part_printed"), inArray(mailOutbox.userId, [member.id, member2.id])));
    expect(new Set(mails.map((m) => m.userId))).toEqual(new Set(members));
    const active = await db().select({ n: sql<number>`COUNT(*)` }).from(plateItems).where(and(eq(plateItems.plateId, p!.id), isNotNull(plateItems.activeInstanceId)));
    expect(Number(active[0]!.n)).toBe(0);
    const [first] = items;
    const sched = await partSchedule(first!.memberId === member.id ? member : member2, (await db().select({ p: partInstances.partId }).from(partInstances).innerJoin(plateItems, eq(plateItems.instanceId, partInstances.id)).where(eq(plateItems.plateId, p!.id)).limit(1))[0]!.p);
    expect(sched.some((s) => s.shelfLabel === "Shelf B2")).toBe(true);
  });

  it("a failed plate puts its parts back in the queue with the reprint counted", async () => {
    // The earlier tests may have printed every queued copy on one plate: send fresh ones.
    await send(member, await boxPart(member, "Fail clip", 20, 10, 8, 2), 2);
    await replan(operator);
    const [p] = await livePlates();
    const started = await startPlate(operator, p!.id, { version: p!.version });
    const [afterStart] = await db().select({ at: plates.updatedAt }).from(plates).where(eq(plates.id, p!.id));
    const ids = (await db().select({ i: plateItems.instanceId }).from(plateItems).where(eq(plateItems.plateId, p!.id))).map((x) => x.i);
    const before = await db().select({ id: partInstances.id, r: partInstances.reprints }).from(partInstances).where(inArray(partInstances.id, ids));
    await new Promise((r) => setTimeout(r, 20));
    await failPlate(operator, p!.id, { version: started.version, reason: "Warped off the bed" });
    // Each action stamps the plate with the time it happened.
    const [afterFail] = await db().select({ at: plates.updatedAt }).from(plates).where(eq(plates.id, p!.id));
    expect(afterFail!.at.getTime()).toBeGreaterThan(afterStart!.at.getTime());
    const after = await db().select({ id: partInstances.id, s: partInstances.status, r: partInstances.reprints }).from(partInstances).where(inArray(partInstances.id, ids));
    for (const a of after) {
      expect(a.s).toBe("queued");
      expect(a.r).toBe(before.find((b) => b.id === a.id)!.r + 1);
    }
    expect((await db().select({ k: mailOutbox.kind }).from(mailOutbox).where(eq(mailOutbox.kind, "plate_failed"))).length).toBeGreaterThan(0);
    // A stale version is refused rather than acted on twice.
    expect((await outcome(cancelPlate(operator, p!.id, { version: started.version, reason: "late" }))).code).toBe("conflict");
  });
});
