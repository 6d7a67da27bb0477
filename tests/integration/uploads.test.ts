// Uploads through the DAL: content-addressed storage, server analysis, refusals that leave nothing behind.
import { mkdtempSync, readdirSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { count, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db";
import { meshBlobs, partFiles, users, workshopSettings } from "@/db/schema";
import { analysisToJson, analyzeBytes, readMesh, write3mf, writeStl } from "@/lib/mesh";
import { createAssembly, shareAssembly } from "@/lib/server/assemblies";
import { AppError } from "@/lib/server/errors";
import { createPart, getAssemblyDetail, getPartDetail } from "@/lib/server/parts";
import type { SessionUser } from "@/lib/server/session";
import { setBlobStore } from "@/lib/server/storage";
import { receiveUpload } from "@/lib/server/uploads";
import { box } from "../fixtures/meshes";

const root = mkdtempSync(path.join(tmpdir(), "pw-uploads-"));
process.env.STORAGE_DIR = root; // read lazily by lib/env on first use

function body(bytes: Uint8Array, chunk = 4096): ReadableStream<Uint8Array> {
  let at = 0;
  return new ReadableStream({
    pull(c) {
      if (at >= bytes.length) return c.close();
      c.enqueue(bytes.slice(at, at + chunk));
      at += chunk;
    },
  });
}

/** Every regular file below the storage root, temporary folder included. */
function storedFiles(dir = root): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) => (e.isDirectory() ? storedFiles(path.join(dir, e.name)) : [path.join(dir, e.name)]));
}

async function person(email: string): Promise<SessionUser> {
  await db().insert(users).ignore().values({ email, name: email.split("@")[0]!, role: "member", passwordHash: "x" });
  const [u] = await db().select({ id: users.id, email: users.email, name: users.name, role: users.role }).from(users).where(eq(users.email, email));
  return u!;
}

const rows = async () => ({
  blobs: (await db().select({ n: count() }).from(meshBlobs))[0]!.n,
  files: (await db().select({ n: count() }).from(partFiles))[0]!.n,
});

let owner: SessionUser, reader: SessionUser, partA: number, partB: number, assemblyId: number;

beforeAll(async () => {
  setBlobStore(undefined);
  await db().insert(workshopSettings).ignore().values({ id: 1, name: "Test shop" });
  owner = await person("owner-u@test.example");
  reader = await person("reader-u@test.example");
  const { id: a } = await createAssembly(owner, { name: "Tripod head", description: "" });
  assemblyId = a;
  partA = (await createPart(owner, a, { name: "Clamp", quantity: 1, material: "PLA", colour: "", notes: "" })).id;
  partB = (await createPart(owner, a, { name: "Clamp copy", quantity: 1, material: "PLA", colour: "", notes: "" })).id;
  await shareAssembly(owner, a, { email: reader.email, access: "read" });
});
afterAll(async () => {
  await closeDb();
  rmSync(root, { recursive: true, force: true });
});

describe("uploads", () => {
  const stl = writeStl(box(20, 30, 40));

  it("stores the same bytes once and keeps each upload as a version", async () => {
    const before = await rows();
    const first = await receiveUpload(owner, partA, body(stl), { name: "clamp.stl", units: "mm" });
    const again = await receiveUpload(owner, partA, body(stl), { name: "clamp-again.stl", units: "mm" });
    const other = await receiveUpload(owner, partB, body(stl), { name: "clamp.stl", units: "mm" });
    expect(first.alreadyStored).toBe(false);
    expect(again.alreadyStored).toBe(true);
    expect(other.alreadyStored).toBe(true);
    expect(new Set([first.sha256, again.sha256, other.sha256]).size).toBe(1);
    const after = await rows();
    expect(after.blobs - before.blobs).toBe(1);
    expect(after.files - before.files).toBe(3);
    // One file on disk under its SHA-256 name, and no temporary file left.
    expect(storedFiles().map((f) => path.basename(f))).toEqual([first.sha256]);
    // The part keeps its history; the newest upload is current.
    const det = await getPartDetail(owner, partA);
    expect(det.files.map((f) => f.versionNo)).toEqual([2, 1]);
    expect(det.current?.id).toBe(again.fileId);
    // The assembly page reads the current mesh's size back out of the stored analysis.
    const tree = await getAssemblyDetail(owner, assemblyId);
    expect(tree.parts.find((p) => p.id === partA)?.size).toEqual(first.analysis.size);
  });

  it("keeps the server's analysis equal to lib/mesh's, and a 20 × 30 × 40 box's volume equal to its closed form", async () => {
    const r = await receiveUpload(owner, partA, body(stl), { name: "clamp.stl", units: "mm" });
    const direct = analyzeBytes(stl, { filename: "clamp.stl" });
    expect(r.analysis).toEqual(analysisToJson("clamp.stl", direct.format, direct.analysis));
    expect(r.analysis.volume_mm3).toBeCloseTo(20 * 30 * 40, 3); // a·b·c (REFERENCES.md, closed forms)
    expect(r.analysis.area_mm2).toBeCloseTo(2 * (20 * 30 + 20 * 40 + 30 * 40), 3);
  });

  it("scales an STL in inches by 25.4 and reads a 3MF's own unit", async () => {
    const tiny = writeStl(box(1, 2, 3));
    const inch = await receiveUpload(owner, partB, body(tiny), { name: "tiny.stl", units: "in" });
    expect(inch.analysis.size.map((x) => Number(x.toFixed(4)))).toEqual([25.4, 50.8, 76.2]); // 1 in = 25.4 mm exactly (international inch, 1959)
    const three = write3mf([{ name: "clamp", mesh: box(10, 20, 30) }]);
    const t = await receiveUpload(owner, partB, body(three), { name: "box.3mf", units: "mm" });
    expect(t.analysis.format).toBe("3mf");
    expect(t.analysis.volume_mm3).toBeCloseTo(6000, 2); // 10 × 20 × 30 mm box (3MF Consortium sample's dimensions)
  });

  it("refuses a corrupt file with the reader's message and leaves no file or row behind", async () => {
    const before = await rows();
    const filesBefore = storedFiles();
    // A binary-looking STL cut short: 84 + 50·N does not hold and the bytes are not ASCII either.
    const broken = stl.slice(0, 84 + 50 * 3 + 17);
    broken[0] = 0xff;
    let expected = "";
    try {
      readMesh(broken, { filename: "broken.stl" });
    } catch (e) {
      expected = (e as Error).message;
    }
    expect(expected).not.toBe("");
    const err = await receiveUpload(owner, partA, body(broken), { name: "broken.stl", units: "mm" }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(AppError);
    expect((err as AppError).code).toBe("invalid");
    expect((err as AppError).message).toContain(expected);
    expect(await rows()).toEqual(before);
    expect(storedFiles()).toEqual(filesBefore);
  });

  it("stops at the size limit with 413 and keeps nothing", async () => {
    const before = await rows();
    const filesBefore = storedFiles();
    const big = writeStl(box(5, 5, 5));
    const err = await receiveUpload(owner, partA, body(big, 100), { name: "big.stl", units: "mm" }, { limitBytes: 300 }).catch((e: unknown) => e);
    expect((err as AppError).code).toBe("too_large");
    expect((err as AppError).status).toBe(413);
    expect(await rows()).toEqual(before);
    expect(storedFiles()).toEqual(filesBefore);
  });

  it("refuses uploads from someone who may only read the part", async () => {
    const err = await receiveUpload(reader, partA, body(stl), { name: "clamp.stl", units: "mm" }).catch((e: unknown) => e);
    expect((err as AppError).code).toBe("forbidden");
  });
});
