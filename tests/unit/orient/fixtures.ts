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
