// A plate's 3MF holds each copy turned into its chosen orientation: a post drawn standing 60 mm tall
// on a printer 40 mm high fits only lying down, is planned lying down, and is exported lying down,
// resting on the bed (lowest z = 0) at the plan's position. Read back with lib/mesh's 3MF reader and,
// where Debian's lib3mf-dev is installed, with the 3MF Consortium's reference library through a small
// reader built here (tests/support/lib3mf-dump.cpp).
import { execFileSync } from "node:child_process";
import { existsSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, expect, it } from "vitest";
import { closeDb, db } from "@/db";
import { attendedHours, materials, plateItems, plates, printerMaterials, printers, spools, workshopSettings } from "@/db/schema";
import { readMesh, writeStl } from "@/lib/mesh";
import { createAssembly } from "@/lib/server/assemblies";
import { chooseOrientation } from "@/lib/server/orientation";
import { createPart } from "@/lib/server/parts";
import { plate3mf } from "@/lib/server/plate-export";
import { replan, sendToQueue } from "@/lib/server/queue";
import type { SessionUser } from "@/lib/server/session";
import { setBlobStore } from "@/lib/server/storage";
import { receiveUpload } from "@/lib/server/uploads";
import { queueSendInput } from "@/lib/validation/queue";
import { box } from "../fixtures/meshes";
import { user } from "./helpers";

const root = mkdtempSync(path.join(tmpdir(), "pw-plate-orient-"));
process.env.STORAGE_DIR = root;
const body = (b: Uint8Array) => new ReadableStream<Uint8Array>({ start(c) { c.enqueue(b); c.close(); } });
let member: SessionUser, operator: SessionUser, printerId = 0;
const exported: { bytes: Uint8Array; items: { x: number; y: number; rotated: number }[] }[] = [];

/** Builds the lib3mf reader once; null when the library or a C++ compiler is missing. */
function lib3mfReader(): string | null {
  if (!existsSync("/usr/include/lib3mf/Model/COM/NMR_DLLInterfaces.h")) return null;
  const out = path.join(root, "lib3mf-dump");
  try {
    execFileSync("c++", ["-O1", "-o", out, path.resolve(__dirname, "../support/lib3mf-dump.cpp"), "-I/usr/include/lib3mf", "-l3MF"], { stdio: "pipe" });
    return out;
  } catch {
    return null;
  }
}

beforeAll(async () => {
  setBlobStore(undefined);
  await db().insert(workshopSettings).ignore().values({ id: 1, name: "Orient plate shop", timezone: "Europe/Berlin", currency: "EUR" });
  member = await user("po-m@test.example", "member");
  operator = await user("po-op@test.example", "operator");
  await db().delete(attendedHours);
  await db().insert(attendedHours).values([1, 2, 3, 4, 5, 6, 7].map((weekday) => ({ weekday, opensAt: "00:00", closesAt: "24:00" })));
  const [pr] = await db().insert(printers).values({ name: "PO Low Wren", bedXMm: 150, bedYMm: 150, heightMm: 40, hourlyRateCents: 200 }).$returningId();
  printerId = pr!.id;
  await db().insert(printerMaterials).values([{ printerId, materialType: "pla" }]);
  const [m] = await db().insert(materials).values({ name: "PO PLA", type: "pla", densityGcm3: 1.24, densitySource: "test", pricePerKgCents: 2200 }).$returningId();
  await db().insert(spools).values({ materialId: m!.id, label: "PO-01", colour: "White", gramsInitial: 1000, gramsRemaining: 1000, loadedPrinterId: printerId });
});
afterAll(async () => {
  await closeDb();
  rmSync(root, { recursive: true, force: true });
});

