import "server-only";
import { sql } from "drizzle-orm";
import type { AttendedCalendar } from "@/lib/calendar/attended-hours";
import { hourBuckets, type Period } from "@/lib/insights/period";
import { MAX_PERIOD_DAYS } from "@/lib/validation/insights";
import type { HeatCell, UtilisationRow } from "@/lib/insights/types";
import { intervalTable, num, RAN, rows } from "./sql";

const H = 3_600_000_000; // microseconds per hour
/** Grid hours the longest period can need (a day more for a clock change). */
const GRID_HOURS = (MAX_PERIOD_DAYS + 2) * 24;

/** Busy spells per printer overlapping the period: plates that ran, and maintenance windows. */
function spells(a: Date, b: Date) {
  return sql`(
    SELECT printer_id, 'print' AS kind, started_at AS s, ended_at AS e FROM plates
     WHERE status IN ${RAN} AND started_at IS NOT NULL AND ended_at IS NOT NULL AND started_at < ${b} AND ended_at > ${a}
    UNION ALL
    SELECT printer_id, 'maint' AS kind, starts_at AS s, COALESCE(ends_at, ${b}) AS e FROM printer_maintenance
     WHERE starts_at < ${b} AND (ends_at IS NULL OR ends_at > ${a})
  ) sp`;
}

/**
 * Printing and maintenance are the clipped spells; what is left of the period is idle, split by
 * the attended calendar into idle while open and idle while closed, so the four add up to the
 * period's length. Assumes a printer's plates and maintenance windows do not overlap each other.
 */
export async function utilisation(p: Period, cal: AttendedCalendar, printers: { id: number; name: string }[]): Promise<UtilisationRow[]> {
  const a = new Date(p.start);
  const b = new Date(p.end);
  const open = cal.openIntervals(p.start, p.end);
  const openH = open.reduce((s, iv) => s + (iv.end - iv.start), 0) / 3_600_000;
  const totalH = (p.end - p.start) / 3_600_000;
  const [totals, inOpen] = await Promise.all([
    rows<{ printer_id: number; kind: string; us: unknown }>(sql`
      SELECT sp.printer_id, sp.kind, SUM(TIMESTAMPDIFF(MICROSECOND, GREATEST(sp.s, ${a}), LEAST(sp.e, ${b}))) AS us
      FROM ${spells(a, b)} GROUP BY sp.printer_id, sp.kind`),
    open.length === 0
      ? Promise.resolve([])
      : rows<{ printer_id: number; kind: string; us: unknown }>(sql`
      SELECT sp.printer_id, sp.kind, SUM(TIMESTAMPDIFF(MICROSECOND, GREATEST(sp.s, o.s), LEAST(sp.e, o.e))) AS us
      FROM ${spells(a, b)} JOIN ${intervalTable(open, "o")} ON sp.s < o.e AND sp.e > o.s
      GROUP BY sp.printer_id, sp.kind`),
  ]);
  const pick = (list: { printer_id: number; kind: string; us: unknown }[], id: number, kind: string) => num(list.find((r) => r.printer_id === id && r.kind === kind)?.us) / H;
  return printers.map((pr) => {
    const printingH = pick(totals, pr.id, "print");
    const maintenanceH = pick(totals, pr.id, "maint");
    const busyOpenH = pick(inOpen, pr.id, "print") + pick(inOpen, pr.id, "maint");
    const idleOpenH = Math.max(0, openH - busyOpenH);
    const idleClosedH = Math.max(0, totalH - openH - (printingH + maintenanceH - busyOpenH));
    return { printerId: pr.id, printer: pr.name, printingH, idleOpenH, idleClosedH, maintenanceH, utilisationPct: totalH > 0 ? (100 * printingH) / totalH : 0 };
  });
}

/**
 * Printing hours of all printers by local weekday and hour: the whole 7 × 24 grid, zeros included.
 * SQL cuts each plate into the hours of a grid counted from the period's start (MariaDB's built-in
 * sequence table gives each plate its hour offsets 0 … n, n being the longest plate's span)
 * and sums per grid hour; Node names each grid hour's local weekday and hour (see hourBuckets).
 */
export async function heatmap(p: Period): Promise<HeatCell[]> {
  const a = new Date(p.start);
  const b = new Date(p.end);
  const clipped = sql`(
      SELECT TIMESTAMPDIFF(MICROSECOND, ${a}, GREATEST(started_at, ${a})) AS s_us, TIMESTAMPDIFF(MICROSECOND, ${a}, LEAST(ended_at, ${b})) AS e_us
      FROM plates WHERE status IN ${RAN} AND started_at < ${b} AND ended_at > ${a}
    ) x`;
  // The longest plate's number of grid hours bounds the offsets each plate is joined with.
  const [span] = await rows<{ n: unknown }>(sql`SELECT MAX(FLOOR((x.e_us - 1) / ${H}) - FLOOR(x.s_us / ${H})) AS n FROM ${clipped}`);
  const maxOffset = Math.min(GRID_HOURS - 1, Math.max(0, Math.floor(num(span?.n))));
  const got = span?.n === null || span?.n === undefined ? [] : await rows<{ k: number; us: unknown }>(sql`
    SELECT FLOOR(x.s_us / ${H}) + o.seq AS k,
      SUM(LEAST(x.e_us, (FLOOR(x.s_us / ${H}) + o.seq + 1) * ${H}) - GREATEST(x.s_us, (FLOOR(x.s_us / ${H}) + o.seq) * ${H})) AS us
    FROM ${clipped}
    JOIN ${sql.raw(`seq_0_to_${maxOffset}`)} o ON o.seq <= FLOOR((x.e_us - 1) / ${H}) - FLOOR(x.s_us / ${H})
    GROUP BY k`);
  const cells: HeatCell[] = [];
  for (let weekday = 1; weekday <= 7; weekday++) for (let hour = 0; hour < 24; hour++) cells.push({ weekday, hour, hours: 0 });
  const grid = hourBuckets(p);
  for (const g of got) {
    const h = grid[Number(g.k)];
    const cell = h ? cells[(h.weekday - 1) * 24 + h.hour] : undefined;
    if (cell) cell.hours += num(g.us) / H;
  }
  return cells;
}
