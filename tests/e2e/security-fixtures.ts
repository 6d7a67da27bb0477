// Shared pieces of the security specs: who calls (the five callers of the role matrix), the ids of
// the seeded objects they call on, the route list read from the file system, and the e2e database.
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { request, type APIRequestContext } from "@playwright/test";
import mysql from "mysql2/promise";
import { targetFromEnv } from "../../db/migrate";
import { authFile, demo } from "./helpers";

export const baseURL = `http://127.0.0.1:${process.env.E2E_PORT ?? 3100}`;

/** The matrix's callers: nobody, the owning member (Jun), another member (Priya), the workshop. */
export const callers = ["anon", "owner", "other", "operator", "admin"] as const;
export type Caller = (typeof callers)[number];

const stateOf: Record<Exclude<Caller, "anon">, string> = { owner: "member", other: "member2", operator: "operator", admin: "admin" };

/** One API client per caller, signed in from the states the setup project saved. Redirects are not followed. */
export async function apiClients(): Promise<Record<Caller, APIRequestContext>> {
  const out = {} as Record<Caller, APIRequestContext>;
  for (const c of callers) {
    out[c] = await request.newContext({ baseURL, maxRedirects: 0, ...(c === "anon" ? {} : { storageState: authFile(stateOf[c]) }) });
  }
  return out;
}

export async function disposeAll(clients: Record<Caller, APIRequestContext>): Promise<void> {
  for (const c of callers) await clients[c].dispose();
}

/** The e2e database the test server uses (DB_NAME is set by scripts/e2e.sh). */
export function e2eDb(): Promise<mysql.Connection> {
  return mysql.createConnection(targetFromEnv(process.env.DB_NAME ?? "platewright_e2e"));
}

export async function rows<T>(conn: mysql.Connection, sql: string, params: unknown[] = []): Promise<T[]> {
  const [r] = await conn.query(sql, params);
  return r as T[];
}

/** Ids of seeded objects the matrix calls on; Jun owns "Camera slider", Priya owns "Seed-tray rack". */
export interface Fixtures {
  junId: number;
  priyaId: number;
  assemblyId: number;
  subAssemblyId: number;
  partId: number;
  fileId: number;
  itemId: number;
  plateId: number;
  queueEntryId: number;
  printerId: number;
  materialId: number;
  spoolId: number;
}

function first<T>(list: T[], what: string): T {
  const v = list[0];
  if (v === undefined) throw new Error(`fixture missing: ${what}`);
  return v;
}

/** Member objects come through the API as Jun (what he sees is what he owns); workshop ids from the database. */
export async function loadFixtures(owner: APIRequestContext, conn: mysql.Connection): Promise<Fixtures> {
  const jun = demo("member");
  const priya = demo("member2");
  const list = (await (await owner.get("/api/assemblies")).json()) as { id: number; name: string }[] | { assemblies: { id: number; name: string }[] };
  const asms = Array.isArray(list) ? list : list.assemblies;
  const root = first(asms.filter((a) => a.name === "Camera slider"), "Camera slider");
  const det = (await (await owner.get(`/api/assemblies/${root.id}`)).json()) as {
    nodes: { id: number; parentId: number | null }[];
    parts: { id: number; currentFileId: number | null }[];
    items: { id: number }[];
  };
  const sub = first(det.nodes.filter((n) => n.parentId !== null), "sub-assembly");
  const part = first(det.parts.filter((p) => p.currentFileId !== null), "part with a file");
  const item = first(det.items, "item");
  const ids = async (sql: string, p: unknown[] = []) => first(await rows<{ id: number }>(conn, sql, p), sql).id;
  const junId = await ids("SELECT id FROM users WHERE email = ?", [jun.email]);
  const priyaId = await ids("SELECT id FROM users WHERE email = ?", [priya.email]);
  const plateId = await ids(
    // Started or finished plates first: a re-plan (concurrency.spec) replaces only planned ones.
    "SELECT pi.plate_id AS id FROM plate_items pi JOIN plates p ON p.id = pi.plate_id GROUP BY pi.plate_id, p.status HAVING SUM(pi.member_id = ?) > 0 AND SUM(pi.member_id = ?) = 0 ORDER BY p.status = 'planned', pi.plate_id LIMIT 1",
    [junId, priyaId],
  );
  return {
    junId,
    priyaId,
    assemblyId: root.id,
    subAssemblyId: sub.id,
    partId: part.id,
    fileId: part.currentFileId!,
    itemId: item.id,
    plateId,
    queueEntryId: await ids("SELECT id FROM queue_entries WHERE member_id = ? ORDER BY id LIMIT 1", [junId]),
    printerId: await ids("SELECT id FROM printers ORDER BY id LIMIT 1"),
    materialId: await ids("SELECT material_id AS id FROM spools ORDER BY id LIMIT 1"),
    spoolId: await ids("SELECT id FROM spools ORDER BY id LIMIT 1"),
  };
}

const METHODS = ["GET", "POST", "PUT", "PATCH", "DELETE", "HEAD", "OPTIONS"] as const;

