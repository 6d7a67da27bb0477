// Orientation storage and the server's re-run on the real database, with a T-shaped part made by manifold-3d.
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db";
import { users, workshopSettings } from "@/db/schema";
import { readMesh, writeStl } from "@/lib/mesh";
import { searchOrientations } from "@/lib/orient";
import { createAssembly, shareAssembly } from "@/lib/server/assemblies";
import { AppError } from "@/lib/server/errors";
import { chooseOrientation, effectiveGeometry, getOrientation, runOrientationSearch } from "@/lib/server/orientation";
import { instanceGeometry } from "@/lib/server/planner";
import { createPart } from "@/lib/server/parts";
import type { SessionUser } from "@/lib/server/session";
import { setBlobStore } from "@/lib/server/storage";
import { receiveUpload } from "@/lib/server/uploads";
import { orientationPickInput } from "@/lib/validation/orientation";
import { box } from "../fixtures/meshes";
import { loadWasm, tShape } from "../unit/orient/fixtures";

const root = mkdtempSync(path.join(tmpdir(), "pw-orient-"));
process.env.STORAGE_DIR = root;

async function person(email: string, role: SessionUser["role"] = "member"): Promise<SessionUser> {
  await db().insert(users).ignore().values({ email, name: email.split("@")[0]!, role, passwordHash: "x" });
  const [u] = await db().select({ id: users.id, email: users.email, name: users.name, role: users.role }).from(users).where(eq(users.email, email));
  return u!;
}

const body = (b: Uint8Array) => new ReadableStream<Uint8Array>({ start(c) { c.enqueue(b); c.close(); } });

async function code(p: Promise<unknown>): Promise<string> {
  try {
    await p;
    return "ok";
  } catch (e) {
    if (e instanceof AppError) return e.code;
    throw e;
  }
}

let owner: SessionUser, reader: SessionUser, stranger: SessionUser, operator: SessionUser;
let partId = 0, fileId = 0;
let stl: Uint8Array;
// A quarter turn about +X: file +Y goes to +Z, so the T's 50 × 40 face (at y = 0) rests on the bed.
const LIE_FLAT: [number, number, number, number] = [Math.SQRT1_2, 0, 0, Math.SQRT1_2];

beforeAll(async () => {
  setBlobStore(undefined);
  await db().insert(workshopSettings).ignore().values({ id: 1, name: "Test shop" });
  owner = await person("orient-owner@test.example");
  reader = await person("orient-reader@test.example");
  stranger = await person("orient-stranger@test.example");
  operator = await person("orient-operator@test.example", "operator");
  const { id: a } = await createAssembly(owner, { name: "Lamp bracket", description: "" });
  partId = (await createPart(owner, a, { name: "Tee", quantity: 1, material: "PLA", colour: "", notes: "" })).id;
  await shareAssembly(owner, a, { email: reader.email, access: "read" });
  stl = writeStl(tShape(await loadWasm()));
  fileId = (await receiveUpload(owner, partId, body(stl), { name: "tee.stl", units: "mm" })).fileId;
});
afterAll(async () => {
  await closeDb();
  rmSync(root, { recursive: true, force: true });
});