it("exports each copy turned as chosen, resting on the bed where the plan put it", async () => {
  const { id: a } = await createAssembly(member, { name: "Fence", description: "" });
  const partId = (await createPart(member, a, { name: "Post", quantity: 3, material: "PLA", colour: "", notes: "" })).id;
  // Drawn standing: 10 wide (x), 20 deep (y), 60 tall (z), off the origin.
  const { fileId } = await receiveUpload(member, partId, body(writeStl(box(10, 20, 60, [7, 3, 11]))), { name: "post.stl", units: "mm" });
  // A quarter turn about +Y: file z → print x, file x → print −z. Lying: 60 × 20 on the bed, 10 high.
  const chosen = await chooseOrientation(member, partId, { kind: "rotation", fileId, quaternion: [0, Math.SQRT1_2, 0, Math.SQRT1_2] });
  expect(chosen.height).toBeCloseTo(10, 3);
  await sendToQueue(member, queueSendInput.parse({ partId, quantity: 3 }));
  await replan(operator);
  // The planner may spread the copies over plates; every plate is checked.
  const planned = await db().select({ id: plates.id }).from(plates).where(and(eq(plates.printerId, printerId), eq(plates.status, "planned")));
  let copies = 0;
  for (const plate of planned) {
    const items = await db().select({ x: plateItems.x, y: plateItems.y, rotated: plateItems.rotated }).from(plateItems).where(eq(plateItems.plateId, plate.id)).orderBy(plateItems.id);
    const { bytes } = await plate3mf(operator, plate.id);
    exported.push({ bytes, items });
    const back = readMesh(bytes, { filename: "plate.3mf" });
    expect(back.parts?.length).toBe(items.length);
    for (const [k, part] of back.parts!.entries()) {
      const pos = back.soup.positions.subarray(part.firstTriangle * 9, (part.firstTriangle + part.triangleCount) * 9);
      const lo = [Infinity, Infinity, Infinity], hi = [-Infinity, -Infinity, -Infinity];
      for (let i = 0; i < pos.length; i++) {
        lo[i % 3] = Math.min(lo[i % 3]!, pos[i]!);
        hi[i % 3] = Math.max(hi[i % 3]!, pos[i]!);
      }
      const it = items[k]!;
      const [w, d] = it.rotated ? [20, 60] : [60, 20];
      expect(lo[2]).toBeCloseTo(0, 3);
      expect(hi[2]! - lo[2]!).toBeCloseTo(10, 3); // lying, not 60 tall
      expect(lo[0]).toBeCloseTo(it.x, 3);
      expect(lo[1]).toBeCloseTo(it.y, 3);
      expect(hi[0]! - lo[0]!).toBeCloseTo(w, 3);
      expect(hi[1]! - lo[1]!).toBeCloseTo(d, 3);
      copies++;
    }
  }
  expect(copies).toBe(3);
});

it("reads the same with the 3MF Consortium's reference library (lib3mf)", (ctx) => {
  const reader = lib3mfReader();
  if (!reader) ctx.skip(); // Debian's lib3mf-dev is not installed here
  expect(exported.length).toBeGreaterThan(0);
  let copies = 0;
  for (const [n, plate] of exported.entries()) {
    const file = path.join(root, `plate-${n}.3mf`);
    writeFileSync(file, plate.bytes);
    const lines = execFileSync(reader!, [file], { encoding: "utf8" }).trim().split("\n");
    expect(lines.length).toBe(plate.items.length); // one build item per copy
    for (const [k, line] of lines.entries()) {
      const [, x0, y0, z0, x1, y1, z1] = line.split(" ").map(Number);
      const it = plate.items[k]!;
      const [w, d] = it.rotated ? [20, 60] : [60, 20];
      expect(x0).toBeCloseTo(it.x, 3);
      expect(y0).toBeCloseTo(it.y, 3);
      expect(z0).toBeCloseTo(0, 3);
      expect(x1! - x0!).toBeCloseTo(w, 3);
      expect(y1! - y0!).toBeCloseTo(d, 3);
      expect(z1! - z0!).toBeCloseTo(10, 3);
      copies++;
    }
  }
  expect(copies).toBe(3);
});
