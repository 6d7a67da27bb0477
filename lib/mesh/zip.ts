import { Inflate } from "fflate";
import { MeshReadError } from "./errors";

/**
 * Minimal ZIP reading (PKWARE APPNOTE layout: end-of-central-directory record, central directory,
 * local headers) with a hard cap on inflated bytes. Sizes declared in the central directory are
 * checked before inflating, and inflation streams in small chunks with a running cap, so a
 * package that lies about its sizes cannot blow up memory either.
 */
export interface ZipEntry {
  name: string;
  method: number;
  flags: number;
  compressedSize: number;
  size: number;
  localOffset: number;
}

const EOCD = 0x06054b50;
const CEN = 0x02014b50;
const LOC = 0x04034b50;

export function isZip(b: Uint8Array): boolean {
  return b.length >= 4 && b[0] === 0x50 && b[1] === 0x4b && b[2] === 3 && b[3] === 4;
}

function badZip(msg: string): never {
  throw new MeshReadError("BAD_ZIP", `damaged ZIP package: ${msg}`);
}

export function zipEntries(b: Uint8Array): ZipEntry[] {
  const dv = new DataView(b.buffer, b.byteOffset, b.byteLength);
  let eocd = -1;
  for (let i = b.length - 22; i >= Math.max(0, b.length - 22 - 65535); i--) {
    if (dv.getUint32(i, true) === EOCD) { eocd = i; break; }
  }
  if (eocd < 0) badZip("no end-of-central-directory record (truncated?)");
  const count = dv.getUint16(eocd + 10, true);
  const cdSize = dv.getUint32(eocd + 12, true);
  const cdOffset = dv.getUint32(eocd + 16, true);
  if (cdOffset === 0xffffffff || count === 0xffff) badZip("ZIP64 packages are not supported");
  if (cdOffset + cdSize > eocd) badZip("central directory lies outside the file");
  const out: ZipEntry[] = [];
  let p = cdOffset;
  for (let k = 0; k < count; k++) {
    if (p + 46 > eocd || dv.getUint32(p, true) !== CEN) badZip(`central directory entry ${k} is malformed`);
    const nameLen = dv.getUint16(p + 28, true);
    const extraLen = dv.getUint16(p + 30, true);
    const commentLen = dv.getUint16(p + 32, true);
    if (p + 46 + nameLen > eocd) badZip(`central directory entry ${k} runs past the directory`);
    const entry: ZipEntry = {
      name: new TextDecoder("utf-8").decode(b.subarray(p + 46, p + 46 + nameLen)),
      flags: dv.getUint16(p + 8, true),
      method: dv.getUint16(p + 10, true),
      compressedSize: dv.getUint32(p + 20, true),
      size: dv.getUint32(p + 24, true),
      localOffset: dv.getUint32(p + 42, true),
    };
    if (entry.size === 0xffffffff || entry.compressedSize === 0xffffffff || entry.localOffset === 0xffffffff) badZip("ZIP64 entries are not supported");
    out.push(entry);
    p += 46 + nameLen + extraLen + commentLen;
  }
  return out;
}

const CHUNK = 16 * 1024;

/** Inflate one entry, refusing more than `cap` bytes whatever the directory says. */
export function zipRead(b: Uint8Array, e: ZipEntry, cap: number): Uint8Array {
  if (e.flags & 1) badZip(`'${e.name}' is encrypted`);
  if (e.size > cap) {
    throw new MeshReadError("ZIP_BOMB", `'${e.name}' would inflate to ${e.size} bytes, over the ${cap}-byte limit`);
  }
  const dv = new DataView(b.buffer, b.byteOffset, b.byteLength);
  const lo = e.localOffset;
  if (lo + 30 > b.length || dv.getUint32(lo, true) !== LOC) badZip(`local header of '${e.name}' is missing`);
  const start = lo + 30 + dv.getUint16(lo + 26, true) + dv.getUint16(lo + 28, true);
  const end = start + e.compressedSize;
  if (end > b.length) badZip(`data of '${e.name}' runs past the end of the file (truncated?)`);
  const data = b.subarray(start, end);
  if (e.method === 0) {
    if (e.compressedSize !== e.size) badZip(`stored entry '${e.name}' has inconsistent sizes`);
    return data;
  }
  if (e.method !== 8) badZip(`'${e.name}' uses compression method ${e.method}; only stored and deflate are supported`);
  const chunks: Uint8Array[] = [];
  let total = 0;
  let done = false;
  const inf = new Inflate((chunk, final) => {
    total += chunk.length;
    // The declared size is a promise: holding the package to it stops lying bombs early.
    if (total > cap || total > e.size) {
      throw new MeshReadError("ZIP_BOMB", `'${e.name}' inflates past its declared ${e.size} bytes (limit ${cap}); refusing`);
    }
    chunks.push(chunk);
    if (final) done = true;
  });
  try {
    for (let p = 0; p < data.length; p += CHUNK) inf.push(data.subarray(p, Math.min(data.length, p + CHUNK)), p + CHUNK >= data.length);
    if (data.length === 0) inf.push(new Uint8Array(0), true);
  } catch (err) {
    if (err instanceof MeshReadError) throw err;
    badZip(`'${e.name}' does not inflate (${err instanceof Error ? err.message : "invalid deflate data"})`);
  }
  if (!done || total !== e.size) badZip(`'${e.name}' inflated to ${total} bytes, not the declared ${e.size}`);
  if (chunks.length === 1) return chunks[0]!;
  const out = new Uint8Array(total);
  let o = 0;
  for (const c of chunks) { out.set(c, o); o += c.length; }
  return out;
}
