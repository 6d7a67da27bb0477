import { MeshReadError } from "./errors";
import { parseTransform, type Affine } from "./affine";
import { pushTriangle, pushVertex, scanTriangles, scanVertices, type MeshSink } from "./threemf-mesh-scan";
import { attr, attrIndex, attrNumber, scanXml, type XmlTag } from "./xml";

/** 3MF Core Specification (3MF Consortium, v1.3.0): namespaces, relationship type, units. */
export const CORE_NS = "http://schemas.microsoft.com/3dmanufacturing/core/2015/02";
/** 3MF Production Extension (v1.1.2): `path` on build items and components. */
export const PROD_NS = "http://schemas.microsoft.com/3dmanufacturing/production/2015/06";
export const MODEL_REL = "http://schemas.microsoft.com/3dmanufacturing/2013/01/3dmodel";
/** Millimetres per model unit (3MF Core Specification, §3.4.1 unit attribute). */
export const UNIT_MM: Record<string, number> = { micron: 0.001, millimeter: 1, centimeter: 10, inch: 25.4, foot: 304.8, meter: 1000 };

/** A reference to an object: in this part (`path` undefined) or in another model part of the package. */
export interface ObjRef { objectId: string; path: string | undefined; m: Affine | undefined }
export interface MeshObj extends MeshSink { kind: "mesh"; id: string; name: string | undefined }
export interface CompObj { kind: "components"; id: string; name: string | undefined; comps: ObjRef[] }
export type Obj = MeshObj | CompObj;

/** One model part (an XML file of the package): its unit, objects and (root only) build items. */
export interface ModelPart { path: string; unit: string; objects: Map<string, Obj>; items: ObjRef[] }

function model(part: string, msg: string): never {
  throw new MeshReadError("BAD_MODEL", `3MF model${part ? ` '${part}'` : ""}: ${msg}`);
}

/** A package path as written in `Target` or `p:path` ("/3D/a.model", percent-encoded) to a ZIP entry name. */
export function partName(target: string): string {
  let t = target;
  try { t = decodeURI(target); } catch { /* keep as written: the lookup reports it missing */ }
  return t.replace(/^\/+/, "");
}

function localName(name: string, prefixes: Map<string, string>, defaultNs: string): { ns: string; local: string } {
  const c = name.indexOf(":");
  if (c < 0) return { ns: defaultNs, local: name };
  return { ns: prefixes.get(name.slice(0, c)) ?? "", local: name.slice(c + 1) };
}

/**
 * Read one model part. In the root part, build items and components may carry the Production
 * Extension's `path` (an object in another model part); in any other part a component with a path
 * is an error and the build is ignored (Production Extension §2, §3.2).
 */
