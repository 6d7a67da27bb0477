import "server-only";
import path from "node:path";
import { z } from "zod";
import { env } from "@/lib/env";
import { LocalStore } from "./local";
import { S3Store } from "./s3";
import type { BlobStore } from "./types";

export type { BlobStore } from "./types";
export { LocalStore } from "./local";
export { S3Store, type S3Options } from "./s3";

// STORAGE_DRIVER=local (default) keeps files under STORAGE_DIR; STORAGE_DRIVER=s3 uses the S3_* settings.
const s3Env = z.object({
  S3_BUCKET: z.string().min(3),
  S3_ENDPOINT: z.string().url().optional(),
  S3_REGION: z.string().default("us-east-1"),
  S3_ACCESS_KEY_ID: z.string().min(1),
  S3_SECRET_ACCESS_KEY: z.string().min(1),
  S3_PREFIX: z.string().default(""),
});

const g = globalThis as unknown as { __pwStore?: BlobStore };

export function storageRoot(): string {
  return path.resolve(env().STORAGE_DIR);
}

/** Temporary uploads live beside the files, so finishing one is a rename on the same disk. */
export function tempDir(): string {
  return path.join(storageRoot(), ".tmp");
}

export function blobStore(): BlobStore {
  if (g.__pwStore) return g.__pwStore;
  if ((process.env.STORAGE_DRIVER ?? "local") === "s3") {
    const e = s3Env.parse(process.env);
    g.__pwStore = new S3Store({ bucket: e.S3_BUCKET, endpoint: e.S3_ENDPOINT, region: e.S3_REGION, accessKeyId: e.S3_ACCESS_KEY_ID, secretAccessKey: e.S3_SECRET_ACCESS_KEY, prefix: e.S3_PREFIX });
  } else {
    g.__pwStore = new LocalStore(storageRoot());
  }
  return g.__pwStore;
}

/** For tests: use a given store until reset. */
export function setBlobStore(store: BlobStore | undefined): void {
  g.__pwStore = store;
}
