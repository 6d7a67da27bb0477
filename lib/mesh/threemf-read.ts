import { MeshReadError } from "./errors";
import { composeAffine, parseTransform, type Affine } from "./affine";
import { attr, attrIndex, attrNumber, scanXml, type XmlTag } from "./xml";
import { zipEntries, zipRead, type ZipEntry } from "./zip";

/** 3MF Core Specification (3MF Consortium, v1.3.0): namespaces, relationship type, units. */
export const CORE_NS = "http://schemas.microsoft.com/3dmanufacturing/core/2015/02";
export const MODEL_REL = "http://schemas.microsoft.com/3dmanufacturing/2013/01/3dmodel";
/** Millimetres per model unit (3MF Core Specification, §3.4.1 unit attribute). */
export const UNIT_MM: Record<string, number> = { micron: 0.001, millimeter: 1, centimeter: 10, inch: 25.4, foot: 304.8, meter: 1000 };

export interface ThreeMfPart {
  objectId: string;
  name: string | undefined;
  firstTriangle: number;
  triangleCount: number;
}

export interface ThreeMfReadOptions {
  maxUncompressedBytes?: number;
  maxTriangles?: number;
}

interface MeshObj { kind: "mesh"; id: string; name: string | undefined; verts: Float64Array; nv: number; tris: Uint32Array; nt: number }
interface CompObj { kind: "components"; id: string; name: string | undefined; comps: { objectId: string; m: Affine | undefined }[] }
type Obj = MeshObj | CompObj;

function model(msg: string): never {
  throw new MeshReadError("BAD_MODEL", `3MF model: ${msg}`);
}

function grow<T extends Float64Array | Uint32Array>(a: T, need: number): T {
  if (need <= a.length) return a;
  const next = new (a.constructor as new (n: number) => T)(Math.max(need, a.length * 2));
  next.set(a);
  return next;
}

function localName(name: string, prefixes: Map<string, string>, defaultNs: string): { ns: string; local: string } {
  const c = name.indexOf(":");
  if (c < 0) return { ns: defaultNs, local: name };
  return { ns: prefixes.get(name.slice(0, c)) ?? "", local: name.slice(c + 1) };
}

