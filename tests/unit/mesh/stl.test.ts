import { describe, expect, it } from "vitest";
import { STLLoader } from "three/examples/jsm/loaders/STLLoader.js";
import { analyzeBytes, analyzeStlFast, isMeshReadError, passSoup, readMesh, writeStl } from "@/lib/mesh";
import { asciiStl, box, cube, uvSphere } from "@/tests/fixtures/meshes";
import { sharedMesh, toArrayBuffer } from "./helpers";

const loaderPositions = (b: Uint8Array) => new STLLoader().parse(toArrayBuffer(b)).getAttribute("position").array as Float32Array;

describe("binary STL byte layout (STL format description: Burns, Automated Fabrication §6.5; Bourke 1999)", () => {
  it("writes an 80-byte header, a uint32 LE count and 50-byte records of 12 float32 + uint16", () => {
    const soup = box(1, 2, 3, [5, 6, 7]);
    const b = writeStl(soup);
    const dv = new DataView(b.buffer);
    expect(b.length).toBe(84 + 50 * 12);
    expect(dv.getUint32(80, true)).toBe(12);
    for (let t = 0; t < 12; t++) {
      const r = 84 + 50 * t;
      for (let j = 0; j < 9; j++) expect(dv.getFloat32(r + 12 + 4 * j, true)).toBe(soup.positions[9 * t + j]);
      const n = [0, 1, 2].map((k) => dv.getFloat32(r + 4 * k, true));
      expect(Math.hypot(...n)).toBeCloseTo(1, 6); // unit normal
      expect(dv.getUint16(r + 48, true)).toBe(0);
    }
    expect(new TextDecoder().decode(b.subarray(0, 5)).toLowerCase()).not.toBe("solid");
  });

  it("reads a binary file whose header begins with 'solid' by its exact size", () => {
    const b = writeStl(cube(2));
    b.set(new TextEncoder().encode("solid looks like text"), 0);
    const r = readMesh(b);
    expect(r.format).toBe("stl-binary");
    expect(r.soup.positions).toEqual(cube(2).positions);
  });

  it("reads a binary file with a 'solid' header and trailing bytes (size rule 84 + 50·N, then the ASCII grammar)", () => {
    // STL format description (Burns §6.5; Bourke 1999): a binary file is 84 + 50·N bytes; the header is
    // free text, so it may begin with 'solid'. With integer coordinates no record byte is a line break,
    // so a reader that trusts 'solid' and looks for the next line never finds a facet.
    const b = writeStl(cube(2));
    const padded = new Uint8Array(b.length + 3);
    padded.set(b);
    padded.set(new TextEncoder().encode("solid cube exported with a text header"), 0);
    const r = readMesh(padded);
    expect(r.format).toBe("stl-binary");
    expect(r.soup.positions).toEqual(cube(2).positions);
    expect(r.warnings[0]).toMatch(/3 bytes after the last triangle/);
  });

  it("still reads ASCII whose size happens to pass the trailing-bytes rule", () => {
    // A 'solid' text that parses as facets is ASCII even when bytes 80–83 give a count that fits.
    const text = new TextEncoder().encode(asciiStl(cube(1)));
    expect(readMesh(text).format).toBe("stl-ascii");
  });

  it("reads records in place whatever the parity and alignment (odd count, byteOffset 2)", () => {
    const soup = uvSphere(7, 5, 3); // 7·(2·5−2) = 56 triangles; trim to an odd count below
    const odd = { positions: soup.positions.slice(0, 9 * 55) };
    const b = writeStl(odd);
    const shifted = new Uint8Array(b.length + 2);
    shifted.set(b, 2);
    for (const bytes of [b, shifted.subarray(2)]) {
      expect(readMesh(bytes).soup.positions).toEqual(odd.positions);
      const fast = analyzeStlFast(bytes);
      const ref = passSoup(odd);
      expect(fast.triangles).toBe(55);
      expect(fast.area).toBeCloseTo(ref.area, 9);
      expect(fast.volume).toBeCloseTo(ref.volume, 9);
      expect(fast.bbox).toEqual(ref.bbox);
    }
  });

  it("agrees with three's STLLoader on parsed positions (generated mesh)", () => {
    const b = writeStl(uvSphere(20, 10, 4));
    expect(readMesh(b).soup.positions).toEqual(loaderPositions(b));
  });

  it("--units in scales by 25.4 (STL has no units; common practice)", () => {
    const r = analyzeBytes(writeStl(cube(1)), { units: "in" }).analysis;
    expect(Math.abs(r.volume / 25.4 ** 3 - 1)).toBeLessThan(1e-6); // float32 coordinates
  });
});

