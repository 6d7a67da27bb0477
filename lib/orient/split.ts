/**
 * Split planner: tries cutting planes on a part in its chosen orientation, finds each piece's own
 * best orientation, and ranks the cuts by fitting and by support saved. Also splits a part that fits
 * no printer, again and again, until every piece fits. Needs manifold-3d, passed in by the caller.
 */
import { overhangLimit } from "@/lib/mesh/overhang";
import { splitEarnsItsPlace } from "@/lib/rules/split";
import type { IndexedMesh, TriangleSoup } from "@/lib/mesh/types";
import { weld } from "@/lib/mesh/weld";
import { withoutRepeatedCorners } from "@/lib/mesh/volume";
import { soupFromIndexed } from "./geometry";
import { cutIntoPieces, indexedFromSolid, solidFromIndexed, type ManifoldWasm, type Solid } from "./manifold-bridge";
import { applyOrientation, IDENTITY_MATRIX, rotationFromMatrix, type Rotation } from "./rotation";
import { makeTicker, searchOrientationsIndexed } from "./search";
import { candidatePlanes, screenPlanes, type CutPlane } from "./split-planes";
import { supportVolumeHeightField } from "./support";
import type { OrientOptions, OrientationCandidate } from "./types";

export interface SplitOptions extends Pick<OrientOptions, "overhangAngle" | "layerHeight" | "printers" | "onProgress" | "signal"> {
  /** The part's chosen orientation (file frame → print frame); default: the file's own. */
  rotation?: Rotation;
  /** Planes to try; default 12. */
  maxPlanes?: number;
  /** Options for each piece's own orientation search; defaults below keep a split search quick. */
  pieceSearch?: Partial<OrientOptions>;
  /** Deepest repeated cut when splitting to fit (2^depth pieces at most); default 6. */
  maxDepth?: number;
  /** Of the planes screened, how many are cut with manifold-3d and fully evaluated; default 8. */
  cutCount?: number;
  /** Ranked candidates returned; default 5. */
  keep?: number;
}

export interface SplitPiece {
  /** In the part's print frame (where the cut was made); apply `orientation.rotation` to print it. */
  soup: TriangleSoup;
  /** mm³, from manifold-3d. */
  volume: number;
  orientation: OrientationCandidate;
}

export interface SplitCandidate {
  kind: "plane" | "to-fit";
  planes: CutPlane[];
  pieces: SplitPiece[];
  /** Support of the whole part in its chosen orientation, and of the pieces each in its best, mm³. */
  supportBefore: number;
  supportAfter: number;
  supportSaved: number;
  /** Area of the new faces, summed over both sides of every cut ÷ 2 (the glue faces), mm². */
  cutArea: number;
  /** Every piece fits at least one printer (true when no printers were given). */
  allPiecesFit: boolean;
}

export interface SplitPlan {
  volume: number;
  supportBefore: number;
  /** The whole part fits some printer in some orientation (true when no printers were given). */
  partFits: boolean;
  /** Best first. */
  candidates: SplitCandidate[];
  /** Planes proposed and screened cheaply, and how many of them were cut and fully evaluated. */
  planesScreened: number;
  planesCut: number;
}

/**
 * Each piece gets a lighter search than a whole part (64 sphere directions, 4 refined at 96 cells):
 * a split search runs it for every piece of every plane.
 */
const PIECE_SEARCH: Partial<OrientOptions> = { sphereDirections: 64, flatRegions: 12, refineCount: 4, gridCells: 96, keep: 1 };

function supportInFrame(mesh: IndexedMesh, sinTheta: number): number {
  let maxSide = 0;
  const b = mesh.vertices;
  let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity;
  for (let i = 0; i + 2 < b.length; i += 3) {
    x0 = Math.min(x0, b[i]!); x1 = Math.max(x1, b[i]!);
    y0 = Math.min(y0, b[i + 1]!); y1 = Math.max(y1, b[i + 1]!);
  }
  maxSide = Math.max(x1 - x0, y1 - y0);
  return supportVolumeHeightField(mesh.vertices, mesh.indices, { cellSize: Math.max(0.25, maxSide / 192), sinTheta }).volume;
}

