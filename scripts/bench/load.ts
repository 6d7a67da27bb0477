// Load benchmark: the operator's queue listing (GET /api/queue/board) against a trivial route
// (GET /api/health), 50 connections for 10 s each, on the production server over loopback, in one run.
// Prints requests per second and p95 latency for both and their ratio. Goal: the board keeps at least
// 30% of the trivial route's throughput. Then a burst: 20 parallel re-plans (operator) while two
// members keep reading (GET /api/me, /api/health); goal: no 5xx and no request over 5 s. Last,
// eight parallel 3MF uploads while health is polled (./upload-burst.ts); goal: health under 1 s.
// Not part of `npm test`.
//
// Usage: npm run bench:load  (needs a build: `next build` or `bash scripts/e2e.sh …` leaves one in .next)
// It takes the e2e lock while it runs, so a concurrent e2e build cannot replace .next under it.
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import { existsSync, readFileSync } from "node:fs";
import net from "node:net";
import path from "node:path";
import autocannon from "autocannon";
import { demoUsers } from "../../db/seed-data";
import { uploadBurst } from "./upload-burst";

const LOCK = "/tmp/platewright-e2e.lock";
const CONNECTIONS = Number(process.env.LOAD_CONNECTIONS ?? 50);
const SECONDS = Number(process.env.LOAD_SECONDS ?? 10);
const GOAL = 0.3;
const REPLANS = Number(process.env.LOAD_REPLANS ?? 20);
const SLOW_MS = 5_000;
const root = path.resolve(import.meta.dirname, "../..");

if (!process.env.PW_LOAD_LOCKED) {
  // Re-run this script under the machine-wide e2e lock (flock(1) waits for the holder).
  const r = spawnSync("flock", [LOCK, "env", "PW_LOAD_LOCKED=1", path.join(root, "node_modules/.bin/tsx"), path.join(root, "scripts/bench/load.ts")], { stdio: "inherit", cwd: root });
  process.exit(r.status ?? 1);
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = net.createServer();
    s.once("error", reject);
    s.listen(0, "127.0.0.1", () => {
      const a = s.address();
      s.close(() => (a && typeof a === "object" ? resolve(a.port) : reject(new Error("no port"))));
    });
  });
}

async function waitHealthy(base: string, ms: number): Promise<boolean> {
  const until = Date.now() + ms;
  while (Date.now() < until) {
    if ((await fetch(`${base}/api/health`).then((r) => r.status, () => 0)) === 200) return true;
    await new Promise((r) => setTimeout(r, 300));
  }
  return false;
}

/** next-auth credentials sign-in: CSRF token first, then the callback; returns the cookie header. */
async function signIn(base: string, email: string, password: string): Promise<string> {
  const csrf = await fetch(`${base}/api/auth/csrf`);
  const jar = csrf.headers.getSetCookie().map((c) => c.split(";")[0]!);
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const res = await fetch(`${base}/api/auth/callback/credentials`, {
    method: "POST",
    headers: { "content-type": "application/x-www-form-urlencoded", cookie: jar.join("; ") },
    body: new URLSearchParams({ csrfToken, email, password, json: "true" }),
    redirect: "manual",
  });
  const cookie = [...jar, ...res.headers.getSetCookie().map((c) => c.split(";")[0]!)].join("; ");
  if (!/session-token=/.test(cookie)) throw new Error(`sign-in as ${email} failed (${res.status})`);
  return cookie;
}

/** Nearest-rank percentile (common practice, no source). */
function percentile(sorted: number[], p: number): number {
  if (!sorted.length) return NaN;
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))]!;
}

interface Figures {
  label: string;
  rps: number;
  p95: number;
  total: number;
  errors: number;
  non2xx: number;
}

async function hammer(label: string, url: string, cookie?: string): Promise<Figures> {
  const latencies: number[] = [];
  const result = await new Promise<autocannon.Result>((resolve, reject) => {
    const instance = autocannon({ url, connections: CONNECTIONS, duration: SECONDS, headers: cookie ? { cookie } : {} }, (err, res) => (err ? reject(err) : resolve(res)));
    instance.on("response", (_c, _status, _bytes, ms) => latencies.push(ms));
  });
  latencies.sort((a, b) => a - b);
  return {
    label,
    rps: result.requests.total / (result.duration || SECONDS),
    p95: percentile(latencies, 95),
    total: result.requests.total,
    errors: result.errors + result.timeouts,
    non2xx: result.non2xx,
  };
}

interface Timed {
  what: string;
  status: number;
  ms: number;
}

async function timed(what: string, url: string, init: RequestInit): Promise<Timed> {
  const t0 = performance.now();
  const status = await fetch(url, init).then(
    async (r) => (await r.arrayBuffer(), r.status),
    () => 0,
  );
  return { what, status, ms: performance.now() - t0 };
}

