// Faults during uploads: the app is killed (SIGKILL) in the middle of an upload and started again;
// what it had received is never taken as a stored file, and old half-written temp files are swept at start. Also the streamed size limit (no
// Content-Length). Runs its own app server (port 3202) on its own database and storage folder, so the
// shared e2e server is never killed.
import { spawn, execFileSync, type ChildProcess } from "node:child_process";
import { createHash } from "node:crypto";
import { existsSync, mkdirSync, readdirSync, rmSync, utimesSync, writeFileSync } from "node:fs";
import http from "node:http";
import path from "node:path";
import { expect, test } from "@playwright/test";
import mysql from "mysql2/promise";
import { targetFromEnv } from "../../db/migrate";
import { demo } from "./helpers";
import { signInAt, waitFor } from "./own-server";
import { boxesStl, rows } from "./security-fixtures";

const APP_PORT = 3202;
const base = `http://127.0.0.1:${APP_PORT}`;
const ROOT = "/tmp/pw-upload-faults";
const STORAGE = path.join(ROOT, "files");
const DB_NAME = "platewright_e2e_uploads";
const env = { ...process.env, DB_NAME, STORAGE_DIR: STORAGE, UPLOAD_LIMIT_MB: "5", MAIL_MODE: "fake", PAYMENTS_MODE: "fake" };

let app: ChildProcess | undefined;
let conn: mysql.Connection;

async function startApp(): Promise<void> {
  app = spawn("node_modules/.bin/next", ["start", "-p", String(APP_PORT), "-H", "127.0.0.1"], {
    env: { ...env, NEXTAUTH_URL: base, NEXTAUTH_SECRET: process.env.NEXTAUTH_SECRET ?? "upload-faults-secret-0123456789" },
    stdio: "ignore",
  });
  expect(await waitFor(`${base}/api/health`, (s) => s === 200, 60_000)).toBe(200);
}

/** Every stored blob under the storage root (the temp folder excluded). */
function storedBlobs(): string[] {
  if (!existsSync(STORAGE)) return [];
  return (readdirSync(STORAGE, { recursive: true }) as string[]).filter((f) => !f.startsWith(".tmp") && /^[0-9a-f]{64}$/.test(path.basename(f))).map((f) => path.basename(f));
}

const sha = (b: Buffer) => createHash("sha256").update(b).digest("hex");

test.describe.configure({ mode: "serial" });

test.beforeAll(async () => {
  test.setTimeout(180_000);
  rmSync(ROOT, { recursive: true, force: true });
  mkdirSync(STORAGE, { recursive: true });
  execFileSync("bash", ["scripts/db.sh", "sql", "-e", `DROP DATABASE IF EXISTS \`${DB_NAME}\`; CREATE DATABASE \`${DB_NAME}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`], { env, stdio: "pipe" });
  execFileSync("node_modules/.bin/tsx", ["scripts/migrate.ts"], { env, stdio: "pipe" });
  execFileSync("node_modules/.bin/tsx", ["db/seed.ts"], { env, stdio: "pipe" });
  conn = await mysql.createConnection(targetFromEnv(DB_NAME));
  await startApp();
});

test.afterAll(async () => {
  app?.kill("SIGTERM");
  await conn?.end();
  try {
    execFileSync("bash", ["scripts/db.sh", "sql", "-e", `DROP DATABASE IF EXISTS \`${DB_NAME}\``], { env, stdio: "pipe" });
  } catch {
    /* the shared server may be gone already */
  }
  rmSync(ROOT, { recursive: true, force: true });
});

async function junPart(): Promise<number> {
  const [p] = await rows<{ id: number }>(conn, "SELECT p.id FROM parts p JOIN assemblies a ON a.id = p.assembly_id JOIN users u ON u.id = a.owner_id WHERE u.email = ? ORDER BY p.id LIMIT 1", [demo("member").email]);
  return p!.id;
}