function findEntry(entries: ZipEntry[], path: string): ZipEntry | undefined {
  const p = path.replace(/^\//, "");
  return entries.find((e) => e.name === p) ?? entries.find((e) => e.name.toLowerCase() === p.toLowerCase());
}

/** The model part's path, found through the package relationships (_rels/.rels). */
function modelPath(zip: Uint8Array, entries: ZipEntry[], cap: number): string {
  const rels = findEntry(entries, "_rels/.rels");
  if (!rels) throw new MeshReadError("NOT_3MF", "a ZIP file without _rels/.rels: not a 3MF package");
  let target: string | undefined;
  scanXml(zipRead(zip, rels, cap), {
    open(t) {
      if (target === undefined && t.name.endsWith("Relationship") && attr(t, "Type") === MODEL_REL) target = attr(t, "Target");
    },
    close() {},
  });
  if (!target) throw new MeshReadError("NOT_3MF", "the package relationships name no 3D model part: not a 3MF package");
  return decodeURI(target);
}

export function readThreeMf(zip: Uint8Array, opts: ThreeMfReadOptions = {}): { positions: Float32Array; parts: ThreeMfPart[]; unit: string } {
  const cap = opts.maxUncompressedBytes ?? 512 * 1024 * 1024;
  const maxTris = opts.maxTriangles ?? 50_000_000;
  const entries = zipEntries(zip);
  const path = modelPath(zip, entries, cap);
  const entry = findEntry(entries, path);
  if (!entry) throw new MeshReadError("NOT_3MF", `the model part '${path}' named in _rels/.rels is not in the package`);
  const xml = zipRead(zip, entry, cap);

  const objects = new Map<string, Obj>();
  const items: { objectId: string; m: Affine | undefined }[] = [];
  const prefixes = new Map<string, string>();
  let defaultNs = "";
  let unit = "millimeter";
  let sawModel = false;
  let cur: Obj | undefined;
  let inBuild = false;
  const need = (t: XmlTag, name: string): string => attr(t, name) ?? model(`<${t.name}> has no ${name} attribute`);

  // Namespaces are read from the root only, so after it a name always resolves the same way.
  const resolved = new Map<string, { ns: string; local: string }>();
  const resolve = (name: string) => {
    let r = resolved.get(name);
    if (!r) { r = localName(name, prefixes, defaultNs); if (sawModel) resolved.set(name, r); }
    return r;
  };

  scanXml(xml, {
    open(t) {
      if (!sawModel) {
        for (let k = 0; k < t.count; k++) {
          const s = t.ranges[k * 4]!, e = t.ranges[k * 4 + 1]!;
          const an = new TextDecoder().decode(t.bytes.subarray(s, e));
          if (an === "xmlns") defaultNs = attr(t, an) ?? "";
          else if (an.startsWith("xmlns:")) prefixes.set(an.slice(6), attr(t, an) ?? "");
        }
      }
      const { ns, local } = resolve(t.name);
      if (!sawModel) {
        if (local !== "model" || ns !== CORE_NS) throw new MeshReadError("NOT_3MF", `the model part's root is <${t.name}> in '${ns}', not a 3MF core <model>`);
        sawModel = true;
        unit = attr(t, "unit") ?? "millimeter";
        if (!(unit in UNIT_MM)) throw new MeshReadError("BAD_UNIT", `unknown 3MF unit '${unit.slice(0, 40)}' (expected micron, millimeter, centimeter, inch, foot or meter)`);
        return;
      }
      if (ns !== CORE_NS) return;
      if (local === "object") {
        const id = need(t, "id");
        if (objects.has(id)) model(`object id ${id} is defined twice`);
        cur = undefined;
        objects.set(id, (cur = { kind: "mesh", id, name: attr(t, "name"), verts: new Float64Array(0), nv: 0, tris: new Uint32Array(0), nt: 0 }));
      } else if (local === "components" && cur) {
        cur = { kind: "components", id: cur.id, name: cur.name, comps: [] };
        objects.set(cur.id, cur);
      } else if (local === "vertex" && cur?.kind === "mesh") {
        const kx = attrIndex(t, "x"), ky = attrIndex(t, "y"), kz = attrIndex(t, "z");
        if (kx < 0 || ky < 0 || kz < 0) model(`a vertex of object ${cur.id} lacks x, y or z`);
        const x = attrNumber(t, kx), y = attrNumber(t, ky), z = attrNumber(t, kz);
        if (!Number.isFinite(x) || !Number.isFinite(y) || !Number.isFinite(z)) {
          throw new MeshReadError("NON_FINITE", `3MF object ${cur.id}, vertex ${cur.nv}: a coordinate is not a finite number`);
        }
        cur.verts = grow(cur.verts, 3 * cur.nv + 3);
        const p = 3 * cur.nv++;
        cur.verts[p] = x; cur.verts[p + 1] = y; cur.verts[p + 2] = z;
      } else if (local === "triangle" && cur?.kind === "mesh") {
        const k1 = attrIndex(t, "v1"), k2 = attrIndex(t, "v2"), k3 = attrIndex(t, "v3");
        if (k1 < 0 || k2 < 0 || k3 < 0) model(`a triangle of object ${cur.id} lacks v1, v2 or v3`);
        const a = attrNumber(t, k1), b = attrNumber(t, k2), c = attrNumber(t, k3);
        const nv = cur.nv;
        if (!(a >= 0 && a < nv && b >= 0 && b < nv && c >= 0 && c < nv && Number.isInteger(a) && Number.isInteger(b) && Number.isInteger(c))) {
          const v = [a, b, c].find((x) => !(Number.isInteger(x) && x >= 0 && x < nv))!;
          throw new MeshReadError("BAD_INDEX", `3MF object ${cur.id}, triangle ${cur.nt}: vertex index ${Number.isNaN(v) ? "(not a number)" : v} is outside 0…${nv - 1}`);
        }
        cur.tris = grow(cur.tris, 3 * cur.nt + 3);
        const p = 3 * cur.nt++;
        cur.tris[p] = a; cur.tris[p + 1] = b; cur.tris[p + 2] = c;
      } else if (local === "component" && cur?.kind === "components") {
        const tr = attr(t, "transform");
        cur.comps.push({ objectId: need(t, "objectid"), m: tr === undefined ? undefined : parseTransform(tr) });
      } else if (local === "build") {
        inBuild = true;
      } else if (local === "item" && inBuild) {
        const tr = attr(t, "transform");
        items.push({ objectId: need(t, "objectid"), m: tr === undefined ? undefined : parseTransform(tr) });
      }
    },
    close(name) {
      const { ns, local } = resolve(name);
      if (ns !== CORE_NS) return;
      if (local === "object") cur = undefined;
      else if (local === "build") inBuild = false;
    },
  });
  if (!sawModel) throw new MeshReadError("NOT_3MF", "the model part has no <model> element");
  if (items.length === 0) model("the build has no items, so nothing would be printed");

  // Count first (with cycle detection), so a component tree cannot make us allocate unboundedly.
  const counts = new Map<string, number>();
  const counting = new Set<string>();
  const countOf = (id: string): number => {
    const known = counts.get(id);
    if (known !== undefined) return known;
    const o = objects.get(id) ?? model(`reference to object ${id}, which is not defined`);
    if (counting.has(id)) model(`object ${id} contains itself through its components`);
    counting.add(id);
    let n = 0;
    if (o.kind === "mesh") n = o.nt;
    else for (const c of o.comps) n += countOf(c.objectId);
    counting.delete(id);
    if (n > maxTris) throw new MeshReadError("TOO_LARGE", `the 3MF build would have ${n} triangles, over the ${maxTris} limit`);
    counts.set(id, n);
    return n;
  };
  let total = 0;
  for (const it of items) {
    total += countOf(it.objectId);
    if (total > maxTris) throw new MeshReadError("TOO_LARGE", `the 3MF build would have ${total} triangles, over the ${maxTris} limit`);
  }
  if (total === 0) throw new MeshReadError("NO_TRIANGLES", "the 3MF build contains no triangles");

  const s = UNIT_MM[unit]!;
  const scale: Affine = [s, 0, 0, 0, s, 0, 0, 0, s, 0, 0, 0];
  const out = new Float32Array(total * 9);
  let tri = 0;
  // A component's transform applies before its parent's (3MF Core Specification §4.1 / §5.1.1).
  const emit = (id: string, m: Affine) => {
    const o = objects.get(id)!;
    if (o.kind === "components") {
      for (const c of o.comps) emit(c.objectId, c.m ? composeAffine(c.m, m) : m);
      return;
    }
    const [m00, m01, m02, m10, m11, m12, m20, m21, m22, m30, m31, m32] = m;
    const v = o.verts, tr = o.tris;
    for (let k = 0; k < o.nt; k++) {
      for (let c = 0; c < 3; c++) {
        const p = 3 * tr[3 * k + c]!;
        const x = v[p]!, y = v[p + 1]!, z = v[p + 2]!;
        const q = tri * 9 + c * 3;
        out[q] = m00 * x + m10 * y + m20 * z + m30;
        out[q + 1] = m01 * x + m11 * y + m21 * z + m31;
        out[q + 2] = m02 * x + m12 * y + m22 * z + m32;
      }
      tri++;
    }
  };
  const parts: ThreeMfPart[] = [];
  for (const it of items) {
    const first = tri;
    emit(it.objectId, it.m ? composeAffine(it.m, scale) : scale);
    parts.push({ objectId: it.objectId, name: objects.get(it.objectId)?.name, firstTriangle: first, triangleCount: tri - first });
  }
  return { positions: out, parts, unit };
}
