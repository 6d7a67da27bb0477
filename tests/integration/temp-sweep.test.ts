// The start-up sweep of the storage temp folder: files older than the threshold (left by a process
// killed mid-upload) go, younger ones (an upload that may still be under way) and stored files stay.
// Thresholds and ages are this project's choice (common practice, no source).
import { existsSync, mkdirSync, mkdtempSync, rmSync, utimesSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { tempDir } from "@/lib/server/storage";
import { startTempSweeper, sweepTempFiles, TEMP_MAX_AGE_MS } from "@/lib/server/storage/sweep";

const root = mkdtempSync(path.join(tmpdir(), "pw-temp-sweep-"));
process.env.STORAGE_DIR = root;

afterAll(() => rmSync(root, { recursive: true, force: true }));

function fileAged(p: string, ageMs: number): void {
  mkdirSync(path.dirname(p), { recursive: true });
  writeFileSync(p, "half a mesh");
  const t = (Date.now() - ageMs) / 1000;
  utimesSync(p, t, t);
}

describe("sweepTempFiles", () => {
  it("removes temp files older than the threshold and keeps younger ones and stored files", async () => {
    const tmp = tempDir();
    expect(tmp).toBe(path.join(root, ".tmp"));
    fileAged(path.join(tmp, "a.upload"), TEMP_MAX_AGE_MS + 60_000);
    fileAged(path.join(tmp, "b.piece"), 3 * 24 * 3_600_000);
    fileAged(path.join(tmp, "c.upload"), 60_000); // an upload under way
    const stored = path.join(root, "ab", "cd", `abcd${"0".repeat(60)}`);
    fileAged(stored, 10 * TEMP_MAX_AGE_MS); // old, but a stored file outside the temp folder
    const removed = await sweepTempFiles();
    expect(removed.sort()).toEqual(["a.upload", "b.piece"]);
    expect(existsSync(path.join(tmp, "a.upload"))).toBe(false);
    expect(existsSync(path.join(tmp, "b.piece"))).toBe(false);
    expect(existsSync(path.join(tmp, "c.upload"))).toBe(true);
    expect(existsSync(stored)).toBe(true);
  });

  it("takes the age limit and clock as parameters, and copes with a missing folder", async () => {
    const later = Date.now() + TEMP_MAX_AGE_MS + 120_000;
    expect(await sweepTempFiles({ now: later })).toEqual(["c.upload"]);
    expect(await sweepTempFiles({ dir: path.join(root, "no-such-folder") })).toEqual([]);
  });
});

describe("startTempSweeper (issue 17, finding 9: dead uploads were swept only at start)", () => {
  it("keeps sweeping while the server runs: a file that turns old after start is removed by a later round", async () => {
    const dir = path.join(root, "timer");
    const young = path.join(dir, "dies-later.upload");
    fileAged(young, 0);
    const removed: string[] = [];
    const stop = startTempSweeper({ dir, intervalMs: 50, onRemoved: (names) => removed.push(...names) });
    try {
      await new Promise((r) => setTimeout(r, 120));
      expect(existsSync(young)).toBe(true); // young: an upload that may still be under way
      // The upload's process dies; its file is not written to again and ages past the threshold.
      const t = (Date.now() - TEMP_MAX_AGE_MS - 60_000) / 1000;
      utimesSync(young, t, t);
      for (let i = 0; i < 40 && existsSync(young); i++) await new Promise((r) => setTimeout(r, 50));
      expect(existsSync(young)).toBe(false);
      expect(removed).toEqual(["dies-later.upload"]);
    } finally {
      stop();
    }
  });
});
