/**
 * Can this mesh be sent to the workshop? A part whose mesh is not closed, or whose volume is not
 * reliable, is not sent: its volume (and so its grams, time and price) cannot be worked out, and
 * the printer would be handed a surface, not a solid. An operator may accept such a part
 * explicitly (recorded with the file); then it may be sent.
 */

/** The stored analysis figures this rule reads (lib/mesh's AnalysisJson keys). */
export interface HealthFigures {
  watertight?: boolean;
  volume_reliable?: boolean;
  volume_mm3?: number;
  boundary_edges?: number;
  nonmanifold_edges?: number;
  inconsistent_edges?: number;
  degenerate_triangles?: number;
}

export interface MeshProblem {
  key: "open-edges" | "flipped-faces" | "shared-edges" | "zero-area" | "inside-out" | "pieces-inside" | "no-volume";
  /** What is wrong, in plain words. */
  text: string;
  /** Whether the automatic repair deals with it. */
  repairable: boolean;
}

const many = (n: number, one: string, more: string) => `${n.toLocaleString("en")} ${n === 1 ? one : more}`;

/** Plain-words problems of a mesh, from its stored analysis (and the repair's count of solid pieces inside others, when known). */
export function meshProblems(a: HealthFigures, piecesInside = 0): MeshProblem[] {
  const out: MeshProblem[] = [];
  const open = a.boundary_edges ?? 0, flipped = a.inconsistent_edges ?? 0, shared = a.nonmanifold_edges ?? 0, zero = a.degenerate_triangles ?? 0;
  if (open > 0) out.push({ key: "open-edges", text: `${many(open, "open edge", "open edges")}: the surface has holes, so it does not close around a solid.`, repairable: true });
  if (flipped > 0) out.push({ key: "flipped-faces", text: `${many(flipped, "edge where", "edges where")} neighbouring faces point opposite ways (flipped faces).`, repairable: true });
  if (shared > 0) out.push({ key: "shared-edges", text: `${many(shared, "edge is", "edges are")} shared by more than two faces: pieces touch along an edge or run into each other. Fix this in the drawing.`, repairable: false });
  if (zero > 0) out.push({ key: "zero-area", text: `${many(zero, "face has", "faces have")} no area (corners on one line).`, repairable: true });
  if (a.watertight && (a.volume_mm3 ?? 0) < 0) out.push({ key: "inside-out", text: "The faces point inwards (the mesh is inside out), so its volume comes out negative.", repairable: true });
  if (piecesInside > 0) out.push({ key: "pieces-inside", text: `${many(piecesInside, "solid piece lies", "solid pieces lie")} inside another: the printer would merge them and the volume counts them twice. Fix this in the drawing.`, repairable: false });
  if (out.length === 0 && !(a.volume_reliable && (a.volume_mm3 ?? 0) > 0)) out.push({ key: "no-volume", text: "The mesh does not enclose a volume that can be measured.", repairable: false });
  return out;
}

/** Closed, consistently wound, with a positive volume: its figures can be trusted. */
export function meshIsSound(a: HealthFigures): boolean {
  return a.watertight === true && a.volume_reliable === true && (a.volume_mm3 ?? 0) > 0;
}

export type SendCheck = { ok: true; accepted: boolean } | { ok: false; reason: string };

/**
 * May a part with this mesh be sent? `acceptedBy` names the operator who accepted a broken mesh, if
 * one did; `piecesInside` counts solid pieces inside another (their volume counts twice).
 */
export function meshSendCheck(a: HealthFigures | null, acceptedBy: string | null, piecesInside = 0): SendCheck {
  if (!a) return { ok: false, reason: "This part has no mesh yet: upload one before sending it to the workshop." };
  if (meshIsSound(a) && piecesInside === 0) return { ok: true, accepted: false };
  if (acceptedBy) return { ok: true, accepted: true };
  const problems = meshProblems(a, piecesInside).map((p) => p.text);
  return { ok: false, reason: `The mesh is not a closed solid, so it cannot be sent: ${problems.join(" ")} Use “Repair the mesh” on the part page, upload a fixed file, or ask an operator to accept it as it is.` };
}
