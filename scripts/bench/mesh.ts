// Benchmark (not a test): npm run bench:mesh. Times three's STLLoader.parse against our single-pass
// and full analyses on the same generated 1,000,000-triangle binary STL, alternating, in one run;
// peak memory of each is measured once in a fresh child process (maxRSS above the loaded file).
import { execFileSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { STLLoader } from "three/examples/jsm/loaders/STLLoader.js";
import { nodeInflateRaw } from "@/lib/mesh-node/inflate";
import { analyzeBytes, analyzeStlBinaryFull, analyzeStlFast, sharedWorkspace, write3mf, writeStl } from "@/lib/mesh";

type Variant = "stlloader" | "ours" | "full" | "threemf" | "cold";
/** The four the goals compare, alternated; "cold" is timed after them (dropping the kept memory
 * in between would hand its freeing to whichever variant runs next). "threemf" is the same mesh
 * as a 3MF package, read and fully analysed. */
const VARIANTS: Variant[] = ["stlloader", "ours", "full", "threemf"];
const ALL: Variant[] = [...VARIANTS, "cold"];
let threeMf: Uint8Array = new Uint8Array(0);

/** The file as STLLoader takes it (an ArrayBuffer of its own, as a worker receives a transferred file). */
const asArrayBuffer = (b: Uint8Array) => b.buffer.slice(b.byteOffset, b.byteOffset + b.byteLength) as ArrayBuffer;

function run(v: Variant, bytes: Uint8Array, ab: ArrayBuffer): number {
  if (v === "stlloader") {
    const t0 = performance.now();
    const g = new STLLoader().parse(ab);
    const dt = performance.now() - t0;
    if (g.getAttribute("position").count !== 3_000_000) throw new Error("STLLoader read a different mesh");
    return dt;
  }
  if (v === "threemf") {
    const t0 = performance.now();
    const r = analyzeBytes(threeMf, { inflateRaw: nodeInflateRaw });
    const dt = performance.now() - t0;
    if (r.analysis.triangles !== 1_000_000) throw new Error("3MF read a different mesh");
    return dt;
  }
  // "cold": the full analysis with no working memory kept from an earlier analysis (a first file).
  if (v === "cold") sharedWorkspace.drop();
  const t0 = performance.now();
  const r = v === "ours" ? analyzeStlFast(bytes) : analyzeStlBinaryFull(bytes);
  const dt = performance.now() - t0;
  if (!r || r.triangles !== 1_000_000) throw new Error("analysis read a different mesh");
  return dt;
}

/** UV sphere of radius 50 mm: 1000 meridians × 501 rings = 1,000,000 triangles, closed. */
function sphereSoup(segments = 1000, rings = 501, r = 50): Float32Array {
  const out = new Float32Array(segments * (2 * rings - 2) * 9);
  let o = 0;
  const v = (i: number, j: number, q: number) => {
    const phi = (Math.PI * i) / rings, th = (2 * Math.PI * (j % segments)) / segments;
    out[q] = i === 0 || i === rings ? 0 : r * Math.sin(phi) * Math.cos(th);
    out[q + 1] = i === 0 || i === rings ? 0 : r * Math.sin(phi) * Math.sin(th);
    out[q + 2] = r - r * Math.cos(phi);
  };
  for (let i = 0; i < rings; i++)
    for (let j = 0; j < segments; j++) {
      if (i > 0) { v(i, j, o); v(i, j + 1, o + 3); v(i + 1, j + 1, o + 6); o += 9; }
      if (i < rings - 1) { v(i, j, o); v(i + 1, j + 1, o + 3); v(i + 1, j, o + 6); o += 9; }
    }
  return out;
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[xs.length >> 1]!;
const mb = (n: number) => n / (1024 * 1024);

if (process.argv[2] === "--mem") {
  // Child: load the file (no copy; STLLoader gets its ArrayBuffer before the mark), then run one
  // variant once and report the peak RSS above that point.
  const v = process.argv[3] as Variant;
  const buf = readFileSync(process.argv[4]!);
  const bytes = new Uint8Array(buf.buffer, buf.byteOffset, buf.byteLength);
  if (v === "threemf") threeMf = new Uint8Array(readFileSync(process.argv[5]!));
  const ab = v === "stlloader" ? asArrayBuffer(bytes) : new ArrayBuffer(0);
  const before = process.memoryUsage().rss;
  run(v, bytes, ab);
  process.stdout.write(String(process.resourceUsage().maxRSS * 1024 - before));
  process.exit(0);
}

const dir = mkdtempSync(join(tmpdir(), "mesh-bench-"));
try {
  const soup = sphereSoup();
  const bytes = writeStl({ positions: soup });
  const file = join(dir, "sphere.stl");
  writeFileSync(file, bytes);
  const size = bytes.length;
  threeMf = write3mf([{ name: "sphere", mesh: { positions: soup } }]);
  const file3mf = join(dir, "sphere.3mf");
  writeFileSync(file3mf, threeMf);
  console.log(`binary STL: 1,000,000 triangles, ${mb(size).toFixed(1)} MB; as 3MF ${mb(threeMf.length).toFixed(1)} MB zipped`);

  const times: Record<Variant, number[]> = { stlloader: [], ours: [], full: [], threemf: [], cold: [] };
  const ab = asArrayBuffer(bytes);
  // Warm-up, not timed: three alternated rounds, so every variant's code has reached the engine's
  // optimising tier (ours takes a few runs: each analysis calls its long loops once) before timing.
  for (let k = 0; k < 3; k++) for (const v of VARIANTS) run(v, bytes, ab);
  const rounds = 9;
  for (let k = 0; k < rounds; k++) for (const v of k % 2 ? [...VARIANTS].reverse() : VARIANTS) times[v].push(run(v, bytes, ab));
  for (let k = 0; k < 5; k++) times.cold.push(run("cold", bytes, ab));
  if (process.env.BENCH_VERBOSE) for (const v of ALL) console.log(v, times[v].map((t) => t.toFixed(0)).join(" "));

  const self = fileURLToPath(import.meta.url);
  const peak: Record<Variant, number> = { stlloader: 0, ours: 0, full: 0, threemf: 0, cold: 0 };
  for (const v of ALL) {
    const out = execFileSync(process.execPath, [...process.execArgv, self, "--mem", v, file, file3mf], { encoding: "utf8" });
    peak[v] = Number(out);
  }
  const label: Record<Variant, string> = { stlloader: "three STLLoader.parse", ours: "ours read+single-pass", full: "ours full analysis", threemf: "3MF read+full analysis", cold: "  same, fresh memory" };
  for (const v of ALL) {
    const m = median(times[v]);
    const fileSize = v === "threemf" ? threeMf.length : size;
    console.log(`${label[v].padEnd(22)} median ${m.toFixed(1).padStart(7)} ms  ${(mb(fileSize) / (m / 1000)).toFixed(0).padStart(5)} MB/s  peak +${mb(peak[v]).toFixed(0)} MB (${(peak[v] / fileSize).toFixed(2)}× file)`);
  }

  // The browser worker has no zlib: the same read with fflate's inflater, for reference.
  const tf: number[] = [];
  for (let k = 0; k < 3; k++) {
    const t0 = performance.now();
    analyzeBytes(threeMf);
    tf.push(performance.now() - t0);
  }
  console.log(`(3MF read+full analysis with fflate's inflater, as in the browser worker: median ${median(tf).toFixed(0)} ms, ${(median(tf) / median(times.full)).toFixed(2)}× the STL full analysis)`);
  console.log(`(full analysis keeps its working memory between files, as the worker and server do; a first file: ratio stlloader/full-fresh: ${(median(times.stlloader) / median(times.cold)).toFixed(2)})`);
  console.log(`ratio 3mf/stl-full: ${(median(times.threemf) / median(times.full)).toFixed(2)}`);
  console.log(`ratio stlloader/full: ${(median(times.stlloader) / median(times.full)).toFixed(2)}`);
  console.log(`ratio stlloader/ours: ${(median(times.stlloader) / median(times.ours)).toFixed(2)}`);
} finally {
  rmSync(dir, { recursive: true, force: true });
}
