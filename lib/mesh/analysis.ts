import { footprint, type Footprint } from "./footprint";
import { resolveOptions, type AnalysisOptions, type ResolvedOptions } from "./options";
import { findNonFinite, finishPass, passRange, PassState, type PassResult } from "./single-pass";
import { sniffStl } from "./stl-read";
import { LITTLE_ENDIAN_HOST, PAIR_STRIDE, stlRecordViews } from "./stl-views";
import { topology, type Topology } from "./topology";
import type { IndexedMesh, TriangleSoup, Vec3 } from "./types";
import { defaultWeldTolerance, Welder } from "./weld";
import { MeshReadError } from "./errors";
import { DEFAULT_MAX_TRIANGLES, readMesh, stlScale, type MeshFormat, type ReadOptions } from "./read";
import { isZip } from "./zip";
import { FRESH, sharedWorkspace } from "./workspace";

export interface MeshAnalysis extends PassResult {
  up: Vec3;
  overhangDeg: number;
  /** Welded vertex count. */
  vertices: number;
  topology: Topology;
  /** False when the mesh is open or inconsistently wound: the signed volume is then meaningless. */
  volumeReliable: boolean;
  footprint: Footprint;
}

/** A strided run of triangles: 9 floats at base + k·stride, triangle index tri0 + k·triStep. */
export interface Segment {
  f: Float32Array; base: number; stride: number; count: number; tri0: number; triStep: number;
  /** Fill `f` before reading (a shared scratch buffer); such segments are never split. */
  load?: () => void;
  /** Binary STL: even records whose odd partners follow in the next segment (never split). */
  partnered?: boolean;
  /** Binary STL: the odd records' segment names the even one it interleaves with. */
  pairOf?: Segment;
}

export function soupSegments(p: Float32Array): Segment[] {
  return [{ f: p, base: 0, stride: 9, count: Math.floor(p.length / 9), tri0: 0, triStep: 1 }];
}

/** Record pairs per chunk: the odd records' shifted copy (~200 KB) stays in cache while read. */
const PAIRS_PER_CHUNK = 2048;

/**
 * Binary STL records in place. Even records are read from one aligned Float32Array view of the
 * file; odd records sit 2 bytes off, so each chunk of them is copied (one Uint8Array.set) into a
 * small aligned scratch buffer just before it is read. Chunks alternate even/odd over the same
 * stretch of the file, so the file is streamed through the cache once and no file-sized copy exists.
 */
export function stlSegments(bytes: Uint8Array, count: number): Segment[] {
  const src = (bytes.byteOffset + 84) % 4 === 0 ? bytes : bytes.slice();
  const even = stlRecordViews(src, 0).even;
  const scratch = new Float32Array(PAIRS_PER_CHUNK * PAIR_STRIDE + 12);
  const scratchBytes = new Uint8Array(scratch.buffer);
  const nEven = (count + 1) >>> 1, nOdd = count >>> 1;
  const out: Segment[] = [];
  for (let k0 = 0; k0 < nEven; k0 += PAIRS_PER_CHUNK) {
    const n = Math.min(PAIRS_PER_CHUNK, nOdd - k0);
    const ev: Segment = { f: even, base: 3 + PAIR_STRIDE * k0, stride: PAIR_STRIDE, count: Math.min(PAIRS_PER_CHUNK, nEven - k0), tri0: 2 * k0, triStep: 2, partnered: n > 0 };
    out.push(ev);
    if (n <= 0) continue;
    const from = 134 + 100 * k0;
    const to = Math.min(src.length, from + 100 * (n - 1) + 50);
    out.push({ f: scratch, base: 3, stride: PAIR_STRIDE, count: n, tri0: 2 * k0 + 1, triStep: 2, load: () => scratchBytes.set(src.subarray(from, to)), pairOf: ev });
  }
  return out;
}