test("killing the app half-way through an upload leaves nothing taken as good; the same bytes upload intact after restart", async () => {
  test.setTimeout(180_000);
  const u = demo("member");
  const cookie = await signInAt(base, u.email, u.password);
  const partId = await junPart();
  const body = boxesStl(60, 60); // 43 200 facets, 2 160 084 bytes: under the 5 MB limit of this server
  const filesBefore = await rows<{ id: number }>(conn, "SELECT id FROM part_files WHERE part_id = ?", [partId]);
  const blobsBefore = storedBlobs();

  // Send slowly in 64 KiB pieces; once half is sent, SIGKILL the server.
  let sent = 0;
  const outcome = await new Promise<string>((resolve) => {
    const req = http.request(`${base}/api/parts/${partId}/file?name=killed.stl`, {
      method: "PUT",
      headers: { "content-type": "application/octet-stream", "content-length": String(body.length), cookie },
    });
    req.on("response", (res) => resolve(`answered ${res.statusCode}`));
    req.on("error", (e) => resolve(`error ${e.message}`));
    const step = () => {
      if (sent >= body.length / 2) {
        app?.kill("SIGKILL");
        return;
      }
      const piece = body.subarray(sent, sent + 64 * 1024);
      sent += piece.length;
      req.write(piece, () => setTimeout(step, 15));
    };
    step();
  });
  expect(outcome).toMatch(/^error/);
  await new Promise<void>((r) => (app?.exitCode !== null || app?.signalCode ? r() : app?.once("exit", () => r())));

  // A half-written temp file from an earlier crash, two hours old: the start-up sweep removes it
  // (lib/server/storage/sweep.ts, older than 30 min); the kill's own leftover is younger and stays.
  const stale = path.join(STORAGE, ".tmp", "stale-from-earlier-crash.upload");
  mkdirSync(path.dirname(stale), { recursive: true });
  writeFileSync(stale, body.subarray(0, 1000));
  const twoHoursAgo = (Date.now() - 2 * 3_600_000) / 1000;
  utimesSync(stale, twoHoursAgo, twoHoursAgo);
  await startApp();
  await expect.poll(() => existsSync(stale), { timeout: 10_000 }).toBe(false);
  // No row, no stored blob: the half-file in the temp folder is never moved into storage.
  expect(await rows<{ id: number }>(conn, "SELECT id FROM part_files WHERE part_id = ?", [partId])).toEqual(filesBefore);
  expect(storedBlobs()).toEqual(blobsBefore);
  const [blobRow] = await rows<{ n: number }>(conn, "SELECT COUNT(*) n FROM mesh_blobs WHERE sha256 = ?", [sha(body)]);
  expect(Number(blobRow!.n)).toBe(0);

  // The whole upload after the restart is stored and served byte for byte.
  const cookie2 = await signInAt(base, u.email, u.password);
  const res = await fetch(`${base}/api/parts/${partId}/file?name=killed.stl`, { method: "PUT", headers: { "content-type": "application/octet-stream", cookie: cookie2 }, body: new Uint8Array(body) });
  expect(res.status, await res.clone().text()).toBe(201);
  const up = (await res.json()) as { fileId: number; sha256: string; alreadyStored: boolean; sizeBytes: number };
  expect(up.sha256).toBe(sha(body));
  expect(up.sizeBytes).toBe(body.length);
  expect(up.alreadyStored).toBe(false);
  const dl = await fetch(`${base}/api/files/${up.fileId}`, { headers: { cookie: cookie2 } });
  expect(dl.status).toBe(200);
  expect(sha(Buffer.from(await dl.arrayBuffer()))).toBe(sha(body));
  expect(storedBlobs()).toContain(sha(body));
  // What the killed run left in the temp folder (if anything) is only ever a *.upload name there.
  const leftovers = existsSync(path.join(STORAGE, ".tmp")) ? readdirSync(path.join(STORAGE, ".tmp")) : [];
  for (const f of leftovers) expect(f).toMatch(/\.upload$/);
  test.info().annotations.push({ type: "temp files left by the kill", description: String(leftovers.length) });
});

test("a streamed body over the limit (no Content-Length) is cut off with 413 and nothing is kept", async () => {
  test.setTimeout(120_000);
  const u = demo("member");
  const cookie = await signInAt(base, u.email, u.password);
  const partId = await junPart();
  const filesBefore = await rows<{ id: number }>(conn, "SELECT id FROM part_files WHERE part_id = ?", [partId]);
  const tmpBefore = existsSync(path.join(STORAGE, ".tmp")) ? readdirSync(path.join(STORAGE, ".tmp")) : [];
  const chunk = Buffer.alloc(256 * 1024, 7);
  const status = await new Promise<number>((resolve, reject) => {
    const req = http.request(`${base}/api/parts/${partId}/file?name=huge.stl`, { method: "PUT", headers: { "content-type": "application/octet-stream", "transfer-encoding": "chunked", cookie } });
    req.on("response", (res) => {
      res.resume();
      resolve(res.statusCode ?? 0);
      req.destroy();
    });
    req.on("error", reject);
    let n = 0;
    const step = () => {
      if (n++ > 40) return req.end(); // 10.25 MB at most, over the 5 MB limit
      req.write(chunk, () => setImmediate(step));
    };
    step();
  });
  expect(status).toBe(413);
  expect(await rows<{ id: number }>(conn, "SELECT id FROM part_files WHERE part_id = ?", [partId])).toEqual(filesBefore);
  await expect.poll(() => readdirSync(path.join(STORAGE, ".tmp")).filter((f) => !tmpBefore.includes(f)), { timeout: 10_000 }).toEqual([]);
  expect((await fetch(`${base}/api/health`)).status).toBe(200);
});
