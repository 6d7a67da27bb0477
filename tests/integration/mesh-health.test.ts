// Broken meshes caught at the door: refused by the queue with the reason, repaired into a new
// version (cube volume a³, closed form), or accepted by an operator (recorded). Real database.
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db";
import { partFiles, users, workshopSettings } from "@/db/schema";
import { seedPrinters } from "@/db/seed/printers";
import { writeStl } from "@/lib/mesh";
import { createAssembly } from "@/lib/server/assemblies";
import { AppError } from "@/lib/server/errors";
import { acceptBrokenMesh, repairPartMesh } from "@/lib/server/mesh-health";
import { chooseOrientation } from "@/lib/server/orientation";
import { createPart, getPartDetail } from "@/lib/server/parts";
import { sendToQueue } from "@/lib/server/queue";
import type { SessionUser } from "@/lib/server/session";
import { setBlobStore } from "@/lib/server/storage";
import { receiveUpload } from "@/lib/server/uploads";
import { queueSendInput } from "@/lib/validation/queue";
import { box, concat, flipTriangles } from "../fixtures/meshes";

const root = mkdtempSync(path.join(tmpdir(), "pw-health-"));
process.env.STORAGE_DIR = root;
const body = (b: Uint8Array) => new ReadableStream<Uint8Array>({ start(c) { c.enqueue(b); c.close(); } });
const a = 30;

/** A cube with triangle 2 flipped and triangle 7 missing. */
function brokenCube(): Uint8Array {
  const p = flipTriangles(box(a, a, a), (t) => t === 2).positions;
  const out = new Float32Array(p.length - 9);
  out.set(p.subarray(0, 63));
  out.set(p.subarray(72), 63);
  return writeStl({ positions: out });
}

async function person(email: string, role: SessionUser["role"] = "member"): Promise<SessionUser> {
  await db().insert(users).ignore().values({ email, name: email.split("@")[0]!, role, passwordHash: "x" });
  const [u] = await db().select({ id: users.id, email: users.email, name: users.name, role: users.role }).from(users).where(eq(users.email, email));
  return u!;
}

async function failure(p: Promise<unknown>): Promise<AppError> {
  try {
    await p;
  } catch (e) {
    if (e instanceof AppError) return e;
    throw e;
  }
  throw new Error("expected a refusal");
}

let owner: SessionUser, operator: SessionUser;
const send = (partId: number) => sendToQueue(owner, queueSendInput.parse({ partId, quantity: 1, wishedDate: "", priority: 0 }));

async function brokenPart(name: string) {
  const { id: asm } = await createAssembly(owner, { name, description: "" });
  const partId = (await createPart(owner, asm, { name, quantity: 1, material: "PLA", colour: "", notes: "" })).id;
  const { fileId } = await receiveUpload(owner, partId, body(brokenCube()), { name: "cube.stl", units: "mm" });
  return { partId, fileId };
}

beforeAll(async () => {
  setBlobStore(undefined);
  await db().insert(workshopSettings).ignore().values({ id: 1, name: "Test shop" });
  await seedPrinters(db());
  owner = await person("health-owner@test.example");
  operator = await person("health-operator@test.example", "operator");
});
afterAll(async () => {
  await closeDb();
  rmSync(root, { recursive: true, force: true });
});

