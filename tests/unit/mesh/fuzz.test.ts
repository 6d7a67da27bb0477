import { describe, expect, it } from "vitest";
import { analyzeBytes, analyzeStlFast, isMeshReadError, readMesh, write3mf, writeStl } from "@/lib/mesh";
import { asciiStl, cube, prng, tetrahedron } from "@/tests/fixtures/meshes";

/**
 * Fuzzing (common practice, no source): seeded mutations of valid STL (binary and ASCII) and 3MF
 * bytes plus random junk. Every input must give a result or a MeshReadError with a code and a
 * message: never another exception, never a hang (the suite's time bound catches that).
 */
const rnd = prng(20240611);
const int = (n: number) => Math.floor(rnd() * n);

const seeds: Uint8Array[] = [
  writeStl(tetrahedron(3)),
  writeStl(cube(2)),
  new TextEncoder().encode(asciiStl(tetrahedron(2))),
  write3mf([{ name: "t", mesh: tetrahedron(2) }], { level: 1 }),
  write3mf([{ mesh: cube(1) }], { level: 0 }),
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
