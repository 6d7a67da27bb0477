// CLI: analyse mesh files (binary/ASCII STL, 3MF, STEP). npm run -s analyze -- FILE... [--up x,y,z] [--overhang-deg 45] [--units mm|in] [--json]
import { readFileSync } from "node:fs";
import { analyzeFile } from "@/lib/mesh-node/step";
import { analysisToJson, isMeshReadError, type AnalysisJson, type ErrorJson, type StlUnits, type Vec3 } from "@/lib/mesh";

function usage(msg?: string): never {
  if (msg) process.stderr.write(`analyze: ${msg}\n`);
  process.stderr.write("usage: analyze FILE... [--up x,y,z] [--overhang-deg 45] [--units mm|in] [--json]\n");
  process.exit(2);
}

const files: string[] = [];
let up: Vec3 = [0, 0, 1];
let overhangDeg = 45;
let units: StlUnits = "mm";
let json = false;
const args = process.argv.slice(2);
for (let i = 0; i < args.length; i++) {
  const a = args[i]!;
  const value = () => args[++i] ?? usage(`${a} needs a value`);
  if (a === "--json") json = true;
  else if (a === "--up") {
    const v = value().split(",").map(Number);
    if (v.length !== 3 || v.some((x) => !Number.isFinite(x)) || v.every((x) => x === 0)) usage("--up wants three numbers, e.g. 0,0,1");
    up = v as Vec3;
  } else if (a === "--overhang-deg") {
    overhangDeg = Number(value());
    if (!(overhangDeg >= 0 && overhangDeg <= 90)) usage("--overhang-deg wants a number from 0 to 90");
  } else if (a === "--units") {
    const u = value();
    if (u !== "mm" && u !== "in") usage("--units wants mm or in");
    units = u;
  } else if (a.startsWith("--")) usage(`unknown option ${a}`);
  else files.push(a);
}
if (files.length === 0) usage("no files given");

const rows: (AnalysisJson | ErrorJson)[] = [];
let failed = false;
for (const file of files) {
  let row: AnalysisJson | ErrorJson;
  try {
    const bytes = new Uint8Array(readFileSync(file));
    const r = await analyzeFile(bytes, { filename: file, units, up, overhangDeg });
    row = analysisToJson(file, r.format, r.analysis);
  } catch (e) {
    failed = true;
    const code = isMeshReadError(e) ? e.code : (e as NodeJS.ErrnoException).code ?? "ERROR";
    row = { file, error: e instanceof Error ? e.message : String(e), code };
  }
  rows.push(row);
  if (json) process.stdout.write(JSON.stringify(row) + "\n");
}

if (!json) {
  const f = (x: number, d = 2) => x.toFixed(d);
  for (const r of rows) {
    if ("error" in r) {
      process.stdout.write(`${r.file}\n  error (${r.code}): ${r.error}\n\n`);
      continue;
    }
    const lines: [string, string][] = [
      ["format", r.format],
      ["triangles / vertices", `${r.triangles} / ${r.vertices}`],
      ["size (mm)", r.size.map((x) => f(x)).join(" × ")],
      ["bbox min / max", `${r.bbox.min.map((x) => f(x)).join(", ")} / ${r.bbox.max.map((x) => f(x)).join(", ")}`],
      ["volume (mm³)", `${f(r.volume_mm3)}${r.volume_reliable ? "" : "  (unreliable: mesh is not closed and consistently wound)"}`],
      ["surface area (mm²)", f(r.area_mm2)],
      [`overhang > ${r.overhang_deg}° (mm²)`, f(r.overhang_area_mm2)],
      ["bed contact (mm²)", f(r.bed_contact_area_mm2)],
      ["footprint hull / rect (mm²)", `${f(r.footprint_area_mm2)} / ${f(r.footprint_rect_mm[0] * r.footprint_rect_mm[1])}`],
      ["watertight", r.watertight ? "yes" : "no"],
      ["boundary / non-manifold / flipped edges", `${r.boundary_edges} / ${r.nonmanifold_edges} / ${r.inconsistent_edges}`],
      ["degenerate triangles", String(r.degenerate_triangles)],
    ];
    const w = Math.max(...lines.map(([k]) => k.length));
    process.stdout.write(`${r.file}\n${lines.map(([k, v]) => `  ${k.padEnd(w)}  ${v}`).join("\n")}\n\n`);
  }
}
process.exit(failed ? 1 : 0);
