import { MeshReadError } from "./errors";
import { composeAffine, type Affine } from "./affine";
import { MODEL_REL, parseModelPart, partName, UNIT_MM, type ModelPart, type Obj, type ObjRef } from "./threemf-model";
import { attr, scanXml } from "./xml";
import { zipEntries, zipRead, type RawInflate, type ZipEntry } from "./zip";

export { CORE_NS, MODEL_REL, PROD_NS, UNIT_MM } from "./threemf-model";

/** Deepest component nesting read (a recursion bound; real files nest a few levels). */
const MAX_NESTING = 256;

export interface ThreeMfPart {
  objectId: string;
  name: string | undefined;
  firstTriangle: number;
  triangleCount: number;
}

export interface ThreeMfReadOptions {
  maxUncompressedBytes?: number;
  maxTriangles?: number;
  inflateRaw?: RawInflate;
}

function findEntry(entries: ZipEntry[], name: string): ZipEntry | undefined {
  return entries.find((e) => e.name === name) ?? entries.find((e) => e.name.toLowerCase() === name.toLowerCase());
}

/** The root model part's name, found through the package relationships (_rels/.rels). */
function rootPath(zip: Uint8Array, entries: ZipEntry[], cap: number): string {
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
  return partName(target);
}

/**
 * Read a 3MF package into a millimetre soup: the root model part (found through _rels/.rels) and,
 * for the Production Extension, the other model parts its build items and components name by
 * path. Each part's vertices are in that part's own unit; transforms compose component first,
 * then parent (3MF Core Specification §4.1, §5.1.1; Production Extension §3).
 */
export function readThreeMf(zip: Uint8Array, opts: ThreeMfReadOptions = {}): { positions: Float32Array; parts: ThreeMfPart[]; unit: string; warnings: string[] } {
  let budget = opts.maxUncompressedBytes ?? 512 * 1024 * 1024;
  const maxTris = opts.maxTriangles ?? 50_000_000;
  const warnings: string[] = [];
  const entries = zipEntries(zip);
  const inflate = (e: ZipEntry): Uint8Array => {
    const out = zipRead(zip, e, budget, opts.inflateRaw); // the cap holds for the package as a whole
    budget -= out.length;
    return out;
  };
  const rootName = rootPath(zip, entries, budget);
  const rootEntry = findEntry(entries, rootName);
  if (!rootEntry) throw new MeshReadError("NOT_3MF", `the model part '/${rootName}' named in _rels/.rels is not in the package`);
  const root = parseModelPart(inflate(rootEntry), rootName, true);
  if (root.items.length === 0) throw new MeshReadError("BAD_MODEL", "3MF model: the build has no items, so nothing would be printed");

  const parts = new Map<string, ModelPart>([[rootName, root]]);
  const partOf = (ref: ObjRef, from: ModelPart): ModelPart => {
    const name = ref.path ?? from.path;
    let p = parts.get(name);
    if (p) return p;
    const e = findEntry(entries, name);
    if (!e) throw new MeshReadError("MISSING_PART", `3MF package: object ${ref.objectId} is referred to in the model part '/${name}', which is not in the package`);
    p = parseModelPart(inflate(e), name, false);
    if (p.unit !== root.unit) warnings.push(`model part '/${name}' is in ${p.unit}s, the root part in ${root.unit}s: each part's own unit was applied`);
    parts.set(name, p);
    return p;
  };
  const objectOf = (ref: ObjRef, from: ModelPart): [Obj, ModelPart] => {
    const p = partOf(ref, from);
    const o = p.objects.get(ref.objectId);
    if (!o) {
      const where = p === root ? "" : ` in the model part '/${p.path}'`;
      throw new MeshReadError("BAD_MODEL", `3MF model: reference to object ${ref.objectId}${where}, which is not defined`);
    }
    return [o, p];
  };

  // Count first (with cycle detection), so a component tree cannot make us allocate unboundedly.
  const counts = new Map<Obj, number>();
  const counting = new Set<Obj>();
  const countOf = (ref: ObjRef, from: ModelPart, depth: number): number => {
    if (depth > MAX_NESTING) throw new MeshReadError("BAD_MODEL", `3MF model: components nested more than ${MAX_NESTING} deep`);
    const [o, p] = objectOf(ref, from);
    const known = counts.get(o);
    if (known !== undefined) return known;
    if (counting.has(o)) throw new MeshReadError("BAD_MODEL", `3MF model: object ${o.id} contains itself through its components`);
    counting.add(o);
    let n = 0;
    if (o.kind === "mesh") n = o.nt;
    else for (const c of o.comps) n += countOf(c, p, depth + 1);
    counting.delete(o);
    if (n > maxTris) throw new MeshReadError("TOO_LARGE", `the 3MF build would have ${n} triangles, over the ${maxTris} limit`);
    counts.set(o, n);
    return n;
  };
  let total = 0;
  for (const it of root.items) {
    total += countOf(it, root, 0);
    if (total > maxTris) throw new MeshReadError("TOO_LARGE", `the 3MF build would have ${total} triangles, over the ${maxTris} limit`);
  }
  if (total === 0) throw new MeshReadError("NO_TRIANGLES", "the 3MF build contains no triangles");

  const out = new Float32Array(total * 9);
  let tv = new Float32Array(0);
  let tri = 0;
  const emit = (ref: ObjRef, from: ModelPart, m: Affine) => {
    const [o, p] = objectOf(ref, from);
    if (o.kind === "components") {
      for (const c of o.comps) emit(c, p, c.m ? composeAffine(c.m, m) : m);
      return;
    }
    // Vertices are in their own part's unit: into the root part's unit first.
    const s = UNIT_MM[p.unit]! / UNIT_MM[root.unit]!;
    const [m00, m01, m02, m10, m11, m12, m20, m21, m22, m30, m31, m32] = composeAffine([s, 0, 0, 0, s, 0, 0, 0, s, 0, 0, 0], m);
    // Place each vertex once, then gather the corners.
    const v = o.verts, nv = o.nv, t = o.tris, nt = o.nt;
    if (tv.length < 3 * nv) tv = new Float32Array(3 * nv);
    for (let k = 0; k < 3 * nv; k += 3) {
      const x = v[k]!, y = v[k + 1]!, z = v[k + 2]!;
      tv[k] = m00 * x + m10 * y + m20 * z + m30;
      tv[k + 1] = m01 * x + m11 * y + m21 * z + m31;
      tv[k + 2] = m02 * x + m12 * y + m22 * z + m32;
    }
    let q = tri * 9;
    for (let k = 0; k < 3 * nt; k++, q += 3) {
      const a = 3 * t[k]!;
      out[q] = tv[a]!; out[q + 1] = tv[a + 1]!; out[q + 2] = tv[a + 2]!;
    }
    tri += nt;
  };
  // Transforms are in the root part's unit; the last step is that unit into millimetres.
  const scale: Affine = [UNIT_MM[root.unit]!, 0, 0, 0, UNIT_MM[root.unit]!, 0, 0, 0, UNIT_MM[root.unit]!, 0, 0, 0];
  const result: ThreeMfPart[] = [];
  for (const it of root.items) {
    const first = tri;
    emit(it, root, it.m ? composeAffine(it.m, scale) : scale);
    result.push({ objectId: it.objectId, name: objectOf(it, root)[0].name, firstTriangle: first, triangleCount: tri - first });
  }
  return { positions: out, parts: result, unit: root.unit, warnings };
}
