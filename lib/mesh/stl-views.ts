/**
 * Binary STL records are 50 bytes (STL format description: 12 × float32 then a uint16), so they
 * are not 4-byte aligned. Record 2k starts at byte 84 + 100k, which is aligned whenever the bytes
 * are; record 2k+1 starts 2 bytes off, so one shifted copy of the bytes aligns all odd records.
 * Two Float32Array views then let the hot loops read vertex floats as plain array elements.
 */
export interface StlRecordViews {
  count: number;
  even: Float32Array;
  /** Float index of record 0's first vertex coordinate in `even`; record 2k is at evenBase + 25k. */
  evenBase: number;
  odd: Float32Array;
  oddBase: number;
}

/** Floats between consecutive same-parity records: 100 bytes. */
export const PAIR_STRIDE = 25;

export const LITTLE_ENDIAN_HOST = new Uint8Array(new Uint32Array([1]).buffer)[0] === 1;

function alignedFrom(bytes: Uint8Array, start: number): Float32Array {
  const abs = bytes.byteOffset + start;
  const len = bytes.length - start;
  if (len <= 0) return new Float32Array(0);
  if (abs % 4 === 0) return new Float32Array(bytes.buffer, abs, len >>> 2);
  const copy = bytes.slice(start); // one memcpy into a fresh, aligned buffer
  return new Float32Array(copy.buffer, 0, len >>> 2);
}

/** Views over `count` records. Little-endian hosts only (floats are stored little-endian). */
export function stlRecordViews(bytes: Uint8Array, count: number): StlRecordViews {
  const even = alignedFrom(bytes, 84);
  const odd = count > 1 ? alignedFrom(bytes, 134) : new Float32Array(0);
  // Skip each record's 3-float normal: the vertex order is the source of truth.
  return { count, even, evenBase: 3, odd, oddBase: 3 };
}

/** Copy the records' vertices into a soup (9 floats per triangle). */
export function stlPositions(bytes: Uint8Array, count: number): Float32Array {
  const out = new Float32Array(count * 9);
  if (!LITTLE_ENDIAN_HOST) {
    const dv = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
    for (let i = 0; i < count; i++) {
      const r = 84 + 50 * i + 12;
      for (let j = 0; j < 9; j++) out[i * 9 + j] = dv.getFloat32(r + 4 * j, true);
    }
    return out;
  }
  const v = stlRecordViews(bytes, count);
  for (let i = 0; i < count; i++) {
    const k = i >>> 1;
    const src = i & 1 ? v.odd : v.even;
    const p = (i & 1 ? v.oddBase : v.evenBase) + PAIR_STRIDE * k;
    const o = i * 9;
    out[o] = src[p]!; out[o + 1] = src[p + 1]!; out[o + 2] = src[p + 2]!;
    out[o + 3] = src[p + 3]!; out[o + 4] = src[p + 4]!; out[o + 5] = src[p + 5]!;
    out[o + 6] = src[p + 6]!; out[o + 7] = src[p + 7]!; out[o + 8] = src[p + 8]!;
  }
  return out;
}
