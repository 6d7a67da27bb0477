import { Inflate } from "fflate";
import { MeshReadError } from "./errors";

/**
 * ZIP reading (PKWARE APPNOTE 6.3: end-of-central-directory record, ZIP64 end record and locator,
 * central directory with ZIP64 extra fields, local headers; data descriptors need nothing, as sizes
 * come from the central directory) with a hard cap on inflated bytes. Sizes declared in the central
 * directory are checked before inflating, and inflation streams in small chunks with a running cap
 * (fflate's Inflate), so a package that lies about its sizes cannot blow up memory either.
 *
 * The directory is read here rather than with fflate's unzipSync: that allocates each entry at its
 * declared size in one piece, silently truncates an entry that inflates past it, and reads the
 * ZIP64 end record without bounds checks; here every offset is checked and every failure says what.
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
const EOCD64 = 0x06064b50;
const EOCD64_LOCATOR = 0x07064b50;
const CEN = 0x02014b50;
const LOC = 0x04034b50;
const ZIP64_EXTRA = 0x0001;
const U32 = 0xffffffff;
const U16 = 0xffff;

export function isZip(b: Uint8Array): boolean {
  return b.length >= 4 && b[0] === 0x50 && b[1] === 0x4b && b[2] === 3 && b[3] === 4;
}

function badZip(msg: string): never {
  throw new MeshReadError("BAD_ZIP", `damaged ZIP package: ${msg}`);
}

/** A little-endian uint64 as a number; refuses values past 2^53 (no file here is that large). */
function u64(dv: DataView, p: number, what: string): number {
  const lo = dv.getUint32(p, true), hi = dv.getUint32(p + 4, true);
  if (hi >= 2 ** 21) badZip(`${what} is larger than any file this reader takes`);
  return hi * 2 ** 32 + lo;
}

/** Entry count, directory size and offset, from the ZIP64 end record when there is one. */
function directory(dv: DataView, eocd: number): { count: number; cdSize: number; cdOffset: number; cdEnd: number } {
  let count = dv.getUint16(eocd + 10, true);
  let cdSize = dv.getUint32(eocd + 12, true);
  let cdOffset = dv.getUint32(eocd + 16, true);
  let cdEnd = eocd;
  const loc = eocd - 20;
  if (loc >= 0 && dv.getUint32(loc, true) === EOCD64_LOCATOR) {
    const rec = u64(dv, loc + 8, "ZIP64 end record offset");
    if (rec + 56 > loc || dv.getUint32(rec, true) !== EOCD64) badZip("the ZIP64 end-of-central-directory locator points at no ZIP64 end record");
    if (dv.getUint32(rec + 16, true) !== 0 || dv.getUint32(loc + 4, true) !== 0) badZip("split or spanned archives are not supported");
    count = u64(dv, rec + 32, "ZIP64 entry count");
    cdSize = u64(dv, rec + 40, "ZIP64 directory size");
    cdOffset = u64(dv, rec + 48, "ZIP64 directory offset");
    cdEnd = rec;
  } else if (count === U16 || cdSize === U32 || cdOffset === U32) {
    badZip("the end record says ZIP64 but there is no ZIP64 end-of-central-directory locator");
  }
  if (cdOffset + cdSize > cdEnd) badZip("central directory lies outside the file");
  // A central directory entry takes at least 46 bytes: a count that cannot fit is a lie.
  if (count * 46 > cdSize) badZip(`the directory declares ${count} entries but has room for ${Math.floor(cdSize / 46)}`);
  return { count, cdSize, cdOffset, cdEnd };
}

/** Replace 0xFFFFFFFF fields with the ZIP64 extra field's values (APPNOTE 4.5.3: in this order). */
function zip64Extra(dv: DataView, e: ZipEntry, p: number, end: number, diskStart: number): void {
  const want = [e.size === U32, e.compressedSize === U32, e.localOffset === U32, diskStart === U16];
  if (!want.some(Boolean)) return;
  while (p + 4 <= end) {
    const id = dv.getUint16(p, true), len = dv.getUint16(p + 2, true);
    if (p + 4 + len > end) break;
    if (id === ZIP64_EXTRA) {
      let q = p + 4;
      const take = (what: string): number => {
        if (q + 8 > p + 4 + len) badZip(`'${e.name}': ZIP64 extra field too short for its ${what}`);
        const v = u64(dv, q, `'${e.name}' ${what}`);
        q += 8;
        return v;
      };
      if (want[0]) e.size = take("size");
      if (want[1]) e.compressedSize = take("compressed size");
      if (want[2]) e.localOffset = take("local header offset");
      if (want[3] && (q + 4 > p + 4 + len || dv.getUint32(q, true) !== 0)) badZip("split or spanned archives are not supported");
      return;
    }
    p += 4 + len;
  }
  badZip(`'${e.name}' has 32-bit fields set to 0xFFFFFFFF but no ZIP64 extra field`);
}

