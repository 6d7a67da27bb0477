/**
 * Which orientations can really be printed: the part must rest on the bed on a real face, and
 * stand there by itself.
 *  - Contact: the faces on the bed (lib/rules/surface's rule) must add up to at least
 *    `requiredContact`: 25 mm² (a 5 × 5 mm pad), or half the largest contact any orientation of the
 *    part gives when the part is too small for that. Common practice, no source: a first layer much
 *    smaller than a fingertip pad rarely holds without a brim.
 *  - Balance: the centre of mass, seen from above, lies over the contact region (the convex hull of
 *    the corners on the bed), so the part does not tip before the first layers bond.
 * The hull is lib/mesh's `convexHull2d`; the centre of mass is the volume-weighted centroid of the
 * tetrahedra from the origin to each face (Mirtich 1996, as the volume in lib/mesh).
 */
import { convexHull2d } from "../mesh/footprint";
import type { IndexedMesh, Vec3 } from "../mesh/types";
import { BED_TOLERANCE_MM, restsOnBed } from "./surface";

export const MIN_CONTACT_AREA_MM2 = 25;
export const MIN_CONTACT_SHARE = 0.5;

/** The contact an orientation needs, given the largest contact any orientation of the part gives. */
export function requiredContact(bestContactMm2: number): number {
  return Math.min(MIN_CONTACT_AREA_MM2, MIN_CONTACT_SHARE * bestContactMm2);
}

/** Centre of mass of a closed mesh of uniform density (file frame). */
export function centreOfMass(mesh: IndexedMesh): Vec3 {
  const v = mesh.vertices, ix = mesh.indices;
  let vol = 0, cx = 0, cy = 0, cz = 0;
  for (let t = 0; t + 2 < ix.length; t += 3) {
    const a = 3 * ix[t]!, b = 3 * ix[t + 1]!, c = 3 * ix[t + 2]!;
    const ax = v[a]!, ay = v[a + 1]!, az = v[a + 2]!, bx = v[b]!, by = v[b + 1]!, bz = v[b + 2]!, qx = v[c]!, qy = v[c + 1]!, qz = v[c + 2]!;
    const d = ax * (by * qz - bz * qy) + ay * (bz * qx - bx * qz) + az * (bx * qy - by * qx);
    vol += d;
    cx += d * (ax + bx + qx);
    cy += d * (ay + by + qy);
    cz += d * (az + bz + qz);
  }
  return vol === 0 ? [0, 0, 0] : [cx / (4 * vol), cy / (4 * vol), cz / (4 * vol)];
}

export interface Stance {
  /** Faces on the bed, mm². */
  contactArea: number;
  /** Convex hull of the corners on the bed, print-frame x, y pairs, counter-clockwise. */
  hull: Float64Array;
  /** Centre of mass seen from above (print-frame x, y) and its height. */
  centre: Vec3;
  /** The centre of mass lies over the contact region. */
  balanced: boolean;
}

/** Row-major 3 × 3 rotation from the file frame to the print frame (Z up). */
export type Frame = readonly [number, number, number, number, number, number, number, number, number];

/** Contact and balance of a mesh turned by `m` (the part rests on its lowest point). `com` in the file frame. */
export function stanceOf(mesh: IndexedMesh, m: Frame, com: Vec3, tolerance = BED_TOLERANCE_MM): Stance {
  const v = mesh.vertices, ix = mesh.indices;
  const nv = v.length / 3;
  let lo = Infinity;
  for (let i = 0; i < nv; i++) {
    const h = m[6] * v[3 * i]! + m[7] * v[3 * i + 1]! + m[8] * v[3 * i + 2]!;
    if (h < lo) lo = h;
  }
  const pts: number[] = [];
  let contactArea = 0;
  for (let t = 0; t + 2 < ix.length; t += 3) {
    const a = 3 * ix[t]!, b = 3 * ix[t + 1]!, c = 3 * ix[t + 2]!;
    const ha = m[6] * v[a]! + m[7] * v[a + 1]! + m[8] * v[a + 2]!;
    const hb = m[6] * v[b]! + m[7] * v[b + 1]! + m[8] * v[b + 2]!;
    const hc = m[6] * v[c]! + m[7] * v[c + 1]! + m[8] * v[c + 2]!;
    const top = Math.max(ha, hb, hc) - lo;
    if (top > tolerance) continue;
    const e1 = [v[b]! - v[a]!, v[b + 1]! - v[a + 1]!, v[b + 2]! - v[a + 2]!], e2 = [v[c]! - v[a]!, v[c + 1]! - v[a + 1]!, v[c + 2]! - v[a + 2]!];
    const n = [e1[1]! * e2[2]! - e1[2]! * e2[1]!, e1[2]! * e2[0]! - e1[0]! * e2[2]!, e1[0]! * e2[1]! - e1[1]! * e2[0]!];
    const len = Math.hypot(n[0]!, n[1]!, n[2]!);
    if (!(len > 0)) continue;
    const nd = -(m[6] * n[0]! + m[7] * n[1]! + m[8] * n[2]!) / len;
    if (!restsOnBed(nd, top, tolerance)) continue;
    contactArea += len / 2;
    for (const p of [a, b, c]) pts.push(m[0] * v[p]! + m[1] * v[p + 1]! + m[2] * v[p + 2]!, m[3] * v[p]! + m[4] * v[p + 1]! + m[5] * v[p + 2]!);
  }
  return stanceFrom(contactArea, pts, m, com, lo);
}

/**
 * The same from contact faces found elsewhere (the orientation search finds them while it measures
 * overhangs): `cornersXY` are their corners in print-frame x, y; `lowest` the height of the bed in
 * the turned frame.
 */
export function stanceFrom(contactArea: number, cornersXY: ArrayLike<number>, m: Frame, com: Vec3, lowest: number): Stance {
  const hull = cornersXY.length ? convexHull2d(Float64Array.from(cornersXY)) : new Float64Array();
  const centre: Vec3 = [m[0] * com[0] + m[1] * com[1] + m[2] * com[2], m[3] * com[0] + m[4] * com[1] + m[5] * com[2], m[6] * com[0] + m[7] * com[1] + m[8] * com[2] - lowest];
  return { contactArea, hull, centre, balanced: insideConvex(hull, centre[0], centre[1]) };
}

/** Is (x, y) inside (or on the edge of) a counter-clockwise convex polygon with at least 3 corners? */
export function insideConvex(hull: Float64Array, x: number, y: number): boolean {
  const n = hull.length >>> 1;
  if (n < 3) return false;
  const scale = Math.max(1, ...Array.from(hull, Math.abs));
  for (let i = 0; i < n; i++) {
    const j = (i + 1) % n;
    const ex = hull[2 * j]! - hull[2 * i]!, ey = hull[2 * j + 1]! - hull[2 * i + 1]!;
    if (ex * (y - hull[2 * i + 1]!) - ey * (x - hull[2 * i]!) < -1e-9 * scale * scale) return false;
  }
  return true;
}

/** Printable: enough contact, and balanced over it. */
export function isStable(s: Stance, bestContactMm2: number): boolean {
  return s.contactArea >= requiredContact(bestContactMm2) - 1e-9 && s.balanced;
}
