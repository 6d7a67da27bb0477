// Plan an instance file: `npm run -s plan -- INSTANCE.json [--json]`.
// Prints the plan as JSON with --json, else a readable summary. Bad input exits 1 naming the field.
import { readFileSync } from "node:fs";
import { planWorkshop } from "@/lib/plan/plan";
import { parsePlanInstance } from "@/lib/plan/schema";

function fail(msg: string): never {
  process.stderr.write(`plan: ${msg}\n`);
  process.exit(1);
}

const args = process.argv.slice(2);
const json = args.includes("--json");
const file = args.find((a) => !a.startsWith("--"));
if (!file) fail("usage: npm run -s plan -- INSTANCE.json [--json]");

let raw: unknown;
try {
  raw = JSON.parse(readFileSync(file, "utf8"));
} catch (e) {
  fail(`cannot read ${file}: ${(e as Error).message}`);
}
const parsed = parsePlanInstance(raw);
if (!parsed.ok) fail(`invalid instance ${file}:\n  ${parsed.errors.join("\n  ")}`);

const out = planWorkshop(parsed.instance);
if (json) {
  process.stdout.write(JSON.stringify(out, null, 2) + "\n");
} else {
  const tz = parsed.instance.timezone;
  const local = (iso: string) => new Date(iso).toLocaleString("en-GB", { timeZone: tz, weekday: "short", day: "2-digit", month: "short", hour: "2-digit", minute: "2-digit" });
  const m = out.metrics;
  const hm = (min: number) => `${Math.floor(min / 60)}:${String(Math.round(min % 60)).padStart(2, "0")}`;
  console.log(`${m.plates} plates, last ends after ${hm(m.makespan_minutes)} h:mm, mean bed fill ${(m.mean_bed_fill * 100).toFixed(1)}%`);
  console.log(`${m.late_instances} late instances (${hm(m.total_lateness_minutes)} h:mm late in total), ${out.unplaced.length} unplaced\n`);
  for (const p of out.plates) {
    const parts = new Map<string, number>();
    for (const it of p.items) parts.set(it.part, (parts.get(it.part) ?? 0) + 1);
    const list = [...parts].map(([id, n]) => (n > 1 ? `${id} ×${n}` : id)).join(", ");
    console.log(`${p.id}  ${p.printer.padEnd(10)} ${local(p.start)} → ${local(p.end)}  ${p.material} ${p.color}: ${list}`);
    if (p.runs_unattended) console.log(`          ! ${p.caution}`);
  }
  for (const u of out.unplaced) console.log(`unplaced ${u.part} #${u.instance}: ${u.reason}`);
}
