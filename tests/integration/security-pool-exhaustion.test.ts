// Finding 1 (issue 17): parallel re-plans and plate starts must not exhaust the connection pool.
// A transaction that asks the pool for a second connection deadlocks once every connection is held by
// requests waiting on the same row lock; the guard in db/tx-guard.ts refuses such calls, and re-plans
// queue in the process instead of each holding a connection while waiting for the planner row.
process.env.DB_POOL_SIZE = "3";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { closeDb, db } from "@/db";
import { insideTransaction, PoolInTransactionError } from "@/db/tx-guard";
import { assemblies, attendedHours, materials, meshBlobs, partFiles, partInstances, parts, plates, printerMaterials, printers, spools, users, workshopSettings } from "@/db/schema";
import { kickOutbox, startOutboxWorker, stopOutboxWorker } from "@/lib/server/mail/worker";
import { startPlate } from "@/lib/server/plates";
import { replan, sendToQueue } from "@/lib/server/queue";
import type { SessionUser } from "@/lib/server/session";
import { queueSendInput } from "@/lib/validation/queue";
import { user } from "./helpers";

let member: SessionUser, operator: SessionUser;
let printerId = 0;

beforeAll(async () => {
  await db().insert(workshopSettings).ignore().values({ id: 1, name: "Pool test shop", timezone: "UTC", currency: "EUR", plateFeeCents: 100 });
  member = await user("pool-m@test.example", "member");
  operator = await user("pool-op@test.example", "operator");
  await db().delete(attendedHours);
  await db().insert(attendedHours).values([1, 2, 3, 4, 5, 6, 7].map((weekday) => ({ weekday, opensAt: "00:00", closesAt: "24:00" })));
  const [pr] = await db().insert(printers).values({ name: "Pool Wren", bedXMm: 220, bedYMm: 220, heightMm: 200, nozzleMm: 0.4, hourlyRateCents: 250, startupMinutes: 5 }).$returningId();
  printerId = pr!.id;
  await db().insert(printerMaterials).values([{ printerId, materialType: "pla" }]);
  const [m] = await db().insert(materials).values({ name: "Pool PLA", type: "pla", densityGcm3: 1.24, densitySource: "test", pricePerKgCents: 2000 }).$returningId();
  await db().insert(spools).values({ materialId: m!.id, label: "POOL-01", colour: "Grey", gramsInitial: 1000, gramsRemaining: 1000, loadedPrinterId: printerId });
  // One part of six 30 × 20 × 5 mm boxes (volume w·d·h, area 2(wd+wh+dh)), all sent to the queue.
  const [a] = await db().insert(assemblies).values({ ownerId: member.id, name: "Pool rig" }).$returningId();
  const [p] = await db().insert(parts).values({ assemblyId: a!.id, name: "Pool tab", quantity: 6, material: "PLA", colour: "grey", layerHeightMm: 0.2, walls: 2, infillPercent: 15 }).$returningId();
  const sha = "b".repeat(64);
  await db().insert(meshBlobs).ignore().values({ sha256: sha, sizeBytes: 84 });
  const analysis = { size: [30, 20, 5], watertight: true, volume_reliable: true, volume_mm3: 3000, area_mm2: 2 * (600 + 150 + 100), footprint_area_mm2: 600 };
  const [f] = await db().insert(partFiles).values({ partId: p!.id, sha256: sha, versionNo: 1, originalName: "tab.stl", units: "mm", format: "stl-binary", sizeX: 30, sizeY: 20, sizeZ: 5, volumeMm3: 3000, watertight: 1, analysis, uploadedBy: member.id }).$returningId();
  await db().update(parts).set({ currentFileId: f!.id }).where(eq(parts.id, p!.id));
  for (let c = 1; c <= 6; c++) await db().insert(partInstances).values({ partId: p!.id, copyNo: c, status: "ready" });
  await sendToQueue(member, queueSendInput.parse({ partId: p!.id, quantity: 6, wishedDate: null, priority: 0 }));
});
afterAll(closeDb);

describe("one connection per transaction", () => {
  it("a pool call from inside a transaction is refused, the transaction's own calls are not", async () => {
    const seen: boolean[] = [];
    const r = db().transaction(async (tx) => {
      seen.push(insideTransaction());
      await tx.select({ id: users.id }).from(users).limit(1);
      await db().select({ id: users.id }).from(users).limit(1);
    });
    // drizzle wraps what the driver threw in its own error, with the original as `cause`.
    const err = await r.then(() => null, (e: unknown) => e as { cause?: unknown });
    expect(err?.cause ?? err).toBeInstanceOf(PoolInTransactionError);
    expect(seen).toEqual([true]);
    expect(insideTransaction()).toBe(false);
    // Outside a transaction the pool answers as usual.
    expect((await db().select({ id: users.id }).from(users).limit(1)).length).toBe(1);
  });

  it("twelve parallel re-plans on a pool of 3 all succeed while a member keeps reading", async () => {
    const replans = Promise.allSettled(Array.from({ length: 12 }, () => replan(operator)));
    // A member's own read (what GET /api/me does) must not wait behind the re-plans for a connection.
    const t0 = Date.now();
    const [me] = await db().select({ id: users.id }).from(users).where(eq(users.id, member.id));
    const readMs = Date.now() - t0;
    const results = await replans;
    const failed = results.filter((r) => r.status === "rejected").map((r) => String((r as PromiseRejectedResult).reason));
    expect(failed).toEqual([]);
    expect(me?.id).toBe(member.id);
    // Common practice, no source: a single indexed read on loopback is far under a second (it took 49.5 s before).
    expect(readMs).toBeLessThan(5_000);
    // Re-plans that arrive while one runs share the run behind it: 12 requests, at most 2 plans.
    const placed = (results[0] as PromiseFulfilledResult<Awaited<ReturnType<typeof replan>>>).value.placed;
    expect(placed).toBe(6);
  });

  it("starting a plate checks the spool through the plate's own transaction", async () => {
    const [p] = await db().select({ id: plates.id, version: plates.version }).from(plates).where(eq(plates.printerId, printerId)).limit(1);
    const starts = await Promise.allSettled([startPlate(operator, p!.id, { version: p!.version }), startPlate(operator, p!.id, { version: p!.version }), startPlate(operator, p!.id, { version: p!.version })]);
    const reasons = starts.filter((s) => s.status === "rejected").map((s) => (s as PromiseRejectedResult).reason as Error);
    expect(starts.filter((s) => s.status === "fulfilled").length).toBe(1);
    expect(reasons.every((e) => !(e.cause instanceof PoolInTransactionError) && /someone else acted on it first/.test(e.message))).toBe(true);
  });

  it("a mail kick from inside a transaction does not carry the transaction into the outbox worker", async () => {
    const errors = vi.spyOn(console, "error").mockImplementation(() => undefined);
    startOutboxWorker();
    try {
      await db().transaction(async (tx) => {
        await tx.select({ id: users.id }).from(users).limit(1);
        kickOutbox(); // what notify(…, tx) does after queueing a message
      });
      await new Promise((r) => setTimeout(r, 300));
      // Before, the worker's round ran inside the transaction's context and its first query was refused.
      expect(errors.mock.calls.map((c) => c.map(String).join(" "))).toEqual([]);
    } finally {
      stopOutboxWorker();
      errors.mockRestore();
    }
  });
});
