// Insights benchmark: how long the page's aggregates take on the seeded history, per section and
// in total, for the week, the month, the seeded four months and a whole year; beside the time it
// takes just to load the same period's plate rows into Node (what the aggregates avoid).
// Prints figures and ratios; it is not a test and asserts nothing. Goal: the page's data < 1 s.
// Run: npm run bench:insights (DB_NAME picks the database; default platewright).
import { spawnSync } from "node:child_process";
import { fileURLToPath } from "node:url";

// lib/server modules import "server-only", which resolves to an empty module only under the
// react-server condition: re-run this file once with that condition set.
if (!process.env.PW_BENCH_CHILD) {
  const r = spawnSync(process.execPath, ["--conditions=react-server", "--import", "tsx", fileURLToPath(import.meta.url)], { stdio: "inherit", env: { ...process.env, PW_BENCH_CHILD: "1" } });
  process.exit(r.status ?? 1);
}

const RUNS = 5;
const fmt = (v: number, d = 1) => v.toFixed(d);
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)] ?? 0;

async function timed(fn: () => Promise<unknown>): Promise<{ med: number; max: number }> {
  await fn(); // warm the pool and the server's caches
  const xs: number[] = [];
  for (let i = 0; i < RUNS; i++) {
    const t0 = performance.now();
    await fn();
    xs.push(performance.now() - t0);
  }
  return { med: median(xs), max: Math.max(...xs) };
}

async function main() {
  const { sql, eq, asc } = await import("drizzle-orm");
  const { db, closeDb } = await import("@/db");
  const { users, printers } = await import("@/db/schema");
  const { getInsights } = await import("@/lib/server/insights");
  const { getAttendedCalendar } = await import("@/lib/server/hours");
  const { getWorkshopSettings } = await import("@/lib/server/workshop");
  const { resolvePeriod, addDays, localDateOf } = await import("@/lib/insights/period");
  const { heatmap, utilisation } = await import("@/lib/server/insights/utilisation");
  const { failures } = await import("@/lib/server/insights/failures");
  const { estimates } = await import("@/lib/server/insights/estimates");
  const { material } = await import("@/lib/server/insights/material");
  const { members } = await import("@/lib/server/insights/members");

  const [admin] = await db().select({ id: users.id, email: users.email, name: users.name, role: users.role }).from(users).where(eq(users.role, "admin")).limit(1);
  if (!admin) throw new Error("no admin in this database: run the seed first");
  const [counts] = (await db().execute(sql`SELECT (SELECT COUNT(*) FROM plates) AS plates, (SELECT COUNT(*) FROM plate_items) AS items, (SELECT COUNT(*) FROM print_history) AS history, (SELECT COUNT(*) FROM charges) AS charges`)) as unknown as [Record<string, unknown>[]];
  console.log(`insights benchmark on ${process.env.DB_NAME ?? "platewright"}: ${JSON.stringify(counts?.[0])}; ${RUNS} runs each, median (max) ms`);

  const ws = await getWorkshopSettings();
  const cal = await getAttendedCalendar();
  const prs = await db().select({ id: printers.id, name: printers.name }).from(printers).orderBy(asc(printers.name));
  const today = localDateOf(Date.now(), ws.timezone);
  const periods = [
    { name: "week", q: { period: "week" as const } },
    { name: "month", q: { period: "month" as const } },
    { name: "4 months", q: { period: "custom" as const, from: addDays(today, -120), to: addDays(today, -1) } },
    { name: "366 days", q: { period: "custom" as const, from: addDays(today, -365), to: today } },
  ];
  for (const { name, q } of periods) {
    const p = resolvePeriod(q, ws.timezone, Date.now());
    const a = new Date(p.start);
    const b = new Date(p.end);
    const total = await timed(() => getInsights(admin, q));
    const parts = {
      utilisation: await timed(() => utilisation(p, cal, prs)),
      heatmap: await timed(() => heatmap(p)),
      failures: await timed(() => failures(p, prs)),
      estimates: await timed(() => estimates(p, prs)),
      material: await timed(() => material(p)),
      members: await timed(() => members(p, true)),
    };
    // What the aggregates avoid: every plate and copy of the period brought into Node.
    let rowsLoaded = 0;
    const raw = await timed(async () => {
      const [r] = (await db().execute(sql`SELECT pl.*, pi.* FROM plates pl LEFT JOIN plate_items pi ON pi.plate_id = pl.id WHERE pl.ended_at >= ${a} AND pl.started_at < ${b}`)) as unknown as [unknown[]];
      rowsLoaded = r.length;
    });
    console.log(`\n== ${name} (${p.from} … ${p.to}, ${fmt((p.end - p.start) / 3_600_000, 0)} h)`);
    console.log(`  whole page data: ${fmt(total.med)} (${fmt(total.max)}) ms  → goal < 1000 ms: ${total.max < 1000 ? "met" : "NOT met"}`);
    console.log("  " + Object.entries(parts).map(([k, v]) => `${k} ${fmt(v.med)} (${fmt(v.max)})`).join(" | "));
    console.log(`  loading the raw rows instead: ${rowsLoaded} rows in ${fmt(raw.med)} ms; page data ÷ raw load = ${fmt(total.med / Math.max(0.01, raw.med), 2)}`);
  }
  await closeDb();
}

main().catch((e: unknown) => {
  console.error("bench: failed:", e instanceof Error ? e.message : e);
  process.exit(1);
});