describe("a mesh that is not a closed solid", () => {
  it("is refused by the queue with the reason in plain words, and the part page says what is wrong", async () => {
    const { partId } = await brokenPart("Broken cube");
    const e = await failure(send(partId));
    expect(e.code).toBe("invalid");
    expect(e.message).toMatch(/not a closed solid/);
    expect(e.message).toMatch(/3 open edges/);
    const d = await getPartDetail(owner, partId);
    expect(d.health?.sound).toBe(false);
    expect(d.health?.problems.map((p) => p.key)).toEqual(expect.arrayContaining(["open-edges", "flipped-faces"]));
  });

  it("is repaired into a new version with the cube's volume, keeps the chosen orientation, and can then be sent", async () => {
    const { partId, fileId } = await brokenPart("Repairable cube");
    // On its side: a quarter turn about X.
    await chooseOrientation(owner, partId, { kind: "rotation", fileId, quaternion: [Math.SQRT1_2, 0, 0, Math.SQRT1_2] });
    const r = await repairPartMesh(owner, partId, { fileId });
    expect(r.sound).toBe(true);
    expect(r.versionNo).toBe(2);
    expect(r.before).toMatchObject({ watertight: false, openEdges: 3 });
    expect(r.after).toMatchObject({ watertight: true, openEdges: 0, flippedEdges: 0 });
    expect(r.after.volumeMm3).toBeCloseTo(a ** 3, 3); // a³ (closed form)
    expect(r.report).toMatchObject({ holesClosed: 1, facesAdded: 1, facesFlipped: 1 });
    const d = await getPartDetail(owner, partId);
    expect(d.current?.id).toBe(r.fileId);
    expect(d.health).toMatchObject({ sound: true, repair: { fromVersion: 1 } });
    expect(d.placed?.source).toBe("chosen");
    expect((await send(partId)).queued).toBe(1);
    // A second repair of the old version is refused as out of date.
    expect((await failure(repairPartMesh(owner, partId, { fileId }))).code).toBe("conflict");
  });

  it("may be accepted as it is by an operator (recorded), not by a member; then it can be sent", async () => {
    const { partId, fileId } = await brokenPart("Accepted cube");
    expect((await failure(acceptBrokenMesh(owner, partId, { fileId, note: "looks fine" }))).code).toBe("forbidden");
    const h = await acceptBrokenMesh(operator, partId, { fileId, note: "The slicer closes this hole; print it." });
    expect(h.accepted).toMatchObject({ by: "health-operator", note: "The slicer closes this hole; print it." });
    const [row] = await db().select({ by: partFiles.acceptedBrokenBy, at: partFiles.acceptedBrokenAt }).from(partFiles).where(eq(partFiles.id, fileId));
    expect(row?.by).toBe(operator.id);
    expect(row?.at).toBeInstanceOf(Date);
    expect((await send(partId)).queued).toBe(1);
  });

  it("a sound mesh has nothing to repair or accept", async () => {
    const { id: asm } = await createAssembly(owner, { name: "Sound", description: "" });
    const partId = (await createPart(owner, asm, { name: "Sound cube", quantity: 1, material: "PLA", colour: "", notes: "" })).id;
    const { fileId } = await receiveUpload(owner, partId, body(writeStl(box(a, a, a))), { name: "cube.stl", units: "mm" });
    expect((await failure(repairPartMesh(owner, partId, { fileId }))).message).toMatch(/found nothing to fix/);
    expect((await failure(acceptBrokenMesh(operator, partId, { fileId, note: "fine" }))).code).toBe("invalid");
  });
});

describe("solid pieces inside each other", () => {
  it("are named on the part page and refused by the queue, though every edge is closed", async () => {
    const { id: asm } = await createAssembly(owner, { name: "Nested", description: "" });
    const partId = (await createPart(owner, asm, { name: "Nested cube", quantity: 1, material: "PLA", colour: "", notes: "" })).id;
    // A 40 mm cube with a 10 mm cube inside it, both facing out: closed, but the volume counts the inner one twice.
    await receiveUpload(owner, partId, body(writeStl(concat(box(40, 40, 40), box(10, 10, 10, [15, 15, 15])))), { name: "nested.stl", units: "mm" });
    const d = await getPartDetail(owner, partId);
    expect(d.health?.sound).toBe(false);
    expect(d.health?.problems.map((p) => p.key)).toEqual(["pieces-inside"]);
    expect(d.health?.problems[0]).toMatchObject({ repairable: false });
    const e = await failure(send(partId));
    expect(e.message).toMatch(/1 solid piece lies inside another/);
  });
});
