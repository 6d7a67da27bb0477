/**
 * Candidate cutting planes for a part already in its print orientation (Z up, resting on z = 0).
 * A plane is {normal, offset}: the points p with normal · p = offset.
 */
import { overhangLimit, isOverhang } from "@/lib/mesh/overhang";
import type { IndexedMesh, Vec3 } from "@/lib/mesh/types";
import { soupBounds } from "@/lib/mesh/weld";
import { facetData } from "./geometry";

export type PlaneKind = "under-overhang" | "middle" | "tilted" | "even" | "to-fit";

export interface CutPlane {
  normal: Vec3;
  offset: number;
  kind: PlaneKind;
}

export interface PlaneOptions {
  maxPlanes?: number;
  /** sin θ of the self-supporting angle, as in the search. */
  sinTheta?: number;
  layerHeight?: number;
}

/**
 * Heights where overhangs start. Overhang facets are binned by centroid height, each weighted by
 * its projected area × height above the bed (the column it would need); the heaviest bins win, and
 * the plane goes at the lowest facet centroid in the bin, so the piece above starts flat on the cut.
 */
export function overhangHeights(mesh: IndexedMesh, sinTheta: number, layer: number, count: number): number[] {
  const f = facetData(mesh);
  const b = soupBounds(mesh.vertices);
  const z0 = b.min[2], height = b.max[2] - z0;
  if (!(height > 0)) return [];
  const binSize = Math.max(layer, height / 200);
  const bins = Math.ceil(height / binSize) + 1;
  const weight = new Float64Array(bins);
  const lowest = new Float64Array(bins).fill(Infinity);
  for (let t = 0; t < f.count; t++) {
    const nz = f.normals[3 * t + 2]!;
    if (!isOverhang(-nz, 1, sinTheta)) continue;
    const h = f.centroids[3 * t + 2]! - z0;
    if (h <= layer) continue; // on the bed
    const k = Math.min(bins - 1, Math.floor(h / binSize));
    weight[k]! += f.areas[t]! * -nz * h;
    if (h < lowest[k]!) lowest[k] = h;
  }
  const order = [...weight.keys()].filter((k) => weight[k]! > 0).sort((p, q) => weight[q]! - weight[p]!);
  const picked: number[] = [];
  for (const k of order) {
    if (picked.length >= count) break;
    if (picked.some((p) => Math.abs(p - k) < 2)) continue;
    picked.push(k);
  }
  return picked.map((k) => z0 + lowest[k]!);
}

function planeKey(p: CutPlane): string {
  const r = (x: number) => Math.round(x * 1000);
  return `${r(p.normal[0])},${r(p.normal[1])},${r(p.normal[2])},${Math.round(p.offset * 100)}`;
}

export function candidatePlanes(mesh: IndexedMesh, opts: PlaneOptions = {}): CutPlane[] {
  const max = opts.maxPlanes ?? 12;
  const sinTheta = opts.sinTheta ?? overhangLimit(45);
  const layer = opts.layerHeight ?? 0.2;
  const b = soupBounds(mesh.vertices);
  const mid: Vec3 = [(b.min[0] + b.max[0]) / 2, (b.min[1] + b.max[1]) / 2, (b.min[2] + b.max[2]) / 2];
  const size: Vec3 = [b.max[0] - b.min[0], b.max[1] - b.min[1], b.max[2] - b.min[2]];
  const list: CutPlane[] = [];
  for (const z of overhangHeights(mesh, sinTheta, layer, Math.ceil(max / 2))) {
    list.push({ normal: [0, 0, 1], offset: z, kind: "under-overhang" });
  }
  list.push({ normal: [1, 0, 0], offset: mid[0], kind: "middle" });
  list.push({ normal: [0, 1, 0], offset: mid[1], kind: "middle" });
  list.push({ normal: [0, 0, 1], offset: mid[2], kind: "middle" });
  const s = Math.SQRT1_2;
  for (const n of [[s, 0, s], [-s, 0, s], [0, s, s], [0, -s, s]] as Vec3[]) {
    list.push({ normal: n, offset: n[0] * mid[0] + n[1] * mid[1] + n[2] * mid[2], kind: "tilted" });
  }
  for (const frac of [0.25, 0.75, 1 / 3, 2 / 3, 0.125, 0.875]) {
    list.push({ normal: [0, 0, 1], offset: b.min[2] + frac * size[2], kind: "even" });
    list.push({ normal: [1, 0, 0], offset: b.min[0] + frac * size[0], kind: "even" });
    list.push({ normal: [0, 1, 0], offset: b.min[1] + frac * size[1], kind: "even" });
  }
  const seen = new Set<string>();
  const out: CutPlane[] = [];
  for (const p of list) {
    const k = planeKey(p);
    if (seen.has(k)) continue;
    seen.add(k);
    out.push(p);
    if (out.length >= max) break;
  }
  return out;
}

/**
 * Cheap screen of many planes before any are cut. Facets go to the side of their centroid; each
 * side's support is estimated as Σ projected overhang area × height over its lowest point (the
 * same proxy as the search's fast stage), for two ways of standing it: on the new cut face, and
 * upright as before. Returns the planes, most support saved first.
 */
export function screenPlanes(mesh: IndexedMesh, planes: CutPlane[], sinTheta: number): { plane: CutPlane; saved: number }[] {
  const f = facetData(mesh);
  const proxy = (side: number, plane: CutPlane, down: Vec3, fromPlane: boolean): number => {
    const [nx, ny, nz] = plane.normal;
    let lo = Infinity;
    if (!fromPlane) {
      for (let t = 0; t < f.count; t++) {
        const c = f.centroids;
        const s = nx * c[3 * t]! + ny * c[3 * t + 1]! + nz * c[3 * t + 2]! - plane.offset;
        if ((s >= 0 ? 1 : -1) !== side && side !== 0) continue;
        const h = -(down[0] * c[3 * t]! + down[1] * c[3 * t + 1]! + down[2] * c[3 * t + 2]!);
        if (h < lo) lo = h;
      }
    }
    let sum = 0;
    for (let t = 0; t < f.count; t++) {
      const c = f.centroids, n = f.normals;
      const cx = c[3 * t]!, cy = c[3 * t + 1]!, cz = c[3 * t + 2]!;
      const s = nx * cx + ny * cy + nz * cz - plane.offset;
      if ((s >= 0 ? 1 : -1) !== side && side !== 0) continue;
      const nd = down[0] * n[3 * t]! + down[1] * n[3 * t + 1]! + down[2] * n[3 * t + 2]!;
      if (!isOverhang(nd, 1, sinTheta)) continue;
      const h = fromPlane ? Math.abs(s) : -(down[0] * cx + down[1] * cy + down[2] * cz) - lo;
      if (h > 1e-6) sum += f.areas[t]! * nd * h;
    }
    return sum;
  };
  const upright: Vec3 = [0, 0, -1];
  const noPlane: CutPlane = { normal: [0, 0, 1], offset: -Infinity, kind: "middle" };
  const before = proxy(0, noPlane, upright, false);
  return planes
    .map((plane) => {
      const n = plane.normal;
      // Above the plane (side +1) the cut face points along −n, so standing on it means down = −n.
      const above = Math.min(proxy(1, plane, [-n[0], -n[1], -n[2]], true), proxy(1, plane, upright, false));
      const below = Math.min(proxy(-1, plane, [n[0], n[1], n[2]], true), proxy(-1, plane, upright, false));
      return { plane, saved: before - above - below };
    })
    .sort((a, b) => b.saved - a.saved);
}
