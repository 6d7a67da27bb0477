/**
 * Height-field estimate of support volume, in the print frame (Z up, bed at the lowest point).
 *
 * Every facet is rasterised onto an XY grid, sampling at cell centres with a top-left fill rule so a
 * shared edge is counted once. Each cell then holds the heights at which a vertical line through its
 * centre crosses the surface. For each crossing by an overhang facet (facing down more steeply than
 * the self-supporting angle allows), the column reaches down to the nearest crossing below it, or to
 * the bed when there is none. Volume = Σ column heights × cell area. Worked method, no source.
 */

import { isOverhang } from "@/lib/mesh/overhang";
export interface HeightFieldOptions {
  /** Cell edge, mm. */
  cellSize: number;
  /** The overhang limit (lib/mesh overhangLimit: sin θ, θ from vertical, plus the tolerance): overhang when −n_z > it. */
  sinTheta: number;
}

export interface HeightFieldResult {
  /** mm³. */
  volume: number;
  /** Area of the grid under overhangs that needed a column, mm² (a by-product for display). */
  supportedArea: number;
  nx: number;
  ny: number;
  cellSize: number;
}

const KIND_UP = 0;
const KIND_DOWN = 1;
const KIND_OVERHANG = 2;

/**
 * Crossing buffers reused between calls: the search runs the estimate many times in a row, and
 * fresh megabyte arrays each time cost more in garbage collection than the estimate itself.
 */
const scratch = { cells: new Int32Array(0), zs: new Float32Array(0), kinds: new Uint8Array(0) };

function ensure(size: number, keep = 0): void {
  if (scratch.cells.length >= size) return;
  const cells = new Int32Array(size), zs = new Float32Array(size), kinds = new Uint8Array(size);
  cells.set(scratch.cells.subarray(0, keep));
  zs.set(scratch.zs.subarray(0, keep));
  kinds.set(scratch.kinds.subarray(0, keep));
  scratch.cells = cells;
  scratch.zs = zs;
  scratch.kinds = kinds;
}

/** Cells on the inside of edge (ax,ay)→(bx,by) for a counter-clockwise triangle, top-left rule. */
function topLeft(dx: number, dy: number): boolean {
  return dy < 0 || (dy === 0 && dx < 0);
}