export function parseModelPart(xml: Uint8Array, path: string, root: boolean): ModelPart {
  const label = root ? "" : path;
  const objects = new Map<string, Obj>();
  const items: ObjRef[] = [];
  const prefixes = new Map<string, string>();
  let defaultNs = "";
  let pathAttr = ""; // the Production Extension's path attribute as written ("p:path")
  let unit = "millimeter";
  let sawModel = false;
  let cur: Obj | undefined;
  let inBuild = false;
  let fast = false; // unprefixed names are core names: the byte-level mesh loop may run
  const need = (t: XmlTag, name: string): string => attr(t, name) ?? model(label, `<${t.name}> has no ${name} attribute`);
  const ref = (t: XmlTag): ObjRef => {
    const tr = attr(t, "transform");
    const p = pathAttr ? attr(t, pathAttr) : undefined;
    if (p !== undefined && !root) model(label, `a component refers to '${p.slice(0, 80)}', but only the root model part may refer to other parts (3MF Production Extension §2)`);
    return { objectId: need(t, "objectid"), path: p === undefined ? undefined : partName(p), m: tr === undefined ? undefined : parseTransform(tr) };
  };

  // Namespaces are read from the root element only, so after it a name always resolves the same way.
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
          const an = new TextDecoder().decode(t.bytes.subarray(t.ranges[k * 4]!, t.ranges[k * 4 + 1]!));
          if (an === "xmlns") defaultNs = attr(t, an) ?? "";
          else if (an.startsWith("xmlns:")) prefixes.set(an.slice(6), attr(t, an) ?? "");
        }
        for (const [p, ns] of prefixes) if (ns === PROD_NS) pathAttr = `${p}:path`;
        fast = defaultNs === CORE_NS;
      }
      const { ns, local } = resolve(t.name);
      if (!sawModel) {
        if (local !== "model" || ns !== CORE_NS) throw new MeshReadError("NOT_3MF", `the model part '${path}' has root <${t.name}> in '${ns}', not a 3MF core <model>`);
        sawModel = true;
        unit = attr(t, "unit") ?? "millimeter";
        if (!(unit in UNIT_MM)) throw new MeshReadError("BAD_UNIT", `unknown 3MF unit '${unit.slice(0, 40)}' (expected micron, millimeter, centimeter, inch, foot or meter)`);
        return;
      }
      if (ns !== CORE_NS) return;
      if (local === "object") {
        const id = need(t, "id");
        if (objects.has(id)) model(label, `object id ${id} is defined twice`);
        objects.set(id, (cur = { kind: "mesh", id, name: attr(t, "name"), verts: new Float64Array(0), nv: 0, tris: new Uint32Array(0), nt: 0 }));
      } else if (local === "components" && cur) {
        cur = { kind: "components", id: cur.id, name: cur.name, comps: [] };
        objects.set(cur.id, cur);
      } else if (local === "vertices" && cur?.kind === "mesh") {
        if (fast) return scanVertices(t.bytes, t.end, cur);
      } else if (local === "triangles" && cur?.kind === "mesh") {
        if (fast) return scanTriangles(t.bytes, t.end, cur);
      } else if (local === "vertex" && cur?.kind === "mesh") {
        const kx = attrIndex(t, "x"), ky = attrIndex(t, "y"), kz = attrIndex(t, "z");
        if (kx < 0 || ky < 0 || kz < 0) model(label, `a vertex of object ${cur.id} lacks x, y or z`);
        const x = attrNumber(t, kx), y = attrNumber(t, ky), z = attrNumber(t, kz);
        if (!Number.isFinite(x) || !Number.isFinite(y) || !Number.isFinite(z)) {
          throw new MeshReadError("NON_FINITE", `3MF object ${cur.id}, vertex ${cur.nv}: a coordinate is not a finite number`);
        }
        pushVertex(cur, x, y, z);
        return fast ? scanVertices(t.bytes, t.end, cur) : t.end;
      } else if (local === "triangle" && cur?.kind === "mesh") {
        const k1 = attrIndex(t, "v1"), k2 = attrIndex(t, "v2"), k3 = attrIndex(t, "v3");
        if (k1 < 0 || k2 < 0 || k3 < 0) model(label, `a triangle of object ${cur.id} lacks v1, v2 or v3`);
        const v = [attrNumber(t, k1), attrNumber(t, k2), attrNumber(t, k3)];
        const nv = cur.nv;
        const bad = v.find((x) => !(Number.isInteger(x) && x >= 0 && x < nv));
        if (bad !== undefined) {
          throw new MeshReadError("BAD_INDEX", `3MF object ${cur.id}, triangle ${cur.nt}: vertex index ${Number.isNaN(bad) ? "(not a number)" : bad} is outside 0…${cur.nv - 1}`);
        }
        pushTriangle(cur, v[0]!, v[1]!, v[2]!);
        return fast ? scanTriangles(t.bytes, t.end, cur) : t.end;
      } else if (local === "component" && cur?.kind === "components") {
        cur.comps.push(ref(t));
      } else if (local === "build") {
        inBuild = true;
      } else if (local === "item" && inBuild && root) {
        items.push(ref(t));
      }
    },
    close(name) {
      const { ns, local } = resolve(name);
      if (ns !== CORE_NS) return;
      if (local === "object") cur = undefined;
      else if (local === "build") inBuild = false;
    },
  });
  if (!sawModel) throw new MeshReadError("NOT_3MF", `the model part '${path}' has no <model> element`);
  return { path, unit, objects, items };
}
