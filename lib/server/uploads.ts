import "server-only";
import { createHash, randomUUID } from "node:crypto";
import { mkdir, open, readFile, rm } from "node:fs/promises";
import path from "node:path";
import { eq, sql } from "drizzle-orm";
import { db } from "@/db";
import { meshBlobs, partFiles, parts } from "@/db/schema";
import { env } from "@/lib/env";
import { analysisToJson, isMeshReadError, isStep, write3mf, type AnalysisJson } from "@/lib/mesh";
import { analyzeFile } from "@/lib/mesh-node/step";
import type { UploadQuery } from "@/lib/validation/assemblies";
import { forgetUnusedBlobs, withBlobsHeld } from "./blobs";
import { AppError } from "./errors";
import { analyzeInWorker, inflateCapFor } from "./mesh-pool/pool";
import { partAccess, requirePartEdit } from "./parts";
import type { SessionUser } from "./session";
import { uploadBudget } from "./upload-budget";
import { blobStore, tempDir } from "./storage";

export interface UploadResult {
  fileId: number;
  versionNo: number;
  sha256: string;
  sizeBytes: number;
  /** True when these exact bytes were stored already (by anyone) and were not written again. */
  alreadyStored: boolean;
  analysis: AnalysisJson;
  warnings: string[];
}

export function uploadLimitBytes(): number {
  return Math.floor(env().UPLOAD_LIMIT_MB * 1024 * 1024);
}

const tooLarge = (limit: number) => new AppError("too_large", `The file is larger than the upload limit of ${Math.round(limit / 1024 / 1024)} MB.`);

/** Streams a body to a temporary file while hashing and counting; stops at the limit. */
async function spool(body: ReadableStream<Uint8Array>, temp: string, limit: number, counted: (bytes: number) => void): Promise<{ sha256: string; size: number }> {
  const hash = createHash("sha256");
  const fh = await open(temp, "wx");
  const reader = body.getReader();
  let size = 0;
  try {
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      size += value.byteLength;
      counted(size);
      if (size > limit) {
        await reader.cancel().catch(() => undefined);
        throw tooLarge(limit);
      }
      hash.update(value);
      await fh.write(value);
    }
  } finally {
    await fh.close();
  }
  return { sha256: hash.digest("hex"), size };
}

/**
 * Receives one mesh for a part: spool to a temporary file, parse and analyse it with lib/mesh,
 * and only then move it into content-addressed storage and record it, in one transaction. On any
 * failure the temporary file is removed, and bytes stored by this call are taken back out.
 */
export async function receiveUpload(
  user: SessionUser,
  partId: number,
  body: ReadableStream<Uint8Array> | null,
  q: UploadQuery,
  opts: { declaredLength?: number; limitBytes?: number } = {},
): Promise<UploadResult> {
  await requirePartEdit(user, partId);
  const limit = opts.limitBytes ?? uploadLimitBytes();
  if (opts.declaredLength !== undefined && opts.declaredLength > limit) throw tooLarge(limit);
  if (!body) throw new AppError("bad_request", "Send the file's bytes as the request body.");
  const slot = uploadBudget().take(user.id);
  if (!slot.ok) throw new AppError("too_many", `Too many uploads: ${slot.reason}. Try again in ${slot.retryAfterS} s.`, undefined, slot.retryAfterS);
  let received = 0;
  try {
    return await receiveWithinBudget(user, partId, body, q, limit, (n) => (received = n));
  } finally {
    slot.finish(received);
  }
}

