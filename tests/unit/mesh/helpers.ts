import { readFileSync } from "node:fs";
import { dirname, resolve } from "node:path";
import { fileURLToPath } from "node:url";

/** Repository root, from this file's location (tests/unit/mesh). */
export const REPO_ROOT = resolve(dirname(fileURLToPath(import.meta.url)), "../../..");

/** Real-world files live beside the clone: ../shared/meshes relative to the repo root. */
export function sharedMesh(rel: string): Uint8Array {
  return new Uint8Array(readFileSync(resolve(REPO_ROOT, "../shared/meshes", rel)));
}

export function toArrayBuffer(b: Uint8Array): ArrayBuffer {
  return b.buffer.slice(b.byteOffset, b.byteOffset + b.byteLength) as ArrayBuffer;
}
