import type { AnalysisJson } from "@/lib/mesh/json";

const f = (x: number, d = 2) => x.toLocaleString("en", { minimumFractionDigits: d, maximumFractionDigits: d });

/** The server's analysis with units; data-key/data-value carry the raw figures (same keys as the analyse CLI). */
export function PartNumbers({ a }: { a: AnalysisJson }) {
  const rows: [keyof AnalysisJson | string, string, string, number | string][] = [
    ["size", "Size", `${a.size.map((x) => f(x)).join(" × ")} mm`, a.size.join(",")],
    ["volume_mm3", "Volume", `${f(a.volume_mm3)} mm³${a.volume_reliable ? "" : " (not reliable: the mesh is not closed)"}`, a.volume_mm3],
    ["area_mm2", "Surface area", `${f(a.area_mm2)} mm²`, a.area_mm2],
    ["overhang_area_mm2", `Overhang past ${a.overhang_deg}°`, `${f(a.overhang_area_mm2)} mm²`, a.overhang_area_mm2],
    ["bed_contact_area_mm2", "On the bed", `${f(a.bed_contact_area_mm2)} mm²`, a.bed_contact_area_mm2],
    ["footprint_area_mm2", "Footprint", `${f(a.footprint_area_mm2)} mm²`, a.footprint_area_mm2],
    ["triangles", "Triangles", a.triangles.toLocaleString("en"), a.triangles],
    ["watertight", "Watertight", a.watertight ? "yes" : "no", String(a.watertight)],
    ["boundary_edges", "Open edges", String(a.boundary_edges), a.boundary_edges],
    ["nonmanifold_edges", "Non-manifold edges", String(a.nonmanifold_edges), a.nonmanifold_edges],
    ["inconsistent_edges", "Flipped neighbours", String(a.inconsistent_edges), a.inconsistent_edges],
  ];
  return (
    <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm" aria-label="Mesh figures">
      {rows.map(([k, label, text, raw]) => (
        <div key={k} className="contents" data-key={k} data-value={String(raw)}>
          <dt className="text-ink-soft">{label}</dt>
          <dd className="num">{text}</dd>
        </div>
      ))}
    </dl>
  );
}
