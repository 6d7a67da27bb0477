// Number formatting for the planner panels (en-GB, as on the part page).
import { materialKeyOf } from "@/lib/rules/materials";
import { downDetail, turnInWords } from "@/lib/rules/orientation-names";

export const mm = (v: number, digits = 1) => v.toLocaleString("en-GB", { maximumFractionDigits: digits, minimumFractionDigits: 0 });

/** The turn from the drawing in words, with the "down" vector as a detail (lib/rules/orientation-names). */
export function downLabel(d: readonly number[]): string {
  return `${turnInWords(d)} · ${downDetail(d)}`;
}

/** Fetches the part's stored file; each call gets its own buffer, since the worker takes it over. */
export async function fileBytes(fileId: number): Promise<ArrayBuffer> {
  const r = await fetch(`/api/files/${fileId}`);
  if (!r.ok) throw new Error(`the file could not be fetched (${r.status})`);
  return r.arrayBuffer();
}

export interface BedInfo {
  id: number;
  name: string;
  bedX: number;
  bedY: number;
  height: number;
  materials: string[];
}

/** Printers that take the part's material (lib/rules' material keys; none when the workshop does not print it), as the planner wants them. */
export function plannerPrinters(beds: BedInfo[], material: string) {
  const key = materialKeyOf(material);
  const able = key ? beds.filter((b) => b.materials.some((m) => materialKeyOf(m) === key)) : [];
  return able.map((b) => ({ id: String(b.id), bed: [b.bedX, b.bedY] as [number, number], height: b.height }));
}
