// Bad input everywhere: every JSON-body route of the role matrix gets malformed JSON, a wrong content
// type, unknown fields, wrong types, a 2 MB string and out-of-range numbers, each answered with a 4xx and
// a JSON `error` (never 500); nothing is stored and the server keeps serving. Uploads: a declared size
// over the limit, a `../` name, a header-injection name and a body that ends early.
// Status codes: RFC 9110 §15.5 (400, 413, 415-style refusals as 400, 422). Content-Disposition: RFC 6266 §4.
import http from "node:http";
import { existsSync } from "node:fs";
import path from "node:path";
import { expect, test, type APIRequestContext } from "@playwright/test";
import type mysql from "mysql2/promise";
import { matrix, type MatrixRow } from "./role-matrix-table";
import { apiClients, baseURL, boxesStl, callers, disposeAll, e2eDb, loadFixtures, rows, tempEntries, throwawayPart, type Caller, type Fixtures } from "./security-fixtures";

let api: Record<Caller, APIRequestContext>;
let conn: mysql.Connection;
let fx: Fixtures;
/** Uploads go to a part of Jun's own making, so the seeded parts keep their files. */
let upPart: number;

test.beforeAll(async () => {
  api = await apiClients();
  conn = await e2eDb();
  fx = await loadFixtures(api.owner, conn);
  upPart = await throwawayPart(api.owner, "Upload checks");
});

test.afterAll(async () => {
  await disposeAll(api);
  await conn.end();
});

/** A fingerprint of what the bad requests could have written: row counts and version sums. */
async function stateOfDb(): Promise<string> {
  const q = [
    "SELECT COUNT(*) n, COALESCE(SUM(version),0) v FROM assemblies",
    "SELECT COUNT(*) n, COALESCE(SUM(version),0) v FROM parts",
    "SELECT COUNT(*) n, COALESCE(SUM(version),0) v FROM assembly_items",
    "SELECT COUNT(*) n, COALESCE(SUM(version),0) v FROM part_instances",
    "SELECT COUNT(*) n, COALESCE(SUM(version),0) v FROM materials",
    "SELECT COUNT(*) n, COALESCE(SUM(version),0) v FROM printers",
    "SELECT COUNT(*) n, COALESCE(SUM(version),0) v FROM spools",
    "SELECT COUNT(*) n, COALESCE(SUM(version),0) v FROM queue_entries",
    "SELECT COUNT(*) n, COALESCE(SUM(version),0) v FROM plates",
    "SELECT COUNT(*) n, COALESCE(SUM(version),0) v FROM workshop_settings",
    "SELECT COUNT(*) n, 0 v FROM part_files",
    "SELECT COUNT(*) n, 0 v FROM mesh_blobs",
    "SELECT COUNT(*) n, 0 v FROM assembly_shares",
    "SELECT COUNT(*) n, 0 v FROM invitations",
    "SELECT COUNT(*) n, 0 v FROM attended_hours",
  ];
  const out: string[] = [];
  for (const s of q) {
    const [r] = await rows<{ n: number; v: number }>(conn, s);
    out.push(`${s.split("FROM ")[1]}=${r?.n}/${r?.v}`);
  }
  return out.join(" ");
}

/** The first caller the matrix lets through to validation (so the bad body is what gets judged). */
function allowedCaller(row: MatrixRow): Caller | undefined {
  return callers.find((c) => row.expect[c] === 422);
}

const hugeString = "x".repeat(2 * 1024 * 1024);
const badBodies: { what: string; type: string; body: string | Buffer }[] = [
  { what: "malformed JSON", type: "application/json", body: '{"name": "Bracket", ' },
  { what: "JSON that is not an object", type: "application/json", body: "[1,2,3]" },
  { what: "wrong content type", type: "text/plain", body: '{"name":"Bracket"}' },
  { what: "form-encoded body", type: "application/x-www-form-urlencoded", body: "name=Bracket&version=1" },
  { what: "unknown fields", type: "application/json", body: JSON.stringify({ __proto__x: 1, isAdmin: true, role: "admin" }) },
  {
    what: "wrong types",
    type: "application/json",
    body: JSON.stringify({ name: 42, version: "one", quantity: [1], email: { a: 1 }, priority: true, printerId: "x", instanceId: null, to: 7, grams: "many", kind: 3 }),
  },
  { what: "a 2 MB string", type: "application/json", body: JSON.stringify({ name: hugeString, notes: hugeString.slice(0, 10) }) },
  { what: "1e308 and beyond", type: "application/json", body: '{"version": 1e308, "quantity": 1e308, "priority": 1e999, "grams": -1e308, "instanceId": 1e308, "printerId": 1e308}' },
  { what: "deeply nested JSON", type: "application/json", body: "[".repeat(5000) + "]".repeat(5000) },
];

