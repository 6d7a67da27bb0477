// Faults: the app keeps serving through a database restart. This spec runs its own MariaDB
// (port 3308, data under /tmp) and its own app server (port 3201) so it never disturbs the shared ones.
import { spawn, execFileSync, type ChildProcess } from "node:child_process";
import { mkdirSync, rmSync } from "node:fs";
import { expect, test } from "@playwright/test";
import { demo } from "./helpers";
import { signInAt, waitFor } from "./own-server";

const DB_PORT = "3308";
const APP_PORT = 3201;
const base = `http://127.0.0.1:${APP_PORT}`;
const dbEnv = { ...process.env, DB_PORT, PW_DB_DIR: "/tmp/pw-faults/mariadb", PW_DB_RUN_DIR: "/tmp/pw-faults/run", DB_NAME: "platewright_e2e" };

function db(cmd: "start" | "stop") {
  execFileSync("bash", ["scripts/db.sh", cmd], { env: dbEnv, stdio: "pipe" });
}

let app: ChildProcess | undefined;

test.describe.configure({ mode: "serial" });

test.beforeAll(async () => {
  test.setTimeout(120_000);
  rmSync("/tmp/pw-faults", { recursive: true, force: true });
  mkdirSync("/tmp/pw-faults", { recursive: true });
  db("start");
  execFileSync("node_modules/.bin/tsx", ["scripts/migrate.ts"], { env: dbEnv, stdio: "pipe" });
  execFileSync("node_modules/.bin/tsx", ["db/seed.ts"], { env: dbEnv, stdio: "pipe" });
  app = spawn("node_modules/.bin/next", ["start", "-p", String(APP_PORT), "-H", "127.0.0.1"], {
    env: { ...dbEnv, NEXTAUTH_URL: base, NEXTAUTH_SECRET: process.env.NEXTAUTH_SECRET ?? "faults-spec-secret-0123456789" },
    stdio: "ignore",
  });
  expect(await waitFor(`${base}/api/health`, (s) => s === 200, 60_000)).toBe(200);
});

test.afterAll(async () => {
  app?.kill("SIGTERM");
  try {
    db("stop");
  } catch {
    /* already stopped */
  }
});

test("requests fail cleanly while MariaDB is down and succeed after it returns, without restarting the app", async () => {
  test.setTimeout(120_000);
  const u = demo("member");
  const cookie = await signInAt(base, u.email, u.password);
  const me = await fetch(`${base}/api/me`, { headers: { cookie } });
  expect(me.status).toBe(200);

  db("stop");
  const health = await fetch(`${base}/api/health`);
  expect(health.status).toBe(503);
  const during = await fetch(`${base}/api/me`, { headers: { cookie } });
  expect(during.status).toBe(503);
  expect(((await during.json()) as { error: string }).error).toMatch(/database is not reachable/i);

  db("start");
  expect(await waitFor(`${base}/api/health`, (s) => s === 200, 30_000)).toBe(200);
  const after = await fetch(`${base}/api/me`, { headers: { cookie } });
  expect(after.status).toBe(200);
  expect(((await after.json()) as { email: string }).email).toBe(u.email);
});