/** Split segments into pieces of at most `max` triangles (for progress and cancellation). */
export function chunkSegments(segs: Segment[], max: number): Segment[] {
  const out: Segment[] = [];
  for (const s of segs) {
    if (s.load || s.partnered || s.pairOf) { out.push(s); continue; }
    for (let k = 0; k < s.count; k += max) {
      out.push({ ...s, base: s.base + k * s.stride, count: Math.min(max, s.count - k), tri0: s.tri0 + k * s.triStep });
    }
  }
  return out;
}

export type Phase = "analyse" | "weld" | "topology" | "footprint";
export interface Step { phase: Phase; fraction: number }

function locateNonFinite(segs: Segment[]): number {
  let best = -1;
  for (const s of segs) {
    s.load?.();
    const t = findNonFinite(s.f, s.base, s.stride, s.count, s.tri0, s.triStep);
    if (t >= 0 && (best < 0 || t < best)) best = t;
  }
  return best;
}

export function* passSteps(segs: Segment[], triangles: number, o: ResolvedOptions): Generator<Step, PassResult> {
  const st = new PassState(o, triangles);
  let done = 0;
  for (const s of segs) {
    s.load?.();
    passRange(st, s.f, s.base, s.stride, s.count, s.tri0, s.triStep);
    done += s.count;
    yield { phase: "analyse", fraction: triangles ? done / triangles : 1 };
  }
  return finishPass(st, () => locateNonFinite(segs));
}

/**
 * Full analysis as a sequence of steps. Each stretch of triangles goes through the single pass and
 * the weld's streaming phase while it is in cache (the weld needs no bounding box until it
 * resolves), then the weld is resolved on the pass's bounding box, then edge census and footprint.
 * Working memory comes from the shared workspace (see workspace.ts); the welded mesh is returned
 * only with `keepMesh`, in fresh arrays.
 */
export function* analysisSteps(segs: Segment[], triangles: number, opts: AnalysisOptions & { keepMesh?: boolean } = {}): Generator<Step, { analysis: MeshAnalysis; mesh: IndexedMesh | null }> {
  const o = resolveOptions(opts);
  if (triangles === 0) throw new MeshReadError("NO_TRIANGLES", "the mesh has no triangles");
  const lease = sharedWorkspace.lease();
  try {
    const zeroArea = lease.uint8("pass.zero", triangles, true);
    const st = new PassState(o, triangles, zeroArea);
    const w = new Welder(triangles, lease, opts.keepMesh ? FRESH : lease);
    let done = 0;
    for (const s of segs) {
      s.load?.();
      passRange(st, s.f, s.base, s.stride, s.count, s.tri0, s.triStep);
      // The weld takes triangles in file order: STL's even records wait for their odd partners.
      if (s.pairOf) w.addPairs(s.pairOf.f, s.pairOf.base, s.f, s.base, s.stride, s.pairOf.count, s.count, s.pairOf.tri0);
      else if (s.triStep === 2) { if (!s.partnered) w.addPairs(s.f, s.base, s.f, s.base, s.stride, s.count, 0, s.tri0); }
      else w.addRange(s.f, s.base, s.stride, s.count, s.tri0);
      done += s.count;
      yield { phase: "analyse", fraction: done / triangles };
    }
    const pass = finishPass(st, () => locateNonFinite(segs));
    const tolerance = o.weldTolerance ?? defaultWeldTolerance(pass.bbox.min, pass.bbox.max);
    const { census, ...mesh } = w.result({ min: pass.bbox.min, max: pass.bbox.max, tolerance }, { zeroArea });
    yield { phase: "weld", fraction: 1 };
    const topo = topology(mesh, census);
    yield { phase: "topology", fraction: 1 };
    const fp = footprint(mesh.vertices, o.up);
    yield { phase: "footprint", fraction: 1 };
    const analysis: MeshAnalysis = {
      ...pass,
      up: o.up,
      overhangDeg: opts.overhangDeg ?? 45,
      vertices: mesh.vertices.length / 3,
      topology: topo,
      volumeReliable: topo.watertight,
      footprint: fp,
    };
    return { analysis, mesh: opts.keepMesh ? mesh : null };
  } finally {
    // Also runs when the caller stops early (generator return) or a step throws.
    lease.release();
  }
}

