import "server-only";
import { sql } from "drizzle-orm";
import type { Period } from "@/lib/insights/period";
import type { MaterialUseRow, StockRow } from "@/lib/insights/types";
import { num, rows } from "./sql";

const key = (material: string, colour: string) => `${material.toLowerCase()}|${colour.trim().toLowerCase()}`;

/**
 * Grams used per material family and colour, from finished plates (weighed grams, else the
 * estimate: failed plates record no weight). Stock is what is left on the spools now; days of
 * stock = stock ÷ (grams used in the period ÷ the period's days).
 */
export async function material(p: Period) {
  const a = new Date(p.start);
  const b = new Date(p.end);
  const [use, stock] = await Promise.all([
    rows<{ material: string; colour: string; n: unknown; g: unknown }>(sql`
      SELECT material, MIN(TRIM(colour)) AS colour, COUNT(*) AS n, SUM(COALESCE(actual_grams, estimated_grams)) AS g
      FROM plates WHERE status = 'finished' AND ended_at >= ${a} AND ended_at < ${b}
      GROUP BY material, LOWER(TRIM(colour)) ORDER BY g DESC`),
    rows<{ material: string; colour: string; n: unknown; g: unknown }>(sql`
      SELECT m.type AS material, MIN(TRIM(s.colour)) AS colour, COUNT(*) AS n, SUM(s.grams_remaining) AS g
      FROM spools s JOIN materials m ON m.id = s.material_id
      GROUP BY m.type, LOWER(TRIM(s.colour)) ORDER BY m.type, colour`),
  ]);
  const days = (p.end - p.start) / 86_400_000;
  const used = new Map(use.map((u) => [key(u.material, u.colour), num(u.g)]));
  const useRows: MaterialUseRow[] = use.map((u) => ({ material: u.material.toUpperCase(), colour: u.colour, plates: num(u.n), grams: num(u.g) }));
  const stockRows: StockRow[] = stock.map((s) => {
    const perDay = days > 0 ? (used.get(key(s.material, s.colour)) ?? 0) / days : 0;
    return { material: s.material.toUpperCase(), colour: s.colour, spools: num(s.n), stockG: num(s.g), gramsPerDay: perDay, daysLeft: perDay > 0 ? num(s.g) / perDay : null };
  });
  return { use: useRows, stock: stockRows };
}
