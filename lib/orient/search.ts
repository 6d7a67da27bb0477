/**
 * Orientation search: fast measures for every candidate direction, then the height-field support
 * estimate and exact footprint for the best few, ranked by the score in score.ts.
 */
import type { IndexedMesh, TriangleSoup, Vec3 } from "@/lib/mesh/types";
import { candidateDirections, type CandidateDirection } from "./directions";
import { fitPrinters } from "./fit";
import { soupBounds, weld } from "@/lib/mesh/weld";
import { indexedVolume } from "@/lib/mesh/volume";
import { nameOrientation } from "@/lib/rules/orientation-names";
import { centreOfMass, isStable, requiredContact, stanceFrom } from "@/lib/rules/stability";
import { BED_TOLERANCE_MM, OVERHANG_DEG, overhangSine } from "@/lib/rules/surface";
import { facetData } from "./geometry";
import { bestSpin, facetCornersXY, footprintOf, quickMetrics, type QuickMetrics } from "./metrics";
import { rotatePoints, rotationForDown, type Rotation } from "./rotation";
import { DEFAULT_WEIGHTS, orientationScore, type ScoreScale } from "./score";
import { supportVolumeHeightField } from "./support";
import { SearchCancelledError, type OrientOptions, type OrientationCandidate, type OrientationResult } from "./types";

/** Candidates closer than this to a better one are not shown side by side (radians, 5°). */
const DISTINCT_ANGLE = (5 * Math.PI) / 180;

/** Lets a worker's message handler run (so a cancel can arrive) about every 30 ms of work. */
export function makeTicker(signal: OrientOptions["signal"], onProgress: OrientOptions["onProgress"]) {
  let last = Date.now();
  return async (fraction: number) => {
    if (signal?.aborted) throw new SearchCancelledError();
    onProgress?.(fraction);
    if (Date.now() - last > 30) {
      await new Promise<void>((r) => setTimeout(r, 0));
      last = Date.now();
      if (signal?.aborted) throw new SearchCancelledError();
    }
  };
}

interface Evaluated {
  cand: CandidateDirection;
  rot: Rotation;
  quick: QuickMetrics;
  proxyScore: number;
  /** Rests on enough contact with its centre of mass over it (lib/rules/stability). */
  stable: boolean;
  /** The facets on the bed, as a key: two directions resting on the same faces are the same choice. */
  contactKey: string;
}

function angleBetween(a: Vec3, b: Vec3): number {
  return Math.acos(Math.max(-1, Math.min(1, a[0] * b[0] + a[1] * b[1] + a[2] * b[2])));
}

/** Picks up to n best-first entries no two of which are within DISTINCT_ANGLE or rest on the same faces. */
function pickDistinct<T extends { down: Vec3; contactKey?: string }>(sorted: T[], n: number): T[] {
  const out: T[] = [];
  for (const e of sorted) {
    if (out.length >= n) break;
    if (out.some((o) => angleBetween(o.down, e.down) < DISTINCT_ANGLE || (e.contactKey && o.contactKey === e.contactKey))) continue;
    out.push(e);
  }
  return out;
}

export async function searchOrientations(soup: TriangleSoup, options: OrientOptions = {}): Promise<OrientationResult> {
  return searchOrientationsIndexed(weld(soup), options);
}

