// A planned plate downloads as 3MF: read back with the mesh engine's reader, one object per copy,
// each copy's bounding box where the plan put it on the bed.
import { createHash } from "node:crypto";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { and, eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, expect, it } from "vitest";
import { closeDb, db } from "@/db";
import { assemblies, attendedHours, materials, meshBlobs, partFiles, partInstances, parts, plateItems, plates, printerMaterials, printers, spools, workshopSettings } from "@/db/schema";
import { readMesh, writeStl } from "@/lib/mesh";
import { plate3mf, plateDetail } from "@/lib/server/plate-export";
import { replan, sendToQueue } from "@/lib/server/queue";
import type { SessionUser } from "@/lib/server/session";
import { LocalStore, setBlobStore } from "@/lib/server/storage";
import { queueSendInput } from "@/lib/validation/queue";
import { box } from "../fixtures/meshes";
import { user } from "./helpers";

let member: SessionUser, other: SessionUser, operator: SessionUser;
let printerId = 0;

beforeAll(async () => {
  const root = mkdtempSync(path.join(tmpdir(), "pw-plates-"));
  const store = new LocalStore(root);
  setBlobStore(store);
  await db().insert(workshopSettings).ignore().values({ id: 1, name: "Export test shop", timezone: "Europe/Berlin", currency: "EUR" });
  member = await user("export-m@test.example", "member");
  other = await user("export-other@test.example", "member");
  operator = await user("export-op@test.example", "operator");
  await db().delete(attendedHours);
  await db().insert(attendedHours).values([1, 2, 3, 4, 5, 6, 7].map((weekday) => ({ weekday, opensAt: "00:00", closesAt: "24:00" })));
  const [pr] = await db().insert(printers).values({ name: "EX Test Lark", bedXMm: 150, bedYMm: 150, heightMm: 100, hourlyRateCents: 200 }).$returningId();
  printerId = pr!.id;
  await db().insert(printerMaterials).values([{ printerId: pr!.id, materialType: "petg" }]);
  const [m] = await db().insert(materials).values({ name: "EX PETG", type: "petg", densityGcm3: 1.27, densitySource: "test", pricePerKgCents: 2500 }).$returningId();
  await db().insert(spools).values({ materialId: m!.id, label: "EX-01", colour: "Blue", gramsInitial: 1000, gramsRemaining: 1000, loadedPrinterId: pr!.id });
  // A 60 × 20 × 10 mm box, placed off the origin in its own file, so the export must move it.
  const bytes = writeStl(box(60, 20, 10, [100, -40, 5]), "export test box");
  const sha = createHash("sha256").update(bytes).digest("hex");
  const tmp = path.join(root, "upload.tmp");
  writeFileSync(tmp, bytes);
  await store.putFile(sha, tmp);
  await db().insert(meshBlobs).ignore().values({ sha256: sha, sizeBytes: bytes.length });
  const [a] = await db().insert(assemblies).values({ ownerId: member.id, name: "Export assembly" }).$returningId();
  const [p] = await db().insert(parts).values({ assemblyId: a!.id, name: "Bar", quantity: 12, material: "PETG", colour: "blue", layerHeightMm: 0.2, walls: 2, infillPercent: 15 }).$returningId();
  const analysis = { size: [60, 20, 10], watertight: true, volume_reliable: true, volume_mm3: 12000, area_mm2: 2 * (1200 + 600 + 200), footprint_area_mm2: 1200 };
  const [f] = await db().insert(partFiles).values({ partId: p!.id, sha256: sha, versionNo: 1, originalName: "bar.stl", units: "mm", format: "stl-binary", sizeX: 60, sizeY: 20, sizeZ: 10, volumeMm3: 12000, watertight: 1, analysis, uploadedBy: member.id }).$returningId();
  await db().update(parts).set({ currentFileId: f!.id }).where(eq(parts.id, p!.id));
  for (let c = 1; c <= 12; c++) await db().insert(partInstances).values({ partId: p!.id, copyNo: c, status: "ready" });
  await sendToQueue(member, queueSendInput.parse({ partId: p!.id, quantity: 12 }));
  await replan(operator);
});
afterAll(async () => {
  setBlobStore(undefined);
  await closeDb();
});

/** This printer's planned plate with the most copies (the planner spreads work over several plates). */
async function fullestPlate() {
  const rows = await db().select({ id: plates.id, n: sql<number>`COUNT(${plateItems.id})` }).from(plates).innerJoin(plateItems, eq(plateItems.plateId, plates.id)).where(and(eq(plates.printerId, printerId), eq(plates.status, "planned"))).groupBy(plates.id);
  return rows.sort((a, b) => Number(b.n) - Number(a.n))[0];
}

it("holds one object per copy, each where the plan put it", async () => {
  const plate = await fullestPlate();
  const items = await db().select({ x: plateItems.x, y: plateItems.y, rotated: plateItems.rotated }).from(plateItems).where(eq(plateItems.plateId, plate!.id)).orderBy(plateItems.id);
  expect(items.length).toBeGreaterThan(1);
  const { bytes } = await plate3mf(operator, plate!.id);
  const back = readMesh(bytes, { filename: "plate.3mf" });
  expect(back.format).toBe("3mf");
  expect(back.parts?.length).toBe(items.length);
  for (const [k, part] of back.parts!.entries()) {
    const pos = back.soup.positions.subarray(part.firstTriangle * 9, (part.firstTriangle + part.triangleCount) * 9);
    const lo = [Infinity, Infinity, Infinity];
    const hi = [-Infinity, -Infinity, -Infinity];
    for (let i = 0; i < pos.length; i++) {
      lo[i % 3] = Math.min(lo[i % 3]!, pos[i]!);
      hi[i % 3] = Math.max(hi[i % 3]!, pos[i]!);
    }
    const it = items[k]!;
    const [w, d] = it.rotated ? [20, 60] : [60, 20];
    // The copy's lower corner at the plan's (x, y), on the bed (z = 0), its extents turned or not.
    expect(lo[0]).toBeCloseTo(it.x, 3);
    expect(lo[1]).toBeCloseTo(it.y, 3);
    expect(lo[2]).toBeCloseTo(0, 3);
    expect(hi[0]! - lo[0]!).toBeCloseTo(w, 3);
    expect(hi[1]! - lo[1]!).toBeCloseTo(d, 3);
    // Inside the 150 mm bed less the 5 mm margin.
    expect(lo[0]).toBeGreaterThanOrEqual(5 - 1e-6);
    expect(hi[0]).toBeLessThanOrEqual(145 + 1e-6);
  }
});

it("a member sees a plate only when a copy of theirs is on it", async () => {
  const plate = await fullestPlate();
  expect((await plateDetail(member, plate!.id)).items.every((i) => i.mine)).toBe(true);
  await expect(plateDetail(other, plate!.id)).rejects.toThrow(/no such plate/);
  await expect(plate3mf(member, plate!.id)).rejects.toThrow(/Only operators/);
});
