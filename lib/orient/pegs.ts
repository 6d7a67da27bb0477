/**
 * Registration pegs for a cut: on each cut face, a round peg stands out of the piece on the side the
 * plane's normal points to and goes into a matching hole in the other piece, a little wider and
 * deeper (the clearance), so the pieces align when glued. Pegs go where the cut face has room: at
 * least the peg's radius plus a wall around it (found by insetting the cut's cross-section with
 * manifold-3d), one per separate region of the face, two on a single region long enough for them.
 */
import type { CrossSection } from "manifold-3d";
import type { ManifoldWasm, Solid } from "./manifold-bridge";

/** Sliding fit for printed pins: 0.2 mm on the radius (common practice for FDM, 0.1–0.3 mm; no source). */
export const DEFAULT_PEG_CLEARANCE_MM = 0.2;
/** Peg diameter and depth into each piece, and the wall kept around a hole, mm (common practice, no source). */
export const PEG_DIAMETER_MM = 5;
export const PEG_DEPTH_MM = 4;
export const PEG_WALL_MM = 1.5;
const SEGMENTS = 32;
/** How far pegs and holes start inside the other side, mm. */
const OVERLAP = 0.01;

export interface PegOptions {
  clearanceMm?: number;
  diameterMm?: number;
  depthMm?: number;
  /** At most this many pegs per cut (default 4). */
  maxPegs?: number;
}

type V3 = [number, number, number];

/** An orthonormal frame (u, v, n) with n the plane's unit normal. */
function frameOf(n: V3): { u: V3; v: V3 } {
  const a: V3 = Math.abs(n[0]) < 0.9 ? [1, 0, 0] : [0, 1, 0];
  const u: V3 = [a[1] * n[2] - a[2] * n[1], a[2] * n[0] - a[0] * n[2], a[0] * n[1] - a[1] * n[0]];
  const l = Math.hypot(...u);
  const uu: V3 = [u[0] / l, u[1] / l, u[2] / l];
  const v: V3 = [n[1] * uu[2] - n[2] * uu[1], n[2] * uu[0] - n[0] * uu[2], n[0] * uu[1] - n[1] * uu[0]];
  return { u: uu, v };
}

/** Column-major 4 × 4 with the given columns (x, y, z axes) and origin. */
function mat4(x: V3, y: V3, z: V3, o: V3 = [0, 0, 0]) {
  return [x[0], x[1], x[2], 0, y[0], y[1], y[2], 0, z[0], z[1], z[2], 0, o[0], o[1], o[2], 1] as [number, number, number, number, number, number, number, number, number, number, number, number, number, number, number, number];
}

function insidePolygons(polys: [number, number][][], x: number, y: number): boolean {
  let inside = false;
  for (const p of polys) {
    for (let i = 0, j = p.length - 1; i < p.length; j = i++) {
      const [xi, yi] = p[i]!, [xj, yj] = p[j]!;
      if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) inside = !inside;
    }
  }
  return inside;
}

/** Where pegs go on the cut normal · p = offset of `whole`, in the plane's (u, v) coordinates. */
function pegSpots(whole: Solid, n: V3, offset: number, radius: number, maxPegs: number): { u: V3; v: V3; spots: [number, number][] } {
  const { u, v } = frameOf(n);
  // World → plane frame: rows u, v, n (the transpose of the frame's columns).
  const local = whole.transform(mat4([u[0], v[0], n[0]], [u[1], v[1], n[1]], [u[2], v[2], n[2]]));
  const cut = local.slice(offset);
  local.delete();
  const room: CrossSection = cut.offset(-(radius + PEG_WALL_MM), "Round");
  cut.delete();
  const spots: [number, number][] = [];
  const regions = room.decompose().sort((a, b) => b.area() - a.area());
  room.delete();
  for (const r of regions) {
    const polys = r.toPolygons() as [number, number][][];
    const pts = polys.flat();
    if (pts.length && spots.length < maxPegs) {
      // Two pegs at the region's farthest-apart corners when they stand well apart (they also stop a turn); else one at its middle.
      let best: [[number, number], [number, number]] | null = null;
      let far = 0;
      for (const a of pts) for (const b of pts) {
        const d = Math.hypot(a[0] - b[0], a[1] - b[1]);
        if (d > far) { far = d; best = [a, b]; }
      }
      const b = r.bounds();
      const mid: [number, number] = [(b.min[0] + b.max[0]) / 2, (b.min[1] + b.max[1]) / 2];
      if (best && far >= 4 * radius && spots.length + 2 <= maxPegs) spots.push(best[0], best[1]);
      else spots.push(insidePolygons(polys, mid[0], mid[1]) ? mid : pts[0]!);
    }
    r.delete();
  }
  return { u, v, spots };
}