export async function searchOrientationsIndexed(mesh: IndexedMesh, options: OrientOptions = {}): Promise<OrientationResult> {
  const sinTheta = overhangSine(options.overhangAngle ?? OVERHANG_DEG);
  const layer = options.layerHeight ?? 0.2;
  const printers = options.printers ?? [];
  const weights = { ...DEFAULT_WEIGHTS, ...options.weights };
  const refineCount = Math.max(1, options.refineCount ?? 16);
  const gridCells = options.gridCells ?? 192;
  const minCell = options.minCellSize ?? 0.25;
  const keep = Math.max(1, options.keep ?? 5);
  // The one bed-contact rule (lib/rules/surface), the same the part page's figures use.
  const bedEps = BED_TOLERANCE_MM;
  const tick = makeTicker(options.signal, options.onProgress);

  const f = facetData(mesh);
  const b = soupBounds(mesh.vertices);
  const scale: ScoreScale = {
    volume: Math.abs(indexedVolume(mesh)),
    surfaceArea: f.totalArea,
    diameter: Math.hypot(b.max[0] - b.min[0], b.max[1] - b.min[1], b.max[2] - b.min[2]),
    bestBedContact: 0,
  };
  const dirs = candidateDirections(f, options.sphereDirections ?? 256, options.flatRegions ?? 24);
  const com = centreOfMass(mesh);

  // Stage 1: fast measures for every direction.
  const evaluated: Evaluated[] = [];
  const extreme = new Set<number>();
  for (let k = 0; k < dirs.length; k++) {
    const cand = dirs[k]!;
    const rot = rotationForDown(cand.dir);
    const quick = quickMetrics(f, mesh.vertices, rot.matrix, sinTheta, bedEps);
    extreme.add(quick.lowVertex);
    extreme.add(quick.highVertex);
    if (quick.bedContactArea > scale.bestBedContact) scale.bestBedContact = quick.bedContactArea;
    evaluated.push({ cand, rot, quick, proxyScore: 0, stable: false, contactKey: "" });
    if (k % 8 === 7) await tick((0.5 * (k + 1)) / dirs.length);
  }
  // The lowest and highest vertices over all directions approximate the convex hull's vertices,
  // which is all a footprint depends on; good enough to rank before the exact check.
  const hullish = Uint32Array.from(extreme);
  // Only orientations that rest on a real face with the centre of mass over it are offered.
  const needed = requiredContact(scale.bestBedContact);
  for (const e of evaluated) {
    if (e.quick.bedContactArea < needed) continue;
    const stance = stanceFrom(e.quick.bedContactArea, facetCornersXY(f, e.quick.contactFacets, e.rot.matrix), e.rot.matrix, com, e.quick.lowest);
    e.stable = isStable(stance, scale.bestBedContact);
    e.contactKey = e.quick.contactFacets.join(",");
  }
  for (const e of evaluated) {
    const { footprint } = bestSpin(mesh.vertices, hullish, e.rot.matrix);
    const fits = fitPrinters(footprint, e.quick.height, printers);
    e.proxyScore = orientationScore(
      { ...e.quick, supportVolume: e.quick.supportProxy, fitsAny: printers.length ? fits.some((x) => x.fits) : null },
      scale,
      weights,
    );
  }
  evaluated.sort((p, q) => p.proxyScore - q.proxyScore);
  const chosen = pickDistinct(evaluated.filter((e) => e.stable).map((e) => ({ ...e, down: e.cand.dir })), refineCount);
  const original = evaluated.find((e) => e.cand.source === "original")!;
  if (!chosen.some((c) => c.cand.source === "original")) chosen.push({ ...original, down: original.cand.dir });

  // Stage 2: exact footprint after the best turn, and the height-field support estimate.
  const refined: OrientationCandidate[] = [];
  for (let k = 0; k < chosen.length; k++) {
    const e = chosen[k]!;
    const spin = bestSpin(mesh.vertices, hullish, e.rot.matrix).spin;
    const rot = spin === 0 ? e.rot : rotationForDown(e.cand.dir, spin);
    const footprint = footprintOf(mesh.vertices, rot.matrix);
    const rotated = rotatePoints(mesh.vertices, rot.matrix);
    const cellSize = Math.max(minCell, Math.max(footprint[0], footprint[1]) / gridCells);
    const hf = supportVolumeHeightField(rotated, mesh.indices, { cellSize, sinTheta });
    const fits = fitPrinters(footprint, e.quick.height, printers);
    const fitsAny = fits.some((x) => x.fits);
    const cand: OrientationCandidate = {
      down: e.cand.dir,
      source: e.cand.source,
      rotation: rot,
      overhangArea: e.quick.overhangArea,
      supportVolume: hf.volume,
      height: e.quick.height,
      layers: Math.ceil(e.quick.height / layer - 1e-9),
      bedContactArea: e.quick.bedContactArea,
      footprint,
      fits,
      fitsAny,
      score: 0,
      stable: e.stable,
      contactRequired: needed,
      label: "",
      turn: "",
    };
    cand.score = orientationScore({ ...cand, fitsAny: printers.length ? fitsAny : null }, scale, weights);
    refined.push(Object.assign(cand, { contactKey: e.contactKey }));
    await tick(0.5 + (0.5 * (k + 1)) / chosen.length);
  }
  refined.sort((p, q) => p.score - q.score);
  const originalCandidate = refined.find((c) => c.source === "original")!;
  const shown = pickDistinct(refined.filter((c) => c.stable), keep);
  // Named in words; "largest flat face" for the one resting on the most contact.
  const most = Math.max(0, ...shown.map((c) => c.bedContactArea));
  for (const c of [...shown, originalCandidate]) {
    const n = nameOrientation(c.down, most > 0 && c.stable && c.bedContactArea >= most * 0.999);
    c.label = n.label;
    c.turn = n.turn;
    delete (c as { contactKey?: string }).contactKey;
  }
  options.onProgress?.(1);
  return {
    candidates: shown,
    original: originalCandidate,
    directionsEvaluated: dirs.length,
    volume: scale.volume,
    surfaceArea: scale.surfaceArea,
  };
}
