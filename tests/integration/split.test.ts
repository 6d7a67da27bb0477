// Accepting a split on the real database: the server re-cuts, stores each piece as STL and creates parts.
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { and, eq, inArray } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db";
import { partFiles, partInstances, parts, queueEntries, users, workshopSettings } from "@/db/schema";
import { analyzeSoup, readMesh, writeStl } from "@/lib/mesh";
import { solidFromSoup } from "@/lib/orient";
import { createAssembly, shareAssembly } from "@/lib/server/assemblies";
import { AppError } from "@/lib/server/errors";
import { bomCsv, createPart, getPartDetail } from "@/lib/server/parts";
import { sendToQueue } from "@/lib/server/queue";
import { quoteStoredAssembly } from "@/lib/server/quotes";
import { queueSendInput } from "@/lib/validation/queue";
import { seedPrinters } from "@/db/seed/printers";
import type { SessionUser } from "@/lib/server/session";
import { blobStore, setBlobStore } from "@/lib/server/storage";
import { acceptSplit, getSplitLinks } from "@/lib/server/split";
import { receiveUpload } from "@/lib/server/uploads";
import { box } from "../fixtures/meshes";
import { loadWasm, tShape } from "../unit/orient/fixtures";

const root = mkdtempSync(path.join(tmpdir(), "pw-split-"));
process.env.STORAGE_DIR = root;

