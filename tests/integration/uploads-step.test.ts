// STEP uploads through the DAL: the file is kept as uploaded beside the 3MF made from it; the figures
// are the CLI's; a file without solids is refused and leaves nothing behind.
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { count, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db";
import { meshBlobs, partFiles, users, workshopSettings } from "@/db/schema";
import { analysisToJson, readMesh } from "@/lib/mesh";
import { analyzeFile } from "@/lib/mesh-node/step";
import { createAssembly } from "@/lib/server/assemblies";
import { AppError } from "@/lib/server/errors";
import { createPart } from "@/lib/server/parts";
import type { SessionUser } from "@/lib/server/session";
import { setBlobStore } from "@/lib/server/storage";
import { openPartFile, receiveUpload } from "@/lib/server/uploads";
import { boxSolid, cylinderSolid, stepFile } from "../fixtures/step";

const root = mkdtempSync(path.join(tmpdir(), "pw-uploads-step-"));
process.env.STORAGE_DIR = root;

const body = (bytes: Uint8Array) => new ReadableStream<Uint8Array>({ start(c) { c.enqueue(bytes.slice()); c.close(); } });
async function bytesOf(s: ReadableStream<Uint8Array>): Promise<Uint8Array> {
  return new Uint8Array(await new Response(s).arrayBuffer());
}
const blobCount = async () => (await db().select({ n: count() }).from(meshBlobs))[0]!.n;

let owner: SessionUser, part: number;
beforeAll(async () => {
  setBlobStore(undefined);
  await db().insert(workshopSettings).ignore().values({ id: 1, name: "Test shop" });
  await db().insert(users).ignore().values({ email: "step-owner@test.example", name: "step-owner", role: "member", passwordHash: "x" });
  const [u] = await db().select({ id: users.id, email: users.email, name: users.name, role: users.role }).from(users).where(eq(users.email, "step-owner@test.example"));
  owner = u!;
  const { id } = await createAssembly(owner, { name: "Lamp bracket", description: "" });
  part = (await createPart(owner, id, { name: "Bracket", quantity: 1, material: "PLA", colour: "", notes: "" })).id;
});
afterAll(async () => {
  await closeDb();
  rmSync(root, { recursive: true, force: true });
});

describe("STEP uploads", () => {
  // Drawn in inches (ISO 10303-41 conversion-based unit): a 1 × 2 × 0.5 in block and a cylinder.
  const step = new TextEncoder().encode(stepFile("in", (w) => [boxSolid(w, 1, 2, 0.5), cylinderSolid(w, 0.25, 1, [2, 0, 0])]));

  it("keeps the STEP as uploaded and a 3MF of its bodies; the figures equal the CLI's", async () => {
    const before = await blobCount();
    const r = await receiveUpload(owner, part, body(step), { name: "bracket.step", units: "mm" });
    expect(await blobCount()).toBe(before + 2);
    const cli = await analyzeFile(step);
    expect(r.analysis).toEqual(analysisToJson("bracket.step", "step", cli.analysis));
    const [row] = await db().select().from(partFiles).where(eq(partFiles.id, r.fileId));
    expect(row!.format).toBe("step");
    expect(row!.sourceSha256).toBe(r.sha256);
    expect(row!.sha256).not.toBe(r.sha256);
    // The source download is the file as uploaded; the mesh download is a 3MF with one object per body.
    const src = await openPartFile(owner, r.fileId, { source: true });
    expect(src.name).toBe("bracket.step");
    expect(await bytesOf(src.stream)).toEqual(step);
    const mesh = await openPartFile(owner, r.fileId);
    expect(mesh.name).toBe("bracket.3mf");
    const read = readMesh(await bytesOf(mesh.stream));
    expect(read.format).toBe("3mf");
    expect(read.parts!.length).toBe(2);
    expect(read.soup.positions.length / 9).toBe(r.analysis.triangles);
  });

  it("refuses a STEP file without solids, leaving nothing stored", async () => {
    const before = await blobCount();
    const empty = new TextEncoder().encode(stepFile("mm", (w) => [w.add("CARTESIAN_POINT('',(0.,0.,0.))")]));
    const e = await receiveUpload(owner, part, body(empty), { name: "nothing.stp", units: "mm" }).catch((x: unknown) => x);
    expect(e).toBeInstanceOf(AppError);
    expect((e as Error).message).toMatch(/no solid or surface to print/);
    expect(await blobCount()).toBe(before);
  });
});