export interface PeggedCut {
  /** The piece on the side the normal points to (with pegs) and the other (with holes). */
  above: Solid;
  below: Solid;
  pegs: number;
  /** Volume added by the pegs and taken by the holes, mm³ (from manifold-3d). */
  pegVolume: number;
  holeVolume: number;
}

/**
 * Adds pegs to `above` and holes to `below`, cut from `whole` by the plane normal · p = offset
 * (unit normal). Consumes `above` and `below`, returns new solids.
 */
export function addPegs(wasm: ManifoldWasm, whole: Solid, above: Solid, below: Solid, normal: V3, offset: number, opts: PegOptions = {}): PeggedCut {
  const clearance = opts.clearanceMm ?? DEFAULT_PEG_CLEARANCE_MM;
  const r = (opts.diameterMm ?? PEG_DIAMETER_MM) / 2;
  const depth = opts.depthMm ?? PEG_DEPTH_MM;
  const { u, v, spots } = pegSpots(whole, normal, offset, r + clearance, opts.maxPegs ?? 4);
  if (!spots.length) return { above, below, pegs: 0, pegVolume: 0, holeVolume: 0 };
  // Cylinders along −n from the plane: local z runs along −n, so they stand into the `below` side.
  const down: V3 = [-normal[0], -normal[1], -normal[2]];
  const pegs: Solid[] = [];
  const holes: Solid[] = [];
  for (const [a, b] of spots) {
    // Each cylinder starts a hair inside the `above` side, so the booleans never meet a face exactly on the cut.
    const at: V3 = [u[0] * a + v[0] * b + normal[0] * (offset + OVERLAP), u[1] * a + v[1] * b + normal[1] * (offset + OVERLAP), u[2] * a + v[2] * b + normal[2] * (offset + OVERLAP)];
    const m = mat4(u, [-v[0], -v[1], -v[2]], down, at); // (u, −v, −n) keeps the frame right-handed
    const pc = wasm.Manifold.cylinder(depth + OVERLAP, r, r, SEGMENTS, false);
    pegs.push(pc.transform(m));
    pc.delete();
    const hc = wasm.Manifold.cylinder(depth + clearance + OVERLAP, r + clearance, r + clearance, SEGMENTS, false);
    holes.push(hc.transform(m));
    hc.delete();
  }
  const pegSolid = wasm.Manifold.union(pegs);
  const holeSolid = wasm.Manifold.union(holes);
  for (const s of [...pegs, ...holes]) s.delete();
  const outAbove = above.add(pegSolid);
  const outBelow = below.subtract(holeSolid);
  const result = { above: outAbove, below: outBelow, pegs: spots.length, pegVolume: outAbove.volume() - above.volume(), holeVolume: below.volume() - outBelow.volume() };
  pegSolid.delete();
  holeSolid.delete();
  above.delete();
  below.delete();
  return result;
}

/**
 * Cuts `whole` by the plane into its connected pieces, with pegs and holes when asked for and the
 * cut leaves one piece on each side (several pieces on a side: no pegs, `pegs` 0). Does not consume `whole`.
 */
export function cutWithPegs(wasm: ManifoldWasm, whole: Solid, normal: V3, offset: number, pegs: PegOptions | null): { solids: Solid[]; pegs: number } {
  const [above, below] = whole.splitByPlane(normal, offset);
  const sides = [above, below].map((s) => {
    if (s.isEmpty()) return [];
    const parts = s.decompose().filter((p) => (p.isEmpty() ? (p.delete(), false) : true));
    return parts;
  });
  if (pegs && sides[0]!.length === 1 && sides[1]!.length === 1) {
    for (const p of [...sides[0]!, ...sides[1]!]) p.delete();
    const cut = addPegs(wasm, whole, above, below, normal, offset, pegs);
    return { solids: [cut.above, cut.below], pegs: cut.pegs };
  }
  above.delete();
  below.delete();
  return { solids: sides.flat(), pegs: 0 };
}
