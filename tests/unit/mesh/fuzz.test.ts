import { readFileSync } from "node:fs";
import { resolve } from "node:path";
import { strToU8, zipSync } from "fflate";
import { describe, expect, it } from "vitest";
import { analyzeBytes, analyzeStlFast, isMeshReadError, readMesh, write3mf, writeStl } from "@/lib/mesh";
import { analyzeFile } from "@/lib/mesh-node/step";
import { asciiStl, cube, prng, tetrahedron } from "@/tests/fixtures/meshes";
import { boxSolid, cylinderSolid, stepFile } from "@/tests/fixtures/step";
import { REPO_ROOT } from "./helpers";

/**
 * Fuzzing (common practice, no source): seeded mutations of valid STL (binary and ASCII), 3MF
 * (plain, ZIP64 and data-descriptor packages written by Python's zipfile, a Production Extension
 * package of several model parts) and STEP bytes, plus random junk. Every input must give a result or a MeshReadError with a code and a
 * message: never another exception, never a hang (the suite's time bound catches that).
 */
const rnd = prng(20240611);
const int = (n: number) => Math.floor(rnd() * n);

const CORE = "http://schemas.microsoft.com/3dmanufacturing/core/2015/02";
const PROD = "http://schemas.microsoft.com/3dmanufacturing/production/2015/06";
const REL = (t: string) =>
  `<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Target="${t}" Id="r" Type="http://schemas.microsoft.com/3dmanufacturing/2013/01/3dmodel"/></Relationships>`;
const tet = `<object id="1"><mesh><vertices><vertex x="0" y="0" z="0"/><vertex x="9" y="0" z="0"/><vertex x="0" y="9" z="0"/><vertex x="0" y="0" z="9"/></vertices><triangles><triangle v1="0" v2="2" v3="1"/><triangle v1="0" v2="1" v3="3"/><triangle v1="1" v2="2" v3="3"/><triangle v1="0" v2="3" v3="2"/></triangles></mesh></object>`;
/** A Production Extension package: the root's component and item refer to objects in /3D/o.model. */
const multiPart = zipSync({
  "_rels/.rels": strToU8(REL("/3D/3dmodel.model")),
  "3D/_rels/3dmodel.model.rels": strToU8(REL("/3D/o.model")),
  "3D/3dmodel.model": strToU8(`<model unit="millimeter" xmlns="${CORE}" xmlns:p="${PROD}"><resources><object id="5"><components><component p:path="/3D/o.model" objectid="1" transform="1 0 0 0 1 0 0 0 1 20 0 0"/></components></object></resources><build><item objectid="5"/><item p:path="/3D/o.model" objectid="1"/></build></model>`),
  "3D/o.model": strToU8(`<model unit="centimeter" xmlns="${CORE}"><resources>${tet}</resources><build/></model>`),
}, { level: 1 });
const zipFixture = (name: string) => new Uint8Array(readFileSync(resolve(REPO_ROOT, "tests/fixtures/zip", name)));

const seeds: Uint8Array[] = [
  writeStl(tetrahedron(3)),
  writeStl(cube(2)),
  new TextEncoder().encode(asciiStl(tetrahedron(2))),
  write3mf([{ name: "t", mesh: tetrahedron(2) }], { level: 1 }),
  write3mf([{ mesh: cube(1) }], { level: 0 }),
  zipFixture("cube-zip64.3mf"),
  zipFixture("cube-descriptor.3mf"),
  multiPart,
];

function mutate(src: Uint8Array): Uint8Array {
  let b = src.slice();
  const ops = 1 + int(4);
  for (let k = 0; k < ops; k++) {
    switch (int(7)) {
      case 0: b[int(b.length)] = int(256); break; // flip a byte
      case 1: b = b.slice(0, int(b.length + 1)); break; // truncate
      case 2: { const dv = new DataView(b.buffer, b.byteOffset, b.byteLength); if (b.length >= 84) dv.setUint32(80, [0, 1, 0xffffffff, int(1e6)][int(4)]!, true); break; } // lie about the count
      case 3: { if (b.length >= 132) new DataView(b.buffer, b.byteOffset, b.byteLength).setFloat32(84 + 12 + 4 * int(9), [NaN, Infinity, -Infinity, 3e38][int(4)]!, true); break; }
      case 4: { const extra = new Uint8Array(int(64)).map(() => int(256)); const n = new Uint8Array(b.length + extra.length); n.set(b); n.set(extra, b.length); b = n; break; }
      case 5: { const i = int(b.length), j = int(b.length); b.copyWithin(i, j, j + int(32)); break; }
      default: { const n = new Uint8Array(b.length); for (let i = 0; i < n.length; i++) n[i] = b[(i + 7) % b.length]!; b = int(2) ? n : b; }
    }
  }
  return b;
}

