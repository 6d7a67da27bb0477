/**
 * Core mesh data shared by every lib/ module. Units are millimetres after reading.
 *
 * A triangle soup: 9 floats per triangle (x0 y0 z0 x1 y1 z1 x2 y2 z2), in the file's
 * vertex order (counter-clockwise seen from outside, per the STL and 3MF conventions).
 */
export interface TriangleSoup {
  positions: Float32Array;
}

/** Welded form: 3 floats per vertex, 3 indices per triangle. */
export interface IndexedMesh {
  vertices: Float32Array;
  indices: Uint32Array;
}

export type Vec3 = [number, number, number];
