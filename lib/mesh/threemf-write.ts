import { strToU8, zipSync } from "fflate";
import { formatTransform, type Affine } from "./affine";
import { CORE_NS, MODEL_REL } from "./threemf-read";
import type { IndexedMesh, TriangleSoup } from "./types";
import { weld } from "./weld";

/** One object of a build: its mesh (millimetres), an optional name and placement. */
export interface ThreeMfObject {
  name?: string;
  mesh: IndexedMesh | TriangleSoup;
  /** 3×4 placement in 3MF order (3MF Core Specification §3.4.3); identity when omitted. */
  transform?: Affine;
}

const esc = (s: string) => s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;").replace(/'/g, "&apos;");

/** Shortest decimal that reads back as the same float32. */
function num(x: number): string {
  const s = String(Number(x.toPrecision(7)));
  return Math.fround(Number(s)) === Math.fround(x) ? s : String(Number(x.toPrecision(9)));
}

function modelXml(objects: ThreeMfObject[]): string {
  const parts: string[] = [
    `<?xml version="1.0" encoding="UTF-8"?>\n<model unit="millimeter" xml:lang="en-US" xmlns="${CORE_NS}">\n <resources>\n`,
  ];
  objects.forEach((o, i) => {
    const m = "indices" in o.mesh ? o.mesh : weld(o.mesh, 0.0005);
    const name = o.name === undefined ? "" : ` name="${esc(o.name)}"`;
    parts.push(`  <object id="${i + 1}" type="model"${name}>\n   <mesh>\n    <vertices>\n`);
    const v = m.vertices;
    let chunk = "";
    for (let k = 0; k < v.length; k += 3) {
      chunk += `     <vertex x="${num(v[k]!)}" y="${num(v[k + 1]!)}" z="${num(v[k + 2]!)}"/>\n`;
      if (chunk.length > 65536) { parts.push(chunk); chunk = ""; }
    }
    chunk += "    </vertices>\n    <triangles>\n";
    const t = m.indices;
    for (let k = 0; k + 2 < t.length; k += 3) {
      chunk += `     <triangle v1="${t[k]}" v2="${t[k + 1]}" v3="${t[k + 2]}"/>\n`;
      if (chunk.length > 65536) { parts.push(chunk); chunk = ""; }
    }
    parts.push(chunk, "    </triangles>\n   </mesh>\n  </object>\n");
  });
  parts.push(" </resources>\n <build>\n");
  objects.forEach((o, i) => {
    parts.push(`  <item objectid="${i + 1}"${o.transform ? ` transform="${formatTransform(o.transform)}"` : ""}/>\n`);
  });
  parts.push(" </build>\n</model>\n");
  return parts.join("");
}

const CONTENT_TYPES =
  '<?xml version="1.0" encoding="UTF-8"?>\n<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">' +
  '<Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/>' +
  '<Default Extension="model" ContentType="application/vnd.ms-package.3dmanufacturing-3dmodel+xml"/></Types>\n';

const RELS =
  '<?xml version="1.0" encoding="UTF-8"?>\n<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">' +
  `<Relationship Target="/3D/3dmodel.model" Id="rel0" Type="${MODEL_REL}"/></Relationships>\n`;

/**
 * A 3MF package (3MF Core Specification): [Content_Types].xml, _rels/.rels and 3D/3dmodel.model,
 * one mesh object per entry and one build item each with its placement. A soup is welded first
 * (0.5 µm pitch) because 3MF meshes are indexed.
 */
export function write3mf(objects: ThreeMfObject[], opts: { level?: 0 | 1 | 6 | 9 } = {}): Uint8Array {
  const level = opts.level ?? 6;
  return zipSync(
    {
      "[Content_Types].xml": strToU8(CONTENT_TYPES),
      "_rels/.rels": strToU8(RELS),
      "3D/3dmodel.model": strToU8(modelXml(objects)),
    },
    { level },
  );
}
