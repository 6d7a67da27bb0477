import "server-only";
import { inArray, sql } from "drizzle-orm";
import { db } from "@/db";
import { users } from "@/db/schema";
import type { Period } from "@/lib/insights/period";
import type { MemberRow } from "@/lib/insights/types";
import { num, numOrNull, rows } from "./sql";

/**
 * Per member: part copies on plates that finished in the period, their share of the plate's grams
 * (by planned grams, scaled to the weighed total), charges raised in the period (money only), and
 * the wait from sending a copy to its plate finishing. Percentiles by PERCENTILE_DISC, which is the
 * nearest-rank method (see lib/insights/percentile.ts).
 */
export async function members(p: Period, money: boolean) {
  const a = new Date(p.start);
  const b = new Date(p.end);
  const printed = sql`pl.status = 'finished' AND pl.ended_at >= ${a} AND pl.ended_at < ${b}`;
  const waits = sql`(
    SELECT pi.member_id, TIMESTAMPDIFF(SECOND, q.sent_at, pl.ended_at) AS w
    FROM plate_items pi JOIN plates pl ON pl.id = pi.plate_id JOIN queue_entries q ON q.instance_id = pi.instance_id
    WHERE ${printed}) wt`;
  const [parts, perMember, overall, charged] = await Promise.all([
    rows<{ member_id: number; n: unknown; g: unknown }>(sql`
      SELECT x.member_id, COUNT(*) AS n, SUM(x.share) AS g FROM (
        SELECT pi.member_id, pi.grams / NULLIF(SUM(pi.grams) OVER (PARTITION BY pi.plate_id), 0) * COALESCE(pl.actual_grams, pl.estimated_grams) AS share
        FROM plate_items pi JOIN plates pl ON pl.id = pi.plate_id WHERE ${printed}
      ) x GROUP BY x.member_id`),
    rows<{ member_id: number; n: unknown; p50: unknown; p90: unknown }>(sql`
      SELECT DISTINCT wt.member_id, COUNT(*) OVER (PARTITION BY wt.member_id) AS n,
        PERCENTILE_DISC(0.5) WITHIN GROUP (ORDER BY wt.w) OVER (PARTITION BY wt.member_id) AS p50,
        PERCENTILE_DISC(0.9) WITHIN GROUP (ORDER BY wt.w) OVER (PARTITION BY wt.member_id) AS p90
      FROM ${waits}`),
    rows<{ n: unknown; p50: unknown; p90: unknown }>(sql`
      SELECT DISTINCT COUNT(*) OVER () AS n,
        PERCENTILE_DISC(0.5) WITHIN GROUP (ORDER BY wt.w) OVER () AS p50,
        PERCENTILE_DISC(0.9) WITHIN GROUP (ORDER BY wt.w) OVER () AS p90
      FROM ${waits}`),
    money
      ? rows<{ member_id: number; c: unknown }>(sql`SELECT member_id, SUM(amount_cents) AS c FROM charges WHERE created_at >= ${a} AND created_at < ${b} GROUP BY member_id`)
      : Promise.resolve([] as { member_id: number; c: unknown }[]),
  ]);
  const ids = [...new Set([...parts.map((r) => r.member_id), ...charged.map((r) => r.member_id)])];
  const names = ids.length ? await db().select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, ids)) : [];
  const hours = (s: unknown) => (numOrNull(s) === null ? null : num(s) / 3600);
  const out: MemberRow[] = ids.map((id) => {
    const pr = parts.find((r) => r.member_id === id);
    const w = perMember.find((r) => r.member_id === id);
    const row: MemberRow = {
      memberId: id,
      name: names.find((n) => n.id === id)?.name ?? `Member ${id}`,
      parts: num(pr?.n),
      grams: num(pr?.g),
      waits: num(w?.n),
      waitMedianH: hours(w?.p50),
      waitP90H: hours(w?.p90),
    };
    if (money) row.chargesCents = num(charged.find((r) => r.member_id === id)?.c);
    return row;
  });
  out.sort((x, y) => y.parts - x.parts || x.name.localeCompare(y.name));
  const o = overall[0];
  return { rows: out, overall: { waits: num(o?.n), waitMedianH: hours(o?.p50), waitP90H: hours(o?.p90) } };
}