test("every JSON-body route refuses bad input with a 4xx and a message, stores nothing, and the server keeps serving", async () => {
  test.setTimeout(180_000);
  const before = await stateOfDb();
  const jsonRoutes = Object.entries(matrix).filter(([, r]) => r.body === "invalid-json");
  expect(jsonRoutes.length).toBeGreaterThan(20);
  const problems: string[] = [];
  for (const [key, row] of jsonRoutes) {
    const [method] = key.split(" ") as [string];
    const c = allowedCaller(row);
    if (!c) continue; // e.g. the webhook: refused before the body is read (its own row checks that)
    for (const b of badBodies) {
      const res = await api[c].fetch(row.path(fx), { method, headers: { "content-type": b.type }, data: b.body, maxRedirects: 0 });
      const s = res.status();
      const text = await res.text();
      let msg = "";
      try {
        msg = (JSON.parse(text) as { error?: string }).error ?? "";
      } catch {
        /* not JSON: reported below */
      }
      if (s < 400 || s >= 500 || msg.length < 5) problems.push(`${key} as ${c}, ${b.what}: ${s} ${text.slice(0, 120)}`);
    }
  }
  expect(problems).toEqual([]);
  expect(await stateOfDb()).toBe(before);
  const health = await api.anon.get("/api/health");
  expect(health.status()).toBe(200);
});

test("a chunked JSON body with no Content-Length is cut off with 413 once it passes the cap, and nothing is stored", async () => {
  const before = await stateOfDb();
  const cookie = (await api.owner.storageState()).cookies.map((c) => `${c.name}=${c.value}`).join("; ");
  // RFC 9112 §7.1: chunked transfer coding, so the server learns the size only by reading. The JSON cap
  // is 1 000 000 bytes (readJson's default); keep sending 64 KiB chunks of one long string until it answers.
  const chunk = Buffer.alloc(64 * 1024, "x");
  const out = await new Promise<{ status: number; body: string; sent: number }>((resolve, reject) => {
    let sent = 0;
    let answered = false;
    const req = http.request(`${baseURL}/api/assemblies`, { method: "POST", headers: { "content-type": "application/json", "transfer-encoding": "chunked", cookie } });
    req.on("response", (res) => {
      answered = true;
      let body = "";
      res.on("data", (d: Buffer) => (body += d.toString()));
      res.on("end", () => {
        resolve({ status: res.statusCode ?? 0, body, sent });
        req.destroy();
      });
    });
    req.on("error", (e) => (answered ? undefined : reject(e)));
    const pump = () => {
      // Up to 64 MiB: a server that buffered the whole body before judging it would never answer in time.
      while (!answered && sent < 64 * 1024 * 1024) {
        const more = req.write(sent === 0 ? Buffer.concat([Buffer.from('{"name":"'), chunk]) : chunk);
        sent += chunk.length;
        if (!more) return void req.once("drain", pump);
      }
    };
    pump();
  });
  expect(out.status, out.body).toBe(413);
  expect((JSON.parse(out.body) as { error: string }).error).toMatch(/larger than the limit of 1000000 bytes/);
  expect(out.sent).toBeLessThan(64 * 1024 * 1024);
  expect(await stateOfDb()).toBe(before);
  expect((await api.anon.get("/api/health")).status()).toBe(200);
});

function partFiles(partId: number) {
  return rows<{ id: number }>(conn, "SELECT id FROM part_files WHERE part_id = ?", [partId]);
}

test("an upload declared over the limit is refused before any byte is stored", async () => {
  const files = (await partFiles(upPart)).length;
  const tmp = tempEntries();
  // The e2e server keeps the default limit (200 MB, lib/env.ts); declare one byte more and send a little.
  const status = await new Promise<number>((resolve, reject) => {
    const req = http.request(`${baseURL}/api/parts/${upPart}/file?name=big.stl`, {
      method: "PUT",
      headers: { "content-type": "application/octet-stream", "content-length": String(200 * 1024 * 1024 + 1), cookie: "" },
    });
    req.on("response", (res) => {
      res.resume();
      resolve(res.statusCode ?? 0);
      req.destroy();
    });
    req.on("error", reject);
    req.write(Buffer.alloc(64 * 1024));
  });
  // Anonymous: 401 before anything. Then the owner, over a raw request so the declared length is what is sent.
  expect(status).toBe(401);
  const cookie = (await api.owner.storageState()).cookies.map((c) => `${c.name}=${c.value}`).join("; ");
  const owner = await new Promise<{ status: number; body: string }>((resolve, reject) => {
    const req = http.request(`${baseURL}/api/parts/${upPart}/file?name=big.stl`, {
      method: "PUT",
      headers: { "content-type": "application/octet-stream", "content-length": String(200 * 1024 * 1024 + 1), cookie },
    });
    req.on("response", (res) => {
      let body = "";
      res.on("data", (d: Buffer) => (body += d.toString()));
      res.on("end", () => {
        resolve({ status: res.statusCode ?? 0, body });
        req.destroy();
      });
    });
    req.on("error", reject);
    req.write(Buffer.alloc(64 * 1024));
  });
  expect(owner.status).toBe(413);
  expect((JSON.parse(owner.body) as { error: string }).error).toMatch(/larger than the upload limit/);
  expect((await partFiles(upPart)).length).toBe(files);
  expect(tempEntries().filter((t) => !tmp.includes(t))).toEqual([]);
});

