import type { MeshAnalysis } from "./analysis";
import type { MeshFormat } from "./read";
import type { Vec3 } from "./types";

/** The flat record the CLI prints and the worker returns: same keys, same numbers. */
export interface AnalysisJson {
  file: string;
  format: MeshFormat;
  triangles: number;
  vertices: number;
  bbox: { min: Vec3; max: Vec3 };
  size: Vec3;
  volume_mm3: number;
  volume_reliable: boolean;
  area_mm2: number;
  overhang_area_mm2: number;
  bed_contact_area_mm2: number;
  footprint_area_mm2: number;
  footprint_rect_mm: [number, number];
  watertight: boolean;
  boundary_edges: number;
  nonmanifold_edges: number;
  inconsistent_edges: number;
  degenerate_triangles: number;
  up: Vec3;
  overhang_deg: number;
}

export interface ErrorJson { file: string; error: string; code: string }

const round = (x: number) => (Number.isFinite(x) ? Number(x.toPrecision(10)) : x);

export function analysisToJson(file: string, format: MeshFormat, a: MeshAnalysis): AnalysisJson {
  const { min, max } = a.bbox;
  const r = a.footprint.rect;
  return {
    file,
    format,
    triangles: a.triangles,
    vertices: a.vertices,
    bbox: { min: [...min], max: [...max] },
    size: [max[0] - min[0], max[1] - min[1], max[2] - min[2]].map(round) as Vec3,
    volume_mm3: round(a.volume),
    volume_reliable: a.volumeReliable,
    area_mm2: round(a.area),
    overhang_area_mm2: round(a.overhangArea),
    bed_contact_area_mm2: round(a.bedContactArea),
    footprint_area_mm2: round(a.footprint.area),
    footprint_rect_mm: [round(r.max[0] - r.min[0]), round(r.max[1] - r.min[1])],
    watertight: a.topology.watertight,
    boundary_edges: a.topology.boundaryEdges,
    nonmanifold_edges: a.topology.nonManifoldEdges,
    inconsistent_edges: a.topology.inconsistentEdges,
    degenerate_triangles: a.topology.degenerateTriangles,
    up: a.up,
    overhang_deg: a.overhangDeg,
  };
}
