/** Test solids made by code with manifold-3d, handed to the planner as plain triangle soups. */
import Module from "manifold-3d";
import type { TriangleSoup } from "@/lib/mesh/types";

type Wasm = Awaited<ReturnType<typeof Module>>;
export type Solid = InstanceType<Wasm["Manifold"]>;

let cached: Promise<Wasm> | null = null;

export function loadWasm(): Promise<Wasm> {
  cached ??= Module().then((w) => {
    w.setup();
    return w;
  });
  return cached;
}

/** Expands a solid into a soup and frees it. */
export function toSoup(solid: Solid): TriangleSoup {
  const mesh = solid.getMesh();
  const { vertProperties: vp, triVerts: tv, numProp } = mesh;
  const positions = new Float32Array(tv.length * 3);
  for (let i = 0; i < tv.length; i++) {
    const v = tv[i]! * numProp;
    positions[3 * i] = vp[v]!;
    positions[3 * i + 1] = vp[v + 1]!;
    positions[3 * i + 2] = vp[v + 2]!;
  }
  solid.delete();
  return { positions };
}

/** An axis-aligned box from corner (x, y, z) with size (w, d, h). */
export function box(w: Wasm, at: [number, number, number], size: [number, number, number]): Solid {
  const c = w.Manifold.cube(size, false);
  const moved = c.translate(at);
  c.delete();
  return moved;
}

/** Union of solids; frees the inputs. */
export function union(w: Wasm, parts: Solid[]): Solid {
  const u = w.Manifold.union(parts);
  for (const p of parts) p.delete();
  return u;
}

/** Lowest-z-first bounding box of a soup. */
export function soupBounds(p: Float32Array): { min: number[]; max: number[] } {
  const min = [Infinity, Infinity, Infinity], max = [-Infinity, -Infinity, -Infinity];
  for (let i = 0; i < p.length; i += 3)
    for (let k = 0; k < 3; k++) {
      min[k] = Math.min(min[k]!, p[i + k]!);
      max[k] = Math.max(max[k]!, p[i + k]!);
    }
  return { min, max };
}

/** A T standing upright: stem 10 × 10 × 30 under a bar 50 × 10 × 10, arms 20 mm each side. */
export function tShape(w: Wasm): TriangleSoup {
  return toSoup(union(w, [box(w, [20, 0, 0], [10, 10, 30]), box(w, [0, 0, 30], [50, 10, 10])]));
}

/** An L in the XZ plane, 10 deep in Y: a 40 × 10 foot along X and a 10 × 40 upright at x = 0. */
export function lShape(w: Wasm): TriangleSoup {
  return toSoup(union(w, [box(w, [0, 0, 0], [40, 10, 10]), box(w, [0, 0, 0], [10, 10, 40])]));
}

/** Right-triangle prism: legs 40 (X) and 20 (Z) in the XZ plane, 30 deep in Y. */
export function wedge(w: Wasm): TriangleSoup {
  const pts: [number, number, number][] = [];
  for (const y of [0, 30]) pts.push([0, y, 0], [40, y, 0], [0, y, 20]);
  return toSoup(w.Manifold.hull(pts));
}
