/**
 * Benchmark of the orientation search and the split planner on generated meshes.
 * Goals: search on ~200,000 triangles with 200+ directions ≤ 2 s; 20-plane split search on
 * ~100,000 triangles ≤ 10 s. Prints figures; asserts nothing.
 */
import Module from "manifold-3d";
import { weld } from "@/lib/mesh/weld";
import { soupFromSolid, type Solid } from "@/lib/orient/manifold-bridge";
import { rotatePoints, rotationForDown } from "@/lib/orient/rotation";
import { searchOrientations } from "@/lib/orient/search";
import { planSplits } from "@/lib/orient/split";
import { supportVolumeHeightField } from "@/lib/orient/support";

const wasm = await Module();
wasm.setup();

/** A mushroom-like part (smooth cap over a stem, a ledge on one side), about `tris` triangles. */
function makePart(tris: number): Solid {
  const seg = 4 * Math.round(Math.sqrt(tris * 2.05) / 4);
  const cap = wasm.Manifold.sphere(30, seg);
  const capMoved = cap.translate([0, 0, 60]);
  const stem = wasm.Manifold.cylinder(60, 8, 8, 64);
  const ledge = wasm.Manifold.cube([30, 10, 6], false).translate([0, -5, 25]);
  const u = wasm.Manifold.union([capMoved, stem, ledge]);
  for (const s of [cap, capMoved, stem, ledge]) s.delete();
  return u;
}

const printers = [
  { id: "small", bed: [180, 180] as [number, number], height: 180 },
  { id: "large", bed: [250, 210] as [number, number], height: 220 },
];

function ms(t0: number) {
  return performance.now() - t0;
}

// --- Orientation search
const big = makePart(200_000);
const bigSoup = soupFromSolid(big);
big.delete();
const triCount = bigSoup.positions.length / 9;
await searchOrientations(bigSoup, { printers }); // warm-up (JIT)
const runs: number[] = [];
let result = await searchOrientations(bigSoup, { printers });
for (let i = 0; i < 3; i++) {
  const t0 = performance.now();
  result = await searchOrientations(bigSoup, { printers });
  runs.push(ms(t0));
}
runs.sort((a, b) => a - b);
const searchMs = runs[1]!;

// Side by side: the height field for every direction, as a naive search would do.
const mesh = weld(bigSoup);
const t1 = performance.now();
const sample = 8;
for (let i = 0; i < sample; i++) {
  const rot = rotationForDown([Math.sin(i), Math.cos(i), -0.5]);
  supportVolumeHeightField(rotatePoints(mesh.vertices, rot.matrix), mesh.indices, { cellSize: 0.5, sinTheta: Math.SQRT1_2 });
}
const perField = ms(t1) / sample;

console.log(`orientation search: ${triCount} triangles, ${result.directionsEvaluated} directions`);
console.log(`  median of 3 runs: ${searchMs.toFixed(0)} ms (goal ≤ 2000 ms, ${(searchMs / 2000).toFixed(2)} of goal)`);
console.log(`  one height field: ${perField.toFixed(1)} ms; for every direction it would take ~${((perField * result.directionsEvaluated) / 1000).toFixed(1)} s, ` +
  `${((perField * result.directionsEvaluated) / searchMs).toFixed(1)}× the two-stage search`);
const best = result.candidates[0]!;
console.log(`  best: down [${best.down.map((x) => x.toFixed(3)).join(", ")}] support ${best.supportVolume.toFixed(0)} mm³, height ${best.height.toFixed(1)} mm; file's own: support ${result.original.supportVolume.toFixed(0)} mm³`);

// --- Split search
const mid = makePart(100_000);
const midSoup = soupFromSolid(mid);
mid.delete();
const t2 = performance.now();
const plan = await planSplits(wasm, midSoup, { printers, maxPlanes: 20 });
const splitMs = ms(t2);
console.log(`split search: ${midSoup.positions.length / 9} triangles, ${plan.planesScreened} planes screened, ${plan.planesCut} cut with manifold-3d and evaluated`);
console.log(`  ${splitMs.toFixed(0)} ms (goal ≤ 10000 ms, ${(splitMs / 10000).toFixed(2)} of goal)`);
const top = plan.candidates[0];
if (top) {
  console.log(`  best cut: ${top.planes.map((p) => `${p.kind} n=[${p.normal.map((x) => x.toFixed(2))}] d=${p.offset.toFixed(1)}`).join("; ")}, ` +
    `${top.pieces.length} pieces, support ${top.supportBefore.toFixed(0)} → ${top.supportAfter.toFixed(0)} mm³, glue face ${top.cutArea.toFixed(0)} mm²`);
}
