import { Notice } from "@/components/ui/notice";
import { materialKeyOf } from "@/lib/validation/printers";
import { QuotePanel } from "./quote-panel";

/** The figures the mesh analysis stores that a quote needs (snake_case, as analysisToJson writes them). */
interface StoredAnalysis {
  size?: [number, number, number];
  volume_mm3?: number;
  volume_reliable?: boolean;
  area_mm2?: number;
  footprint_area_mm2?: number;
}

/**
 * The quote on a part's page, from its current file's analysis and its print settings. Says why
 * when there is nothing to price yet.
 */
export function PartQuote({
  analysis,
  part,
  placed,
}: {
  analysis: unknown;
  part: { material: string; layerHeightMm: number; walls: number; infillPercent: number };
  /** Footprint and height as the part will lie on the bed (the chosen orientation, else the file as drawn). */
  placed: { footprint: [number, number]; height: number; source: "chosen" | "file"; supportVolumeMm3?: number } | null;
}) {
  const a = readAnalysis(analysis);
  const material = materialKeyOf(part.material);
  const problem = !a
    ? "Upload a mesh to see what this part costs."
    : !a.volume_reliable || !a.volume_mm3 || !a.area_mm2 || !a.size
      ? "The mesh is not a closed solid, so its volume and price cannot be worked out. Repair it above, or upload a fixed file."
      : !material
        ? `No price list for “${part.material}”.`
        : null;
  if (problem || !a || !material || !a.size) {
    return (
      <section className="mt-6" aria-label="Quote">
        <Notice tone="info" title="No quote yet">
          {problem}
        </Notice>
      </section>
    );
  }
  return (
    <div className="mt-6">
      <QuotePanel
        title={placed?.source === "chosen" ? "Quote for one copy, as it will print" : "Quote for one copy"}
        input={{
          volumeMm3: a.volume_mm3!,
          areaMm2: a.area_mm2!,
          heightMm: placed?.height ?? a.size[2],
          widthMm: placed?.footprint[0] ?? a.size[0],
          depthMm: placed?.footprint[1] ?? a.size[1],
          footprintAreaMm2: a.footprint_area_mm2 || undefined,
          layerHeightMm: part.layerHeightMm,
          wallCount: part.walls,
          infillPercent: part.infillPercent,
          supportVolumeMm3: placed?.supportVolumeMm3 || undefined,
          supports: (placed?.supportVolumeMm3 ?? 0) > 0,
          material,
        }}
      />
    </div>
  );
}

/** MariaDB keeps JSON as text, so the driver may hand back a string; accept both. */
function readAnalysis(v: unknown): StoredAnalysis | null {
  if (typeof v === "string") {
    try {
      return JSON.parse(v) as StoredAnalysis;
    } catch {
      return null;
    }
  }
  return (v ?? null) as StoredAnalysis | null;
}
