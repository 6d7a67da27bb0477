import "server-only";
import { and, eq, sql } from "drizzle-orm";
import { db } from "@/db";
import { partFiles, partOrientations, parts, partSplits, users, type OrientationKind } from "@/db/schema";
import { readMesh, type TriangleSoup } from "@/lib/mesh";
import { soupBounds, weld } from "@/lib/mesh/weld";
import { largestContact } from "@/lib/orient/contact";
import { applyOrientation, fitPrinters, matrixFromQuaternion, rotationFromMatrix, searchOrientations, supportVolumeHeightField, type OrientationCandidate, type Printer, type Quat, type Rotation } from "@/lib/orient";
import { centreOfMass, isStable, materialKeyOf, nameOrientation, overhangSine, requiredContact, stanceOf, surfaceFigures } from "@/lib/rules";
import type { OrientationPickInput, OrientationSearchInput } from "@/lib/validation/orientation";
import { AppError } from "./errors";
import { partAccess, requirePartEdit } from "./parts";
import { workshopPrinters } from "./part-envelope";
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
  /** Rests on enough contact with its centre of mass over it (lib/rules/stability); named in words. */
  stable?: boolean;
  contactRequired?: number;
  label?: string;
  turn?: string;
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
    stable: c.stable,
    contactRequired: c.contactRequired,
    label: c.label,
    turn: c.turn,
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

/**
 * Printers that take the material, as lib/orient sees them (its fit is lib/rules' envelope rule).
 * None when the workshop does not print the material: then nothing fits, as on the part page and in the queue.
 */
export async function orientPrinters(material: string): Promise<Printer[]> {
  const { envelopes } = await workshopPrinters();
  const key = materialKeyOf(material);
  return key ? envelopes.filter((e) => e.materials.includes(key)).map((e) => ({ id: e.id, bed: [e.bed[0], e.bed[1]], height: e.height })) : [];
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

/** Support estimate cell: fine enough for a figure within a few % (lib/orient README), coarse enough for large parts. */
const cellFor = (footprint: [number, number]) => Math.max(0.25, Math.max(footprint[0], footprint[1]) / 192);

/**
 * Height, footprint, fits, overhang, bed contact and support of the soup turned by `r`, computed
 * here from the stored mesh: overhang and bed contact by lib/mesh under lib/rules' thresholds, support
 * by lib/orient's height field. These are the figures the part page, the quote and the queue use.
 */
export function measureRotation(soup: TriangleSoup, r: Rotation, layerHeightMm: number, printers: Printer[], overhangDeg?: number): OrientationFigures {
  const placed = applyOrientation(soup, r);
  const b = soupBounds(placed.positions);
  const footprint: [number, number] = [b.max[0] - b.min[0], b.max[1] - b.min[1]];
  const height = b.max[2] - b.min[2];
  const surface = surfaceFigures(placed, { overhangDeg });
  const mesh = weld(placed);
  const support = supportVolumeHeightField(mesh.vertices, mesh.indices, { cellSize: cellFor(footprint), sinTheta: overhangSine(overhangDeg) });
  const stance = stanceOf(mesh, IDENTITY_FRAME, centreOfMass(mesh));
  const best = Math.max(largestContact(mesh), stance.contactArea);
  const m = r.matrix;
  const down = [-m[6] || 0, -m[7] || 0, -m[8] || 0];
  const name = nameOrientation(down, stance.contactArea > 0 && stance.contactArea >= best * 0.999);
  return {
    source: "pick",
    height,
    layers: Math.ceil(height / layerHeightMm - 1e-9),
    footprint,
    fits: fitPrinters(footprint, height, printers).map((f) => ({ printerId: f.printerId, fits: f.fits })),
    overhangArea: surface.overhangArea,
    bedContactArea: surface.bedContactArea,
    supportVolume: support.volume,
    // Judged against the largest contact the part can give, as the search judges it.
    stable: isStable(stance, best),
    contactRequired: requiredContact(best),
    label: name.label,
    turn: name.turn,
  };
}

const IDENTITY_FRAME = [1, 0, 0, 0, 1, 0, 0, 0, 1] as const;

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
  // The measured figures win over the search's (one bed-contact and overhang rule); the search's score stays.
  const summary = same ? { ...same, ...figures, source: same.source, label: same.label ?? figures.label, stable: same.stable ?? figures.stable, contactRequired: same.contactRequired ?? figures.contactRequired } : { ...figures, source: input.kind === "original" ? ("original" as const) : ("pick" as const) };
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
