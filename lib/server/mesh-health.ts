import "server-only";
import { and, eq } from "drizzle-orm";
import { alias } from "drizzle-orm/mysql-core";
import { db } from "@/db";
import { partFiles, partOrientations, parts, users } from "@/db/schema";
import { analysisToJson, analyzeSoup, readMesh, writeStl, type AnalysisJson } from "@/lib/mesh";
import { repairMesh, type RepairReport } from "@/lib/mesh/repair";
import { shellReport } from "@/lib/mesh/shells";
import { weld } from "@/lib/mesh/weld";
import { can } from "@/lib/permissions";
import { meshIsSound, meshProblems, type HealthFigures, type MeshProblem } from "@/lib/rules/mesh-health";
import type { MeshAcceptInput, MeshRepairInput } from "@/lib/validation/mesh-health";
import { AppError } from "./errors";
import { chooseOrientation, jsonOf } from "./orientation";
import { partAccess, requirePartEdit } from "./parts";
import type { SessionUser } from "./session";
import { blobStore } from "./storage";
import { receiveUpload } from "./uploads";

/** The figures shown before and after a repair. */
export interface HealthSnapshot {
  watertight: boolean;
  volumeMm3: number;
  volumeReliable: boolean;
  openEdges: number;
  flippedEdges: number;
  sharedEdges: number;
  zeroAreaFaces: number;
  triangles: number;
}

export interface StoredRepair {
  report: RepairReport;
  before: HealthSnapshot;
  after: HealthSnapshot;
  fromVersion: number;
}

export function snapshot(a: AnalysisJson): HealthSnapshot {
  return {
    watertight: a.watertight,
    volumeMm3: a.volume_mm3,
    volumeReliable: a.volume_reliable,
    openEdges: a.boundary_edges,
    flippedEdges: a.inconsistent_edges,
    sharedEdges: a.nonmanifold_edges,
    zeroAreaFaces: a.degenerate_triangles,
    triangles: a.triangles,
  };
}

const accepter = alias(users, "accepter");

/** Solid pieces inside another, per stored file (files never change, so the answer is kept; at most 500). */
const insideCache = new Map<number, number>();

/**
 * How many solid pieces of a closed mesh lie inside another (lib/mesh/shells): read from the stored
 * file once per file. Only asked of meshes that are otherwise sound (a broken one goes to the repair,
 * which finds them too).
 */
export async function piecesInsideOf(file: { fileId: number; sha256: string; units: "mm" | "in" }): Promise<number> {
  const hit = insideCache.get(file.fileId);
  if (hit !== undefined) return hit;
  let n: number;
  try {
    const soup = readMesh(await blobStore().read(file.sha256), { units: file.units }).soup;
    n = shellReport(weld(soup)).solidInside;
  } catch (e) {
    // A secondary check: the stored analysis already said the mesh is closed. Say so in the log, do not block.
    console.warn(`[platewright] pieces-inside check skipped for file ${file.fileId}:`, e instanceof Error ? e.message : e);
    return 0;
  }
  if (insideCache.size >= 500) insideCache.delete(insideCache.keys().next().value!);
  insideCache.set(file.fileId, n);
  return n;
}

/** The current file's health as the part page shows it: problems in plain words, who accepted it, the repair that made it. */
export async function currentMeshHealth(partId: number) {
  const [row] = await db()
    .select({ fileId: partFiles.id, sha256: partFiles.sha256, units: partFiles.units, analysis: partFiles.analysis, acceptedBy: accepter.name, acceptedAt: partFiles.acceptedBrokenAt, note: partFiles.acceptedBrokenNote, repair: partFiles.repairReport })
    .from(parts)
    .innerJoin(partFiles, eq(partFiles.id, parts.currentFileId))
    .leftJoin(accepter, eq(accepter.id, partFiles.acceptedBrokenBy))
    .where(eq(parts.id, partId))
    .limit(1);
  if (!row) return null;
  const a = jsonOf<HealthFigures>(row.analysis);
  const repair = row.repair ? jsonOf<StoredRepair>(row.repair) : null;
  const inside = meshIsSound(a) ? await piecesInsideOf(row) : (repair?.report.piecesInside ?? 0);
  const problems: MeshProblem[] = meshProblems(a, inside);
  return {
    fileId: row.fileId,
    sound: meshIsSound(a) && problems.length === 0,
    problems,
    accepted: row.acceptedBy ? { by: row.acceptedBy, at: row.acceptedAt?.toISOString() ?? null, note: row.note ?? "" } : null,
    repair,
  };
}

