import "server-only";
import { and, eq, sql } from "drizzle-orm";
import { db } from "@/db";
import { partFiles, partOrientations, parts, partSplits, users, type OrientationKind } from "@/db/schema";
import { readMesh, type TriangleSoup } from "@/lib/mesh";
import { fitPrinters, matrixFromQuaternion, rotationFromMatrix, searchOrientations, type OrientationCandidate, type Printer, type Quat, type Rotation } from "@/lib/orient";
import { boundsOf } from "@/lib/orient/geometry";
import { rotatePoints } from "@/lib/orient/rotation";
import type { OrientationPickInput, OrientationSearchInput } from "@/lib/validation/orientation";
import { AppError } from "./errors";
import { partAccess, requirePartEdit } from "./parts";
import { materialKeyOf } from "./planner";
import { listPrinterBeds } from "./printers";
import type { SessionUser } from "./session";
import { blobStore } from "./storage";

/** Figures of one orientation as stored beside it; search figures only when a search produced them. */
export interface OrientationFigures {
  source: "original" | "axis" | "flat" | "sphere" | "pick";
  height: number;
  layers: number;
  footprint: [number, number];
  fits: { printerId: string; fits: boolean }[];
  overhangArea?: number;
  supportVolume?: number;
  bedContactArea?: number;
  score?: number;
}

export interface StoredOrientation {
  kind: OrientationKind | "file";
  fileId: number;
  quaternion: Quat;
  matrix: Rotation["matrix"];
  down: [number, number, number];
  footprint: [number, number];
  height: number;
  summary: OrientationFigures & { candidates?: CandidateSummary[] };
  chosenBy: string | null;
  chosenAt: string | null;
}

export interface CandidateSummary extends OrientationFigures {
  down: [number, number, number];
  quaternion: Quat;
}

/** MariaDB keeps json as longtext: depending on the driver path it arrives parsed or as text. */
export const jsonOf = <T>(v: unknown): T => (typeof v === "string" ? (JSON.parse(v) as T) : (v as T));

const IDENTITY: Quat = [0, 0, 0, 1];

export function figuresOf(c: OrientationCandidate): OrientationFigures {
  return {
    source: c.source,
    height: c.height,
    layers: c.layers,
    footprint: c.footprint,
    fits: c.fits.map((f) => ({ printerId: f.printerId, fits: f.fits })),
    overhangArea: c.overhangArea,
    supportVolume: c.supportVolume,
    bedContactArea: c.bedContactArea,
    score: c.score,
  };
}

/** The part's current mesh and what the search needs: the printers that take its material. */
export async function partMesh(partId: number): Promise<{ fileId: number; soup: TriangleSoup; layerHeightMm: number; printers: Printer[]; assemblyId: number; volumeMm3: number }> {
  const [row] = await db()
    .select({ fileId: partFiles.id, sha256: partFiles.sha256, units: partFiles.units, material: parts.material, layerHeightMm: parts.layerHeightMm, assemblyId: parts.assemblyId, volumeMm3: partFiles.volumeMm3 })
    .from(parts)
    .innerJoin(partFiles, eq(partFiles.id, parts.currentFileId))
    .where(eq(parts.id, partId))
    .limit(1);
  if (!row) throw new AppError("invalid", "This part has no mesh yet: upload one first.", { fileId: ["No mesh uploaded."] });
  const bytes = await blobStore().read(row.sha256);
  const soup = readMesh(bytes, { units: row.units }).soup;
  return { fileId: row.fileId, soup, layerHeightMm: row.layerHeightMm, printers: await orientPrinters(row.material), assemblyId: row.assemblyId, volumeMm3: row.volumeMm3 };
}