async function person(email: string): Promise<SessionUser> {
  await db().insert(users).ignore().values({ email, name: email.split("@")[0]!, role: "member", passwordHash: "x" });
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

const IDENTITY: [number, number, number, number] = [0, 0, 0, 1];
// The T: stem 10 × 10 × 30 under a bar 50 × 10 × 10; box volumes w·d·h give 3000 + 5000 = 8000 mm³.
const STEM = 10 * 10 * 30, BAR = 50 * 10 * 10;
let owner: SessionUser, reader: SessionUser, partId = 0, fileId = 0, assemblyId = 0;
let instanceIds: number[] = [];

beforeAll(async () => {
  setBlobStore(undefined);
  await db().insert(workshopSettings).ignore().values({ id: 1, name: "Test shop" });
  owner = await person("split-owner@test.example");
  reader = await person("split-reader@test.example");
  assemblyId = (await createAssembly(owner, { name: "Coat rack", description: "" })).id;
  partId = (await createPart(owner, assemblyId, { name: "Hook", quantity: 2, material: "PLA", colour: "", notes: "" })).id;
  await shareAssembly(owner, assemblyId, { email: reader.email, access: "read" });
  fileId = (await receiveUpload(owner, partId, body(writeStl(tShape(await loadWasm()))), { name: "hook.stl", units: "mm" })).fileId;
  const inst = await db().select({ id: partInstances.id }).from(partInstances).where(eq(partInstances.partId, partId));
  instanceIds = inst.map((i) => i.id);
  // Copy 1 is waiting in the workshop's queue; copy 2 is still drafted.
  await db().update(partInstances).set({ status: "queued" }).where(eq(partInstances.id, instanceIds[0]!));
  await db().insert(queueEntries).values({ instanceId: instanceIds[0]!, memberId: owner.id, sentBy: owner.id, priority: 0 });
});
afterAll(async () => {
  await closeDb();
  rmSync(root, { recursive: true, force: true });
});

describe("accepting a split", () => {
  const plane = { kind: "plane" as const, plane: { normal: [0, 0, 1] as [number, number, number], offset: 30 } };

  it("is refused for a reader, for a plane that misses the part and for a stale file", async () => {
    expect(await code(acceptSplit(reader, partId, { fileId, quaternion: IDENTITY, cut: plane }))).toBe("forbidden");
    expect(await code(acceptSplit(owner, partId, { fileId, quaternion: IDENTITY, cut: { kind: "plane", plane: { normal: [0, 0, 1], offset: 80 } } }))).toBe("invalid");
    expect(await code(acceptSplit(owner, partId, { fileId: fileId + 999, quaternion: IDENTITY, cut: plane }))).toBe("conflict");
    expect((await getSplitLinks(owner, partId)).pieces).toHaveLength(0);
  });

  it("creates the pieces as parts whose stored STL volumes sum to the parent's, and marks the parent split", async () => {
    const res = await acceptSplit(owner, partId, { fileId, quaternion: IDENTITY, cut: plane });
    expect(res.pieces).toHaveLength(2);
    const wasm = await loadWasm();
    const volumes: number[] = [];
    for (const p of res.pieces) {
      const [f] = await db().select({ sha256: partFiles.sha256, partId: partFiles.partId }).from(partFiles).where(eq(partFiles.id, p.fileId));
      const bytes = await blobStore().read(f!.sha256);
      // Binary STL: 84 + 50·N bytes (STL format description; Burns, Automated Fabrication §6.5).
      const soup = readMesh(bytes).soup;
      expect(bytes.byteLength).toBe(84 + 50 * (soup.positions.length / 9));
      const v = analyzeSoup(soup).volume;
      volumes.push(v);
      // Cross-check with manifold-3d's own volume of the read-back mesh (independent library).
      const solid = solidFromSoup(wasm, soup);
      expect(solid.volume()).toBeCloseTo(v, 1);
      solid.delete();
      const [row] = await db().select({ assemblyId: parts.assemblyId, currentFileId: parts.currentFileId, quantity: parts.quantity }).from(parts).where(eq(parts.id, p.partId));
      expect(row).toEqual({ assemblyId, currentFileId: p.fileId, quantity: 2 });
      const copies = await db().select({ status: partInstances.status }).from(partInstances).where(eq(partInstances.partId, p.partId));
      expect(copies.map((c) => c.status)).toEqual(["drafted", "drafted"]);
    }
    const sum = volumes.reduce((s, v) => s + v, 0);
    expect(Math.abs(sum - (STEM + BAR)) / (STEM + BAR)).toBeLessThan(0.001);
    expect(Math.abs(sum - res.parentVolumeMm3) / res.parentVolumeMm3).toBeLessThan(0.001);
    const sorted = [...volumes].sort((a, b) => a - b);
    expect(Math.abs(sorted[0]! - STEM) / STEM).toBeLessThan(0.001);
    expect(Math.abs(sorted[1]! - BAR) / BAR).toBeLessThan(0.001);

    const links = await getSplitLinks(owner, partId);
    expect(links.pieces.map((p) => p.id).sort()).toEqual(res.pieces.map((p) => p.partId).sort());
    expect((await getSplitLinks(owner, res.pieces[0]!.partId)).parent?.id).toBe(partId);
    // The parent's unprinted copies left the workshop: no queue entry, no copy to send.
    expect(await db().select({ id: queueEntries.id }).from(queueEntries).where(inArray(queueEntries.instanceId, instanceIds))).toHaveLength(0);
    expect(await db().select({ id: partInstances.id }).from(partInstances).where(and(eq(partInstances.partId, partId)))).toHaveLength(0);
    expect(res.copiesWithdrawn).toBe(2);
    // The pieces are part of the assembly, each with its own mesh to view.
    const detail = await getPartDetail(owner, res.pieces[0]!.partId);
    expect(detail.current?.id).toBe(res.pieces[0]!.fileId);
  });

  it("the parent leaves the BOM, the assembly quote and sending; its pieces take its place", async () => {
    await seedPrinters(db());
    const { csv } = await bomCsv(owner, assemblyId);
    const names = csv.split("\r\n").slice(1).filter(Boolean).map((l) => l.split(",")[1]);
    expect(names).not.toContain("Hook");
    expect(names.filter((n) => n?.startsWith("Hook – piece"))).toHaveLength(2);
    const q = await quoteStoredAssembly(owner, assemblyId);
    const labels = q.priced?.lines.map((l) => l.label) ?? [];
    expect(labels).not.toContain("Hook");
    expect(labels.filter((l) => l?.startsWith("Hook – piece"))).toHaveLength(2);
    expect(q.unpriced.map((u) => u.name)).not.toContain("Hook");
    const e = await sendToQueue(owner, queueSendInput.parse({ partId, quantity: 1, wishedDate: "", priority: 0 })).catch((x: unknown) => x);
    expect(e).toBeInstanceOf(AppError);
    expect((e as AppError).message).toMatch(/split into pieces/);
  });

  it("adds registration pegs and holes on request: the pieces sum to the part less the clearance volume", async () => {
    // A 40 × 30 × 60 block cut across at 30 mm: two pegs (5 mm, 4 mm deep) and two holes 0.3 mm wider and deeper.
    const blockId = (await createPart(owner, assemblyId, { name: "Block", quantity: 1, material: "PLA", colour: "", notes: "" })).id;
    const blockFile = (await receiveUpload(owner, blockId, body(writeStl(box(40, 30, 60))), { name: "block.stl", units: "mm" })).fileId;
    const res = await acceptSplit(owner, blockId, { fileId: blockFile, quaternion: IDENTITY, cut: { kind: "plane", plane: { normal: [0, 0, 1], offset: 30 } }, pegs: { clearanceMm: 0.3 } });
    expect(res.pieces).toHaveLength(2);
    const prism32 = (r: number, h: number) => 16 * r * r * Math.sin((2 * Math.PI) / 32) * h; // regular 32-gon prism (closed form)
    const clearance = 2 * (prism32(2.5 + 0.3, 4 + 0.3) - prism32(2.5, 4));
    const sum = res.pieces.reduce((s, p) => s + p.volumeMm3, 0);
    expect(Math.abs(sum + clearance - 72_000) / 72_000).toBeLessThan(0.001);
  });

  it("cannot split the same part twice", async () => {
    expect(await code(acceptSplit(owner, partId, { fileId, quaternion: IDENTITY, cut: plane }))).toBe("conflict");
  });
});
