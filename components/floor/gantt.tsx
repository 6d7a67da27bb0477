"use client";
// The Floor's timeline drawn to scale: one lane per printer, time across, closed hours shaded,
// a now-line, plates as blocks as long as their run. Text and a marker say what the colour says.
import Link from "next/link";
import type { FloorBoardWire } from "@/lib/queries/queue";
import { plateStatusLabel, type PlateStatus } from "@/lib/validation/plates";
import { hmm, timeIn } from "./format";

const LANE = 44;
const HEAD = 120;
const WIDTH = 1200;
const TOP = 24;

const fill: Record<PlateStatus, string> = {
  planned: "var(--color-sheet)",
  printing: "var(--color-warn-wash)",
  finished: "var(--color-accent-wash)",
  failed: "var(--color-fail-wash)",
  cancelled: "var(--color-paper)",
};

export function Gantt({ board }: { board: FloorBoardWire }) {
  const t0 = Date.parse(board.window.from);
  const t1 = Date.parse(board.window.to);
  const span = Math.max(t1 - t0, 1);
  const x = (iso: string | number) => HEAD + ((WIDTH - HEAD - 8) * ((typeof iso === "number" ? iso : Date.parse(iso)) - t0)) / span;
  const height = TOP + board.lanes.length * LANE + 4;
  const hours: number[] = [];
  const step = span > 4 * 86_400_000 ? 12 : span > 2 * 86_400_000 ? 6 : 3;
  for (let h = Math.ceil(t0 / 3_600_000 / step) * step; h * 3_600_000 < t1; h += step) hours.push(h * 3_600_000);
  return (
    <figure className="overflow-x-auto rounded-lg border border-rule bg-sheet">
      <svg viewBox={`0 0 ${WIDTH} ${height}`} className="min-w-[900px]" role="img" aria-label={`Timeline of ${board.lanes.length} printers from ${timeIn(board.window.from, board.timezone)} to ${timeIn(board.window.to, board.timezone)}`}>
        <rect x={HEAD} y={TOP} width={WIDTH - HEAD - 8} height={height - TOP - 4} fill="var(--color-rule)" opacity={0.45} />
        {board.open.map((o) => (
          <rect key={o.from} x={x(o.from)} y={TOP} width={Math.max(x(o.to) - x(o.from), 0)} height={height - TOP - 4} fill="var(--color-paper)" />
        ))}
        {hours.map((h) => (
          <g key={h}>
            <line x1={x(h)} x2={x(h)} y1={TOP - 4} y2={height - 4} stroke="var(--color-rule)" strokeWidth={0.5} />
            <text x={x(h) + 2} y={14} fontSize={10} fill="var(--color-ink-soft)">{timeIn(new Date(h).toISOString(), board.timezone, step >= 6)}</text>
          </g>
        ))}
        {board.lanes.map((lane, i) => {
          const y = TOP + i * LANE;
          return (
            <g key={lane.id}>
              <line x1={0} x2={WIDTH} y1={y + LANE} y2={y + LANE} stroke="var(--color-rule)" strokeWidth={0.5} />
              <text x={6} y={y + 18} fontSize={12} fontWeight={600} fill="var(--color-ink)">{lane.name}</text>
              <text x={6} y={y + 33} fontSize={10} fill="var(--color-ink-soft)">{lane.state === "maintenance" ? "⚒ maintenance" : lane.spool ? `${lane.spool.material} ${lane.spool.colour}` : "no spool"}</text>
              {lane.plates.map((p) => {
                const start = p.startedAt ?? p.plannedStart;
                const end = p.endedAt ?? p.plannedEnd;
                const left = Math.max(x(start), HEAD);
                const w = Math.max(x(end) - left, 3);
                const text = `${p.runsUnattended ? "☾ " : ""}#${p.id} ${plateStatusLabel[p.status]}`;
                return (
                  <Link key={p.id} href={`/plates/${p.id}`} aria-label={`Plate ${p.id}, ${plateStatusLabel[p.status]}, ${timeIn(start, board.timezone)} to ${timeIn(end, board.timezone)}${p.runsUnattended ? ", runs unattended past closing" : ""}`}>
                    <title>{`Plate ${p.id} · ${plateStatusLabel[p.status]} · ${p.items} parts · ${hmm(p.estimatedMinutes)} · ${timeIn(start, board.timezone)} – ${timeIn(end, board.timezone)}${p.runsUnattended ? " · runs unattended past closing" : ""}`}</title>
                    <rect x={left} y={y + 6} width={w} height={LANE - 12} rx={3} fill={fill[p.status]} stroke={p.runsUnattended ? "var(--color-warn)" : "var(--color-ink-soft)"} strokeWidth={p.runsUnattended ? 2 : 1} strokeDasharray={p.status === "cancelled" ? "4 3" : undefined} />
                    {w > 50 ? <text x={left + 4} y={y + LANE / 2 + 4} fontSize={10} fill="var(--color-ink)">{text}</text> : null}
                  </Link>
                );
              })}
            </g>
          );
        })}
        <line x1={x(board.now)} x2={x(board.now)} y1={TOP - 6} y2={height} stroke="var(--color-fail)" strokeWidth={1.5} />
        <text x={x(board.now) + 3} y={TOP - 8} fontSize={10} fill="var(--color-fail)">now</text>
      </svg>
      <figcaption className="flex flex-wrap gap-4 border-t border-rule px-3 py-2 text-xs text-ink-soft">
        <span><span aria-hidden className="inline-block h-3 w-4 border border-rule bg-paper align-middle" /> attended</span>
        <span><span aria-hidden className="inline-block h-3 w-4 bg-rule/60 align-middle" /> closed</span>
        <span>☾ amber outline: runs unattended past closing</span>
        <span><span aria-hidden className="inline-block h-3 w-0.5 bg-fail align-middle" /> now</span>
        <span>Times in {board.timezone}</span>
      </figcaption>
    </figure>
  );
}
