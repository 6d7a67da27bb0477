import "server-only";
import { createHash, randomUUID } from "node:crypto";
import { mkdir, writeFile, rm } from "node:fs/promises";
import path from "node:path";
import { and, asc, eq, inArray } from "drizzle-orm";
import { db } from "@/db";
import { partFiles, partInstances, parts, partSplits, queueEntries, statusEvents } from "@/db/schema";
import { analysisToJson, analyzeBytes, writeStl, type TriangleSoup } from "@/lib/mesh";
import { applyOrientation, searchOrientations, splitUntilFits, type ManifoldWasm, type Printer, type Rotation } from "@/lib/orient";
import { cutIntoPieces, solidFromIndexed, soupFromSolid, weldForSolid } from "@/lib/orient/manifold-bridge";
import { cutWithPegs } from "@/lib/orient/pegs";
import type { SplitAcceptInput } from "@/lib/validation/orientation";
import { AppError } from "./errors";
import { isSplit, partMesh, rotationOfQuaternion } from "./orientation";
import { partAccess, requirePartEdit } from "./parts";
import type { SessionUser } from "./session";
import { forgetUnusedBlobs, withBlobsHeld } from "./blobs";
import { blobStore, tempDir } from "./storage";

/** Each piece's own orientation search: the planner's lighter settings (lib/orient/split.ts). */
const PIECE_SEARCH = { sphereDirections: 64, flatRegions: 12, refineCount: 4, gridCells: 96, keep: 1 } as const;

const g = globalThis as unknown as { __pwManifold?: Promise<ManifoldWasm> };

/**
 * manifold-3d, loaded once per server process. The import is left to Node at run time (not
 * bundled) so its WebAssembly file is found beside its own module.
 */
export function manifold(): Promise<ManifoldWasm> {
  g.__pwManifold ??= import(/* webpackIgnore: true */ /* turbopackIgnore: true */ "manifold-3d").then(async (m) => {
    const wasm = await m.default();
    wasm.setup();
    return wasm;
  });
  return g.__pwManifold;
}

export interface CutPiece {
  /** Turned into its own best orientation and resting on z = 0: what gets printed. */
  soup: TriangleSoup;
  volume: number;
  rotation: Rotation;
}

/**
 * The server's own cut: the part in the given rotation, cut by the plane (print frame) with
 * manifold-3d, or cut in halves until every piece fits. Each piece is then turned to its best.
 */
export async function cutPart(wasm: ManifoldWasm, soup: TriangleSoup, rotation: Rotation, cut: SplitAcceptInput["cut"], printers: Printer[], layerHeight: number, pegs: SplitAcceptInput["pegs"] = undefined): Promise<CutPiece[]> {
  const opts = { ...PIECE_SEARCH, printers, layerHeight };
  if (cut.kind === "to-fit") {
    const fit = await splitUntilFits(wasm, soup, { rotation, printers, layerHeight });
    if (!fit) throw new AppError("invalid", printers.length ? "The part already fits a printer in some orientation: choose a plane instead." : "No printers are set up, so there is nothing to cut to fit.", { cut: ["Nothing to cut to fit."] });
    return fit.pieces.map((p) => ({ soup: applyOrientation(p.soup, p.orientation.rotation), volume: p.volume, rotation: p.orientation.rotation }));
  }
  const framed = applyOrientation(soup, rotation);
  const whole = solidFromIndexed(wasm, weldForSolid(framed));
  const n = cut.plane.normal;
  const l = Math.hypot(...n);
  try {
    const total = whole.volume();
    const { solids } = pegs ? cutWithPegs(wasm, whole, [n[0] / l, n[1] / l, n[2] / l], cut.plane.offset / l, pegs) : { solids: cutIntoPieces(whole, [n[0] / l, n[1] / l, n[2] / l], cut.plane.offset / l) };
    try {
      if (solids.length < 2 || solids.some((s) => s.volume() <= total * 1e-4)) {
        throw new AppError("invalid", "This plane does not cut the part into pieces.", { "cut.plane": ["The plane misses the part or only shaves a sliver."] });
      }
      const out: CutPiece[] = [];
      for (const s of solids) {
        const pieceSoup = soupFromSolid(s);
        const found = await searchOrientations(pieceSoup, opts);
        const best = found.candidates[0] ?? found.original;
        out.push({ soup: applyOrientation(pieceSoup, best.rotation), volume: s.volume(), rotation: best.rotation });
      }
      return out;
    } finally {
      for (const s of solids) s.delete();
    }
  } finally {
    whole.delete();
  }
}