test("a ../ file name stays a label: stored inside storage, served as an attachment with a safe name", async () => {
  const stl = boxesStl(1, 1);
  const evil = "../../../../tmp/pw-escape-check.stl";
  const res = await api.owner.put(`/api/parts/${upPart}/file?name=${encodeURIComponent(evil)}`, { headers: { "content-type": "application/octet-stream" }, data: stl });
  expect(res.status(), await res.text()).toBe(201);
  const up = (await res.json()) as { fileId: number; sha256: string };
  expect(existsSync("/tmp/pw-escape-check.stl")).toBe(false);
  expect(existsSync(path.resolve(".data/files", evil))).toBe(false);
  const dl = await api.owner.get(`/api/files/${up.fileId}`);
  expect(dl.status()).toBe(200);
  const h = dl.headers();
  // RFC 6266 §4: attachment with a quoted filename; no path separators or quotes inside it.
  expect(h["content-disposition"]).toMatch(/^attachment; filename="[^"/\\\r\n]+"$/);
  expect(h["content-type"]).toBe("application/octet-stream");
  expect(h["x-content-type-options"]).toBe("nosniff");
  expect(Buffer.compare(await dl.body(), stl)).toBe(0);
  // Another member is not served it at all (existence hidden).
  expect((await api.other.get(`/api/files/${up.fileId}`)).status()).toBe(404);

  // A name trying to end the header and add one of its own.
  const inj = 'a".stl\r\nX-Injected: 1\r\n\r\nb.stl';
  const res2 = await api.owner.put(`/api/parts/${upPart}/file?name=${encodeURIComponent(inj)}`, { headers: { "content-type": "application/octet-stream" }, data: stl });
  expect(res2.status()).toBeLessThan(500);
  if (res2.status() === 201) {
    const dl2 = await api.owner.get(`/api/files/${((await res2.json()) as { fileId: number }).fileId}`);
    expect(dl2.headers()["x-injected"]).toBeUndefined();
    expect(dl2.headers()["content-disposition"]).toMatch(/^attachment; filename="[^"/\\\r\n]+"$/);
  } else {
    expect(res2.status()).toBeGreaterThanOrEqual(400);
  }
});

test("an upload with the wrong content type or a non-mesh body is refused and leaves nothing", async () => {
  const files = (await partFiles(upPart)).length;
  const blobs = await rows<{ n: number }>(conn, "SELECT COUNT(*) n FROM mesh_blobs");
  const tmp = tempEntries();
  const wrongType = await api.owner.put(`/api/parts/${upPart}/file?name=x.stl`, { headers: { "content-type": "text/plain" }, data: boxesStl(1, 1) });
  expect(wrongType.status()).toBe(400);
  expect(((await wrongType.json()) as { error: string }).error).toMatch(/octet-stream/);
  const junk = await api.owner.put(`/api/parts/${upPart}/file?name=x.stl`, { headers: { "content-type": "application/octet-stream" }, data: Buffer.from("this is not a mesh at all, just words") });
  expect(junk.status()).toBe(422);
  expect(((await junk.json()) as { error: string }).error).toMatch(/could not be read/);
  expect((await partFiles(upPart)).length).toBe(files);
  expect(await rows<{ n: number }>(conn, "SELECT COUNT(*) n FROM mesh_blobs")).toEqual(blobs);
  expect(tempEntries().filter((t) => !tmp.includes(t))).toEqual([]);
});

test("a request body that ends early stores nothing, leaves no temp file, and the server keeps serving", async () => {
  const files = (await partFiles(upPart)).length;
  const tmp = tempEntries();
  const state = await api.owner.storageState();
  const cookie = state.cookies.map((c) => `${c.name}=${c.value}`).join("; ");
  const full = boxesStl(40, 40); // 19 200 facets, 960 084 bytes
  await new Promise<void>((resolve) => {
    const req = http.request(`${baseURL}/api/parts/${upPart}/file?name=cut.stl`, {
      method: "PUT",
      headers: { "content-type": "application/octet-stream", "content-length": String(full.length), cookie },
    });
    req.on("error", () => resolve());
    req.on("close", () => resolve());
    req.write(full.subarray(0, 300_000), () => setTimeout(() => req.destroy(), 300));
  });
  // Give the server a moment to notice the closed connection and clean up.
  await expect.poll(() => tempEntries().filter((t) => !tmp.includes(t)), { timeout: 10_000 }).toEqual([]);
  expect((await partFiles(upPart)).length).toBe(files);
  expect((await api.anon.get("/api/health")).status()).toBe(200);
  // The same bytes sent whole are taken.
  const ok = await api.owner.put(`/api/parts/${upPart}/file?name=cut.stl`, { headers: { "content-type": "application/octet-stream" }, data: full });
  expect(ok.status(), await ok.text()).toBe(201);
});
