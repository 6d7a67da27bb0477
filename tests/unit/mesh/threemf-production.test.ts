import { strToU8, unzipSync, zipSync } from "fflate";
import { describe, expect, it } from "vitest";
import { analyzeBytes, isMeshReadError, readMesh, type MeshReadErrorCode } from "@/lib/mesh";
import { sharedMesh } from "./helpers";

// Multi-part packages of the 3MF Production Extension (v1.1.2, 3MF Consortium): the root model part
// may name objects in other model parts with the `p:path` attribute on build items and on components
// (§3.1); those parts are listed in the root part's own relationships (/3D/_rels/….rels, §3.3);
// only the root may use p:path (§2). Core rules (3MF Core Specification v1.3.0): units §3.4.1,
// x' = m00·x + m10·y + m20·z + m30, a component's transform before its parent's.
const CORE = "http://schemas.microsoft.com/3dmanufacturing/core/2015/02";
const PROD = "http://schemas.microsoft.com/3dmanufacturing/production/2015/06";
const REL_TYPE = "http://schemas.microsoft.com/3dmanufacturing/2013/01/3dmodel";
const rels = (...targets: string[]) =>
  `<?xml version="1.0"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">${targets.map((t, i) => `<Relationship Target="${t}" Id="r${i}" Type="${REL_TYPE}"/>`).join("")}</Relationships>`;

/** An axis-aligned box [0,a]×[0,b]×[0,c] as a 3MF mesh object, outward counter-clockwise triangles. */
function boxObject(id: number, a: number, b: number, c: number, prefix = ""): string {
  const v = [[0, 0, 0], [a, 0, 0], [a, b, 0], [0, b, 0], [0, 0, c], [a, 0, c], [a, b, c], [0, b, c]];
  const t = [[0, 2, 1], [0, 3, 2], [4, 5, 6], [4, 6, 7], [0, 1, 5], [0, 5, 4], [1, 2, 6], [1, 6, 5], [2, 3, 7], [2, 7, 6], [3, 0, 4], [3, 4, 7]];
  const p = prefix;
  return `<${p}object id="${id}" type="model"><${p}mesh><${p}vertices>${v.map(([x, y, z]) => `<${p}vertex x="${x}" y="${y}" z="${z}"/>`).join("")}</${p}vertices><${p}triangles>${t.map(([i, j, k]) => `<${p}triangle v1="${i}" v2="${j}" v3="${k}"/>`).join("")}</${p}triangles></${p}mesh></${p}object>`;
}
const part = (body: string, unit = "millimeter", build = "<build/>") =>
  `<?xml version="1.0" encoding="UTF-8"?><model unit="${unit}" xmlns="${CORE}" xmlns:p="${PROD}"><resources>${body}</resources>${build}</model>`;

function pkg(files: Record<string, string>): Uint8Array {
  return zipSync(Object.fromEntries(Object.entries(files).map(([k, v]) => [k, strToU8(v)])));
}

function code(f: () => unknown): MeshReadErrorCode | "none" {
  try { f(); return "none"; } catch (e) { if (isMeshReadError(e)) return e.code; throw e; }
}

// Root: object 10 = components [a 2×3×4 box from /3D/Objects/a.model moved +20 x, its own 1 mm cube];
// build: item 10 as is, and item (p:path b.model, object 7: a 5 mm cube) moved +50 y.
const ROOT = part(
  boxObject(2, 1, 1, 1) +
    `<object id="10" type="model"><components><component p:path="/3D/Objects/a.model" objectid="1" transform="1 0 0 0 1 0 0 0 1 20 0 0"/><component objectid="2"/></components></object>`,
  "millimeter",
  `<build><item objectid="10"/><item p:path="/3D/Objects/b.model" objectid="7" transform="1 0 0 0 1 0 0 0 1 0 50 0"/></build>`,
);
const FILES = {
  "_rels/.rels": rels("/3D/3dmodel.model"),
  "3D/_rels/3dmodel.model.rels": rels("/3D/Objects/a.model", "/3D/Objects/b.model"),
  "3D/3dmodel.model": ROOT,
  "3D/Objects/a.model": part(boxObject(1, 2, 3, 4)),
  // A child part's build is ignored (§2): this item must not be printed.
  "3D/Objects/b.model": part(boxObject(7, 5, 5, 5), "millimeter", `<build><item objectid="7"/></build>`),
};

