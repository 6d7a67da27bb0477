import type { TriangleSoup } from "./types";

/**
 * Binary STL per the STL format description: 80-byte header, uint32 LE count, then per facet
 * 12 little-endian float32 (unit normal, three vertices) and a zero uint16 attribute.
 * The header never starts with "solid", so readers cannot mistake it for ASCII.
 */
export function writeStl(soup: TriangleSoup, header = "binary STL written by Platewright"): Uint8Array {
  const p = soup.positions;
  const n = Math.floor(p.length / 9);
  const out = new Uint8Array(84 + 50 * n);
  const dv = new DataView(out.buffer);
  const h = header.replace(/^\s*solid/i, "_solid").slice(0, 80);
  for (let i = 0; i < h.length; i++) out[i] = h.charCodeAt(i) & 0x7f;
  dv.setUint32(80, n, true);
  for (let t = 0; t < n; t++) {
    const q = 9 * t;
    const e1x = p[q + 3]! - p[q]!, e1y = p[q + 4]! - p[q + 1]!, e1z = p[q + 5]! - p[q + 2]!;
    const e2x = p[q + 6]! - p[q]!, e2y = p[q + 7]! - p[q + 1]!, e2z = p[q + 8]! - p[q + 2]!;
    let nx = e1y * e2z - e1z * e2y, ny = e1z * e2x - e1x * e2z, nz = e1x * e2y - e1y * e2x;
    const l = Math.hypot(nx, ny, nz);
    if (l > 0) { nx /= l; ny /= l; nz /= l; } else { nx = ny = nz = 0; }
    const r = 84 + 50 * t;
    dv.setFloat32(r, nx, true);
    dv.setFloat32(r + 4, ny, true);
    dv.setFloat32(r + 8, nz, true);
    for (let j = 0; j < 9; j++) dv.setFloat32(r + 12 + 4 * j, p[q + j]!, true);
  }
  return out;
}