const sha256Of = (b: Uint8Array) => createHash("sha256").update(b).digest("hex");

/**
 * Accepting a split: the server re-cuts the stored mesh (client geometry is never trusted), writes
 * each piece as binary STL, stores it like an upload, and in one transaction creates the pieces as
 * parts in the same assembly, links them to the parent and takes the parent's unprinted copies
 * (drafted, ready, queued, with their queue entries) away: the pieces are printed instead.
 */
export async function acceptSplit(user: SessionUser, partId: number, input: SplitAcceptInput) {
  await requirePartEdit(user, partId);
  if (await isSplit(partId)) throw new AppError("conflict", "This part was split already.");
  const mesh = await partMesh(partId);
  if (input.fileId !== mesh.fileId) throw new AppError("conflict", "A newer mesh was uploaded since this split was planned. Plan it again.", { fileId: ["Not the part's current file."] });
  const busy = await db().select({ id: partInstances.id }).from(partInstances).where(and(eq(partInstances.partId, partId), inArray(partInstances.status, ["plated", "printing"])));
  if (busy.length) throw new AppError("conflict", "A copy of this part is on a plate or printing; split it once that is done.");
  const rotation = rotationOfQuaternion(input.quaternion);
  const pieces = await cutPart(await manifold(), mesh.soup, rotation, input.cut, mesh.printers, mesh.layerHeightMm, input.pegs);
  const [parent] = await db()
    .select({ name: parts.name, quantity: parts.quantity, material: parts.material, colour: parts.colour, layerHeightMm: parts.layerHeightMm, walls: parts.walls, infillPercent: parts.infillPercent })
    .from(parts)
    .where(eq(parts.id, partId));
  if (!parent) throw new AppError("not_found", "No such part, or it is not shared with you.");
  const N = pieces.length;
  const files = pieces.map((p, k) => {
    const name = `${parent.name.slice(0, 90)} – piece ${k + 1} of ${N}`;
    const bytes = writeStl(p.soup, `Platewright piece ${k + 1} of ${N}`);
    const analysed = analyzeBytes(bytes, { filename: `${name}.stl`, units: "mm" });
    return { name, bytes, sha256: sha256Of(bytes), json: analysisToJson(`${name}.stl`, analysed.format, analysed.analysis) };
  });
  await mkdir(tempDir(), { recursive: true });
  const fresh: string[] = [];
  const rewritten = new Set<string>();
  const temps: string[] = [];
  try {
    for (const f of files) {
      const temp = path.join(tempDir(), `${randomUUID()}.piece`);
      temps.push(temp);
      await writeFile(temp, f.bytes);
      if (await blobStore().putFile(f.sha256, temp)) fresh.push(f.sha256);
    }
    const plane = input.cut.kind === "plane" ? { normal: input.cut.plane.normal, offset: input.cut.plane.offset } : null;
    // Recorded under the pieces' blob row locks (lib/server/blobs.ts), so a clean-up of the same bytes elsewhere cannot remove them meanwhile.
    const created = await withBlobsHeld(files, rewritten, async (tx) => {
      const [lock] = await tx.select({ fileId: parts.currentFileId }).from(parts).where(eq(parts.id, partId)).for("update");
      if (!lock || lock.fileId !== mesh.fileId) throw new AppError("conflict", "The part changed while it was being cut. Plan it again.");
      const again = await tx.select({ id: partSplits.id }).from(partSplits).where(eq(partSplits.parentPartId, partId)).limit(1);
      if (again.length) throw new AppError("conflict", "This part was split already.");
      const out: { partId: number; fileId: number; name: string; volumeMm3: number }[] = [];
      for (const [k, f] of files.entries()) {
        const [p] = await tx
          .insert(parts)
          .values({ assemblyId: mesh.assemblyId, name: f.name, quantity: parent.quantity, material: parent.material, colour: parent.colour, layerHeightMm: parent.layerHeightMm, walls: parent.walls, infillPercent: parent.infillPercent, notes: `Cut from ${parent.name.slice(0, 200)}; glue the cut faces together.` })
          .$returningId();
        const pid = p!.id;
        const j = f.json;
        const [file] = await tx
          .insert(partFiles)
          .values({ partId: pid, sha256: f.sha256, versionNo: 1, originalName: `${f.name}.stl`, units: "mm", format: j.format, sizeX: j.size[0], sizeY: j.size[1], sizeZ: j.size[2], volumeMm3: j.volume_mm3, watertight: j.watertight ? 1 : 0, analysis: j, uploadedBy: user.id })
          .$returningId();
        await tx.update(parts).set({ currentFileId: file!.id }).where(eq(parts.id, pid));
        for (let copy = 1; copy <= parent.quantity; copy++) {
          const [inst] = await tx.insert(partInstances).values({ partId: pid, copyNo: copy }).$returningId();
          await tx.insert(statusEvents).values({ instanceId: inst!.id, fromStatus: null, toStatus: "drafted", byUserId: user.id, reason: `Cut from ${parent.name.slice(0, 200)}` });
        }
        const piece = pieces[k]!;
        await tx.insert(partSplits).values({ parentPartId: partId, piecePartId: pid, splitBy: user.id, plane: { kind: input.cut.kind, plane, pegs: input.pegs ?? null, parentQuaternion: rotation.quaternion, pieceQuaternion: piece.rotation.quaternion, piece: k + 1, of: N, volumeMm3: piece.volume } });
        out.push({ partId: pid, fileId: file!.id, name: f.name, volumeMm3: j.volume_mm3 });
      }
      const unprinted = await tx.select({ id: partInstances.id }).from(partInstances).where(and(eq(partInstances.partId, partId), inArray(partInstances.status, ["drafted", "ready", "queued"]))).for("update");
      const ids = unprinted.map((u) => u.id);
      if (ids.length) {
        await tx.delete(queueEntries).where(inArray(queueEntries.instanceId, ids));
        await tx.delete(partInstances).where(inArray(partInstances.id, ids));
      }
      return { pieces: out, copiesWithdrawn: ids.length };
    });
    return { ...created, parentVolumeMm3: mesh.volumeMm3 };
  } catch (e) {
    const mine = new Set([...fresh, ...rewritten]);
    await forgetUnusedBlobs(files.filter((f) => mine.has(f.sha256)).map((f) => ({ sha256: f.sha256, sizeBytes: f.bytes.byteLength }))).catch((err: unknown) => console.error("[platewright] split clean-up failed", err));
    throw e;
  } finally {
    for (const t of temps) await rm(t, { force: true }).catch(() => undefined);
  }
}

/** The split links of a part: its pieces when it was split, its parent when it is a piece. */
export async function getSplitLinks(user: SessionUser, partId: number) {
  await partAccess(user, partId);
  const pieces = await db()
    .select({ id: parts.id, name: parts.name, at: partSplits.splitAt })
    .from(partSplits)
    .innerJoin(parts, eq(parts.id, partSplits.piecePartId))
    .where(eq(partSplits.parentPartId, partId))
    .orderBy(asc(partSplits.id));
  const [parent] = await db().select({ id: parts.id, name: parts.name }).from(partSplits).innerJoin(parts, eq(parts.id, partSplits.parentPartId)).where(eq(partSplits.piecePartId, partId)).limit(1);
  return { pieces: pieces.map((p) => ({ id: p.id, name: p.name })), splitAt: pieces[0]?.at.toISOString() ?? null, parent: parent ?? null };
}
