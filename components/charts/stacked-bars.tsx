"use client";
import { AxisBottom, AxisLeft } from "@visx/axis";
import { Group } from "@visx/group";
import { scaleBand, scaleLinear } from "@visx/scale";
import { Bar } from "@visx/shape";

export interface Series {
  key: string;
  label: string;
  colour: string;
}
export interface StackRow {
  label: string;
  values: Record<string, number>;
}

const W = 640;
const M = { top: 8, right: 16, bottom: 36, left: 110 };

/** Horizontal stacked bars: one bar per row, segments in series order, with a legend. */
export function StackedBars({ rows, series, unit, title }: { rows: StackRow[]; series: Series[]; unit: string; title: string }) {
  const rowH = 30;
  const h = M.top + M.bottom + Math.max(1, rows.length) * rowH;
  const max = Math.max(1e-9, ...rows.map((r) => series.reduce((s, k) => s + (r.values[k.key] ?? 0), 0)));
  const x = scaleLinear<number>({ domain: [0, max], range: [0, W - M.left - M.right], nice: true });
  const y = scaleBand<string>({ domain: rows.map((r) => r.label), range: [0, h - M.top - M.bottom], padding: 0.25 });
  return (
    <figure>
      <svg viewBox={`0 0 ${W} ${h}`} width="100%" role="img" aria-label={title} className="max-w-full">
        <Group left={M.left} top={M.top}>
          {rows.map((r) => {
            let at = 0;
            return series.map((s) => {
              const v = r.values[s.key] ?? 0;
              const bar = <Bar key={`${r.label}-${s.key}`} x={x(at)} y={y(r.label) ?? 0} width={Math.max(0, x(at + v) - x(at))} height={y.bandwidth()} fill={s.colour}><title>{`${r.label}, ${s.label}: ${v.toFixed(1)} ${unit}`}</title></Bar>;
              at += v;
              return bar;
            });
          })}
          <AxisLeft scale={y} hideTicks tickLabelProps={{ fontSize: 11, fill: "var(--color-ink)", textAnchor: "end", dy: "0.33em" }} stroke="var(--color-rule)" />
          <AxisBottom top={h - M.top - M.bottom} scale={x} numTicks={6} label={unit} labelProps={{ fontSize: 11, fill: "var(--color-ink-soft)", textAnchor: "middle" }} tickLabelProps={{ fontSize: 10, fill: "var(--color-ink-soft)", textAnchor: "middle" }} stroke="var(--color-rule)" tickStroke="var(--color-rule)" />
        </Group>
      </svg>
      <Legend series={series} />
    </figure>
  );
}

export function Legend({ series }: { series: Series[] }) {
  return (
    <figcaption className="mt-2 flex flex-wrap gap-x-4 gap-y-1 text-xs text-ink-soft">
      {series.map((s) => (
        <span key={s.key} className="inline-flex items-center gap-1.5">
          <span aria-hidden className="inline-block h-3 w-3 rounded-sm" style={{ background: s.colour }} />
          {s.label}
        </span>
      ))}
    </figcaption>
  );
}
