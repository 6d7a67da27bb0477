// Planner benchmark: 1,000 part instances, 12 printers of 3 bed sizes, 4 materials.
// Prints figures and ratios against lower bounds; it is not a test and asserts nothing.
import { planLowerBounds } from "@/lib/plan/bounds";
import { generateInstance } from "@/lib/plan/generate-instance";
import { planWorkshop } from "@/lib/plan/plan";
import { validatePlan } from "@/lib/plan/validate";

const SEEDS = [1, 2, 3];
const fmt = (v: number, d = 2) => v.toFixed(d);

function run(hours: "all" | "workdays", seed: number) {
  const inst = generateInstance({ seed, printers: 12, instances: 1000, hours, owners: 8, dueFraction: 0.15 });
  const t0 = performance.now();
  const out = planWorkshop(inst);
  const ms = performance.now() - t0;
  const errors = validatePlan(inst, out);
  const lb = planLowerBounds(inst);
  return { ms, out, lb, errors };
}

console.log("plan benchmark: 1,000 instances, 12 printers (beds 180², 220², 256² mm), 4 materials, margin 5 mm, gap 3 mm");
console.log("goal: plan ≤ 2 s; plates ≤ 1.15 × area bound; finish ≤ 1.15 × max(total minutes / printers, longest part)");
for (const hours of ["all", "workdays"] as const) {
  console.log(`\n== attendance: ${hours === "all" ? "all hours (the goal's setting)" : "Mon-Fri 08:00-18:00 Europe/Berlin (bounds assume all hours; ratio shown for reference)"}`);
  for (const seed of SEEDS) {
    const { ms, out, lb, errors } = run(hours, seed);
    const m = out.metrics;
    console.log(
      `seed ${seed}: ${fmt(ms, 0)} ms | plates ${m.plates} vs bound ${lb.plates} → ratio ${fmt(m.plates / lb.plates, 3)} | ` +
        `finish ${fmt(m.makespan_minutes / 60, 1)} h vs bound ${fmt(lb.finishMinutes / 60, 1)} h → ratio ${fmt(m.makespan_minutes / lb.finishMinutes, 3)} ` +
        `(${fmt(m.makespan_minutes / lb.finishByMaterialMinutes, 3)} vs the per-material bound ${fmt(lb.finishByMaterialMinutes / 60, 1)} h) | ` +
        `fill ${fmt(m.mean_bed_fill * 100, 1)}% | late ${m.late_instances} | unplaced ${out.unplaced.length} | ` +
        `unattended ${out.plates.filter((p) => p.runs_unattended).length} | validator faults ${errors.length}`,
    );
  }
}
