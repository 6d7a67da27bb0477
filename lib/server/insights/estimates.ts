import "server-only";
import { sql } from "drizzle-orm";
import type { Period } from "@/lib/insights/period";
import type { EstimatePoint, EstimateRow } from "@/lib/insights/types";
import { num, rows } from "./sql";

/** Most points the scatter carries: enough to see the spread, bounded so the payload stays small. */
export const MAX_POINTS = 1500;

/**
 * Estimated against actual per printer from the print history (finished plates): the ratio of
 * sums, so long plates weigh more, as they do on the printer's clock. Grams only over weighed plates.
 */
export async function estimates(p: Period, printers: { id: number; name: string }[]) {
  const a = new Date(p.start);
  const b = new Date(p.end);
  const inPeriod = sql`finished_at >= ${a} AND finished_at < ${b}`;
  const [sums, pts] = await Promise.all([
    rows<{ printer_id: number; n: unknown; em: unknown; am: unknown; ng: unknown; eg: unknown; ag: unknown }>(sql`
      SELECT printer_id, COUNT(*) AS n, SUM(estimated_minutes) AS em, SUM(actual_minutes) AS am,
        SUM(actual_grams IS NOT NULL) AS ng, SUM(CASE WHEN actual_grams IS NOT NULL THEN estimated_grams ELSE 0 END) AS eg, SUM(actual_grams) AS ag
      FROM print_history WHERE ${inPeriod} GROUP BY printer_id`),
    rows<{ printer_id: number; em: unknown; am: unknown }>(sql`
      SELECT printer_id, estimated_minutes AS em, actual_minutes AS am FROM print_history
      WHERE ${inPeriod} ORDER BY finished_at DESC, id DESC LIMIT ${MAX_POINTS + 1}`),
  ]);
  const nameOf = new Map(printers.map((x) => [x.id, x.name]));
  const byPrinter: EstimateRow[] = printers.map((pr) => {
    const r = sums.find((s) => s.printer_id === pr.id);
    const em = num(r?.em);
    const eg = num(r?.eg);
    return {
      printer: pr.name,
      plates: num(r?.n),
      estimatedMin: em,
      actualMin: num(r?.am),
      timeRatio: em > 0 ? num(r?.am) / em : null,
      weighedPlates: num(r?.ng),
      estimatedG: eg,
      actualG: num(r?.ag),
      gramsRatio: eg > 0 ? num(r?.ag) / eg : null,
    };
  });
  const points: EstimatePoint[] = pts.slice(0, MAX_POINTS).map((r) => ({ printer: nameOf.get(r.printer_id) ?? `#${r.printer_id}`, estimatedMin: num(r.em), actualMin: num(r.am) }));
  return { byPrinter, points, pointsCapped: pts.length > MAX_POINTS };
}