export type MeshHealth = NonNullable<Awaited<ReturnType<typeof currentMeshHealth>>>;

async function currentFile(partId: number) {
  const [row] = await db()
    .select({ fileId: partFiles.id, sha256: partFiles.sha256, units: partFiles.units, name: partFiles.originalName, versionNo: partFiles.versionNo, analysis: partFiles.analysis })
    .from(parts)
    .innerJoin(partFiles, eq(partFiles.id, parts.currentFileId))
    .where(eq(parts.id, partId))
    .limit(1);
  if (!row) throw new AppError("invalid", "This part has no mesh yet: upload one first.", { fileId: ["No mesh uploaded."] });
  return row;
}

function notCurrent(fileId: number, current: number): void {
  if (fileId !== current) throw new AppError("conflict", "A newer mesh was uploaded since you opened this page. Reload to see it.", { fileId: ["Not the part's current file."] });
}

/**
 * Repairs the current mesh (lib/mesh/repair) and stores the result as a new version of the part,
 * like an upload, with the before/after figures kept beside it. The chosen orientation carries over
 * (the repair moves no corner). Says so when there is nothing it can repair.
 */
export async function repairPartMesh(user: SessionUser, partId: number, input: MeshRepairInput) {
  await requirePartEdit(user, partId);
  const cur = await currentFile(partId);
  notCurrent(input.fileId, cur.fileId);
  const before = jsonOf<AnalysisJson>(cur.analysis);
  const soup = readMesh(await blobStore().read(cur.sha256), { units: cur.units }).soup;
  const { soup: fixed, report } = repairMesh(soup);
  const changed = report.zeroAreaDropped + report.duplicatesDropped + report.facesFlipped + report.facesAdded + report.piecesTurnedOut > 0;
  if (!changed) {
    const left = meshProblems(before, report.piecesInside).filter((p) => !p.repairable).map((p) => p.text);
    throw new AppError("invalid", left.length ? `The automatic repair cannot fix this mesh: ${left.join(" ")}` : "The automatic repair found nothing to fix.", { fileId: ["Nothing to repair."] });
  }
  const base = cur.name.replace(/\.(stl|3mf)$/i, "").slice(0, 200);
  const name = `${base} (repaired).stl`;
  const after = analysisToJson(name, "stl-binary", analyzeSoup(fixed));
  const bytes = writeStl(fixed, `Platewright repair of version ${cur.versionNo}`);
  const body = new ReadableStream<Uint8Array>({ start(c) { c.enqueue(bytes); c.close(); } });
  const up = await receiveUpload(user, partId, body, { name, units: "mm" });
  const stored: StoredRepair = { report, before: snapshot(before), after: snapshot(after), fromVersion: cur.versionNo };
  await db().update(partFiles).set({ repairedFromFileId: cur.fileId, repairReport: stored }).where(eq(partFiles.id, up.fileId));
  // The repair keeps every corner where it was, so the member's orientation still holds.
  const [chosen] = await db()
    .select({ quaternion: partOrientations.quaternion })
    .from(partOrientations)
    .where(and(eq(partOrientations.partId, partId), eq(partOrientations.kind, "chosen"), eq(partOrientations.fileId, cur.fileId)))
    .limit(1);
  if (chosen) {
    await chooseOrientation(user, partId, { kind: "rotation", fileId: up.fileId, quaternion: jsonOf<[number, number, number, number]>(chosen.quaternion) }).catch(() => undefined);
  }
  const problemsLeft = meshProblems(after, report.piecesInside);
  return { fileId: up.fileId, versionNo: up.versionNo, ...stored, sound: meshIsSound(after) && problemsLeft.length === 0, problemsLeft };
}

/** An operator or admin accepts the current mesh as it is; who, when and why are kept with the file. */
export async function acceptBrokenMesh(user: SessionUser, partId: number, input: MeshAcceptInput) {
  if (!can(user.role, "parts:accept-mesh")) throw new AppError("forbidden", "Only the workshop (operators and admins) may accept a mesh that is not a closed solid.");
  await partAccess(user, partId);
  const cur = await currentFile(partId);
  notCurrent(input.fileId, cur.fileId);
  if (meshIsSound(jsonOf<HealthFigures>(cur.analysis))) throw new AppError("invalid", "This mesh is a closed solid already; there is nothing to accept.", { fileId: ["Nothing to accept."] });
  await db().update(partFiles).set({ acceptedBrokenBy: user.id, acceptedBrokenAt: new Date(), acceptedBrokenNote: input.note }).where(eq(partFiles.id, cur.fileId));
  return (await currentMeshHealth(partId))!;
}
