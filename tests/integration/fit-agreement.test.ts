// "Does this part fit that printer?" answered by the part page, the quote, the orientation panel and
// the queue, for meshes from ../shared/meshes and generated ones × the seeded printers
// (db/seed/printers.ts). All four go through lib/rules/fit; the generated parts are also checked
// against answers worked by hand from the printers' sizes and the 5 mm margin (common practice, no source).
import { readFileSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db";
import { users, workshopSettings } from "@/db/schema";
import { seedPrinters } from "@/db/seed/printers";
import { writeStl } from "@/lib/mesh";
import { createAssembly } from "@/lib/server/assemblies";
import { AppError } from "@/lib/server/errors";
import { chooseOrientation } from "@/lib/server/orientation";
import { partEnvelope } from "@/lib/server/part-envelope";
import { createPart, getPartDetail } from "@/lib/server/parts";
import { listPrinterBeds } from "@/lib/server/printers";
import { sendToQueue } from "@/lib/server/queue";
import { partQuoteInput, quotePart } from "@/lib/server/quotes";
import type { SessionUser } from "@/lib/server/session";
import { setBlobStore } from "@/lib/server/storage";
import { receiveUpload } from "@/lib/server/uploads";
import { queueSendInput } from "@/lib/validation/queue";
import { box } from "../fixtures/meshes";

const root = mkdtempSync(path.join(tmpdir(), "pw-fit-"));
process.env.STORAGE_DIR = root;
const shared = path.resolve(__dirname, "../../../shared/meshes");
const body = (b: Uint8Array) => new ReadableStream<Uint8Array>({ start(c) { c.enqueue(b); c.close(); } });
// A quarter turn about +X (x, y, z) → (x, −z, y): the file's Y axis stands up.
const Y_UP: [number, number, number, number] = [Math.SQRT1_2, 0, 0, Math.SQRT1_2];
const Z_TO_Y: [number, number, number, number] = [-Math.SQRT1_2, 0, 0, Math.SQRT1_2];

interface Case {
  name: string;
  material: string;
  file: () => { bytes: Uint8Array; name: string; units: "mm" | "in" };
  turn?: [number, number, number, number];
  /** Worked by hand: seeded beds Wren 180², Heron and Kestrel 220², Osprey 256² less 5 mm a side; heights 180, 250, 250, 256. */
  expect?: string[];
}

const gen = (sx: number, sy: number, sz: number) => () => ({ bytes: writeStl(box(sx, sy, sz)), name: `box-${sx}x${sy}x${sz}.stl`, units: "mm" as const });
const file = (rel: string, units: "mm" | "in" = "mm") => () => ({ bytes: new Uint8Array(readFileSync(path.join(shared, rel))), name: path.basename(rel), units });

const cases: Case[] = [
  { name: "Peg", material: "PLA", file: gen(20, 20, 20), expect: ["Heron", "Kestrel", "Osprey", "Wren"] },
  { name: "Edge", material: "PLA", file: gen(170, 170, 10), expect: ["Heron", "Kestrel", "Osprey", "Wren"] }, // 170 = 180 − 2 × 5 exactly
  { name: "Rail", material: "PLA", file: gen(200, 30, 20), expect: ["Heron", "Kestrel", "Osprey"] },
  { name: "Tower", material: "PLA", file: gen(50, 50, 240), expect: ["Heron", "Kestrel", "Osprey"] },
  { name: "Tray", material: "PETG", file: gen(215, 215, 5), expect: ["Osprey"] }, // 215 > 220 − 10
  { name: "Hinge", material: "ABS", file: gen(40, 40, 40), expect: ["Osprey"] },
  { name: "Sole", material: "TPU 95A", file: gen(60, 40, 10), expect: ["Heron", "Wren"] },
  { name: "Knob", material: "Wood fill", file: gen(30, 30, 30), expect: [] },
  // Drawn standing 240 mm tall; turned so the file's Z lies along Y: 50 × 240 on the bed, 50 high.
  { name: "Mast", material: "PLA", file: gen(50, 50, 240), turn: Z_TO_Y, expect: ["Osprey"] },
  { name: "Box sample", material: "PLA", file: file("3mf-samples/examples/core/box.3mf") },
  { name: "Cylinders sample", material: "PETG", file: file("3mf-samples/examples/core/multiple_cylinders.3mf") },
  { name: "Half donut", material: "PLA", file: file("numpy-stl/tests/stl_binary/HalfDonut.stl", "in") },
  { name: "Star", material: "ABS", file: file("numpy-stl/tests/stl_binary/StarWithEmptyHeader.stl", "in"), turn: Y_UP },
];

let owner: SessionUser;
const names = new Map<string, string>();

async function person(email: string): Promise<SessionUser> {
  await db().insert(users).ignore().values({ email, name: email.split("@")[0]!, role: "member", passwordHash: "x" });
  const [u] = await db().select({ id: users.id, email: users.email, name: users.name, role: users.role }).from(users).where(eq(users.email, email));
  return u!;
}

beforeAll(async () => {
  setBlobStore(undefined);
  await db().insert(workshopSettings).ignore().values({ id: 1, name: "Test shop" });
  await seedPrinters(db());
  for (const b of await listPrinterBeds()) names.set(String(b.id), b.name);
  owner = await person("fit-owner@test.example");
});
afterAll(async () => {
  await closeDb();
  rmSync(root, { recursive: true, force: true });
});

const sorted = (xs: Iterable<string>) => [...xs].sort();

describe("fit answers agree across the bench", () => {
  it("has the four seeded printers", () => {
    expect(sorted(names.values())).toEqual(["Heron", "Kestrel", "Osprey", "Wren"]);
  });

  for (const c of cases) {
    it(`${c.name} (${c.material}): part page, quote, orientation and queue name the same printers`, async () => {
      const { id: a } = await createAssembly(owner, { name: `Fit ${c.name}`, description: "" });
      const partId = (await createPart(owner, a, { name: c.name, quantity: 1, material: c.material, colour: "", notes: "" })).id;
      const f = c.file();
      const { fileId } = await receiveUpload(owner, partId, body(f.bytes), { name: f.name, units: f.units });
      const chosen = await chooseOrientation(owner, partId, c.turn ? { kind: "rotation", fileId, quaternion: c.turn } : { kind: "original", fileId });

      const orientation = sorted(chosen.summary.fits.filter((x) => x.fits).map((x) => names.get(x.printerId)!));
      const detail = await getPartDetail(owner, partId);
      const page = sorted(detail.fit.fits.filter((x) => x.fits).map((x) => x.name));
      const input = partQuoteInput(detail.current?.analysis, detail.part, await partEnvelope(partId));
      let quote: string[] = [];
      if ("input" in input) {
        try {
          quote = sorted((await quotePart(owner, input.input)).options.filter((o) => o.fits).map((o) => o.printerName));
        } catch (e) {
          if (!(e instanceof AppError && e.code === "invalid")) throw e;
        }
      }
      let queue: string[] = [];
      try {
        queue = sorted((await sendToQueue(owner, queueSendInput.parse({ partId, quantity: 1, wishedDate: "", priority: 0 }))).printers);
      } catch (e) {
        if (!(e instanceof AppError && e.code === "invalid" && /No printer here can take this part/.test(e.message))) throw e;
      }
      expect({ page, quote, orientation, queue }).toEqual({ page, quote: page, orientation: page, queue: page });
      if (c.expect) expect(page).toEqual(sorted(c.expect));
      // The page shows the part as it will lie: a turned part's footprint is the chosen one.
      expect(detail.placed?.source).toBe("chosen");
    });
  }
});