export function supportVolumeHeightField(
  vertices: ArrayLike<number>,
  indices: ArrayLike<number>,
  opts: HeightFieldOptions,
): HeightFieldResult {
  let minX = Infinity, minY = Infinity, minZ = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (let i = 0; i + 2 < vertices.length; i += 3) {
    const x = vertices[i]!, y = vertices[i + 1]!, z = vertices[i + 2]!;
    if (x < minX) minX = x;
    if (x > maxX) maxX = x;
    if (y < minY) minY = y;
    if (y > maxY) maxY = y;
    if (z < minZ) minZ = z;
  }
  const c = opts.cellSize;
  const nx = Math.max(1, Math.ceil((maxX - minX) / c));
  const ny = Math.max(1, Math.ceil((maxY - minY) / c));
  const inv = 1 / c;

  ensure(Math.max(1024, nx * ny * 4));
  let { cells, zs, kinds } = scratch;
  let cap = cells.length;
  let n = 0;
  const push = (cell: number, z: number, kind: number) => {
    if (n === cap) {
      ensure(cap * 2, n);
      ({ cells, zs, kinds } = scratch);
      cap = cells.length;
    }
    cells[n] = cell;
    zs[n] = z;
    kinds[n] = kind;
    n++;
  };

  const tris = Math.floor(indices.length / 3);
  const sinTheta = opts.sinTheta;
  for (let t = 0; t < tris; t++) {
    const ia = indices[3 * t]! * 3, ib = indices[3 * t + 1]! * 3, ic = indices[3 * t + 2]! * 3;
    // Grid units, origin at the bounding-box corner; cell centres sit at k + 0.5.
    const ax = (vertices[ia]! - minX) * inv, ay = (vertices[ia + 1]! - minY) * inv;
    const px1 = (vertices[ib]! - minX) * inv, py1 = (vertices[ib + 1]! - minY) * inv;
    const px2 = (vertices[ic]! - minX) * inv, py2 = (vertices[ic + 1]! - minY) * inv;
    // Most small facets cover no cell centre: reject them before any other work.
    const i0 = Math.max(0, Math.ceil((ax < px1 ? (ax < px2 ? ax : px2) : px1 < px2 ? px1 : px2) - 0.5));
    const i1 = Math.min(nx - 1, Math.floor((ax > px1 ? (ax > px2 ? ax : px2) : px1 > px2 ? px1 : px2) - 0.5));
    if (i0 > i1) continue;
    const j0 = Math.max(0, Math.ceil((ay < py1 ? (ay < py2 ? ay : py2) : py1 < py2 ? py1 : py2) - 0.5));
    const j1 = Math.min(ny - 1, Math.floor((ay > py1 ? (ay > py2 ? ay : py2) : py1 > py2 ? py1 : py2) - 0.5));
    if (j0 > j1) continue;
    let area2 = (px1 - ax) * (py2 - ay) - (py1 - ay) * (px2 - ax);
    if (area2 > -1e-12 && area2 < 1e-12) continue; // vertical facet: no crossing
    const az = vertices[ia + 2]!, z1 = vertices[ib + 2]!, z2 = vertices[ic + 2]!;
    // Facing and steepness from the 3D normal (in grid units for x, y: only ratios matter here).
    const ux = px1 - ax, uy = py1 - ay, uz = (z1 - az) * inv;
    const wx = px2 - ax, wy = py2 - ay, wz = (z2 - az) * inv;
    const nx3 = uy * wz - uz * wy, ny3 = uz * wx - ux * wz, nz = ux * wy - uy * wx;
    const nlen = Math.sqrt(nx3 * nx3 + ny3 * ny3 + nz * nz);
    const kind = nz > 0 ? KIND_UP : isOverhang(-nz, nlen, sinTheta) ? KIND_OVERHANG : KIND_DOWN;
    // Counter-clockwise order in the plane for the edge tests.
    let bx = px1, by = py1, bz = z1, cx = px2, cy = py2, cz = z2;
    if (area2 < 0) {
      bx = px2; by = py2; bz = z2;
      cx = px1; cy = py1; cz = z1;
      area2 = -area2;
    }
    const tlAB = topLeft(bx - ax, by - ay), tlBC = topLeft(cx - bx, cy - by), tlCA = topLeft(ax - cx, ay - cy);
    const invA = 1 / area2;
    for (let j = j0; j <= j1; j++) {
      const py = j + 0.5;
      for (let i = i0; i <= i1; i++) {
        const px = i + 0.5;
        const eab = (bx - ax) * (py - ay) - (by - ay) * (px - ax);
        if (eab < 0 || (eab === 0 && !tlAB)) continue;
        const ebc = (cx - bx) * (py - by) - (cy - by) * (px - bx);
        if (ebc < 0 || (ebc === 0 && !tlBC)) continue;
        const eca = (ax - cx) * (py - cy) - (ay - cy) * (px - cx);
        if (eca < 0 || (eca === 0 && !tlCA)) continue;
        const z = (ebc * az + eca * bz + eab * cz) * invA;
        push(j * nx + i, z, kind);
      }
    }
  }

  // Counting sort of the crossings by cell.
  const cellCount = nx * ny;
  const start = new Int32Array(cellCount + 1);
  for (let k = 0; k < n; k++) start[cells[k]! + 1]!++;
  for (let k = 0; k < cellCount; k++) start[k + 1]! += start[k]!;
  const fill = start.slice(0, cellCount);
  const sz = new Float32Array(n);
  const sk = new Uint8Array(n);
  for (let k = 0; k < n; k++) {
    const at = fill[cells[k]!]!++;
    sz[at] = zs[k]!;
    sk[at] = kinds[k]!;
  }

  let columns = 0;
  let supportedCells = 0;
  for (let cell = 0; cell < cellCount; cell++) {
    const s = start[cell]!, e = start[cell + 1]!;
    if (e - s === 0) continue;
    // Insertion sort by height: lists are short (a few crossings per cell).
    for (let k = s + 1; k < e; k++) {
      const z = sz[k]!, kd = sk[k]!;
      let m = k - 1;
      while (m >= s && (sz[m]! > z || (sz[m] === z && sk[m]! > kd))) {
        sz[m + 1] = sz[m]!;
        sk[m + 1] = sk[m]!;
        m--;
      }
      sz[m + 1] = z;
      sk[m + 1] = kd;
    }
    let any = false;
    for (let k = s; k < e; k++) {
      if (sk[k] !== KIND_OVERHANG) continue;
      // Ties sort up-facing first, so a surface touching from below ends the column at once.
      const below = k > s ? sz[k - 1]! : minZ;
      const h = sz[k]! - below;
      if (h > 0) {
        columns += h;
        any = true;
      }
    }
    if (any) supportedCells++;
  }
  return { volume: columns * c * c, supportedArea: supportedCells * c * c, nx, ny, cellSize: c };
}
