"use client";
// The Floor's timeline drawn to scale: one lane per printer, time across, closed hours shaded, a
// now-line, plates as blocks as long as their run. Day labels on top, hours below them, the now-label
// in a row of its own under the lanes, so no two labels share a place. Zoom: a day or a week.
import Link from "next/link";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import type { FloorBoardWire } from "@/lib/queries/queue";
import { plateStatusLabel, type PlateStatus } from "@/lib/validation/plates";
import { hmm, timeIn } from "./format";

const LANE = 52;
const HEAD = 150;
const WIDTH = 1200;
const RIGHT = 8;
const DAY_ROW = 18;
const HOUR_ROW = 36;
const TOP = 44;
const NOW_ROW = 20;
const H = 3_600_000;
/** Average glyph width at 12 px in the house font, px (measured by eye; common practice, no source). */
const GLYPH = 6.6;

const fill: Record<PlateStatus, string> = {
  planned: "var(--color-sheet)",
  printing: "var(--color-warn-wash)",
  finished: "var(--color-accent-wash)",
  failed: "var(--color-fail-wash)",
  cancelled: "var(--color-paper)",
};

type Zoom = "day" | "week";
const zooms: Record<Zoom, { label: string; before: number; span: number; hourStep: number }> = {
  day: { label: "Day", before: 4 * H, span: 24 * H, hourStep: 2 },
  week: { label: "Week", before: 12 * H, span: 7 * 24 * H, hourStep: 12 },
};

/** Local hour (0–23) and day label of an instant in the workshop's zone (Intl, ECMA-402). */
function local(ms: number, timezone: string): { hour: number; day: string } {
  const parts = new Intl.DateTimeFormat("en-GB", { timeZone: timezone, hour: "2-digit", hourCycle: "h23", weekday: "short", day: "numeric", month: "short" }).formatToParts(new Date(ms));
  const get = (t: string) => parts.find((p) => p.type === t)?.value ?? "";
  return { hour: Number(get("hour")), day: `${get("weekday")} ${get("day")} ${get("month")}` };
}

/** Text cut to fit a width, with an ellipsis; empty when not even a few characters fit. */
function fitText(text: string, width: number): string {
  const room = Math.floor((width - 8) / GLYPH);
  if (room >= text.length) return text;
  return room >= 4 ? `${text.slice(0, room - 1)}…` : "";
}

