import "server-only";
import { randomUUID } from "node:crypto";
import { mkdir, rm, writeFile } from "node:fs/promises";
import path from "node:path";
import { asc, eq, inArray, or, sql } from "drizzle-orm";
import { db, type Db } from "@/db";
import { meshBlobs, partFiles } from "@/db/schema";
import { blobStore, tempDir } from "./storage";

// Stored mesh bytes are shared by content (SHA-256). The `mesh_blobs` row of a hash is its mutex:
// whoever records a file for the hash, and whoever removes unreferenced bytes, does so holding that
// row's lock (SELECT … FOR UPDATE) until their transaction ends. So a clean-up never deletes bytes
// that a concurrent upload is about to record, and an upload that finds its bytes gone (a clean-up
// won just before it) writes them again before it records them.

export interface BlobBytes {
  sha256: string;
  bytes: Uint8Array;
}

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

class BlobRowGone extends Error {}

/** InnoDB's answer when inserts of one key race its delete: "try restarting transaction". Drizzle wraps the driver's error in `cause`. */
function isDeadlock(e: unknown): boolean {
  for (let cur: unknown = e, depth = 0; cur && depth < 5; depth++) {
    const c = cur as { code?: string; errno?: number; cause?: unknown };
    if (c.code === "ER_LOCK_DEADLOCK" || c.errno === 1213) return true;
    cur = c.cause;
  }
  return false;
}

/** Runs `fn` again (a few times, after a short random pause) when the database chose it as a deadlock victim. */
async function restartOnDeadlock<T>(fn: () => Promise<T>, attempts = 6): Promise<T> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await fn();
    } catch (e) {
      if (!isDeadlock(e) || attempt >= attempts) throw e;
      await new Promise((r) => setTimeout(r, 5 + Math.random() * 20 * attempt));
    }
  }
}

async function writeBytes(sha256: string, bytes: Uint8Array): Promise<void> {
  await mkdir(tempDir(), { recursive: true });
  const temp = path.join(tempDir(), `${randomUUID()}.restore`);
  try {
    await writeFile(temp, bytes, { flag: "wx" });
    await blobStore().putFile(sha256, temp);
  } finally {
    await rm(temp, { force: true });
  }
}

/**
 * Runs `fn` in a transaction that holds the row locks of these blobs (taken in hash order, so two
 * callers never wait on each other in a circle), after making sure each one's bytes are in the
 * store. Hashes whose bytes this call had to write are added to `written`, so the caller can take
 * them back out if it fails. Retried (at most 3 times) when a clean-up removed a row in between, and
 * restarted when InnoDB picks it as a deadlock victim (inserts of a key racing its delete can be).
 */
export async function withBlobsHeld<T>(blobs: BlobBytes[], written: Set<string>, fn: (tx: Tx) => Promise<T>): Promise<T> {
  const list = [...new Map(blobs.map((b) => [b.sha256, b])).values()].sort((a, b) => (a.sha256 < b.sha256 ? -1 : 1));
  const shas = list.map((b) => b.sha256);
  const once = async () => {
    // The rows must exist (committed) before they can be locked; an existing row is left as it is.
    if (list.length) await db().insert(meshBlobs).ignore().values(list.map((b) => ({ sha256: b.sha256, sizeBytes: b.bytes.byteLength })));
    return db().transaction(async (tx) => {
      if (list.length) {
        const held = await tx.select({ sha256: meshBlobs.sha256 }).from(meshBlobs).where(inArray(meshBlobs.sha256, shas)).orderBy(asc(meshBlobs.sha256)).for("update");
        if (held.length !== list.length) throw new BlobRowGone();
        for (const b of list) {
          if (await blobStore().has(b.sha256)) continue;
          await writeBytes(b.sha256, b.bytes);
          written.add(b.sha256);
        }
      }
      return fn(tx);
    });
  };
  for (let attempt = 1; ; attempt++) {
    try {
      return await restartOnDeadlock(once);
    } catch (e) {
      if (e instanceof BlobRowGone && attempt < 3) continue;
      throw e;
    }
  }
}

/**
 * Removes the stored bytes and row of each hash no part file refers to (as its mesh or its source), each under its row lock, so
 * an upload recording the same bytes at the same moment either finishes first (and the bytes stay)
 * or waits and then writes them again. Failures to delete bytes are ignored (an orphan file is
 * harmless: the next upload of those bytes reuses it).
 */
export async function forgetUnusedBlobs(blobs: { sha256: string; sizeBytes: number }[]): Promise<void> {
  for (const { sha256, sizeBytes } of new Map(blobs.map((b) => [b.sha256, b])).values()) {
    await restartOnDeadlock(async () => {
      // Lockable only when the row exists; its true size, in case an upload records it meanwhile.
      await db().insert(meshBlobs).ignore().values({ sha256, sizeBytes });
      await db().transaction(async (tx) => {
        const [row] = await tx.select({ sha256: meshBlobs.sha256 }).from(meshBlobs).where(eq(meshBlobs.sha256, sha256)).for("update");
        if (!row) return; // another clean-up removed it, bytes and all, under the same lock
        // This transaction's first plain read, so its snapshot is taken after the lock: it sees every
        // committed reference, and no uncommitted one can exist while we hold the row.
        const [used] = await tx.select({ n: sql<number>`COUNT(*)` }).from(partFiles).where(or(eq(partFiles.sha256, sha256), eq(partFiles.sourceSha256, sha256)));
        if (Number(used?.n ?? 0) > 0) return;
        await blobStore().delete(sha256).catch(() => undefined);
        await tx.delete(meshBlobs).where(eq(meshBlobs.sha256, sha256));
      });
    });
  }
}