/** Printers that take the material (all of them when the material is unknown), as lib/orient sees them. */
export async function orientPrinters(material: string): Promise<Printer[]> {
  const beds = await listPrinterBeds().catch(() => []);
  const key = materialKeyOf(material);
  const able = key ? beds.filter((b) => b.materialKeys.includes(key)) : beds;
  return (able.length ? able : beds).map((b) => ({ id: String(b.id), bed: [b.bedX, b.bedY], height: b.height }));
}

export async function isSplit(partId: number): Promise<number> {
  const [r] = await db().select({ n: sql<number>`COUNT(*)` }).from(partSplits).where(eq(partSplits.parentPartId, partId));
  return Number(r?.n ?? 0);
}

async function rowOf(partId: number, kind: OrientationKind, fileId: number): Promise<StoredOrientation | null> {
  const [r] = await db()
    .select({
      kind: partOrientations.kind,
      fileId: partOrientations.fileId,
      quaternion: partOrientations.quaternion,
      matrix: partOrientations.matrix,
      downX: partOrientations.downX,
      downY: partOrientations.downY,
      downZ: partOrientations.downZ,
      footprintX: partOrientations.footprintX,
      footprintY: partOrientations.footprintY,
      heightMm: partOrientations.heightMm,
      summary: partOrientations.summary,
      chosenBy: users.name,
      chosenAt: partOrientations.chosenAt,
    })
    .from(partOrientations)
    .leftJoin(users, eq(users.id, partOrientations.chosenBy))
    .where(and(eq(partOrientations.partId, partId), eq(partOrientations.kind, kind), eq(partOrientations.fileId, fileId)))
    .limit(1);
  if (!r) return null;
  return {
    kind: r.kind,
    fileId: r.fileId,
    quaternion: jsonOf<Quat>(r.quaternion),
    matrix: jsonOf<Rotation["matrix"]>(r.matrix),
    down: [r.downX, r.downY, r.downZ],
    footprint: [r.footprintX, r.footprintY],
    height: r.heightMm,
    summary: jsonOf<StoredOrientation["summary"]>(r.summary),
    chosenBy: r.chosenBy,
    chosenAt: r.chosenAt.toISOString(),
  };
}

/** What the part page shows: the effective orientation (chosen for this file, else the file's own) and the server's suggestion. */
export async function getOrientation(user: SessionUser, partId: number) {
  await partAccess(user, partId);
  const [p] = await db().select({ fileId: parts.currentFileId }).from(parts).where(eq(parts.id, partId)).limit(1);
  const fileId = p?.fileId ?? null;
  if (fileId === null) return { fileId: null, chosen: null, suggested: null, splitInto: await isSplit(partId) };
  return { fileId, chosen: await rowOf(partId, "chosen", fileId), suggested: await rowOf(partId, "suggested", fileId), splitInto: await isSplit(partId) };
}

export type OrientationView = Awaited<ReturnType<typeof getOrientation>>;

/** Unit rotation from a quaternion that is close to unit length (checked by the schema). */
export function rotationOfQuaternion(q: Quat): Rotation {
  const l = Math.hypot(...q);
  return rotationFromMatrix(matrixFromQuaternion([q[0] / l, q[1] / l, q[2] / l, q[3] / l]));
}

/** Height, footprint and fits of the soup turned by `r`, computed here from the stored mesh. */
export function measureRotation(soup: TriangleSoup, r: Rotation, layerHeightMm: number, printers: Printer[]): OrientationFigures {
  const b = boundsOf(rotatePoints(soup.positions, r.matrix));
  const footprint: [number, number] = [b.max[0] - b.min[0], b.max[1] - b.min[1]];
  const height = b.max[2] - b.min[2];
  return { source: "pick", height, layers: Math.ceil(height / layerHeightMm - 1e-9), footprint, fits: fitPrinters(footprint, height, printers).map((f) => ({ printerId: f.printerId, fits: f.fits })) };
}