export function Gantt({ board }: { board: FloorBoardWire }) {
  // Open on the day unless the next planned plate starts beyond it (a closed weekend): then the week.
  const [zoom, setZoom] = useState<Zoom>(() => {
    const dayEnd = Date.parse(board.now) - zooms.day.before + zooms.day.span;
    const starts = board.lanes.flatMap((l) => l.plates.filter((p) => p.status === "planned").map((p) => Date.parse(p.plannedStart)));
    return starts.length === 0 || Math.min(...starts) < dayEnd ? "day" : "week";
  });
  const z = zooms[zoom];
  const now = Date.parse(board.now);
  const t0 = now - z.before;
  const t1 = t0 + z.span;
  const plotW = WIDTH - HEAD - RIGHT;
  const x = (t: string | number) => HEAD + (plotW * ((typeof t === "number" ? t : Date.parse(t)) - t0)) / z.span;
  const bottom = TOP + board.lanes.length * LANE;
  const height = bottom + NOW_ROW;

  // Hour ticks and local midnights, walking whole hours across the window.
  const hours: number[] = [];
  const days: { at: number; label: string }[] = [];
  for (let t = Math.ceil(t0 / H) * H; t < t1; t += H) {
    const l = local(t, board.timezone);
    if (l.hour === 0) days.push({ at: t, label: l.day });
    if (l.hour % z.hourStep === 0) hours.push(t);
  }
  // The part-day before the first midnight gets its label when it has room for it.
  const firstDay = local(t0, board.timezone).day;
  const dayLabels = [{ at: t0, label: firstDay }, ...days].filter((d, i, all) => {
    const next = all[i + 1];
    return i > 0 || !next || x(next.at) - HEAD >= d.label.length * GLYPH + 10;
  });

  return (
    <figure className="flex flex-col rounded-lg border border-rule bg-sheet">
      <div className="flex flex-wrap items-center gap-2 border-b border-rule px-3 py-2 text-sm">
        <span className="text-ink-soft">Timeline:</span>
        {(Object.keys(zooms) as Zoom[]).map((k) => (
          <Button key={k} type="button" variant={zoom === k ? "primary" : "ghost"} aria-pressed={zoom === k} onClick={() => setZoom(k)}>
            {zooms[k].label}
          </Button>
        ))}
        <span className="num text-ink-soft">
          {timeIn(new Date(t0).toISOString(), board.timezone)} → {timeIn(new Date(t1).toISOString(), board.timezone)}
        </span>
      </div>
      <div className="overflow-x-auto">
        <svg viewBox={`0 0 ${WIDTH} ${height}`} className="min-w-[1000px]" role="img" aria-label={`Timeline of ${board.lanes.length} printers over a ${zoom}, from ${timeIn(new Date(t0).toISOString(), board.timezone)}`}>
          <rect x={HEAD} y={TOP} width={plotW} height={bottom - TOP} fill="var(--color-rule)" opacity={0.45} />
          {board.open.map((o) => {
            const a = Math.max(x(o.from), HEAD);
            const b = Math.min(x(o.to), WIDTH - RIGHT);
            return b > a ? <rect key={o.from} x={a} y={TOP} width={b - a} height={bottom - TOP} fill="var(--color-paper)" /> : null;
          })}
          {hours.filter((h) => x(h) + 40 <= WIDTH).map((h) => (
            <g key={h}>
              <line x1={x(h)} x2={x(h)} y1={DAY_ROW + 6} y2={bottom} stroke="var(--color-rule)" strokeWidth={0.6} />
              <text x={x(h) + 3} y={HOUR_ROW} fontSize={12} fill="var(--color-ink-soft)" className="num">{`${String(local(h, board.timezone).hour).padStart(2, "0")}:00`}</text>
            </g>
          ))}
          {days.map((d) => <line key={d.at} x1={x(d.at)} x2={x(d.at)} y1={2} y2={bottom} stroke="var(--color-ink-soft)" strokeWidth={1} />)}
          {dayLabels.map((d) => (
            <text key={d.at} x={Math.max(x(d.at), HEAD) + 4} y={DAY_ROW - 2} fontSize={13} fontWeight={600} fill="var(--color-ink)">{d.label}</text>
          ))}
          {board.lanes.map((lane, i) => {
            const y = TOP + i * LANE;
            return (
              <g key={lane.id}>
                <line x1={0} x2={WIDTH} y1={y + LANE} y2={y + LANE} stroke="var(--color-rule)" strokeWidth={0.6} />
                <text x={8} y={y + 21} fontSize={14} fontWeight={600} fill="var(--color-ink)">{lane.name}</text>
                <text x={8} y={y + 39} fontSize={12} fill="var(--color-ink-soft)">{fitText(lane.state === "maintenance" ? "⚒ maintenance" : lane.spool ? `${lane.spool.material} ${lane.spool.colour}` : "no spool", HEAD - 8)}</text>
                {lane.plates.map((p) => {
                  const start = p.startedAt ?? p.plannedStart;
                  const end = p.endedAt ?? p.plannedEnd;
                  const left = Math.max(x(start), HEAD);
                  const right = Math.min(x(end), WIDTH - RIGHT);
                  if (right < HEAD || left > WIDTH - RIGHT) return null;
                  const w = Math.max(right - left, 3);
                  const words = `${p.runsUnattended ? "☾ " : ""}#${p.id} ${plateStatusLabel[p.status]} · ${p.material.toUpperCase()} ${p.colour}${p.change ? " · ⇄ spool change" : ""}`;
                  const label = fitText(words, w);
                  const tip = `Plate ${p.id} · ${plateStatusLabel[p.status]} on ${lane.name} · ${p.material.toUpperCase()} ${p.colour} · ${p.items} parts · ${hmm(p.estimatedMinutes)} · ${timeIn(start, board.timezone)} – ${timeIn(end, board.timezone)}${p.change ? " · spool change before it" : ""}${p.runsUnattended ? " · runs unattended past closing" : ""}`;
                  return (
                    <Link key={p.id} href={`/plates/${p.id}`} aria-label={tip}>
                      <title>{tip}</title>
                      <rect x={left} y={y + 7} width={w} height={LANE - 14} rx={3} fill={fill[p.status]} stroke={p.runsUnattended ? "var(--color-warn)" : "var(--color-ink-soft)"} strokeWidth={p.runsUnattended ? 2 : 1} strokeDasharray={p.status === "cancelled" ? "4 3" : undefined} />
                      {label ? <text x={left + 4} y={y + LANE / 2 + 4} fontSize={12} fill="var(--color-ink)">{label}</text> : null}
                    </Link>
                  );
                })}
              </g>
            );
          })}
          {now >= t0 && now <= t1 ? (
            <g>
              <line x1={x(now)} x2={x(now)} y1={TOP - 4} y2={bottom + 4} stroke="var(--color-fail)" strokeWidth={1.5} />
              <text x={x(now)} y={bottom + 16} fontSize={12} fill="var(--color-fail)" textAnchor="middle">{`now ${timeIn(board.now, board.timezone, false)}`}</text>
            </g>
          ) : null}
        </svg>
      </div>
      <figcaption className="flex flex-wrap gap-4 border-t border-rule px-3 py-2 text-xs text-ink-soft">
        <span><span aria-hidden className="inline-block h-3 w-4 border border-rule bg-paper align-middle" /> attended</span>
        <span><span aria-hidden className="inline-block h-3 w-4 bg-rule/60 align-middle" /> closed</span>
        <span>☾ amber outline: runs unattended past closing</span>
        <span>⇄ spool change before the plate</span>
        <span><span aria-hidden className="inline-block h-3 w-0.5 bg-fail align-middle" /> now</span>
        <span>Hover or focus a plate for its details. Times in {board.timezone}</span>
      </figcaption>
    </figure>
  );
}
