// The bed seen from above, drawn to scale in millimetres: the usable area inside the margin, and
// each copy where the plan put it (y grows away from the viewer, as on the machine).
import type { PlateDetailWire } from "@/lib/queries/plates";

export function BedLayout({ d }: { d: PlateDetailWire }) {
  const { bedX, bedY, marginMm } = d.plate;
  const pad = 8;
  return (
    <figure className="rounded-lg border border-rule bg-sheet p-3">
      <svg viewBox={`${-pad} ${-pad} ${bedX + 2 * pad} ${bedY + 2 * pad}`} className="mx-auto max-h-[480px] w-full" role="img" aria-label={`Bed of ${bedX} × ${bedY} mm seen from above with ${d.items.length} parts`}>
        <g transform={`translate(0 ${bedY}) scale(1 -1)`}>
          <rect x={0} y={0} width={bedX} height={bedY} fill="#e6e3dc" stroke="var(--color-ink-soft)" strokeWidth={0.6} />
          <rect x={marginMm} y={marginMm} width={bedX - 2 * marginMm} height={bedY - 2 * marginMm} fill="none" stroke="var(--color-ink-soft)" strokeDasharray="3 2" strokeWidth={0.4} />
          {Array.from({ length: Math.floor(bedX / 10) + 1 }, (_, i) => <line key={`x${i}`} x1={i * 10} x2={i * 10} y1={0} y2={bedY} stroke="#d3cfc6" strokeWidth={0.2} />)}
          {Array.from({ length: Math.floor(bedY / 10) + 1 }, (_, i) => <line key={`y${i}`} x1={0} x2={bedX} y1={i * 10} y2={i * 10} stroke="#d3cfc6" strokeWidth={0.2} />)}
          {d.items.map((it, k) => (
            <g key={it.itemId}>
              <title>{`${it.label}: ${it.w.toFixed(1)} × ${it.d.toFixed(1)} × ${it.h.toFixed(1)} mm at (${it.x.toFixed(1)}, ${it.y.toFixed(1)})${it.rotated ? ", turned 90°" : ""}`}</title>
              <rect x={it.x} y={it.y} width={it.w} height={it.d} fill={it.mine || d.staff ? "var(--color-clay)" : "#bdb8ae"} stroke="var(--color-ink)" strokeWidth={0.5} />
              <text x={it.x + it.w / 2} y={-(it.y + it.d / 2)} transform="scale(1 -1)" fontSize={Math.min(8, Math.max(3, it.w / 4))} textAnchor="middle" dominantBaseline="middle" fill="var(--color-ink)">{k + 1}</text>
            </g>
          ))}
        </g>
      </svg>
      <figcaption className="mt-2 text-xs text-ink-soft">{bedX} × {bedY} mm bed, 10 mm grid; dashed line: {marginMm} mm margin. Numbers match the list.</figcaption>
    </figure>
  );
}
