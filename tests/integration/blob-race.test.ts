// Identical bytes uploaded in parallel while other uploads of the same bytes fail and clean up: the
// clean-up and the recording of a file both hold the blob's row lock, so bytes a recorded file needs
// are never removed, and bytes removed just before an upload recorded them are written again.
// Content addressing by SHA-256 (FIPS 180-4), checked against node:crypto; the rest is common
// practice, no source.
import { createHash } from "node:crypto";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { count, eq, inArray } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db";
import { meshBlobs, partFiles, parts, users, workshopSettings } from "@/db/schema";
import { writeStl } from "@/lib/mesh";
import { createAssembly } from "@/lib/server/assemblies";
import { forgetUnusedBlobs, withBlobsHeld } from "@/lib/server/blobs";
import { AppError } from "@/lib/server/errors";
import { createPart } from "@/lib/server/parts";
import type { SessionUser } from "@/lib/server/session";
import { blobStore, setBlobStore } from "@/lib/server/storage";
import { receiveUpload } from "@/lib/server/uploads";
import { box } from "../fixtures/meshes";

const root = mkdtempSync(path.join(tmpdir(), "pw-blob-race-"));
process.env.STORAGE_DIR = root;

const sha = (b: Uint8Array) => createHash("sha256").update(b).digest("hex");
let owner: SessionUser;
let assemblyId: number;

function whole(bytes: Uint8Array): ReadableStream<Uint8Array> {
  return new ReadableStream({
    start(c) {
      c.enqueue(bytes);
      c.close();
    },
  });
}

/** Sends the first half at once and the rest when `gate` opens. */
function gated(bytes: Uint8Array, gate: Promise<void>): ReadableStream<Uint8Array> {
  const half = Math.floor(bytes.length / 2);
  let sent = false;
  return new ReadableStream({
    async pull(c) {
      if (!sent) {
        sent = true;
        c.enqueue(bytes.slice(0, half));
        return;
      }
      await gate;
      c.enqueue(bytes.slice(half));
      c.close();
    },
  });
}

const newPart = async (name: string) => (await createPart(owner, assemblyId, { name, quantity: 1, material: "PLA", colour: "", notes: "" })).id;

beforeAll(async () => {
  setBlobStore(undefined);
  await db().insert(workshopSettings).ignore().values({ id: 1, name: "Test shop" });
  await db().insert(users).ignore().values({ email: "blob-race@test.example", name: "Blob Race", role: "member", passwordHash: "x" });
  const [u] = await db().select({ id: users.id, email: users.email, name: users.name, role: users.role }).from(users).where(eq(users.email, "blob-race@test.example"));
  owner = u!;
  assemblyId = (await createAssembly(owner, { name: "Race rig", description: "" })).id;
});

afterAll(async () => {
  await closeDb();
  rmSync(root, { recursive: true, force: true });
});

describe("blob clean-up under contention", () => {
  it("12 uploads that fail after storing race 12 that succeed with the same bytes; the bytes and their row stay (3 rounds)", async () => {
    for (let round = 0; round < 3; round++) {
      const bytes = writeStl(box(17 + round, 23, 31));
      const key = sha(bytes);
      const doomed = await Promise.all(Array.from({ length: 12 }, (_, k) => newPart(`Doomed ${round}.${k}`)));
      const good = await Promise.all(Array.from({ length: 12 }, (_, k) => newPart(`Good ${round}.${k}`)));
      let open!: () => void;
      const gate = new Promise<void>((r) => (open = r));
      // The doomed uploads pass the access check and stream half their body; then their parts go away,
      // so each one stores the bytes, fails in its transaction and cleans up after itself.
      const failing = doomed.map((p) => receiveUpload(owner, p, gated(bytes, gate), { name: "same.stl", units: "mm" }).then(() => "ok", (e: unknown) => (e instanceof AppError ? e.code : String(e))));
      await new Promise((r) => setTimeout(r, 50));
      await db().delete(parts).where(inArray(parts.id, doomed));
      const succeeding = good.map((p) => receiveUpload(owner, p, whole(bytes), { name: "same.stl", units: "mm" }));
      open();
      const [lost, won] = await Promise.all([Promise.all(failing), Promise.all(succeeding)]);
      expect(lost).toEqual(doomed.map(() => "not_found"));
      expect(won.every((w) => w.sha256 === key)).toBe(true);
      // Every recorded file has its bytes, unchanged, and the blob row with the true size.
      expect((await db().select({ n: count() }).from(partFiles).where(eq(partFiles.sha256, key)))[0]!.n).toBe(12);
      expect(await blobStore().has(key)).toBe(true);
      expect(sha(await blobStore().read(key))).toBe(key);
      const [row] = await db().select({ size: meshBlobs.sizeBytes }).from(meshBlobs).where(eq(meshBlobs.sha256, key));
      expect(row?.size).toBe(bytes.length);
    }
  });

  it("a clean-up waits for an upload that holds the blob, and then keeps the bytes it recorded", async () => {
    const bytes = writeStl(box(41, 7, 9));
    const key = sha(bytes);
    const partId = await newPart("Held");
    let release!: () => void;
    const held = new Promise<void>((r) => (release = r));
    let locked!: () => void;
    const isLocked = new Promise<void>((r) => (locked = r));
    const upload = withBlobsHeld([{ sha256: key, bytes }], new Set(), async (tx) => {
      await tx.insert(partFiles).values({ partId, sha256: key, versionNo: 1, originalName: "held.stl", units: "mm", format: "stl-binary", sizeX: 41, sizeY: 7, sizeZ: 9, volumeMm3: 41 * 7 * 9, watertight: 1, analysis: {}, uploadedBy: owner.id });
      locked();
      await held;
    });
    await isLocked;
    let cleaned = false;
    const cleanup = forgetUnusedBlobs([{ sha256: key, sizeBytes: bytes.length }]).then(() => (cleaned = true));
    await new Promise((r) => setTimeout(r, 300));
    expect(cleaned).toBe(false); // waiting on the row lock
    release();
    await upload;
    await cleanup;
    expect(await blobStore().has(key)).toBe(true);
    expect((await db().select({ n: count() }).from(meshBlobs).where(eq(meshBlobs.sha256, key)))[0]!.n).toBe(1);
  });

  it("an upload whose bytes a clean-up removed just before writes them again", async () => {
    const bytes = writeStl(box(5, 6, 7));
    const key = sha(bytes);
    const partId = await newPart("Again");
    await withBlobsHeld([{ sha256: key, bytes }], new Set(), async () => undefined); // stored, no file refers to it
    expect(await blobStore().has(key)).toBe(true);
    await forgetUnusedBlobs([{ sha256: key, sizeBytes: bytes.length }]);
    expect(await blobStore().has(key)).toBe(false);
    expect((await db().select({ n: count() }).from(meshBlobs).where(eq(meshBlobs.sha256, key)))[0]!.n).toBe(0);
    // The upload had found the bytes stored (so wrote none) before the clean-up removed them.
    const written = new Set<string>();
    await withBlobsHeld([{ sha256: key, bytes }], written, async (tx) => {
      await tx.insert(partFiles).values({ partId, sha256: key, versionNo: 1, originalName: "again.stl", units: "mm", format: "stl-binary", sizeX: 5, sizeY: 6, sizeZ: 7, volumeMm3: 210, watertight: 1, analysis: {}, uploadedBy: owner.id });
    });
    expect([...written]).toEqual([key]);
    expect(sha(await blobStore().read(key))).toBe(key);
  });
});
