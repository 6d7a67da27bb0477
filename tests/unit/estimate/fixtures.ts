/**
 * Fixture makers for the estimate tests: a seeded PRNG and part measurements taken from solids
 * built by manifold-3d (an outside geometry library), so the inputs do not come from our code.
 */
import Module from "manifold-3d";
import type { PartGeometry, PrintSettings, PrinterProfile } from "@/lib/estimate";

/** mulberry32, a small 32-bit seeded generator (from memory); returns floats in [0, 1). */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

type Wasm = Awaited<ReturnType<typeof Module>>;
type Solid = InstanceType<Wasm["Manifold"]>;
let wasm: Wasm | undefined;

export async function manifold(): Promise<Wasm> {
  if (!wasm) {
    wasm = await Module();
    wasm.setup();
  }
  return wasm;
}

/** Volume, area and height of a manifold solid; footprint given by the caller's closed form. */
export function measure(solid: Solid, footprintAreaMm2?: number): PartGeometry {
  const box = solid.boundingBox();
  const geometry: PartGeometry = {
    volumeMm3: solid.volume(),
    areaMm2: solid.surfaceArea(),
    heightMm: box.max[2] - box.min[2],
    footprintAreaMm2,
  };
  solid.delete();
  return geometry;
}

export const SETTINGS: PrintSettings = {
  layerHeightMm: 0.2,
  wallCount: 2,
  lineWidthMm: 0.45,
  topLayers: 4,
  bottomLayers: 3,
  infill: 0.2,
};

/** Flow 8 mm³/s: the low end of the 8–15 mm³/s that standard hotends melt (REFERENCES.md, common practice). */
export const PRINTER: PrinterProfile = {
  volumetricFlowMm3s: 8,
  perLayerSeconds: 2,
  startupMinutes: 5,
  hourlyRateCents: 350,
};