describe("3MF Production Extension: objects in other model parts", () => {
  it("reads objects through p:path on components and build items, transforms composed (volumes and box by hand)", () => {
    const r = readMesh(pkg(FILES));
    expect(r.parts!.map((p) => p.triangleCount)).toEqual([24, 12]);
    const a = analyzeBytes(pkg(FILES)).analysis;
    expect(a.triangles).toBe(36);
    expect(a.volume).toBeCloseTo(2 * 3 * 4 + 1 + 125, 9); // 150 mm³
    expect(a.area).toBeCloseTo(2 * (6 + 12 + 8) + 6 + 6 * 25, 9); // 208 mm²
    // The 2×3×4 box sits at x 20…22; the 5 mm cube at y 50…55.
    expect(a.bbox.min).toEqual([0, 0, 0]);
    expect(a.bbox.max).toEqual([22, 55, 5]);
  });

  it("applies each part's own unit (a child part in centimetres), with a warning", () => {
    const files = { ...FILES, "3D/Objects/b.model": part(boxObject(7, 0.5, 0.5, 0.5), "centimeter") };
    const r = readMesh(pkg(files));
    expect(r.warnings.join(" ")).toMatch(/'\/3D\/Objects\/b.model' is in centimeters/);
    expect(analyzeBytes(pkg(files)).analysis.volume).toBeCloseTo(150, 6);
  });

  it("a missing part is a clear error naming it", () => {
    const files: Record<string, string> = { ...FILES };
    delete files["3D/Objects/a.model"];
    try {
      readMesh(pkg(files));
      expect.unreachable();
    } catch (e) {
      expect(isMeshReadError(e) && e.code).toBe("MISSING_PART");
      expect((e as Error).message).toMatch(/object 1 .*'\/3D\/Objects\/a.model', which is not in the package/);
    }
  });

  it("an object missing from an existing part names the part; p:path outside the root is refused (§2)", () => {
    const wrongId = { ...FILES, "3D/Objects/a.model": part(boxObject(4, 2, 3, 4)) };
    expect(() => readMesh(pkg(wrongId))).toThrow(/object 1 in the model part '\/3D\/Objects\/a.model', which is not defined/);
    const nested = { ...FILES, "3D/Objects/a.model": part(`<object id="1"><components><component p:path="/3D/Objects/b.model" objectid="7"/></components></object>`) };
    expect(code(() => readMesh(pkg(nested)))).toBe("BAD_MODEL");
  });
});

describe("component nesting", () => {
  it("a chain of components deeper than 256 is a clear error, not a stack overflow", () => {
    let objs = boxObject(1, 1, 1, 1);
    for (let i = 2; i <= 2000; i++) objs += `<object id="${i}"><components><component objectid="${i - 1}"/></components></object>`;
    const files = { "_rels/.rels": rels("/3D/3dmodel.model"), "3D/3dmodel.model": part(objs, "millimeter", `<build><item objectid="2000"/></build>`) };
    expect(() => readMesh(pkg(files))).toThrow(/components nested more than 256 deep/);
    // 200 levels read.
    const ok = { ...files, "3D/3dmodel.model": part(objs, "millimeter", `<build><item objectid="200"/></build>`) };
    expect(readMesh(pkg(ok)).soup.positions.length).toBe(12 * 9);
  });
});

describe("the byte-level mesh loop reads what the general XML path reads", () => {
  // With the core namespace bound to a prefix (m:vertex), every element goes through the general
  // scanner; unprefixed, through the fast loop. Both must give the same soup, bit for bit.
  const prefixed = (xml: string) =>
    xml
      .replace(/xmlns="http:\/\/schemas.microsoft.com\/3dmanufacturing\/core\/2015\/02"/, `xmlns:m="${CORE}"`)
      .replace(/<(\/?)(?!\?)([A-Za-z][\w]*)(?=[\s/>])/g, (m, slash: string, name: string) => (name.includes(":") ? m : `<${slash}m:${name}`));
  it.each(["3mf-samples/examples/core/box.3mf", "3mf-samples/examples/core/multiple_cylinders.3mf"])("%s (3MF Consortium sample)", (f) => {
    const bytes = sharedMesh(f);
    const files = unzipSync(bytes);
    const name = Object.keys(files).find((k) => k.endsWith(".model"))!;
    const xml = new TextDecoder().decode(files[name]);
    expect(xml).toMatch(/<vertex /);
    const slow = zipSync({ ...files, [name]: strToU8(prefixed(xml)) });
    expect(new TextDecoder().decode(unzipSync(slow)[name]).includes("<m:vertex ")).toBe(true);
    expect(readMesh(bytes).soup.positions).toEqual(readMesh(slow).soup.positions);
  });

  it("odd but valid forms (attribute order, single quotes, spacing, exponents, extra attributes) read alike", () => {
    const odd = `<object id="1"><mesh><vertices>
      <vertex z="0" y='0' x="0"/><vertex  x = "1e1" y="0" z="0" />
      <vertex x="0" y="10.000" z="0"/>\t<vertex x="-0" y="0" z="+10"/>
      </vertices><triangles><triangle v3="1" v2="2" v1="0"/><triangle v1="0" v2="1" v3="3" pid="1" p1="0"/>
      <triangle v1="1" v2="2" v3="3"/><triangle v1='0' v2='3' v3='2'/></triangles></mesh></object>`;
    const xml = part(odd, "millimeter", `<build><item objectid="1"/></build>`);
    const files = { "_rels/.rels": rels("/3D/3dmodel.model"), "3D/3dmodel.model": xml };
    const fast = readMesh(pkg(files));
    const slow = readMesh(pkg({ ...files, "3D/3dmodel.model": prefixed(xml) }));
    expect(fast.soup.positions).toEqual(slow.soup.positions);
    expect(analyzeBytes(pkg(files)).analysis.volume).toBeCloseTo(1000 / 6, 9); // right tetrahedron, legs 10
  });
});
