// Open and non-manifold edges of a triangle soup as line segments (6 floats each), for the viewer.
// Vertices are matched on coordinates rounded to 1 µm, enough for files written in millimetres.

export function problemEdges(positions: Float32Array): Float32Array {
  const key = (i: number) => `${Math.round(positions[i]! * 1000)},${Math.round(positions[i + 1]! * 1000)},${Math.round(positions[i + 2]! * 1000)}`;
  const uses = new Map<string, { n: number; a: number; b: number }>();
  const tris = Math.floor(positions.length / 9);
  for (let t = 0; t < tris; t++) {
    for (let e = 0; e < 3; e++) {
      const a = t * 9 + e * 3;
      const b = t * 9 + ((e + 1) % 3) * 3;
      const ka = key(a), kb = key(b);
      if (ka === kb) continue;
      const k = ka < kb ? `${ka}|${kb}` : `${kb}|${ka}`;
      const u = uses.get(k);
      if (u) u.n++;
      else uses.set(k, { n: 1, a, b });
    }
  }
  const out: number[] = [];
  for (const u of uses.values()) {
    if (u.n === 2) continue; // an edge shared by exactly two triangles is fine
    for (const i of [u.a, u.b]) out.push(positions[i]!, positions[i + 1]!, positions[i + 2]!);
  }
  return new Float32Array(out);
}
