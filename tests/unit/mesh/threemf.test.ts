import { strToU8, zipSync } from "fflate";
import { describe, expect, it } from "vitest";
import { analyzeBytes, isMeshReadError, readMesh, UNIT_MM, write3mf, type MeshReadErrorCode } from "@/lib/mesh";
import { box, cube } from "@/tests/fixtures/meshes";
import { sharedMesh } from "./helpers";

const NS = "http://schemas.microsoft.com/3dmanufacturing/core/2015/02";
const RELS = `<?xml version="1.0"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Target="/3D/m.model" Id="r" Type="http://schemas.microsoft.com/3dmanufacturing/2013/01/3dmodel"/></Relationships>`;
const CUBE1 = `<object id="1" type="model"><mesh><vertices>${[[0,0,0],[1,0,0],[1,1,0],[0,1,0],[0,0,1],[1,0,1],[1,1,1],[0,1,1]].map(([x,y,z]) => `<vertex x="${x}" y="${y}" z="${z}"/>`).join("")}</vertices><triangles>${[[0,2,1],[0,3,2],[4,5,6],[4,6,7],[0,1,5],[0,5,4],[1,2,6],[1,6,5],[2,3,7],[2,7,6],[3,0,4],[3,4,7]].map(([a,b,c]) => `<triangle v1="${a}" v2="${b}" v3="${c}"/>`).join("")}</triangles></mesh></object>`;

function pkg(model: string, rels = RELS, path = "3D/m.model"): Uint8Array {
  return zipSync({ "_rels/.rels": strToU8(rels), [path]: strToU8(model) });
}
const model = (body: string, unit = "millimeter") => `<?xml version="1.0" encoding="UTF-8"?><model unit="${unit}" xmlns="${NS}"><resources>${body}</resources>`;

function code(f: () => unknown): MeshReadErrorCode | "none" {
  try { f(); return "none"; } catch (e) { if (isMeshReadError(e)) return e.code; throw e; }
}