describe("ASCII STL (solid / facet normal / outer loop / vertex / endloop / endfacet / endsolid)", () => {
  const soup = box(3, 4, 5);
  it.each([
    ["spaces, LF", { ws: " ", eol: "\n" }],
    ["tabs, CRLF, upper case", { ws: "\t", eol: "\r\n", upper: true }],
    ["mixed runs of whitespace", { ws: " \t  ", eol: "\n\n" }],
  ])("%s", (_n, style) => {
    const text = asciiStl(soup, style);
    const r = readMesh(new TextEncoder().encode(text));
    expect(r.format).toBe("stl-ascii");
    expect(r.soup.positions).toEqual(soup.positions);
    // three's STLLoader (0.187) only recognises lower-case 'solid' text; cross-check it where it reads.
    if (!("upper" in style)) expect(loaderPositions(new TextEncoder().encode(text))).toEqual(r.soup.positions);
  });

  it("reads several solid blocks into one soup", () => {
    const text = asciiStl(box(1, 1, 1), { name: "a" }) + asciiStl(box(1, 1, 1, [3, 0, 0]), { name: "b" });
    const r = analyzeBytes(new TextEncoder().encode(text)).analysis;
    expect(r.triangles).toBe(24);
    expect(r.volume).toBeCloseTo(2, 9);
  });

  it("names the line of a malformed facet", () => {
    const text = asciiStl(cube(1)).replace("endloop", "endlop");
    try {
      readMesh(new TextEncoder().encode(text));
      expect.unreachable();
    } catch (e) {
      expect(isMeshReadError(e) && e.code).toBe("BAD_ASCII");
      expect((e as Error).message).toMatch(/line 7: expected 'endloop'/);
    }
  });
});

describe("real files in ../shared/meshes (values and troubles from REFERENCES.md)", () => {
  it("HalfDonut ASCII and binary: volume 2.343149 (numpy-stl tests, MeshLab value, tol 1e-5)", () => {
    const ascii = analyzeBytes(sharedMesh("numpy-stl/tests/stl_ascii/HalfDonut.stl"));
    const bin = analyzeBytes(sharedMesh("numpy-stl/tests/stl_binary/HalfDonut.stl"));
    expect(ascii.format).toBe("stl-ascii"); // ends with upper-case ENDSOLID
    expect(bin.format).toBe("stl-binary"); // 'solid' header and one byte past 84 + 50·N
    expect(bin.warnings[0]).toMatch(/1 bytes after the last triangle/);
    for (const r of [ascii, bin]) {
      expect(r.analysis.volume).toBeCloseTo(2.343149, 5);
      expect(r.analysis.topology.watertight).toBe(true);
    }
  });

  it("StarWithEmptyHeader: volume 1.416599 (numpy-stl tests, MeshLab value)", () => {
    expect(analyzeBytes(sharedMesh("numpy-stl/tests/stl_binary/StarWithEmptyHeader.stl")).analysis.volume).toBeCloseTo(1.416599, 5);
  });

  it("unit_cube.STL: binary with a 'solid' header, a closed unit cube", () => {
    const r = analyzeBytes(sharedMesh("trimesh/models/unit_cube.STL"));
    expect(r.format).toBe("stl-binary");
    expect(r.analysis.volume).toBeCloseTo(1, 6);
    expect(r.analysis.area).toBeCloseTo(6, 6);
    expect(r.analysis.topology.watertight).toBe(true);
  });

  it("triamid.stl is closed but inconsistently wound: volume reported unreliable", () => {
    const r = analyzeBytes(sharedMesh("numpy-stl/tests/stl_tests/triamid.stl")).analysis;
    expect(r.topology.boundaryEdges).toBe(0);
    expect(r.topology.inconsistentEdges).toBeGreaterThan(0);
    expect(r.volumeReliable).toBe(false);
  });

  it("shared.STL: two cubes sharing an edge give one non-manifold edge", () => {
    const r = analyzeBytes(sharedMesh("trimesh/models/shared.STL")).analysis;
    expect(r.topology.nonManifoldEdges).toBe(1);
    expect(r.topology.boundaryEdges).toBe(0);
    expect(r.topology.watertight).toBe(false);
  });

  it("soup.stl: 100 loose triangles, every edge a boundary edge", () => {
    const r = analyzeBytes(sharedMesh("trimesh/models/soup.stl")).analysis;
    expect(r.triangles).toBe(100);
    expect(r.topology.boundaryEdges).toBe(300);
    expect(r.volumeReliable).toBe(false);
  });

  it.each(["numpy-stl/tests/stl_binary/StarWithEmptyHeader.stl", "numpy-stl/tests/stl_tests/triamid.stl", "trimesh/models/unit_cube.STL", "trimesh/models/shared.STL", "trimesh/models/soup.stl"])(
    "%s: positions equal three's STLLoader",
    (f) => {
      const b = sharedMesh(f);
      expect(readMesh(b).soup.positions).toEqual(loaderPositions(b));
    },
  );
});
