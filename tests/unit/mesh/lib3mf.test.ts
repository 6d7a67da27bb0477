import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { strToU8, zipSync } from "fflate";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { analyzeBytes, write3mf } from "@/lib/mesh";
import { box, uvSphere } from "@/tests/fixtures/meshes";
import { REPO_ROOT, sharedMesh } from "./helpers";

// A second reader: the 3MF Consortium's reference library, lib3mf (Debian's lib3mf-dev, 1.8), through
// the small C++ program tests/tools/lib3mf-read.cpp compiled here with g++. For every 3MF test file,
// our triangles, volume, area and bounding box must equal its reading (it keeps vertices and
// transforms in float32, so to 1e-6 relative). Skipped with a message where g++ or lib3mf is missing.
const HEADER = "/usr/include/lib3mf/Model/COM/NMR_DLLInterfaces.h";
const hasGpp = spawnSync("g++", ["--version"]).status === 0;
const available = hasGpp && existsSync(HEADER);
if (!available) console.warn(`lib3mf cross-check skipped: ${hasGpp ? `${HEADER} is missing` : "g++ is missing"} (apt-get install -y lib3mf-dev g++)`);

const CORE = "http://schemas.microsoft.com/3dmanufacturing/core/2015/02";
const PROD = "http://schemas.microsoft.com/3dmanufacturing/production/2015/06";
const TYPES = '<?xml version="1.0" encoding="UTF-8"?><Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types"><Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/><Default Extension="model" ContentType="application/vnd.ms-package.3dmanufacturing-3dmodel+xml"/></Types>';
const rels = (...t: string[]) =>
  `<?xml version="1.0"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">${t.map((x, i) => `<Relationship Target="${x}" Id="r${i}" Type="http://schemas.microsoft.com/3dmanufacturing/2013/01/3dmodel"/>`).join("")}</Relationships>`;
const uuid = (n: number) => `${String(n).repeat(8).slice(0, 8)}-1111-4111-8111-111111111111`;
const tet = (id: number, s: number) =>
  `<object id="${id}" type="model" p:UUID="${uuid(id + 6)}"><mesh><vertices><vertex x="0" y="0" z="0"/><vertex x="${s}" y="0" z="0"/><vertex x="0" y="${s}" z="0"/><vertex x="0" y="0" z="${s}"/></vertices><triangles><triangle v1="0" v2="2" v3="1"/><triangle v1="0" v2="1" v3="3"/><triangle v1="1" v2="2" v3="3"/><triangle v1="0" v2="3" v3="2"/></triangles></mesh></object>`;

/** A Production Extension package (v1.1.2): the root's component and a build item refer to /3D/o.model. */
const production = zipSync({
  "[Content_Types].xml": strToU8(TYPES),
  "_rels/.rels": strToU8(rels("/3D/3dmodel.model")),
  "3D/_rels/3dmodel.model.rels": strToU8(rels("/3D/o.model")),
  "3D/3dmodel.model": strToU8(
    `<?xml version="1.0" encoding="UTF-8"?><model unit="millimeter" xmlns="${CORE}" xmlns:p="${PROD}" requiredextensions="p"><resources><object id="5" type="model" p:UUID="${uuid(1)}"><components><component p:path="/3D/o.model" objectid="1" transform="0 1 0 -1 0 0 0 0 1 20 0 0" p:UUID="${uuid(2)}"/></components></object></resources><build p:UUID="${uuid(3)}"><item objectid="5" p:UUID="${uuid(4)}"/><item p:path="/3D/o.model" objectid="1" transform="1 0 0 0 1 0 0 0 1 0 30 5" p:UUID="${uuid(5)}"/></build></model>`,
  ),
  "3D/o.model": strToU8(`<?xml version="1.0" encoding="UTF-8"?><model unit="millimeter" xmlns="${CORE}" xmlns:p="${PROD}"><resources>${tet(1, 9)}</resources><build/></model>`),
});

const files: [string, () => Uint8Array][] = [
  ["3MF Consortium sample box.3mf", () => sharedMesh("3mf-samples/examples/core/box.3mf")],
  ["3MF Consortium sample multiple_cylinders.3mf", () => sharedMesh("3mf-samples/examples/core/multiple_cylinders.3mf")],
  ["ZIP64 package written by Python's zipfile", () => new Uint8Array(readFileSync(resolve(REPO_ROOT, "tests/fixtures/zip/cube-zip64.3mf")))],
  ["data-descriptor package written by Python's zipfile", () => new Uint8Array(readFileSync(resolve(REPO_ROOT, "tests/fixtures/zip/cube-descriptor.3mf")))],
  ["Production Extension package of two model parts", () => production],
  ["our writer: placed and turned objects", () => write3mf([
    { name: "plate", mesh: box(30, 20, 3) },
    { name: "ball", mesh: uvSphere(24, 12, 6), transform: [0.8660254, 0.5, 0, -0.5, 0.8660254, 0, 0, 0, 1, 40, 10, 6] },
  ])],
];

describe.skipIf(!available)("lib3mf (3MF Consortium reference library) reads what we read", () => {
  let dir = "", exe = "";
  beforeAll(() => {
    dir = mkdtempSync(join(tmpdir(), "lib3mf-"));
    exe = join(dir, "lib3mf-read");
    const cc = spawnSync("g++", ["-std=c++17", "-O1", resolve(REPO_ROOT, "tests/tools/lib3mf-read.cpp"), "-I/usr/include/lib3mf", "-l3MF", "-o", exe], { encoding: "utf8" });
    if (cc.status !== 0) throw new Error(`g++ failed: ${cc.stderr.slice(0, 400)}`);
  }, 60_000);
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it.each(files)("%s", (_name, bytes) => {
    const b = bytes();
    const file = join(dir, "in.3mf");
    writeFileSync(file, b);
    const out = spawnSync(exe, [file], { encoding: "utf8" });
    expect(out.status, out.stdout + out.stderr).toBe(0);
    const ref = JSON.parse(out.stdout) as { triangles: number; volume: number; area: number; min: number[]; max: number[] };
    const ours = analyzeBytes(b).analysis;
    expect(ours.triangles).toBe(ref.triangles);
    expect(Math.abs(ours.volume / ref.volume - 1)).toBeLessThan(1e-6);
    expect(Math.abs(ours.area / ref.area - 1)).toBeLessThan(1e-6);
    const span = Math.max(...ref.max.map((x, i) => x - ref.min[i]!));
    for (let i = 0; i < 3; i++) {
      expect(Math.abs(ours.bbox.min[i]! - ref.min[i]!)).toBeLessThan(1e-6 * span);
      expect(Math.abs(ours.bbox.max[i]! - ref.max[i]!)).toBeLessThan(1e-6 * span);
    }
  });
});