describe("storing an orientation", () => {
  it("is refused for members who may only read the part, for strangers and for the workshop", async () => {
    const pick = { kind: "rotation" as const, fileId, quaternion: LIE_FLAT };
    expect(await code(chooseOrientation(reader, partId, pick))).toBe("forbidden");
    expect(await code(chooseOrientation(stranger, partId, pick))).toBe("not_found");
    expect(await code(chooseOrientation(operator, partId, pick))).toBe("forbidden");
    expect((await getOrientation(owner, partId)).chosen).toBeNull();
  });

  it("refuses a quaternion that is not of unit length, and a pick planned for another file", async () => {
    // A rotation quaternion has norm 1 (Hamilton's unit quaternions; common practice for rotations).
    expect(orientationPickInput.safeParse({ kind: "rotation", fileId, quaternion: [1, 1, 0, 0] }).success).toBe(false);
    expect(orientationPickInput.safeParse({ kind: "rotation", fileId, quaternion: LIE_FLAT, extra: 1 }).success).toBe(false);
    expect(await code(chooseOrientation(owner, partId, { kind: "rotation", fileId: fileId + 999, quaternion: LIE_FLAT }))).toBe("conflict");
  });

  it("stores the owner's pick with footprint and height measured on the server", async () => {
    const saved = await chooseOrientation(owner, partId, { kind: "rotation", fileId, quaternion: LIE_FLAT });
    // Hand-worked from the T's boxes: lying on its face it is 50 wide, 40 deep (bar 10 + stem 30) and 10 high.
    expect(saved.footprint[0]).toBeCloseTo(50, 3);
    expect(saved.footprint[1]).toBeCloseTo(40, 3);
    expect(saved.height).toBeCloseTo(10, 3);
    expect(saved.summary.layers).toBe(50); // 10 mm at the workshop's default 0.2 mm layers
    expect(saved.down[1]).toBeCloseTo(-1, 6);
    expect(saved.chosenBy).toBe(owner.name);
    // On its face the T rests on the bar's 50 × 10 and the stem's 10 × 30: 800 mm², its largest flat face, nothing overhangs.
    expect(saved.summary.bedContactArea).toBeCloseTo(800, 2);
    expect(saved.summary.overhangArea).toBeCloseTo(0, 6);
    expect(saved.summary.supportVolume).toBeCloseTo(0, 6);
    expect(saved.summary).toMatchObject({ stable: true, label: "Lying on its largest flat face", turn: "tipped onto its front, 90° about X" });
    // The planner uses it: the instance's footprint and height are the stored ones, not the file's box (50 × 10 × 40).
    const eff = await effectiveGeometry(partId);
    expect(eff).not.toBeNull();
    const geo = instanceGeometry({ sizeX: 50, sizeY: 10, sizeZ: 40 }, eff);
    expect(geo.height).toBeCloseTo(10, 3);
    expect(geo.footprint[1]).toBeCloseTo(40, 3);
  });
});

describe("the server's re-run", () => {
  it("stores the same best orientation as the pure function on the same bytes", async () => {
    const server = await runOrientationSearch(owner, partId, {});
    const pure = await searchOrientations(readMesh(stl).soup, { printers: [], layerHeight: 0.2 });
    const best = pure.candidates[0]!;
    expect(server.best.down[0]).toBeCloseTo(best.down[0], 9);
    expect(server.best.down[1]).toBeCloseTo(best.down[1], 9);
    expect(server.best.down[2]).toBeCloseTo(best.down[2], 9);
    expect(server.best.score).toBeCloseTo(best.score, 9);
    expect(server.candidates.length).toBe(pure.candidates.length);
    // Hand-worked: lying on either big face leaves nothing overhanging and is the lowest, widest stance
    // (README score: support and overhang 0, height 10 of diagonal ≈ 67, contact 800 mm² is the most).
    expect(Math.abs(best.down[1])).toBeGreaterThan(0.999);
    expect(best.supportVolume).toBeLessThan(1);
    const stored = await getOrientation(owner, partId);
    expect(stored.suggested?.down[1]).toBeCloseTo(best.down[1], 9);
    expect(stored.suggested?.summary.candidates?.length).toBe(pure.candidates.length);
  });

  it("is refused for a reader", async () => {
    expect(await code(runOrientationSearch(reader, partId, {}))).toBe("forbidden");
  });
});

describe("a new file version", () => {
  it("leaves the old choice behind: the file's own orientation applies again", async () => {
    await receiveUpload(owner, partId, body(writeStl(box(20, 30, 40))), { name: "tee-v2.stl", units: "mm" });
    const now = await getOrientation(owner, partId);
    expect(now.fileId).not.toBe(fileId);
    expect(now.chosen).toBeNull();
    expect(await effectiveGeometry(partId)).toBeNull();
  });
});
