/**
 * The largest contact any orientation of a part gives: measured (lib/rules' bed-contact rule) on
 * the six axis directions and the normals of its 24 largest flat regions, the directions where the
 * search finds it too. Used for an orientation picked outside a search, so that "lying on its
 * largest flat face" and the minimum contact mean the same as in the search.
 */
import type { IndexedMesh } from "@/lib/mesh/types";
import { BED_TOLERANCE_MM } from "@/lib/rules/surface";
import { AXIS_DIRECTIONS, flatRegionDirections } from "./directions";
import { facetData } from "./geometry";
import { quickMetrics } from "./metrics";
import { rotationForDown } from "./rotation";

export function largestContact(mesh: IndexedMesh): number {
  const f = facetData(mesh);
  let best = 0;
  for (const dir of [...AXIS_DIRECTIONS, ...flatRegionDirections(f, 24).map((r) => r.dir)]) {
    const q = quickMetrics(f, mesh.vertices, rotationForDown(dir).matrix, 1, BED_TOLERANCE_MM);
    if (q.bedContactArea > best) best = q.bedContactArea;
  }
  return best;
}