/** REPLANS parallel re-plans while members read in a loop until the last re-plan has answered. */
async function replanBurst(base: string, operatorCookie: string): Promise<boolean> {
  const members = demoUsers.filter((u) => u.role === "member").slice(0, 2);
  const memberCookies = await Promise.all(members.map((m) => signIn(base, m.email, m.password)));
  let done = false;
  const reads: Timed[] = [];
  const readers = memberCookies.map(async (c) => {
    while (!done) {
      reads.push(await timed("GET /api/me (member)", `${base}/api/me`, { headers: { cookie: c } }));
      reads.push(await timed("GET /api/health", `${base}/api/health`, {}));
    }
  });
  const t0 = performance.now();
  const plans = await Promise.all(Array.from({ length: REPLANS }, () => timed("POST /api/plan (operator)", `${base}/api/plan`, { method: "POST", headers: { cookie: operatorCookie, origin: base } })));
  const wall = performance.now() - t0;
  done = true;
  await Promise.all(readers);
  const all = [...plans, ...reads];
  const rows = [...new Set(all.map((t) => t.what))].map((what) => {
    const mine = all.filter((t) => t.what === what);
    const ms = mine.map((t) => t.ms).sort((a, b) => a - b);
    const statuses = [...new Set(mine.map((t) => t.status))].sort().join(" ");
    return { request: what, count: mine.length, statuses, "p50 ms": percentile(ms, 50).toFixed(0), "max ms": ms[ms.length - 1]!.toFixed(0) };
  });
  console.log(`bench:load: ${REPLANS} parallel re-plans with two members reading (${wall.toFixed(0)} ms until the last re-plan answered)`);
  console.table(rows);
  const failed = all.filter((t) => t.status === 0 || t.status >= 500);
  const slow = all.filter((t) => t.ms > SLOW_MS);
  const ok = failed.length === 0 && slow.length === 0 && plans.every((p) => p.status === 200);
  console.log(`burst: ${failed.length} failed or 5xx, ${slow.length} over ${SLOW_MS} ms, re-plans all 200: ${plans.every((p) => p.status === 200)}  goal (none failed, none slow): ${ok ? "met" : "NOT met"}`);
  return ok;
}

async function main(): Promise<number> {
  if (!existsSync(path.join(root, ".next/BUILD_ID"))) {
    console.error("bench:load: no production build in .next. Build first (`npx next build`, or run any spec through scripts/e2e.sh), then run again.");
    return 2;
  }
  const port = await freePort();
  const base = `http://127.0.0.1:${port}`;
  const secretFile = path.join(root, ".data/nextauth-secret");
  const secret = process.env.NEXTAUTH_SECRET ?? (existsSync(secretFile) ? readFileSync(secretFile, "utf8").trim() : randomBytes(32).toString("base64url"));
  let server: ChildProcess | undefined;
  try {
    server = spawn(path.join(root, "node_modules/.bin/next"), ["start", "-p", String(port), "-H", "127.0.0.1"], {
      cwd: root,
      stdio: "ignore",
      env: {
        ...process.env,
        NODE_ENV: "production",
        NEXT_TELEMETRY_DISABLED: "1",
        NEXTAUTH_URL: base,
        NEXTAUTH_SECRET: secret,
        DB_NAME: process.env.DB_NAME ?? "platewright",
        // Nothing the server does may leave 127.0.0.1.
        NODE_OPTIONS: `${process.env.NODE_OPTIONS ?? ""} --require ${path.join(root, "tests/support/loopback-only.cjs")}`.trim(),
      },
    });
    if (!(await waitHealthy(base, 90_000))) {
      console.error(`bench:load: the server on ${base} did not become healthy (is MariaDB up? bash scripts/db.sh start)`);
      return 1;
    }
    const op = demoUsers.find((u) => u.role === "operator");
    if (!op) throw new Error("no demo operator in db/seed-data.ts");
    const cookie = await signIn(base, op.email, op.password);
    const check = await fetch(`${base}/api/queue/board`, { headers: { cookie } });
    if (check.status !== 200) throw new Error(`GET /api/queue/board as ${op.email}: ${check.status}`);
    const board = (await check.json()) as Record<string, unknown>;
    console.log(`bench:load: ${base}, database ${process.env.DB_NAME ?? "platewright"}, board keys: ${Object.keys(board).join(", ")}`);
    // Warm both routes so neither pays for first compilation of its code paths.
    for (let i = 0; i < 20; i++) {
      await fetch(`${base}/api/health`).then((r) => r.arrayBuffer());
      await fetch(`${base}/api/queue/board`, { headers: { cookie } }).then((r) => r.arrayBuffer());
    }
    console.log(`bench:load: ${CONNECTIONS} connections, ${SECONDS} s per route…`);
    const trivial = await hammer("GET /api/health", `${base}/api/health`);
    const queue = await hammer("GET /api/queue/board (operator)", `${base}/api/queue/board`, cookie);
    const rows = [trivial, queue].map((f) => ({ route: f.label, "req/s": f.rps.toFixed(1), "p95 ms": f.p95.toFixed(1), requests: f.total, errors: f.errors, "non-2xx": f.non2xx }));
    console.table(rows);
    const ratio = queue.rps / trivial.rps;
    console.log(`ratio (board / health throughput): ${ratio.toFixed(3)}  goal ≥ ${GOAL}: ${ratio >= GOAL ? "met" : "NOT met"}`);
    const clean = [trivial, queue].every((f) => f.errors === 0 && f.non2xx === 0);
    if (!clean) console.error("bench:load: some requests failed (see errors / non-2xx above)");
    const burstOk = await replanBurst(base, cookie);
    const member = demoUsers.find((u) => u.role === "member")!;
    const uploadsOk = await uploadBurst(base, await signIn(base, member.email, member.password));
    return clean && burstOk && uploadsOk ? 0 : 1;
  } finally {
    server?.kill("SIGTERM");
  }
}

main().then(
  (code) => process.exit(code),
  (e: unknown) => {
    console.error("bench:load:", e instanceof Error ? e.message : e);
    process.exit(1);
  },
);
