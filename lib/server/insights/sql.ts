import "server-only";
import { sql, type SQL } from "drizzle-orm";
import { db } from "@/db";

/** Runs a raw aggregate and returns its rows (mysql2 gives DECIMAL sums as strings: read with num()). */
export async function rows<T>(q: SQL): Promise<T[]> {
  const [out] = (await db().execute(q)) as unknown as [T[], unknown];
  return out;
}

export function num(v: unknown): number {
  if (v === null || v === undefined) return 0;
  const n = typeof v === "number" ? v : Number(v);
  return Number.isFinite(n) ? n : 0;
}

export function numOrNull(v: unknown): number | null {
  return v === null || v === undefined ? null : num(v);
}

/** An instant as DATETIME(3) text in UTC: the pool reads and writes UTC (timezone "Z"). */
export function utc(ms: number): string {
  return new Date(ms).toISOString().replace("T", " ").replace("Z", "");
}

/**
 * A derived table of intervals sent as one JSON parameter: JSON_TABLE turns it into rows the
 * aggregate can join, so the local-time arithmetic (done in Node with the zone rules) meets the
 * rows in SQL and only the sums come back.
 */
export function intervalTable(list: { start: number; end: number; a?: number; b?: number }[], alias: string): SQL {
  const json = JSON.stringify(list.map((iv, i) => [utc(iv.start), utc(iv.end), iv.a ?? i, iv.b ?? 0]));
  return sql`JSON_TABLE(${json}, '$[*]' COLUMNS (s DATETIME(3) PATH '$[0]', e DATETIME(3) PATH '$[1]', a INT PATH '$[2]', b INT PATH '$[3]')) ${sql.raw(alias)}`;
}

/** Plates that count as run time: finished and failed ones (cancelled plates may never have run). */
export const RAN = sql.raw(`('finished','failed')`);
