import "server-only";
import { sql } from "drizzle-orm";
import { trendBuckets, type Period } from "@/lib/insights/period";
import type { RateRow, ReasonRow, Reprints } from "@/lib/insights/types";
import { intervalTable, num, RAN, rows } from "./sql";

const rate = (finished: number, failed: number) => (finished + failed > 0 ? (100 * failed) / (finished + failed) : null);
type Counts = { k: string | number | null; fin: unknown; fail: unknown };
const toRate = (label: string, r?: Counts): RateRow => {
  const finished = num(r?.fin);
  const failed = num(r?.fail);
  return { label, finished, failed, ratePct: rate(finished, failed) };
};

/** Plates that ended (finished or failed) inside the period, by when they ended. */
export async function failures(p: Period, printers: { id: number; name: string }[]) {
  const a = new Date(p.start);
  const b = new Date(p.end);
  const ended = sql`status IN ${RAN} AND ended_at >= ${a} AND ended_at < ${b}`;
  const counts = sql`SUM(status = 'finished') AS fin, SUM(status = 'failed') AS fail`;
  const buckets = trendBuckets(p);
  const [byPrinter, byMaterial, byReason, trend, reprints] = await Promise.all([
    rows<Counts>(sql`SELECT printer_id AS k, ${counts} FROM plates WHERE ${ended} GROUP BY printer_id`),
    rows<Counts>(sql`SELECT material AS k, ${counts} FROM plates WHERE ${ended} GROUP BY material ORDER BY material`),
    // Reasons are free text: trimmed, and grouped by the column's case-insensitive collation.
    rows<{ reason: string | null; n: unknown }>(sql`
      SELECT MIN(TRIM(reason)) AS reason, COUNT(*) AS n FROM plates
      WHERE status = 'failed' AND ended_at >= ${a} AND ended_at < ${b}
      GROUP BY TRIM(COALESCE(reason, '')) ORDER BY n DESC, reason`),
    buckets.length
      ? rows<Counts>(sql`
        SELECT tb.a AS k, ${sql.raw("SUM(pl.status = 'finished') AS fin, SUM(pl.status = 'failed') AS fail")}
        FROM ${intervalTable(buckets, "tb")}
        LEFT JOIN plates pl ON pl.ended_at >= tb.s AND pl.ended_at < tb.e AND pl.status IN ${RAN}
        GROUP BY tb.a`)
      : Promise.resolve([] as Counts[]),
    // A print is a reprint when the same part copy was on a plate that failed before this one ended.
    rows<{ prints: unknown; reprints: unknown }>(sql`
      SELECT COUNT(*) AS prints,
        SUM(EXISTS (SELECT 1 FROM plate_items pi2 JOIN plates p2 ON p2.id = pi2.plate_id
                     WHERE pi2.instance_id = pi.instance_id AND p2.id <> pl.id AND p2.status = 'failed' AND p2.ended_at < pl.ended_at)) AS reprints
      FROM plate_items pi JOIN plates pl ON pl.id = pi.plate_id
      WHERE pl.status IN ${RAN} AND pl.ended_at >= ${a} AND pl.ended_at < ${b}`),
  ]);
  const failedTotal = byReason.reduce((s, r) => s + num(r.n), 0);
  const rp = reprints[0];
  const prints = num(rp?.prints);
  const again = num(rp?.reprints);
  return {
    byPrinter: printers.map((pr) => toRate(pr.name, byPrinter.find((r) => Number(r.k) === pr.id))),
    byMaterial: byMaterial.map((r) => toRate(String(r.k).toUpperCase(), r)),
    byReason: byReason.map((r): ReasonRow => ({ reason: r.reason || "No reason given", failed: num(r.n), sharePct: failedTotal ? (100 * num(r.n)) / failedTotal : 0 })),
    trend: buckets.map((bk, i) => toRate(bk.label, trend.find((r) => Number(r.k) === i))),
    reprints: { prints, reprints: again, sharePct: prints ? (100 * again) / prints : null } satisfies Reprints,
  };
}