/** Ranking: pieces that all fit first, then most support saved, then the smallest glue face. */
export function compareSplits(a: SplitCandidate, b: SplitCandidate): number {
  if (a.allPiecesFit !== b.allPiecesFit) return a.allPiecesFit ? -1 : 1;
  const scale = Math.max(a.supportBefore, 1e-9);
  const saved = (b.supportSaved - a.supportSaved) / scale;
  if (Math.abs(saved) > 0.01) return saved;
  return a.cutArea - b.cutArea;
}

interface Ctx {
  wasm: ManifoldWasm;
  pieceOpts: OrientOptions;
  printersGiven: boolean;
}

async function evaluatePieces(ctx: Ctx, solids: Solid[]): Promise<{ pieces: SplitPiece[]; area: number }> {
  const pieces: SplitPiece[] = [];
  let area = 0;
  for (const s of solids) {
    const mesh = indexedFromSolid(s);
    const result = await searchOrientationsIndexed(mesh, ctx.pieceOpts);
    pieces.push({ soup: { positions: soupFromIndexed(mesh.vertices, mesh.indices) }, volume: s.volume(), orientation: result.candidates[0] ?? result.original });
    area += s.surfaceArea();
  }
  return { pieces, area };
}

function summarise(kind: SplitCandidate["kind"], planes: CutPlane[], pieces: SplitPiece[], piecesArea: number, wholeArea: number, before: number, printersGiven: boolean): SplitCandidate {
  const after = pieces.reduce((s, p) => s + p.orientation.supportVolume, 0);
  return {
    kind,
    planes,
    pieces,
    supportBefore: before,
    supportAfter: after,
    supportSaved: before - after,
    cutArea: Math.max(0, (piecesArea - wholeArea) / 2),
    allPiecesFit: !printersGiven || pieces.every((p) => p.orientation.fitsAny),
  };
}

function printFrameMesh(soup: TriangleSoup, rotation: Rotation | undefined): IndexedMesh {
  const oriented = applyOrientation(soup, rotation ?? rotationFromMatrix([...IDENTITY_MATRIX]));
  return withoutRepeatedCorners(weld(oriented));
}

/** Cuts the solid in the middle of its longest side until every piece fits a printer. */
async function cutToFit(ctx: Ctx, whole: Solid, maxDepth: number, tick: (f: number) => Promise<void>) {
  const queue: { solid: Solid; depth: number }[] = [{ solid: whole.translate([0, 0, 0]), depth: 0 }];
  const done: Solid[] = [];
  const planes: CutPlane[] = [];
  let steps = 0;
  try {
    while (queue.length) {
      const item = queue.pop()!;
      const r = await searchOrientationsIndexed(indexedFromSolid(item.solid), ctx.pieceOpts);
      if ((r.candidates[0] ?? r.original).fitsAny || item.depth >= maxDepth) {
        done.push(item.solid);
        continue;
      }
      const bb = item.solid.boundingBox();
      const size = [0, 1, 2].map((k) => bb.max[k]! - bb.min[k]!);
      const axis = size.indexOf(Math.max(...size));
      const normal: [number, number, number] = [axis === 0 ? 1 : 0, axis === 1 ? 1 : 0, axis === 2 ? 1 : 0];
      const offset = (bb.min[axis]! + bb.max[axis]!) / 2;
      planes.push({ normal, offset, kind: "to-fit" });
      const parts = cutIntoPieces(item.solid, normal, offset);
      item.solid.delete();
      for (const p of parts) queue.push({ solid: p, depth: item.depth + 1 });
      await tick(Math.min(0.99, ++steps / 2 ** maxDepth));
    }
    return { solids: done, planes };
  } catch (e) {
    for (const q of queue) q.solid.delete();
    for (const d of done) d.delete();
    throw e;
  }
}

/**
 * Repeated cuts until every piece fits at least one printer. Returns null when the part already
 * fits or when no printers were given.
 */
