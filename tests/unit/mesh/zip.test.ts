import { readFileSync } from "node:fs";
import { resolve } from "node:path";
import { unzipSync } from "fflate";
import { describe, expect, it } from "vitest";
import { analyzeBytes, isMeshReadError, readMesh } from "@/lib/mesh";
import { zipEntries, zipRead } from "@/lib/mesh/zip";
import { REPO_ROOT } from "./helpers";

// Fixtures written by Python's zipfile (CPython 3.11) with tests/fixtures/zip/make.py, committed:
// a 10 mm cube (volume 1000 mm³, area 600 mm², by hand) in a 3MF package.
const fixture = (name: string) => new Uint8Array(readFileSync(resolve(REPO_ROOT, "tests/fixtures/zip", name)));
const u32 = (b: Uint8Array, p: number) => new DataView(b.buffer, b.byteOffset).getUint32(p, true);
const find = (b: Uint8Array, sig: number, from = 0) => {
  for (let i = from; i + 4 <= b.length; i++) if (u32(b, i) === sig) return i;
  return -1;
};

describe("ZIP64 and data descriptors (PKWARE APPNOTE 6.3 §4.3.9, §4.3.14–15, §4.5.3)", () => {
  it("reads a package whose every size and offset is in ZIP64 fields (written by Python's zipfile)", () => {
    const b = fixture("cube-zip64.3mf");
    // The fixture is what it claims: a ZIP64 end record and locator, 0xFFFFFFFF in the directory.
    expect(find(b, 0x06064b50)).toBeGreaterThan(0);
    expect(find(b, 0x07064b50)).toBeGreaterThan(0);
    const cen = find(b, 0x02014b50);
    expect([u32(b, cen + 20), u32(b, cen + 24)]).toEqual([0xffffffff, 0xffffffff]);
    const entries = zipEntries(b);
    expect(entries.map((e) => [e.name, e.method])).toEqual([["[Content_Types].xml", 0], ["_rels/.rels", 0], ["3D/3dmodel.model", 8]]);
    // Every entry's bytes equal fflate's unzipSync reading of the same package.
    const ref = unzipSync(b);
    for (const e of entries) expect(zipRead(b, e, 1 << 20)).toEqual(ref[e.name]);
    const r = analyzeBytes(b).analysis;
    expect(r.triangles).toBe(12);
    expect(r.volume).toBeCloseTo(1000, 9);
    expect(r.area).toBeCloseTo(600, 9);
    expect(r.topology.watertight).toBe(true);
  });

  it("reads a package streamed with data descriptors (bit 3, zero sizes in the local headers)", () => {
    const b = fixture("cube-descriptor.3mf");
    expect(find(b, 0x08074b50)).toBeGreaterThan(0);
    expect(u32(b, 18)).toBe(0); // the first local header's compressed size
    const entries = zipEntries(b);
    expect(entries.every((e) => (e.flags & 8) === 8)).toBe(true);
    const r = analyzeBytes(b).analysis;
    expect(r.volume).toBeCloseTo(1000, 9);
    expect(r.area).toBeCloseTo(600, 9);
  });

  it("refuses a ZIP64 locator that points at no ZIP64 end record, with a clear error", () => {
    const b = fixture("cube-zip64.3mf").slice();
    const rec = find(b, 0x06064b50);
    b[rec] = 0; // break the record's signature
    try {
      readMesh(b);
      expect.unreachable();
    } catch (e) {
      expect(isMeshReadError(e) && e.code).toBe("BAD_ZIP");
      expect((e as Error).message).toMatch(/ZIP64 end-of-central-directory locator points at no ZIP64 end record/);
    }
  });

  it("keeps the inflate cap on a ZIP64 entry", () => {
    const b = fixture("cube-zip64.3mf");
    const model = zipEntries(b).find((e) => e.name === "3D/3dmodel.model")!;
    expect(() => zipRead(b, model, 100)).toThrow(/over the 100-byte limit/);
  });
});
