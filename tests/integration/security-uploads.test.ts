// Uploads under failure and contention, through the DAL: a body that breaks off mid-way keeps
// nothing; parallel uploads into one part get distinct version numbers and the bytes are stored once.
// Content addressing by SHA-256 (FIPS 180-4), checked against node:crypto.
import { createHash } from "node:crypto";
import { mkdtempSync, readdirSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { count, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db";
import { meshBlobs, partFiles, users, workshopSettings } from "@/db/schema";
import { writeStl } from "@/lib/mesh";
import { createAssembly } from "@/lib/server/assemblies";
import { createPart } from "@/lib/server/parts";
import type { SessionUser } from "@/lib/server/session";
import { setBlobStore } from "@/lib/server/storage";
import { receiveUpload } from "@/lib/server/uploads";
import { box } from "../fixtures/meshes";

const root = mkdtempSync(path.join(tmpdir(), "pw-sec-uploads-"));
process.env.STORAGE_DIR = root;

function files(dir = root): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) => (e.isDirectory() ? files(path.join(dir, e.name)) : [path.join(dir, e.name)]));
}

/** A body that delivers `cutAt` bytes and then fails, as a dropped client connection does. */
function brokenBody(bytes: Uint8Array, cutAt: number): ReadableStream<Uint8Array> {
  let at = 0;
  return new ReadableStream({
    pull(c) {
      if (at >= cutAt) return c.error(new Error("client went away"));
      const end = Math.min(cutAt, at + 1024);
      c.enqueue(bytes.slice(at, end));
      at = end;
    },
  });
}

function whole(bytes: Uint8Array): ReadableStream<Uint8Array> {
  return new ReadableStream({
    start(c) {
      c.enqueue(bytes);
      c.close();
    },
  });
}

const sha = (b: Uint8Array) => createHash("sha256").update(b).digest("hex");
let owner: SessionUser;
let partId: number;

beforeAll(async () => {
  setBlobStore(undefined);
  await db().insert(workshopSettings).ignore().values({ id: 1, name: "Test shop" });
  await db().insert(users).ignore().values({ email: "sec-uploads@test.example", name: "Sec Uploads", role: "member", passwordHash: "x" });
  const [u] = await db().select({ id: users.id, email: users.email, name: users.name, role: users.role }).from(users).where(eq(users.email, "sec-uploads@test.example"));
  owner = u!;
  const { id: a } = await createAssembly(owner, { name: "Contention rig", description: "" });
  partId = (await createPart(owner, a, { name: "Racing bracket", quantity: 1, material: "PLA", colour: "", notes: "" })).id;
});

afterAll(async () => {
  await closeDb();
  rmSync(root, { recursive: true, force: true });
});

const counts = async () => ({
  blobs: (await db().select({ n: count() }).from(meshBlobs))[0]!.n,
  files: (await db().select({ n: count() }).from(partFiles).where(eq(partFiles.partId, partId)))[0]!.n,
});

describe("uploads under failure and contention", () => {
  it("a body that breaks off half-way is refused and leaves no temp file, blob or row", async () => {
    const bytes = writeStl(box(30, 20, 10));
    const before = await counts();
    const filesBefore = files();
    await expect(receiveUpload(owner, partId, brokenBody(bytes, Math.floor(bytes.length / 2)), { name: "cut.stl", units: "mm" })).rejects.toThrow();
    expect(await counts()).toEqual(before);
    expect(files()).toEqual(filesBefore);
  });

  it("ten parallel uploads of the same bytes get versions 1…10 and one stored copy whose hash is the bytes' SHA-256", async () => {
    const bytes = writeStl(box(12, 34, 56));
    const before = await counts();
    const res = await Promise.all(Array.from({ length: 10 }, () => receiveUpload(owner, partId, whole(bytes), { name: "same.stl", units: "mm" })));
    const versions = res.map((r) => r.versionNo).sort((a, b) => a - b);
    expect(new Set(versions).size).toBe(10);
    expect(versions[9]! - versions[0]!).toBe(9);
    expect(res.every((r) => r.sha256 === sha(bytes))).toBe(true);
    // At least one wrote the bytes. Racing uploads of identical bytes may each rename their own temp
    // copy onto the same content address (atomic, same bytes), so more than one can report writing.
    expect(res.filter((r) => !r.alreadyStored).length).toBeGreaterThanOrEqual(1);
    const after = await counts();
    expect(after.files - before.files).toBe(10);
    expect(after.blobs - before.blobs).toBe(1);
    const stored = files().filter((f) => path.basename(f) === sha(bytes));
    expect(stored.length).toBe(1);
    expect(sha(new Uint8Array(readFileSync(stored[0]!)))).toBe(sha(bytes));
    expect(files().filter((f) => f.includes(`${path.sep}.tmp${path.sep}`))).toEqual([]);
  });

  it("parallel uploads of different bytes each keep their own bytes under their own version", async () => {
    const meshes = Array.from({ length: 6 }, (_, k) => writeStl(box(10 + k, 20, 30)));
    const res = await Promise.all(meshes.map((m, k) => receiveUpload(owner, partId, whole(m), { name: `v${k}.stl`, units: "mm" })));
    expect(new Set(res.map((r) => r.versionNo)).size).toBe(6);
    for (let k = 0; k < 6; k++) expect(res[k]!.sha256).toBe(sha(meshes[k]!));
    const rows = await db().select({ versionNo: partFiles.versionNo, sha256: partFiles.sha256, name: partFiles.originalName }).from(partFiles).where(eq(partFiles.partId, partId));
    for (const r of res) expect(rows.find((x) => x.versionNo === r.versionNo)?.sha256).toBe(r.sha256);
  });
});
