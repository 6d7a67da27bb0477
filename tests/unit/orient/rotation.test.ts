import { describe, expect, it } from "vitest";
import type { Vec3 } from "@/lib/mesh/types";
import { applyMat, matrixFromQuaternion, rotationForDown } from "@/lib/orient/rotation";
import { fibonacciSphere } from "@/lib/orient/directions";

describe("rotation from a down direction", () => {
  it("maps +X to −Z as a quarter turn about Y (worked by hand)", () => {
    const r = rotationForDown([1, 0, 0]);
    const d = applyMat(r.matrix, [1, 0, 0]);
    expect(d[0]).toBeCloseTo(0, 12);
    expect(d[2]).toBeCloseTo(-1, 12);
    // Worked by hand: axis (1,0,0) × (0,0,−1) = (0,1,0), angle 90°: q = (0, sin 45°, 0, cos 45°).
    expect(r.quaternion[1]).toBeCloseTo(Math.SQRT1_2, 12);
    expect(r.quaternion[3]).toBeCloseTo(Math.SQRT1_2, 12);
  });

  it("turns +Z down with a half turn (q = (1,0,0,0), worked by hand)", () => {
    const r = rotationForDown([0, 0, 1]);
    expect(r.quaternion.map((x) => Math.abs(x))).toEqual([1, 0, 0, 0]);
  });

  it("for 200 directions and a spin: down goes to −Z, matrix orthonormal, quaternion the same rotation", () => {
    for (const d of fibonacciSphere(200)) {
      const r = rotationForDown(d as Vec3, 0.7);
      const m = r.matrix;
      const down = applyMat(m, d as Vec3);
      expect(down[2]).toBeCloseTo(-1, 9);
      // Rows orthonormal: M·Mᵀ = I (definition of a rotation).
      for (let i = 0; i < 3; i++)
        for (let j = 0; j < 3; j++) {
          const dot = m[3 * i]! * m[3 * j]! + m[3 * i + 1]! * m[3 * j + 1]! + m[3 * i + 2]! * m[3 * j + 2]!;
          expect(dot).toBeCloseTo(i === j ? 1 : 0, 9);
        }
      const back = matrixFromQuaternion(r.quaternion);
      for (let k = 0; k < 9; k++) expect(back[k]).toBeCloseTo(m[k]!, 9);
    }
  });
});