async function store(partId: number, fileId: number, kind: OrientationKind, r: Rotation, figures: StoredOrientation["summary"], by: number | null): Promise<void> {
  const m = r.matrix;
  const values = {
    fileId,
    quaternion: r.quaternion,
    matrix: m,
    // The row of M that maps to +Z is "up" in the file's frame; down is its opposite.
    downX: -m[6] || 0,
    downY: -m[7] || 0,
    downZ: -m[8] || 0,
    footprintX: figures.footprint[0],
    footprintY: figures.footprint[1],
    heightMm: figures.height,
    summary: figures,
    chosenBy: by,
    chosenAt: new Date(),
  };
  await db().insert(partOrientations).values({ partId, kind, ...values }).onDuplicateKeyUpdate({ set: values });
}

function notCurrent(fileId: number, current: number): void {
  if (fileId !== current) throw new AppError("conflict", "A newer mesh was uploaded since this orientation was planned. Plan it again.", { fileId: ["Not the part's current file."] });
}

/** Stores the member's pick for the current file. Figures are recomputed here from the stored mesh. */
export async function chooseOrientation(user: SessionUser, partId: number, input: OrientationPickInput): Promise<StoredOrientation> {
  await requirePartEdit(user, partId);
  if (await isSplit(partId)) throw new AppError("conflict", "This part was split into pieces; orient the pieces instead.");
  const mesh = await partMesh(partId);
  notCurrent(input.fileId, mesh.fileId);
  const r = rotationOfQuaternion(input.kind === "original" ? IDENTITY : input.quaternion);
  const figures = measureRotation(mesh.soup, r, mesh.layerHeightMm, mesh.printers);
  // A pick that is one of the server's own candidates keeps that candidate's search figures.
  const suggested = await rowOf(partId, "suggested", mesh.fileId);
  const same = suggested?.summary.candidates?.find((c) => Math.abs(c.quaternion.reduce((s, v, i) => s + v * r.quaternion[i]!, 0)) > 1 - 1e-6);
  const summary = same ? { ...same, ...figures, source: same.source } : { ...figures, source: input.kind === "original" ? ("original" as const) : ("pick" as const) };
  delete (summary as { candidates?: unknown }).candidates;
  await store(partId, mesh.fileId, "chosen", r, summary, user.id);
  return (await rowOf(partId, "chosen", mesh.fileId))!;
}

/** Runs the search here, in Node, and stores the best as the part's suggestion. */
export async function runOrientationSearch(user: SessionUser, partId: number, input: OrientationSearchInput) {
  await requirePartEdit(user, partId);
  const mesh = await partMesh(partId);
  const result = await searchOrientations(mesh.soup, { printers: mesh.printers, layerHeight: mesh.layerHeightMm, overhangAngle: input.overhangAngle });
  const best = result.candidates[0] ?? result.original;
  const candidates: CandidateSummary[] = result.candidates.map((c) => ({ ...figuresOf(c), down: c.down, quaternion: c.rotation.quaternion }));
  await store(partId, mesh.fileId, "suggested", best.rotation, { ...figuresOf(best), candidates }, user.id);
  return { fileId: mesh.fileId, best: { ...figuresOf(best), down: best.down, quaternion: best.rotation.quaternion }, original: figuresOf(result.original), candidates, directionsEvaluated: result.directionsEvaluated };
}

/** The chosen orientation's footprint and height for the part's current file, or null (the file's own). */
export async function effectiveGeometry(partId: number): Promise<{ footprint: [number, number]; height: number } | null> {
  const [r] = await db()
    .select({ x: partOrientations.footprintX, y: partOrientations.footprintY, h: partOrientations.heightMm })
    .from(partOrientations)
    .innerJoin(parts, and(eq(parts.id, partOrientations.partId), eq(parts.currentFileId, partOrientations.fileId)))
    .where(and(eq(partOrientations.partId, partId), eq(partOrientations.kind, "chosen")))
    .limit(1);
  return r ? { footprint: [r.x, r.y], height: r.h } : null;
}
