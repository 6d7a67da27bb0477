import "server-only";
import { sql } from "drizzle-orm";
import type { AttendedCalendar } from "@/lib/calendar/attended-hours";
import { hourBuckets, type Period } from "@/lib/insights/period";
import type { HeatCell, UtilisationRow } from "@/lib/insights/types";
import { intervalTable, num, RAN, rows } from "./sql";

const H = 3_600_000_000; // microseconds per hour

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

/** Printing hours of all printers by local weekday and hour: the whole 7 × 24 grid, zeros included. */
export async function heatmap(p: Period): Promise<HeatCell[]> {
  const a = new Date(p.start);
  const b = new Date(p.end);
  const buckets = hourBuckets(p).map((h) => ({ start: h.start, end: h.end, a: h.weekday, b: h.hour }));
  const got = buckets.length
    ? await rows<{ wd: number; h: number; us: unknown }>(sql`
      SELECT hb.a AS wd, hb.b AS h, SUM(TIMESTAMPDIFF(MICROSECOND, GREATEST(pl.started_at, hb.s), LEAST(pl.ended_at, hb.e))) AS us
      FROM ${intervalTable(buckets, "hb")}
      JOIN plates pl ON pl.started_at < hb.e AND pl.ended_at > hb.s
      WHERE pl.status IN ${RAN} AND pl.started_at < ${b} AND pl.ended_at > ${a}
      GROUP BY hb.a, hb.b`)
    : [];
  const cells: HeatCell[] = [];
  for (let weekday = 1; weekday <= 7; weekday++) {
    for (let hour = 0; hour < 24; hour++) {
      cells.push({ weekday, hour, hours: num(got.find((g) => g.wd === weekday && g.h === hour)?.us) / H });
    }
  }
  return cells;
}
