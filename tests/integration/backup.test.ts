// Backup and restore round trip: every row and every stored file comes back.
import { execFileSync } from "node:child_process";
import { createHash } from "node:crypto";
import { mkdtempSync, mkdirSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import mysql from "mysql2/promise";
import { afterAll, describe, expect, it } from "vitest";
import { runMigrations } from "../../db/migrate";
import { seed } from "../../db/seed";
import { testTarget } from "./global-setup";

const base = testTarget();
const source = { ...base, database: `${base.database}_bk_src` };
const target = { ...base, database: `${base.database}_bk_dst` };
const work = mkdtempSync(path.join(tmpdir(), "pw-backup-"));

async function withServer<T>(fn: (c: mysql.Connection) => Promise<T>): Promise<T> {
  const { database: _d, ...server } = base;
  const c = await mysql.createConnection(server);
  try {
    return await fn(c);
  } finally {
    await c.end();
  }
}

async function tableCounts(db: typeof source): Promise<Record<string, number>> {
  const c = await mysql.createConnection(db);
  try {
    const [tables] = await c.query<mysql.RowDataPacket[]>("SELECT table_name AS t FROM information_schema.tables WHERE table_schema = ? ORDER BY table_name", [db.database]);
    const out: Record<string, number> = {};
    for (const { t } of tables) {
      const [[row]] = (await c.query(`SELECT COUNT(*) AS n FROM \`${t}\``)) as unknown as [[{ n: number }]];
      out[t] = Number(row.n);
    }
    return out;
  } finally {
    await c.end();
  }
}

function filesIn(dir: string): Record<string, string> {
  const out: Record<string, string> = {};
  const walk = (d: string) => {
    for (const e of readdirSync(d, { withFileTypes: true })) {
      const p = path.join(d, e.name);
      if (e.isDirectory()) walk(p);
      else out[path.relative(dir, p)] = createHash("sha256").update(readFileSync(p)).digest("hex");
    }
  };
  walk(dir);
  return out;
}

function run(args: string[], env: Record<string, string>) {
  return execFileSync("bash", ["scripts/backup.sh", ...args], { env: { ...process.env, ...env }, encoding: "utf8" });
}

afterAll(async () => {
  await withServer(async (c) => {
    await c.query(`DROP DATABASE IF EXISTS \`${source.database}\``);
    await c.query(`DROP DATABASE IF EXISTS \`${target.database}\``);
  });
  rmSync(work, { recursive: true, force: true });
});

describe("backup and restore", () => {
  it("restores into an empty database and finds every row and file", async () => {
    await withServer(async (c) => {
      await c.query(`DROP DATABASE IF EXISTS \`${source.database}\``);
      await c.query(`DROP DATABASE IF EXISTS \`${target.database}\``);
      await c.query(`CREATE DATABASE \`${source.database}\``);
    });
    await runMigrations(source);
    await seed(source);
    const srcFiles = path.join(work, "files-src");
    mkdirSync(path.join(srcFiles, "ab"), { recursive: true });
    writeFileSync(path.join(srcFiles, "ab", "abcdef"), Buffer.from([0, 1, 2, 255, 254]));
    writeFileSync(path.join(srcFiles, "top-level"), "plain text\n");
    // A partial upload a killed server left behind (issue 17, finding 9): never part of a backup.
    mkdirSync(path.join(srcFiles, ".tmp"), { recursive: true });
    writeFileSync(path.join(srcFiles, ".tmp", "half.upload"), "partial bytes");
    const env = { DB_NAME: source.database, STORAGE_DIR: srcFiles, DB_PORT: String(base.port) };
    const out = path.join(work, "backup");
    run(["create", out], env);

    const dstFiles = path.join(work, "files-dst");
    run(["restore", out], { ...env, DB_NAME: target.database, STORAGE_DIR: dstFiles });

    const before = await tableCounts(source);
    expect(Object.keys(before).length).toBeGreaterThan(3);
    expect(before.users).toBeGreaterThan(0);
    expect(await tableCounts(target)).toEqual(before);
    const kept = Object.fromEntries(Object.entries(filesIn(srcFiles)).filter(([p]) => !p.startsWith(".tmp")));
    expect(filesIn(dstFiles)).toEqual(kept);
    expect(readFileSync(path.join(out, "manifest.txt"), "utf8")).not.toContain(".tmp");

    // Restoring over a database that has tables is refused, so nothing is overwritten.
    expect(() => run(["restore", out], { ...env, DB_NAME: target.database, STORAGE_DIR: dstFiles })).toThrow();
  });
});
