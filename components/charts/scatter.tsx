"use client";
import { AxisBottom, AxisLeft } from "@visx/axis";
import { Group } from "@visx/group";
import { scaleLinear } from "@visx/scale";
import { Circle, Line } from "@visx/shape";
import { Legend, type Series } from "./stacked-bars";

const W = 640;
const H = 360;
const M = { top: 12, right: 16, bottom: 40, left: 52 };

/** Estimated (x) against actual (y) with the 1:1 line: points above it ran longer than estimated. */
export function Scatter({ points, series, title, unit }: { points: { group: string; x: number; y: number }[]; series: Series[]; title: string; unit: string }) {
  const max = Math.max(1, ...points.map((p) => Math.max(p.x, p.y)));
  const iw = W - M.left - M.right;
  const ih = H - M.top - M.bottom;
  const x = scaleLinear<number>({ domain: [0, max], range: [0, iw], nice: true });
  const y = scaleLinear<number>({ domain: [0, max], range: [ih, 0], nice: true });
  const top = Math.max(x.domain()[1] ?? max, y.domain()[1] ?? max);
  const colourOf = new Map(series.map((s) => [s.key, s.colour]));
  return (
    <figure>
      <svg viewBox={`0 0 ${W} ${H}`} width="100%" role="img" aria-label={title} className="max-w-full">
        <Group left={M.left} top={M.top}>
          <Line from={{ x: x(0), y: y(0) }} to={{ x: x(top), y: y(top) }} stroke="var(--color-ink-soft)" strokeDasharray="4 3" />
          <text x={x(top) - 4} y={y(top) + 14} textAnchor="end" fontSize={10} fill="var(--color-ink-soft)">
            1:1
          </text>
          {points.map((p, i) => (
            <Circle key={i} cx={x(p.x)} cy={y(p.y)} r={3} fill={colourOf.get(p.group) ?? "var(--color-accent)"} fillOpacity={0.7} />
          ))}
          <AxisLeft scale={y} numTicks={6} label={`actual ${unit}`} labelProps={{ fontSize: 11, fill: "var(--color-ink-soft)", textAnchor: "middle" }} tickLabelProps={{ fontSize: 10, fill: "var(--color-ink-soft)", textAnchor: "end", dy: "0.33em" }} stroke="var(--color-rule)" tickStroke="var(--color-rule)" />
          <AxisBottom top={ih} scale={x} numTicks={6} label={`estimated ${unit}`} labelProps={{ fontSize: 11, fill: "var(--color-ink-soft)", textAnchor: "middle" }} tickLabelProps={{ fontSize: 10, fill: "var(--color-ink-soft)", textAnchor: "middle" }} stroke="var(--color-rule)" tickStroke="var(--color-rule)" />
        </Group>
      </svg>
      <Legend series={series} />
    </figure>
  );
}
