"use client";
import { AxisBottom, AxisLeft } from "@visx/axis";
import { Group } from "@visx/group";
import { scaleBand, scaleLinear } from "@visx/scale";
import { Bar } from "@visx/shape";

const W = 640;
const M = { top: 8, right: 48, bottom: 36, left: 150 };

/** Horizontal bars with the value written at the end of each; max fixes the scale (e.g. 100 for percent). */
export function Bars({ rows, unit, title, max, colour = "var(--color-accent)", digits = 1 }: { rows: { label: string; value: number | null }[]; unit: string; title: string; max?: number; colour?: string; digits?: number }) {
  const rowH = 26;
  const h = M.top + M.bottom + Math.max(1, rows.length) * rowH;
  const top = max ?? Math.max(1e-9, ...rows.map((r) => r.value ?? 0));
  const x = scaleLinear<number>({ domain: [0, top], range: [0, W - M.left - M.right], nice: max === undefined });
  const y = scaleBand<string>({ domain: rows.map((r) => r.label), range: [0, h - M.top - M.bottom], padding: 0.25 });
  return (
    <svg viewBox={`0 0 ${W} ${h}`} width="100%" role="img" aria-label={title} className="max-w-full">
      <Group left={M.left} top={M.top}>
        {rows.map((r) => (
          <g key={r.label}>
            <Bar x={0} y={y(r.label) ?? 0} width={Math.max(0, x(r.value ?? 0))} height={y.bandwidth()} fill={colour}>
              <title>{`${r.label}: ${r.value === null ? "none" : r.value.toFixed(digits)} ${unit}`}</title>
            </Bar>
            <text x={x(r.value ?? 0) + 4} y={(y(r.label) ?? 0) + y.bandwidth() / 2} dy="0.33em" fontSize={10} fill="var(--color-ink-soft)">
              {r.value === null ? "–" : r.value.toFixed(digits)}
            </text>
          </g>
        ))}
        <AxisLeft scale={y} hideTicks tickFormat={(l) => (l.length > 24 ? `${l.slice(0, 23)}…` : l)} tickLabelProps={{ fontSize: 11, fill: "var(--color-ink)", textAnchor: "end", dy: "0.33em" }} stroke="var(--color-rule)" />
        <AxisBottom top={h - M.top - M.bottom} scale={x} numTicks={5} label={unit} labelProps={{ fontSize: 11, fill: "var(--color-ink-soft)", textAnchor: "middle" }} tickLabelProps={{ fontSize: 10, fill: "var(--color-ink-soft)", textAnchor: "middle" }} stroke="var(--color-rule)" tickStroke="var(--color-rule)" />
      </Group>
    </svg>
  );
}
