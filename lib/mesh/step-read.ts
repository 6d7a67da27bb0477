import { MeshReadError } from "./errors";
import type { ReadResult } from "./read";
import type { ThreeMfPart } from "./threemf-read";

/**
 * STEP (ISO 10303-21 exchange files of AP203, AP214, AP242) through an OpenCascade tessellator in
 * WebAssembly (occt-import-js). The module is loaded by the host (lib/mesh-node/step.ts on the
 * server and CLI, the mesh worker in the browser) and handed in, so this file stays free of any
 * loader. Each solid of the file becomes one body (a part range of the soup); coordinates come out
 * in millimetres whatever the file's length unit (the tessellator converts from the file's unit).
 */
export interface OcctMesh {
  name?: string;
  attributes: { position: { array: ArrayLike<number> } };
  index: { array: ArrayLike<number> };
}
export interface OcctResult { success: boolean; meshes?: OcctMesh[] }
export interface OcctModule {
  ReadStepFile(content: Uint8Array, params: Record<string, string | number> | null): OcctResult;
}

/**
 * Tessellation: every point of a facet within 0.01 mm of the true surface (linear deflection, far
 * below any printer's resolution) and successive facets turning by at most 0.1 rad (angular
 * deflection). Facet corners lie on the surface, so a curved solid comes out slightly small: a
 * cylinder's volume is at least sin(0.1)/0.1 ≈ 99.83 % of πr²h, more for large radii.
 */
export const STEP_LINEAR_DEFLECTION_MM = 0.01;
export const STEP_ANGULAR_DEFLECTION_RAD = 0.1;
export const STEP_PARAMS = {
  linearUnit: "millimeter",
  linearDeflectionType: "absolute_value",
  linearDeflection: STEP_LINEAR_DEFLECTION_MM,
  angularDeflection: STEP_ANGULAR_DEFLECTION_RAD,
};

const MAGIC = "ISO-10303-21;";

/** Does the file open as an ISO 10303-21 exchange file (after a byte-order mark or white space)? */
export function isStep(b: Uint8Array): boolean {
  let i = 0;
  if (b[0] === 0xef && b[1] === 0xbb && b[2] === 0xbf) i = 3;
  while (i < b.length && (b[i] === 32 || b[i] === 9 || b[i] === 10 || b[i] === 13)) i++;
  for (let j = 0; j < MAGIC.length; j++) if (b[i + j] !== MAGIC.charCodeAt(j)) return false;
  return true;
}

/**
 * Checks of the exchange structure made before the tessellator sees the file (ISO 10303-21: each
 * entity instance name `#n` is defined once in the DATA section). A name defined twice can send the
 * tessellator into a loop, so it is refused here with its name. Strings ('…', '' inside) and
 * comments (/* … *\/) are skipped.
 */
export function checkStepText(b: Uint8Array): void {
  if (!isStep(b)) throw new MeshReadError("BAD_STEP", "not a STEP file: it does not begin with 'ISO-10303-21;' (ISO 10303-21)");
  const seen = new Set<number>();
  let atStart = true; // at the start of a statement (after ';')
  for (let i = 0; i < b.length; i++) {
    const c = b[i]!;
    if (c === 39) { // a string: '' is a quote inside it
      for (i++; i < b.length; i++) if (b[i] === 39) { if (b[i + 1] === 39) i++; else break; }
      atStart = false;
    } else if (c === 47 && b[i + 1] === 42) { // a comment
      const e = b.indexOf(42, i + 2);
      let j = e;
      while (j >= 0 && b[j + 1] !== 47) j = b.indexOf(42, j + 1);
      i = j < 0 ? b.length : j + 1;
    } else if (c === 59) atStart = true;
    else if (c === 35 && atStart) { // '#' opening a statement: an instance definition
      let n = 0, j = i + 1;
      while (j < b.length && b[j]! >= 48 && b[j]! <= 57) n = n * 10 + (b[j++]! - 48);
      while (b[j] === 32 || b[j] === 9 || b[j] === 10 || b[j] === 13) j++;
      if (b[j] === 61 && j > i + 1) {
        if (seen.has(n)) throw new MeshReadError("BAD_STEP", `the STEP file defines instance #${n} twice (ISO 10303-21 requires each instance name once)`);
        seen.add(n);
      }
      atStart = false;
      i = j - 1;
    } else if (c !== 32 && c !== 9 && c !== 10 && c !== 13) atStart = false;
  }
}

/** Tessellate a STEP file with a loaded module into a millimetre soup, one part per body. */
export function readStepWith(occt: OcctModule, bytes: Uint8Array, opts: { maxTriangles?: number } = {}): ReadResult {
  checkStepText(bytes);
  let r: OcctResult;
  try {
    r = occt.ReadStepFile(bytes, STEP_PARAMS);
  } catch (e) {
    throw new MeshReadError("BAD_STEP", `the STEP file could not be read (${e instanceof Error ? e.message.slice(0, 120) : "the tessellator failed"})`);
  }
  return stepResultToRead(r, opts);
}

/** The tessellator's answer as a millimetre soup, one part per body (solids, then shells and loose faces). */
export function stepResultToRead(r: OcctResult, opts: { maxTriangles?: number } = {}): ReadResult {
  const maxTriangles = opts.maxTriangles ?? 20_000_000;
  if (!r || !r.success) throw new MeshReadError("BAD_STEP", "the STEP file could not be read: its DATA section is malformed or uses entities the reader does not know");
  const meshes = (r.meshes ?? []).filter((m) => m.index.array.length >= 3);
  if (meshes.length === 0) throw new MeshReadError("NO_SOLIDS", "the STEP file holds no solid or surface to print (only curves, points or an empty model)");
  let total = 0;
  for (const m of meshes) total += Math.floor(m.index.array.length / 3);
  if (total > maxTriangles) throw new MeshReadError("TOO_LARGE", `the STEP file tessellates to ${total} triangles, over the ${maxTriangles} limit`);
  const positions = new Float32Array(total * 9);
  const parts: ThreeMfPart[] = [];
  let tri = 0;
  meshes.forEach((m, k) => {
    const p = m.attributes.position.array, idx = m.index.array;
    const nv = Math.floor(p.length / 3), nt = Math.floor(idx.length / 3);
    const first = tri;
    for (let t = 0; t < nt; t++, tri++) {
      for (let c = 0; c < 3; c++) {
        const v = idx[3 * t + c]!;
        if (!(v >= 0 && v < nv)) throw new MeshReadError("BAD_STEP", `the tessellator returned a bad vertex index in body ${k + 1}`);
        const q = 9 * tri + 3 * c;
        positions[q] = p[3 * v]!; positions[q + 1] = p[3 * v + 1]!; positions[q + 2] = p[3 * v + 2]!;
      }
    }
    parts.push({ objectId: String(k + 1), name: m.name || undefined, firstTriangle: first, triangleCount: nt });
  });
  for (let i = 0; i < positions.length; i++) {
    if (!Number.isFinite(positions[i]!)) throw new MeshReadError("NON_FINITE", `STEP body: triangle ${Math.floor(i / 9)} has a coordinate that is not a finite number`);
  }
  return { format: "step", soup: { positions }, parts, warnings: [] };
}