export async function splitUntilFits(wasm: ManifoldWasm, soup: TriangleSoup, options: SplitOptions = {}): Promise<SplitCandidate | null> {
  const printers = options.printers ?? [];
  if (!printers.length) return null;
  const sinTheta = overhangLimit(options.overhangAngle ?? 45);
  const pieceOpts: OrientOptions = { ...PIECE_SEARCH, ...options.pieceSearch, printers, overhangAngle: options.overhangAngle, layerHeight: options.layerHeight, signal: options.signal };
  const ctx: Ctx = { wasm, pieceOpts, printersGiven: true };
  const mesh = printFrameMesh(soup, options.rotation);
  const whole = solidFromIndexed(wasm, mesh);
  try {
    const first = await searchOrientationsIndexed(mesh, pieceOpts);
    if ((first.candidates[0] ?? first.original).fitsAny) return null;
    const tick = makeTicker(options.signal, options.onProgress);
    const { solids, planes } = await cutToFit(ctx, whole, options.maxDepth ?? 6, tick);
    try {
      const { pieces, area } = await evaluatePieces(ctx, solids);
      return summarise("to-fit", planes, pieces, area, whole.surfaceArea(), supportInFrame(mesh, sinTheta), true);
    } finally {
      for (const s of solids) s.delete();
    }
  } finally {
    whole.delete();
  }
}

export async function planSplits(wasm: ManifoldWasm, soup: TriangleSoup, options: SplitOptions = {}): Promise<SplitPlan> {
  const printers = options.printers ?? [];
  const sinTheta = overhangLimit(options.overhangAngle ?? 45);
  const pieceOpts: OrientOptions = { ...PIECE_SEARCH, ...options.pieceSearch, printers, overhangAngle: options.overhangAngle, layerHeight: options.layerHeight, signal: options.signal };
  const ctx: Ctx = { wasm, pieceOpts, printersGiven: printers.length > 0 };
  const tick = makeTicker(options.signal, options.onProgress);
  const mesh = printFrameMesh(soup, options.rotation);
  const whole = solidFromIndexed(wasm, mesh);
  try {
    const volume = whole.volume();
    const wholeArea = whole.surfaceArea();
    const before = supportInFrame(mesh, sinTheta);
    const wholeSearch = await searchOrientationsIndexed(mesh, pieceOpts);
    const partFits = !printers.length || (wholeSearch.candidates[0] ?? wholeSearch.original).fitsAny;
    const screened = candidatePlanes(mesh, { maxPlanes: options.maxPlanes ?? 12, sinTheta, layerHeight: options.layerHeight });
    // Every plane is screened cheaply; only the most promising are cut with manifold-3d.
    const ranked = screenPlanes(mesh, screened, sinTheta).map((s) => s.plane);
    const planes = ranked.slice(0, Math.max(1, options.cutCount ?? 8));
    const out: SplitCandidate[] = [];
    for (let k = 0; k < planes.length; k++) {
      const plane = planes[k]!;
      const solids = cutIntoPieces(whole, plane.normal, plane.offset);
      try {
        // A plane that misses the part, or only shaves a sliver, is not a split.
        if (solids.length >= 2 && solids.every((s) => s.volume() > volume * 1e-4)) {
          const { pieces, area } = await evaluatePieces(ctx, solids);
          out.push(summarise("plane", [plane], pieces, area, wholeArea, before, ctx.printersGiven));
        }
      } finally {
        for (const s of solids) s.delete();
      }
      await tick((partFits ? 1 : 0.7) * ((k + 1) / planes.length));
    }
    if (!partFits) {
      const fit = await splitUntilFits(wasm, soup, { ...options, onProgress: (f) => options.onProgress?.(0.7 + 0.3 * f) });
      if (fit) out.push(fit);
    }
    // Keep cuts that earn their place (lib/rules/split): a real support saving, or a part made printable at all.
    const useful = out.filter((c) => splitEarnsItsPlace(c, partFits));
    useful.sort(compareSplits);
    options.onProgress?.(1);
    return { volume, supportBefore: before, partFits, candidates: useful.slice(0, options.keep ?? 5), planesScreened: screened.length, planesCut: planes.length };
  } finally {
    whole.delete();
  }
}

