// Finding 4 (issue 17): a 200 KB 3MF inflated 200 MB on the request thread (about 2.5 s of a blocked
// server per upload), with no per-user limit. Now: the inflate cap is scaled to the package's size,
// the analysis runs in a worker thread, and each member has an upload budget.
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { eq } from "drizzle-orm";
import { strFromU8, strToU8, unzipSync, zipSync } from "fflate";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db";
import { users, workshopSettings } from "@/db/schema";
import { write3mf } from "@/lib/mesh";
import { createAssembly } from "@/lib/server/assemblies";
import { AppError } from "@/lib/server/errors";
import { closeMeshPool, inflateCapFor, meshPoolCompleted } from "@/lib/server/mesh-pool/pool";
import { createPart } from "@/lib/server/parts";
import type { SessionUser } from "@/lib/server/session";
import { setBlobStore } from "@/lib/server/storage";
import { UploadBudget, uploadBudget } from "@/lib/server/upload-budget";
import { receiveUpload } from "@/lib/server/uploads";
import { box } from "../fixtures/meshes";

process.env.STORAGE_DIR = mkdtempSync(path.join(tmpdir(), "pw-sec-exhaust-"));

const body = (bytes: Uint8Array) => new ReadableStream<Uint8Array>({ start: (c) => (c.enqueue(bytes), c.close()) });
const MiB = 1024 * 1024;

let owner: SessionUser;
let partId: number;

beforeAll(async () => {
  setBlobStore(undefined);
  await db().insert(workshopSettings).ignore().values({ id: 1, name: "Test shop" });
  await db().insert(users).ignore().values({ email: "exhaust@test.example", name: "Exhaust", role: "member", passwordHash: "x" });
  const [u] = await db().select({ id: users.id, email: users.email, name: users.name, role: users.role }).from(users).where(eq(users.email, "exhaust@test.example"));
  owner = u!;
  const { id: a } = await createAssembly(owner, { name: "Bomb rig", description: "" });
  partId = (await createPart(owner, a, { name: "Bomb plate", quantity: 1, material: "PLA", colour: "", notes: "" })).id;
});
afterAll(async () => {
  await closeMeshPool();
  await closeDb();
});

/** A valid 3MF of a 10 mm box whose model part carries `padMiB` MiB of XML comment: tiny deflated. */
function paddedPackage(padMiB: number): Uint8Array {
  const files = unzipSync(write3mf([{ name: "box", mesh: box(10, 10, 10) }]));
  const xml = strFromU8(files["3D/3dmodel.model"]!);
  files["3D/3dmodel.model"] = strToU8(xml.replace("</model>", `<!--${"a".repeat(padMiB * MiB)}--></model>`));
  return zipSync(files, { level: 9 });
}

describe("the inflate cap follows the package's size", () => {
  it("is 64 × the compressed size, between 16 and 256 MiB", () => {
    expect(inflateCapFor(200 * 1024)).toBe(16 * MiB);
    expect(inflateCapFor(1 * MiB)).toBe(64 * MiB);
    expect(inflateCapFor(50 * MiB)).toBe(256 * MiB);
  });

  it("refuses a small package that would inflate to 60 MiB, without inflating it", async () => {
    const bomb = paddedPackage(60);
    expect(bomb.byteLength).toBeLessThan(300 * 1024);
    const r = await receiveUpload(owner, partId, body(bomb), { name: "bomb.3mf", units: "mm" }).then(
      () => null,
      (e: unknown) => e,
    );
    expect(r).toBeInstanceOf(AppError);
    expect((r as AppError).code).toBe("invalid");
    expect((r as AppError).message).toMatch(/over the \d+-byte limit/);
  });

  it("still takes an ordinary 3MF, and reads it in a worker thread", async () => {
    const before = meshPoolCompleted();
    const ok = await receiveUpload(owner, partId, body(paddedPackage(1)), { name: "box.3mf", units: "mm" });
    // A 10 mm cube: volume 1000 mm³ (closed form).
    expect(ok.analysis.volume_mm3).toBeCloseTo(1000, 3);
    expect(meshPoolCompleted()).toBe(before + 1);
  });
});

describe("the upload budget", () => {
  it("refuses past the count in the window, and lets uploads in again when it has passed", () => {
    let now = 0;
    const b = new UploadBudget({ MAX_COUNT: 3, MAX_BYTES: 10_000, WINDOW_MS: 60_000 }, () => now);
    for (let i = 0; i < 3; i++) {
      const s = b.take(7);
      expect(s.ok).toBe(true);
      if (s.ok) s.finish(100);
    }
    const refused = b.take(7);
    expect(refused).toMatchObject({ ok: false, retryAfterS: 60 });
    expect(b.take(8).ok).toBe(true); // another member is not affected
    now = 60_001;
    expect(b.take(7).ok).toBe(true);
  });

  it("refuses past the bytes in the window, counting uploads still under way", () => {
    const b = new UploadBudget({ MAX_COUNT: 100, MAX_BYTES: 1000, WINDOW_MS: 60_000 }, () => 0);
    const first = b.take(1);
    const second = b.take(1);
    expect(first.ok && second.ok).toBe(true);
    if (first.ok) first.finish(1200);
    expect(b.take(1)).toMatchObject({ ok: false, reason: expect.stringMatching(/MB in the last 1 minutes/) });
  });

  it("answers 429 through the upload path once the member's budget is spent", async () => {
    const held = Array.from({ length: 100 }, () => uploadBudget().take(owner.id)).filter((s) => s.ok);
    try {
      const r = await receiveUpload(owner, partId, body(paddedPackage(1)), { name: "box.3mf", units: "mm" }).then(
        () => null,
        (e: unknown) => e as AppError,
      );
      expect(r?.status).toBe(429);
      expect(r?.retryAfterS).toBeGreaterThan(0);
    } finally {
      for (const s of held) if (s.ok) s.finish(0);
    }
  });
});
