import "server-only";
import { createReadStream } from "node:fs";
import { mkdir, readFile, rename, rm, stat, unlink } from "node:fs/promises";
import path from "node:path";
import { Readable } from "node:stream";
import { checkKey, type BlobStore } from "./types";

/** Files on local disk, fanned out by the key's first two byte pairs (ab/cd/abcd…) to keep folders small. */
export class LocalStore implements BlobStore {
  readonly kind = "local" as const;
  constructor(private readonly root: string) {}

  pathOf(key: string): string {
    checkKey(key);
    return path.join(this.root, key.slice(0, 2), key.slice(2, 4), key);
  }

  async has(key: string): Promise<boolean> {
    return stat(this.pathOf(key)).then((s) => s.isFile(), () => false);
  }

  async putFile(key: string, tempPath: string): Promise<boolean> {
    const target = this.pathOf(key);
    if (await this.has(key)) {
      await unlink(tempPath).catch(() => undefined);
      return false;
    }
    await mkdir(path.dirname(target), { recursive: true });
    // rename is atomic within one file system, so a reader never sees half a file; the temporary
    // folder sits inside the storage root for that reason.
    await rename(tempPath, target);
    return true;
  }

  async read(key: string): Promise<Uint8Array> {
    return new Uint8Array(await readFile(this.pathOf(key)));
  }

  async stream(key: string): Promise<ReadableStream<Uint8Array>> {
    const p = this.pathOf(key);
    await stat(p);
    return Readable.toWeb(createReadStream(p)) as ReadableStream<Uint8Array>;
  }

  async delete(key: string): Promise<void> {
    await rm(this.pathOf(key), { force: true });
  }
}