async function receiveWithinBudget(user: SessionUser, partId: number, body: ReadableStream<Uint8Array>, q: UploadQuery, limit: number, counted: (bytes: number) => void): Promise<UploadResult> {
  await mkdir(tempDir(), { recursive: true });
  const temp = path.join(tempDir(), `${randomUUID()}.upload`);
  const store = blobStore();
  let stored = false;
  const rewritten = new Set<string>();
  let sha256 = "";
  let sizeBytes = 0;
  let meshBlob: { sha256: string; sizeBytes: number } | undefined;
  try {
    const spooled = await spool(body, temp, limit, counted);
    sha256 = spooled.sha256;
    sizeBytes = spooled.size;
    const bytes = new Uint8Array(await readFile(temp));
    let json: AnalysisJson;
    let warnings: string[];
    let mesh: Uint8Array | undefined;
    if (isStep(bytes)) {
      // STEP: tessellated in a worker thread of its own with a time limit (lib/mesh-node/step.ts). The
      // file is kept as uploaded (the source) beside a 3MF of its tessellation, one object per body:
      // that mesh is what the viewer, plates and exports read.
      let analysed;
      try {
        analysed = await analyzeFile(bytes, { filename: q.name, units: q.units });
      } catch (e) {
        if (isMeshReadError(e)) throw new AppError("invalid", `${q.name} could not be read: ${e.message}.`, { file: [e.message] });
        throw e;
      }
      json = analysisToJson(q.name, analysed.format, analysed.analysis);
      warnings = analysed.warnings;
      const soup = analysed.soup;
      mesh = soup
        ? write3mf((analysed.parts ?? [{ objectId: "1", name: undefined, firstTriangle: 0, triangleCount: soup.positions.length / 9 }]).map((p) => ({
            name: p.name ?? `body ${p.objectId}`,
            mesh: { positions: soup.positions.subarray(9 * p.firstTriangle, 9 * (p.firstTriangle + p.triangleCount)) },
          })))
        : undefined;
    } else {
      // STL and 3MF: read and analysed in a worker thread (the request thread stays free), with the
      // inflate cap scaled to the file's size so a small package cannot expand to hundreds of megabytes.
      const analysed = await analyzeInWorker({ path: temp, filename: q.name, units: q.units, maxUncompressedBytes: inflateCapFor(spooled.size) });
      if (!analysed.ok) throw new AppError("invalid", `${q.name} could not be read: ${analysed.message}.`, { file: [analysed.message] });
      json = analysed.json;
      warnings = analysed.warnings;
    }
    const meshSha = mesh ? createHash("sha256").update(mesh).digest("hex") : sha256;
    if (mesh) meshBlob = { sha256: meshSha, sizeBytes: mesh.byteLength };
    stored = await store.putFile(sha256, temp);
    // Recorded under the blob's row lock, so a concurrent clean-up of the same bytes cannot remove them
    // between here and the commit (and if one removed them just before, they are written again).
    const row = await withBlobsHeld(mesh ? [{ sha256, bytes }, { sha256: meshSha, bytes: mesh }] : [{ sha256, bytes }], rewritten, async (tx) => {
      const [cur] = await tx.select({ id: parts.id }).from(parts).where(eq(parts.id, partId)).for("update");
      if (!cur) throw new AppError("not_found", "The part was deleted while the file was uploading.");
      const [max] = await tx.select({ n: sql<number>`COALESCE(MAX(${partFiles.versionNo}), 0)` }).from(partFiles).where(eq(partFiles.partId, partId));
      const versionNo = Number(max?.n ?? 0) + 1;
      const [res] = await tx
        .insert(partFiles)
        .values({
          partId,
          sha256: meshSha,
          sourceSha256: mesh ? sha256 : null,
          versionNo,
          originalName: q.name,
          units: q.units,
          format: json.format,
          sizeX: json.size[0],
          sizeY: json.size[1],
          sizeZ: json.size[2],
          volumeMm3: json.volume_mm3,
          watertight: json.watertight ? 1 : 0,
          analysis: json,
          uploadedBy: user.id,
        })
        .$returningId();
      await tx.update(parts).set({ currentFileId: res!.id, version: sql`${parts.version} + 1`, updatedAt: new Date() }).where(eq(parts.id, partId));
      return { fileId: res!.id, versionNo };
    });
    return { ...row, sha256, sizeBytes: spooled.size, alreadyStored: !stored && rewritten.size === 0, analysis: json, warnings };
  } catch (e) {
    // Bytes this call stored, and that no recorded file refers to, are taken back out (under the lock).
    if (stored || rewritten.size) await forgetUnusedBlobs([{ sha256, sizeBytes }, ...(meshBlob ? [meshBlob] : [])]).catch((err: unknown) => console.error("[platewright] upload clean-up failed", err));
    throw e;
  } finally {
    await rm(temp, { force: true });
  }
}

/**
 * A stored upload, for those who may read its part: the mesh (for a STEP upload, the 3MF made from
 * it, named .3mf), or with `source` the file as uploaded (the STEP itself; the mesh when there is none).
 */
export async function openPartFile(user: SessionUser, fileId: number, opts: { source?: boolean } = {}): Promise<{ name: string; size: number; stream: ReadableStream<Uint8Array> }> {
  const [row] = await db()
    .select({ partId: partFiles.partId, sha256: partFiles.sha256, sourceSha256: partFiles.sourceSha256, name: partFiles.originalName })
    .from(partFiles)
    .where(eq(partFiles.id, fileId))
    .limit(1);
  if (!row) throw new AppError("not_found", "No such file, or it is not shared with you.");
  await partAccess(user, row.partId).catch(() => {
    throw new AppError("not_found", "No such file, or it is not shared with you.");
  });
  const useSource = opts.source === true && row.sourceSha256 !== null;
  const sha = useSource ? row.sourceSha256! : row.sha256;
  const name = row.sourceSha256 !== null && !useSource ? row.name.replace(/\.(step|stp)$/i, "") + ".3mf" : row.name;
  const [blob] = await db().select({ size: meshBlobs.sizeBytes }).from(meshBlobs).where(eq(meshBlobs.sha256, sha)).limit(1);
  if (!blob) throw new AppError("not_found", "No such file, or it is not shared with you.");
  return { name, size: blob.size, stream: await blobStore().stream(sha) };
}
