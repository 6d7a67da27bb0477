"use client";
import { AxisBottom, AxisLeft } from "@visx/axis";
import { Group } from "@visx/group";
import { scaleLinear, scalePoint } from "@visx/scale";
import { Circle, LinePath } from "@visx/shape";

const W = 640;
const H = 220;
const M = { top: 12, right: 16, bottom: 44, left: 44 };

/** A value over time buckets; buckets without a value (nothing ended) leave a gap in the line. */
export function Trend({ points, unit, title, max }: { points: { label: string; value: number | null }[]; unit: string; title: string; max?: number }) {
  const iw = W - M.left - M.right;
  const ih = H - M.top - M.bottom;
  const x = scalePoint<string>({ domain: points.map((p) => p.label), range: [0, iw], padding: 0.5 });
  const y = scaleLinear<number>({ domain: [0, max ?? Math.max(1, ...points.map((p) => p.value ?? 0))], range: [ih, 0], nice: true });
  const every = Math.max(1, Math.ceil(points.length / 8));
  return (
    <svg viewBox={`0 0 ${W} ${H}`} width="100%" role="img" aria-label={title} className="max-w-full">
      <Group left={M.left} top={M.top}>
        <LinePath data={points} x={(p) => x(p.label) ?? 0} y={(p) => y(p.value ?? 0)} defined={(p) => p.value !== null} stroke="var(--color-fail)" strokeWidth={2} />
        {points.map((p) => (p.value === null ? null : <Circle key={p.label} cx={x(p.label) ?? 0} cy={y(p.value)} r={3} fill="var(--color-fail)"><title>{`${p.label}: ${p.value.toFixed(1)} ${unit}`}</title></Circle>))}
        <AxisLeft scale={y} numTicks={5} label={unit} labelProps={{ fontSize: 11, fill: "var(--color-ink-soft)", textAnchor: "middle" }} tickLabelProps={{ fontSize: 10, fill: "var(--color-ink-soft)", textAnchor: "end", dy: "0.33em" }} stroke="var(--color-rule)" tickStroke="var(--color-rule)" />
        <AxisBottom top={ih} scale={x} tickValues={points.filter((_, i) => i % every === 0).map((p) => p.label)} tickLabelProps={{ fontSize: 10, fill: "var(--color-ink-soft)", textAnchor: "middle" }} stroke="var(--color-rule)" tickStroke="var(--color-rule)" />
      </Group>
    </svg>
  );
}