export function zipEntries(b: Uint8Array): ZipEntry[] {
  const dv = new DataView(b.buffer, b.byteOffset, b.byteLength);
  let eocd = -1;
  for (let i = b.length - 22; i >= Math.max(0, b.length - 22 - 65535); i--) {
    if (dv.getUint32(i, true) === EOCD) { eocd = i; break; }
  }
  if (eocd < 0) badZip("no end-of-central-directory record (truncated?)");
  const { count, cdOffset, cdEnd } = directory(dv, eocd);
  const out: ZipEntry[] = [];
  let p = cdOffset;
  for (let k = 0; k < count; k++) {
    if (p + 46 > cdEnd || dv.getUint32(p, true) !== CEN) badZip(`central directory entry ${k} is malformed`);
    const nameLen = dv.getUint16(p + 28, true);
    const extraLen = dv.getUint16(p + 30, true);
    const commentLen = dv.getUint16(p + 32, true);
    if (p + 46 + nameLen + extraLen > cdEnd) badZip(`central directory entry ${k} runs past the directory`);
    const entry: ZipEntry = {
      name: new TextDecoder("utf-8").decode(b.subarray(p + 46, p + 46 + nameLen)),
      flags: dv.getUint16(p + 8, true),
      method: dv.getUint16(p + 10, true),
      compressedSize: dv.getUint32(p + 20, true),
      size: dv.getUint32(p + 24, true),
      localOffset: dv.getUint32(p + 42, true),
    };
    zip64Extra(dv, entry, p + 46 + nameLen, p + 46 + nameLen + extraLen, dv.getUint16(p + 34, true));
    out.push(entry);
    p += 46 + nameLen + extraLen + commentLen;
  }
  return out;
}

/**
 * Compressed bytes fed to the inflater at a time: deflate expands at most ~1032:1, so one step
 * yields at most ~64 MB before the running cap is checked again.
 */
const CHUNK = 64 * 1024;

/**
 * A raw-deflate inflater the host may supply (the server and CLI pass Node's zlib, several times
 * faster than fflate): returns the inflated bytes and throws a RangeError rather than produce more
 * than `limit` bytes. Without one, fflate's streaming Inflate is used (the browser worker).
 */
export type RawInflate = (data: Uint8Array, limit: number) => Uint8Array;

/** Inflate one entry, refusing more than `cap` bytes whatever the directory says. */
export function zipRead(b: Uint8Array, e: ZipEntry, cap: number, inflateRaw?: RawInflate): Uint8Array {
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
  // Deflate expands at most ~1032:1 (zlib's technical notes, from memory): a larger declared size is
  // a lie, refused before anything of that size is allocated.
  if (e.size > e.compressedSize * 1032 + 1024) badZip(`'${e.name}' declares ${e.size} bytes from ${e.compressedSize} compressed, more than deflate can produce`);
  if (inflateRaw) {
    let out: Uint8Array;
    try {
      out = inflateRaw(data, Math.max(1, e.size));
    } catch (err) {
      if (err instanceof RangeError) throw new MeshReadError("ZIP_BOMB", `'${e.name}' inflates past its declared ${e.size} bytes (limit ${cap}); refusing`);
      badZip(`'${e.name}' does not inflate (${err instanceof Error ? err.message : "invalid deflate data"})`);
    }
    if (out.length !== e.size) badZip(`'${e.name}' inflated to ${out.length} bytes, not the declared ${e.size}`);
    return out;
  }
  // Inflated straight into an array of the declared size (already within the cap): a chunk that
  // would run past it is a lie about the size, refused before it is copied.
  const out = new Uint8Array(e.size);
  let total = 0;
  let done = false;
  const inf = new Inflate((chunk, final) => {
    if (total + chunk.length > e.size) {
      throw new MeshReadError("ZIP_BOMB", `'${e.name}' inflates past its declared ${e.size} bytes (limit ${cap}); refusing`);
    }
    out.set(chunk, total);
    total += chunk.length;
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
  return out;
}
