import { MeshReadError } from "./errors";
import { readStlAscii, readStlBinary, sniffStl } from "./stl-read";
import { isStep } from "./step-read";
import { readThreeMf, type ThreeMfPart } from "./threemf-read";
import type { TriangleSoup } from "./types";
import { isZip, type RawInflate } from "./zip";

export type MeshFormat = "stl-binary" | "stl-ascii" | "3mf" | "step";
export type StlUnits = "mm" | "in";

export interface ReadOptions {
  /** Used only in messages and to prefer a format when the bytes are ambiguous. */
  filename?: string;
  /** STL carries no units (millimetres by convention, common practice); "in" scales by 25.4. */
  units?: StlUnits;
  /** Cap on bytes inflated from a 3MF package (default 512 MiB). */
  maxUncompressedBytes?: number;
  /** Cap on triangles produced (default 20 million). */
  maxTriangles?: number;
  /** A faster raw-deflate inflater for 3MF packages (see zip.ts); fflate's otherwise. */
  inflateRaw?: RawInflate;
}

export interface ReadResult {
  format: MeshFormat;
  /** Millimetres. */
  soup: TriangleSoup;
  /** 3MF build items, in order, as triangle ranges of the soup. */
  parts?: ThreeMfPart[];
  warnings: string[];
}

export const DEFAULT_MAX_TRIANGLES = 20_000_000;

export function stlScale(units: StlUnits | undefined): number {
  if (units === undefined || units === "mm") return 1;
  if (units === "in") return 25.4;
  throw new RangeError(`unknown units '${String(units)}' (mm or in)`);
}

/** Read STL (binary or ASCII) or 3MF bytes into a millimetre soup. Throws MeshReadError. */
export function readMesh(bytes: Uint8Array, opts: ReadOptions = {}): ReadResult {
  const maxTriangles = opts.maxTriangles ?? DEFAULT_MAX_TRIANGLES;
  const warnings: string[] = [];
  if (bytes.length === 0) throw new MeshReadError("EMPTY", "the file is empty (0 bytes)");
  if (isStep(bytes)) throw new MeshReadError("NEEDS_STEP_READER", "a STEP file needs the STEP tessellator: read it with readStepWith (lib/mesh/step-read.ts)");
  if (isZip(bytes)) {
    const r = readThreeMf(bytes, { maxUncompressedBytes: opts.maxUncompressedBytes, maxTriangles, inflateRaw: opts.inflateRaw });
    if (opts.units && opts.units !== "mm") warnings.push("units option ignored: a 3MF file states its own unit");
    warnings.push(...r.warnings);
    return { format: "3mf", soup: { positions: r.positions }, parts: r.parts, warnings };
  }
  const kind = sniffStl(bytes);
  let positions: Float32Array;
  let format: MeshFormat;
  if (kind.kind === "binary") {
    if (kind.count > maxTriangles) throw new MeshReadError("TOO_LARGE", `binary STL has ${kind.count} triangles, over the ${maxTriangles} limit`);
    if (kind.trailingBytes > 0) warnings.push(`${kind.trailingBytes} bytes after the last triangle record were ignored`);
    positions = readStlBinary(bytes, kind.count);
    format = "stl-binary";
  } else {
    // An ASCII facet takes well over 100 bytes, so this bound is safe before parsing.
    if (bytes.length / 100 > maxTriangles * 4) throw new MeshReadError("TOO_LARGE", `ASCII STL of ${bytes.length} bytes is over the size limit`);
    positions = readStlAscii(bytes);
    if (positions.length / 9 > maxTriangles) throw new MeshReadError("TOO_LARGE", `ASCII STL has ${positions.length / 9} triangles, over the ${maxTriangles} limit`);
    format = "stl-ascii";
  }
  const s = stlScale(opts.units);
  if (s !== 1) for (let i = 0; i < positions.length; i++) positions[i]! *= s;
  for (let i = 0; i < positions.length; i++) {
    if (!Number.isFinite(positions[i]!)) {
      throw new MeshReadError("NON_FINITE", `triangle ${Math.floor(i / 9)} has a coordinate that is not a finite number (NaN or infinity)`);
    }
  }
  return { format, soup: { positions }, warnings };
}