export function runSteps<T>(g: Generator<Step, T>): T {
  for (;;) {
    const r = g.next();
    if (r.done) return r.value;
  }
}

/** Single pass over a soup: bbox, volume, area, overhang and bed contact; no welding. */
export function passSoup(soup: TriangleSoup, opts?: AnalysisOptions): PassResult {
  const p = soup.positions;
  return runSteps(passSteps(soupSegments(p), Math.floor(p.length / 9), resolveOptions(opts)));
}

/** Full analysis of a soup (welds it; the welded mesh is returned with it). */
export function analyzeSoup(soup: TriangleSoup, opts?: AnalysisOptions): MeshAnalysis {
  const p = soup.positions;
  return runSteps(analysisSteps(soupSegments(p), Math.floor(p.length / 9), opts)).analysis;
}

export function analyzeSoupWithMesh(soup: TriangleSoup, opts?: AnalysisOptions): { analysis: MeshAnalysis; mesh: IndexedMesh } {
  const p = soup.positions;
  const r = runSteps(analysisSteps(soupSegments(p), Math.floor(p.length / 9), { ...opts, keepMesh: true }));
  return { analysis: r.analysis, mesh: r.mesh! };
}

function binaryStlOrNull(bytes: Uint8Array, opts: ReadOptions = {}): number | null {
  if (bytes.length === 0 || isZip(bytes)) return null;
  const k = sniffStl(bytes);
  if (k.kind !== "binary" || !LITTLE_ENDIAN_HOST) return null;
  if (k.count === 0) throw new MeshReadError("NO_TRIANGLES", "the binary STL declares 0 triangles");
  const max = opts.maxTriangles ?? DEFAULT_MAX_TRIANGLES;
  if (k.count > max) throw new MeshReadError("TOO_LARGE", `binary STL has ${k.count} triangles, over the ${max} limit`);
  return k.count;
}

/**
 * Single-pass analysis straight from mesh bytes: binary STL records are read in place through two
 * aligned Float32Array views, with no intermediate positions array. Other inputs (ASCII STL, 3MF,
 * inches, big-endian hosts) are read into a soup first.
 */
export function analyzeStlFast(bytes: Uint8Array, opts: AnalysisOptions & ReadOptions = {}): PassResult {
  const count = stlScale(opts.units) !== 1 || isZip(bytes) ? null : binaryStlOrNull(bytes, opts);
  if (count !== null) return runSteps(passSteps(stlSegments(bytes, count), count, resolveOptions(opts)));
  return passSoup(readMesh(bytes, opts).soup, opts);
}

/** Full analysis straight from binary STL bytes (weld and edge census included), or null if not binary STL. */
export function analyzeStlBinaryFull(bytes: Uint8Array, opts: AnalysisOptions & ReadOptions = {}): MeshAnalysis | null {
  if (stlScale(opts.units) !== 1) return null;
  const count = binaryStlOrNull(bytes, opts);
  if (count === null) return null;
  return runSteps(analysisSteps(stlSegments(bytes, count), count, opts)).analysis;
}

/** Read and fully analyse any supported bytes; binary STL is analysed in place. */
export function analyzeBytes(bytes: Uint8Array, opts: AnalysisOptions & ReadOptions = {}): { format: MeshFormat; analysis: MeshAnalysis; warnings: string[] } {
  const direct = analyzeStlBinaryFull(bytes, opts);
  if (direct) {
    const k = sniffStl(bytes);
    const trailing = k.kind === "binary" ? k.trailingBytes : 0;
    return { format: "stl-binary", analysis: direct, warnings: trailing ? [`${trailing} bytes after the last triangle record were ignored`] : [] };
  }
  const r = readMesh(bytes, opts);
  return { format: r.format, analysis: analyzeSoup(r.soup, opts), warnings: r.warnings };
}
