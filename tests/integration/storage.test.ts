// Both storage back ends honour one contract; S3 is checked against a local fake S3 server (s3rver) on loopback.
import { createHash } from "node:crypto";
import { mkdtempSync, rmSync, writeFileSync, existsSync } from "node:fs";
import { createRequire } from "node:module";
import type { AddressInfo } from "node:net";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { LocalStore, S3Store, type BlobStore } from "@/lib/server/storage";

interface FakeS3 {
  run(): Promise<AddressInfo>;
  close(): Promise<void>;
}
const S3rver = createRequire(import.meta.url)("s3rver") as new (o: object) => FakeS3;

const work = mkdtempSync(path.join(tmpdir(), "pw-storage-"));
let fake: FakeS3;
let s3: S3Store;

beforeAll(async () => {
  fake = new S3rver({ address: "127.0.0.1", port: 0, silent: true, directory: path.join(work, "s3"), configureBuckets: [{ name: "pw-meshes", configs: [] }] });
  const addr = await fake.run();
  // s3rver accepts its documented default credentials, S3RVER / S3RVER (its README).
  s3 = new S3Store({ bucket: "pw-meshes", endpoint: `http://127.0.0.1:${addr.port}`, region: "us-east-1", accessKeyId: "S3RVER", secretAccessKey: "S3RVER", prefix: "meshes/" });
});
afterAll(async () => {
  await fake?.close();
  rmSync(work, { recursive: true, force: true });
});

function temp(bytes: Uint8Array): string {
  const p = path.join(work, `t-${Math.random().toString(36).slice(2)}`);
  writeFileSync(p, bytes);
  return p;
}

const sha = (b: Uint8Array) => createHash("sha256").update(b).digest("hex");

const contract = (name: string, store: () => BlobStore) =>
  describe(`${name} storage`, () => {
    it("stores bytes under their SHA-256, once, and reads them back unchanged", async () => {
      const bytes = new Uint8Array(70_001).map((_, i) => (i * 31 + 7) & 255);
      const key = sha(bytes);
      expect(await store().has(key)).toBe(false);
      const t1 = temp(bytes);
      expect(await store().putFile(key, t1)).toBe(true);
      expect(existsSync(t1)).toBe(false); // the temporary file is moved or removed
      const t2 = temp(bytes);
      expect(await store().putFile(key, t2)).toBe(false);
      expect(existsSync(t2)).toBe(false);
      expect(await store().has(key)).toBe(true);
      const back = await store().read(key);
      expect(sha(back)).toBe(key);
      const chunks: Uint8Array[] = [];
      for await (const c of (await store().stream(key)) as unknown as AsyncIterable<Uint8Array>) chunks.push(c);
      expect(sha(Buffer.concat(chunks))).toBe(key);
      await store().delete(key);
      expect(await store().has(key)).toBe(false);
    });

    it("refuses keys that are not SHA-256 hex, so no path can escape the store", async () => {
      await expect(store().has("../../etc/passwd")).rejects.toThrow(/not a storage key/);
    });
  });

contract("local disk", () => new LocalStore(path.join(work, "local")));
contract("S3-compatible", () => s3);