function junk(): Uint8Array {
  const n = int(4) === 0 ? int(90) : int(600);
  const b = new Uint8Array(n).map(() => int(256));
  if (n > 5 && int(3) === 0) b.set(new TextEncoder().encode("solid"), 0);
  if (n > 4 && int(4) === 0) b.set([0x50, 0x4b, 3, 4], 0);
  return b;
}

describe("fuzz: 10,000 mutated and random inputs through every reader", () => {
  it("each returns a result or a clear MeshReadError", () => {
    const codes = new Map<string, number>();
    let ok = 0;
    const t0 = performance.now();
    for (let i = 0; i < 10_000; i++) {
      const input = i % 5 === 4 ? junk() : mutate(seeds[i % seeds.length]!);
      for (const run of [() => readMesh(input, { maxUncompressedBytes: 1 << 20 }), () => analyzeBytes(input, { maxUncompressedBytes: 1 << 20 }), () => analyzeStlFast(input, { maxUncompressedBytes: 1 << 20 })]) {
        try {
          run();
          ok++;
        } catch (e) {
          if (!isMeshReadError(e)) throw new Error(`input ${i} threw a non-MeshReadError: ${String(e)}`);
          expect(e.message.length).toBeGreaterThan(10);
          codes.set(e.code, (codes.get(e.code) ?? 0) + 1);
        }
      }
    }
    expect(performance.now() - t0).toBeLessThan(30_000);
    expect(ok).toBeGreaterThan(0);
    // The mutations reach many distinct failure paths, not one catch-all.
    expect(codes.size).toBeGreaterThanOrEqual(6);
  });

  it("the ZIP64, descriptor and multi-part seeds read before mutation (so their mutations reach the new paths)", () => {
    for (const s of seeds.slice(5)) expect(readMesh(s).soup.positions.length).toBeGreaterThan(0);
  });

  it("an empty file, zero triangles and a huge declared count have their own messages", () => {
    const c = (b: Uint8Array) => { try { readMesh(b); return "none"; } catch (e) { return isMeshReadError(e) ? e.code : "other"; } };
    expect(c(new Uint8Array(0))).toBe("EMPTY");
    const zero = new Uint8Array(84);
    expect(c(zero)).toBe("NO_TRIANGLES");
    const huge = writeStl(cube(1));
    new DataView(huge.buffer).setUint32(80, 0xffffffff, true);
    huge[0] = 200; // binary-looking header
    expect(c(huge)).toBe("TRUNCATED");
    expect(c(new TextEncoder().encode("hello world, this is not a mesh at all, just some text ".repeat(3)))).toBe("UNKNOWN_FORMAT");
  });
});

describe("fuzz: mutated STEP text through the tessellator", () => {
  // Mutations that keep the file's structure mostly intact reach deep into the STEP reader; each
  // must give a result or a MeshReadError (BAD_STEP, NO_SOLIDS, …), never a crash of the process.
  const base = stepFile("mm", (w) => [boxSolid(w, 10, 20, 5), cylinderSolid(w, 3, 8, [20, 0, 0])]);
  const lines = base.split("\n");
  const stepRnd = prng(77);
  const pick = (n: number) => Math.floor(stepRnd() * n);
  function mutateStep(): string {
    const l = lines.slice();
    for (let k = 1 + pick(3); k > 0; k--) {
      const i = 7 + pick(l.length - 10); // inside DATA
      switch (pick(6)) {
        case 0: l.splice(i, 1); break; // drop an instance
        case 1: l[i] = l[i]!.replace(/#\d+/, `#${pick(400)}`); break; // a reference to elsewhere (or nowhere)
        case 2: l[i] = l[i]!.replace(/-?\d+\./, `${pick(2) ? "-" : ""}${pick(1e6)}.`); break; // a number changed
        case 3: l[i] = l[i]!.slice(0, pick(l[i]!.length)); break; // cut mid-instance
        case 4: l[i] = l[i]!.replace(/\.T\./, ".F."); break; // flip an orientation
        default: l.splice(i, 0, l[pick(l.length)]!); // a duplicated instance
      }
    }
    return l.join("\n");
  }
  it("200 mutated files: each a result or a clear error", async () => {
    const codes = new Map<string, number>();
    const t0 = performance.now();
    for (let i = 0; i < 200; i++) {
      const input = new TextEncoder().encode(mutateStep());
      try {
        const r = await analyzeFile(input, { stepTimeLimitMs: 5000 });
        expect(r.format).toBe("step");
        codes.set("ok", (codes.get("ok") ?? 0) + 1);
      } catch (e) {
        if (!isMeshReadError(e)) throw new Error(`STEP input ${i} threw a non-MeshReadError: ${String(e)}`);
        expect(e.message.length).toBeGreaterThan(10);
        codes.set(e.code, (codes.get(e.code) ?? 0) + 1);
      }
    }
    expect(performance.now() - t0).toBeLessThan(100_000);
    expect(codes.get("ok")).toBeGreaterThan(0);
    expect(codes.size).toBeGreaterThanOrEqual(2);
  }, 120_000);
});
