"use client";
import { Group } from "@visx/group";
import { HeatmapRect } from "@visx/heatmap";
import { scaleLinear } from "@visx/scale";
import { weekdayNames, type HeatCell } from "@/lib/insights/types";

const W = 640;
const M = { top: 18, right: 8, bottom: 8, left: 40 };

/** Printing hours by weekday (rows) and local hour (columns); darker is busier. */
export function HeatMap({ cells, title }: { cells: HeatCell[]; title: string }) {
  const binW = (W - M.left - M.right) / 24;
  const binH = 22;
  const h = M.top + M.bottom + 7 * binH;
  const max = Math.max(1e-9, ...cells.map((c) => c.hours));
  // One column per hour, its bins Monday to Sunday.
  const columns = Array.from({ length: 24 }, (_, hour) => ({ hour, bins: Array.from({ length: 7 }, (_, i) => ({ weekday: i + 1, hours: cells.find((c) => c.hour === hour && c.weekday === i + 1)?.hours ?? 0 })) }));
  const colour = scaleLinear<string>({ domain: [0, max], range: ["#f1ede4", "#0a4f4f"] });
  return (
    <svg viewBox={`0 0 ${W} ${h}`} width="100%" role="img" aria-label={title} className="max-w-full">
      <Group left={M.left} top={M.top}>
        <HeatmapRect data={columns} bins={(c) => c.bins} count={(b) => b.hours} xScale={(i) => i * binW} yScale={(i) => i * binH} binWidth={binW} binHeight={binH} gap={1.5} colorScale={(v) => colour(v as number)}>
          {(grid) =>
            grid.map((col) =>
              col.map((cell) => (
                <rect key={`${cell.row}-${cell.column}`} x={cell.x} y={cell.y} width={cell.width} height={cell.height} fill={cell.color} rx={2}>
                  <title>{`${weekdayNames[cell.row]} ${String(cell.column).padStart(2, "0")}:00: ${(cell.count ?? 0).toFixed(2)} h printing`}</title>
                </rect>
              )),
            )
          }
        </HeatmapRect>
        {weekdayNames.map((d, i) => (
          <text key={d} x={-6} y={i * binH + binH / 2} dy="0.33em" textAnchor="end" fontSize={10} fill="var(--color-ink-soft)">
            {d}
          </text>
        ))}
        {[0, 3, 6, 9, 12, 15, 18, 21].map((hr) => (
          <text key={hr} x={hr * binW + binW / 2} y={-6} textAnchor="middle" fontSize={10} fill="var(--color-ink-soft)">
            {String(hr).padStart(2, "0")}
          </text>
        ))}
      </Group>
    </svg>
  );
}