describe("3MF reading (3MF Core Specification v1.3.0)", () => {
  it("box.3mf (3MF Consortium sample): 10 × 20 × 30 mm, volume 6000 mm³, area 2200 mm²", () => {
    const r = analyzeBytes(sharedMesh("3mf-samples/examples/core/box.3mf"));
    expect(r.format).toBe("3mf");
    expect(r.analysis.volume).toBeCloseTo(6000, 6);
    expect(r.analysis.area).toBeCloseTo(2200, 6);
    expect(r.analysis.topology.watertight).toBe(true);
  });

  it("converts every unit of the spec's table to millimetres (§3.4.1)", () => {
    const table = { micron: 0.001, millimeter: 1, centimeter: 10, inch: 25.4, foot: 304.8, meter: 1000 };
    expect(UNIT_MM).toEqual(table);
    for (const [unit, mm] of Object.entries(table)) {
      const r = analyzeBytes(pkg(model(CUBE1, unit) + `<build><item objectid="1"/></build></model>`)).analysis;
      expect(r.volume / mm ** 3).toBeCloseTo(1, 5);
    }
    expect(code(() => readMesh(pkg(model(CUBE1, "furlong") + `<build><item objectid="1"/></build></model>`)))).toBe("BAD_UNIT");
  });

  it("applies x' = m00·x + m10·y + m20·z + m30 and a component's transform before its parent's", () => {
    // Component: scale x by 2. Item: rotate 90° about Z (x→y, y→−x), then translate (10, 0, 0).
    // Unit cube → component → [0,2]×[0,1]×[0,1] → rotate → [−1,0]×[0,2] → translate → x ∈ [9,10], y ∈ [0,2].
    const body = CUBE1 + `<object id="2" type="model"><components><component objectid="1" transform="2 0 0 0 1 0 0 0 1 0 0 0"/></components></object>`;
    const xml = model(body) + `<build><item objectid="2" transform="0 1 0 -1 0 0 0 0 1 10 0 0"/></build></model>`;
    const r = analyzeBytes(pkg(xml)).analysis;
    expect(r.bbox.min).toEqual([9, 0, 0]);
    expect(r.bbox.max).toEqual([10, 2, 1]);
    expect(r.volume).toBeCloseTo(2, 9);
  });

  it("finds the model part through _rels/.rels, not a fixed path", () => {
    const rels = RELS.replace("/3D/m.model", "/parts/elsewhere.model");
    const r = readMesh(pkg(model(CUBE1) + `<build><item objectid="1"/></build></model>`, rels, "parts/elsewhere.model"));
    expect(r.soup.positions.length).toBe(12 * 9);
  });

  it("writes several named, placed objects and reads them back", () => {
    const bytes = write3mf([
      { name: "bracket & clip", mesh: box(10, 10, 10) },
      { name: "pin", mesh: cube(5), transform: [1, 0, 0, 0, 1, 0, 0, 0, 1, 30, 0, 0] },
    ]);
    const r = readMesh(bytes);
    expect(r.parts!.map((p) => p.name)).toEqual(["bracket & clip", "pin"]);
    expect(r.parts!.map((p) => p.triangleCount)).toEqual([12, 12]);
    const a = analyzeBytes(bytes).analysis;
    expect(a.volume).toBeCloseTo(1125, 6);
    expect(a.bbox.max).toEqual([35, 10, 10]);
  });

  it("refuses bad packages with specific codes", () => {
    const build = `<build><item objectid="1"/></build></model>`;
    expect(code(() => readMesh(zipSync({ "a.txt": strToU8("hello") })))).toBe("NOT_3MF");
    expect(code(() => readMesh(pkg(`<!DOCTYPE m [<!ENTITY a "aaaa">]>` + model(CUBE1) + build)))).toBe("DOCTYPE");
    expect(code(() => readMesh(pkg(model(CUBE1.replace('v3="1"', 'v3="8"')) + build)))).toBe("BAD_INDEX");
    expect(code(() => readMesh(pkg(model(CUBE1.replace('v3="1"', 'v3="-1"')) + build)))).toBe("BAD_INDEX");
    expect(code(() => readMesh(pkg(model(CUBE1.replace('x="1"', 'x="&bogus;"')) + build)))).toBe("NON_FINITE");
    expect(code(() => readMesh(pkg(model(CUBE1.replace('id="1" type', 'id="1" name="&bogus;" type')) + build)))).toBe("BAD_XML");
    expect(code(() => readMesh(pkg(model(CUBE1) + "<build><item objectid='1'/></buildd></model>")))).toBe("BAD_XML");
    expect(code(() => readMesh(pkg(model(CUBE1) + `<build><item objectid="7"/></build></model>`)))).toBe("BAD_MODEL");
    const loop = `<object id="5"><components><component objectid="6"/></components></object><object id="6"><components><component objectid="5"/></components></object>`;
    expect(code(() => readMesh(pkg(model(loop) + `<build><item objectid="5"/></build></model>`)))).toBe("BAD_MODEL");
    const good = pkg(model(CUBE1) + build);
    expect(code(() => readMesh(good.subarray(0, good.length - 30)))).toBe("BAD_ZIP");
  });

  it("caps inflated size: a small package that expands hugely is refused before or while inflating", () => {
    const big = new Uint8Array(64 * 1024 * 1024); // 64 MiB of zeros deflates to ~64 KiB
    const bomb = zipSync({ "_rels/.rels": strToU8(RELS), "3D/m.model": big }, { level: 9 });
    expect(bomb.length).toBeLessThan(1024 * 1024);
    expect(code(() => readMesh(bomb, { maxUncompressedBytes: 8 * 1024 * 1024 }))).toBe("ZIP_BOMB");
    // A package that understates the inflated size in its directory is stopped by the running cap.
    const lying = bomb.slice();
    const dv = new DataView(lying.buffer);
    for (let i = lying.length - 22; i >= 0; i--) {
      if (dv.getUint32(i, true) === 0x02014b50 && new TextDecoder().decode(lying.subarray(i + 46, i + 56)) === "3D/m.model") dv.setUint32(i + 24, 1000, true);
    }
    expect(code(() => readMesh(lying, { maxUncompressedBytes: 8 * 1024 * 1024 }))).toBe("ZIP_BOMB");
  });
});