function walk(dir: string): string[] {
  return (readdirSync(dir, { recursive: true }) as string[]).map((f) => path.join(dir, f));
}

/** Every `METHOD /path` a route.ts under app/ exports, path as in the folders (route groups dropped). */
export function listRoutes(root = "app"): string[] {
  const out: string[] = [];
  for (const file of walk(root).filter((f) => path.basename(f) === "route.ts" || path.basename(f) === "route.tsx")) {
    const src = readFileSync(file, "utf8");
    const segs = path.dirname(path.relative(root, file)).split(path.sep).filter((s) => s !== "." && !/^\(.*\)$/.test(s));
    const route = "/" + segs.join("/");
    const found = new Set<string>();
    for (const m of src.matchAll(/export\s+(?:async\s+)?(?:function|const|let)\s+([A-Z]+)\b/g)) found.add(m[1]!);
    for (const m of src.matchAll(/export\s*\{([^}]*)\}/g)) {
      for (const part of m[1]!.split(",")) {
        const name = part.trim().split(/\s+as\s+/).pop()?.trim();
        if (name) found.add(name);
      }
    }
    for (const m of METHODS) if (found.has(m)) out.push(`${m} ${route}`);
  }
  return out.sort();
}

/** Files under app/ and lib/ that declare server actions. */
export function listServerActionFiles(roots = ["app", "lib"]): string[] {
  return roots
    .flatMap((r) => walk(r))
    .filter((f) => /\.(ts|tsx)$/.test(f))
    .filter((f) => /^\s*["']use server["']/m.test(readFileSync(f, "utf8")))
    .sort();
}

/** A 4xx answer must carry a JSON `error` the user can read. */
export async function errorMessage(res: { headers(): Record<string, string>; text(): Promise<string> }): Promise<string> {
  const type = res.headers()["content-type"] ?? "";
  const text = await res.text();
  if (!type.includes("application/json")) return "";
  const body = JSON.parse(text) as { error?: unknown };
  return typeof body.error === "string" ? body.error : "";
}

/**
 * A binary STL of `nx × ny` separate boxes (12 facets each), laid out on a grid. Layout from the STL
 * format description (Burns, Automated Fabrication §6.5; Bourke 1999): 80-byte header, uint32 LE
 * facet count, 50 bytes per facet (normal, three vertices, uint16 attribute count).
 */
export function boxesStl(nx: number, ny: number, size = 5): Buffer {
  const quads: [number, number, number][][] = [
    [[0, 0, 0], [0, 1, 0], [1, 1, 0], [1, 0, 0]],
    [[0, 0, 1], [1, 0, 1], [1, 1, 1], [0, 1, 1]],
    [[0, 0, 0], [1, 0, 0], [1, 0, 1], [0, 0, 1]],
    [[0, 1, 0], [0, 1, 1], [1, 1, 1], [1, 1, 0]],
    [[0, 0, 0], [0, 0, 1], [0, 1, 1], [0, 1, 0]],
    [[1, 0, 0], [1, 1, 0], [1, 1, 1], [1, 0, 1]],
  ];
  const n = nx * ny * 12;
  const buf = Buffer.alloc(84 + 50 * n);
  buf.write("platewright security test boxes", 0, "ascii");
  buf.writeUInt32LE(n, 80);
  let o = 84;
  for (let i = 0; i < nx; i++) {
    for (let j = 0; j < ny; j++) {
      const ox = i * size * 2;
      const oy = j * size * 2;
      for (const q of quads) {
        for (const tri of [[q[0], q[1], q[2]], [q[0], q[2], q[3]]] as [number, number, number][][]) {
          o += 12; // zero normal: readers recompute it from the vertex order
          for (const v of tri) {
            buf.writeFloatLE(ox + v[0] * size, o);
            buf.writeFloatLE(oy + v[1] * size, o + 4);
            buf.writeFloatLE(v[2] * size, o + 8);
            o += 12;
          }
          o += 2;
        }
      }
    }
  }
  return buf;
}

/** Names in the storage temp folder (uploads in flight or left behind). */
export function tempEntries(storageDir = process.env.STORAGE_DIR ?? ".data/files"): string[] {
  try {
    return readdirSync(path.join(storageDir, ".tmp"));
  } catch {
    return [];
  }
}

/** A part of the owner's own, in a fresh assembly, so races and uploads leave the seeded demo parts alone. */
export async function throwawayPart(owner: APIRequestContext, label: string, quantity = 1): Promise<number> {
  const asm = await owner.post("/api/assemblies", { data: { name: `${label} ${Date.now().toString(36)}` } });
  if (asm.status() !== 201) throw new Error(`throwaway assembly: ${asm.status()} ${await asm.text()}`);
  const { id } = (await asm.json()) as { id: number };
  const part = await owner.post(`/api/assemblies/${id}/parts`, { data: { name: `${label} part`, quantity, material: "PLA" } });
  if (part.status() !== 201) throw new Error(`throwaway part: ${part.status()} ${await part.text()}`);
  return ((await part.json()) as { id: number }).id;
}
