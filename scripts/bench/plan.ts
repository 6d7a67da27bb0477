// Planner benchmark: 1,000 part instances, 12 printers of 3 bed sizes, 4 materials.
// Prints figures and ratios against lower bounds; it is not a test and asserts nothing.
import { planLowerBounds, platesForFinishBound } from "@/lib/plan/bounds";
import { generateInstance } from "@/lib/plan/generate-instance";
import { planWorkshop } from "@/lib/plan/plan";
import { validatePlan } from "@/lib/plan/validate";

const SEEDS = [1, 2, 3];
/** Each plan is timed this many times (it is deterministic); the median is printed. */
const RUNS = 3;
/** The goal's tolerance on the finish time. */
const FINISH_SLACK = 1.15;
const fmt = (v: number, d = 2) => v.toFixed(d);

function run(hours: "all" | "workdays", seed: number) {
  const inst = generateInstance({ seed, printers: 12, instances: 1000, hours, owners: 8, dueFraction: 0.15 });
  const times: number[] = [];
  let out = planWorkshop(inst);
  for (let i = 0; i < RUNS; i++) {
    const t0 = performance.now();
    out = planWorkshop(inst);
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  const errors = validatePlan(inst, out);
  const lb = planLowerBounds(inst);
  const forFinish = platesForFinishBound(inst, FINISH_SLACK * lb.finishMinutes);
  return { ms: times[Math.floor(times.length / 2)]!, out, lb, errors, forFinish };
}

console.log("plan benchmark: 1,000 instances, 12 printers (beds 180², 220², 256² mm), 4 materials, margin 5 mm, gap 3 mm");
console.log("goal: plan ≤ 2 s; plates ≤ 1.15 × area bound; finish ≤ 1.15 × max(total minutes / printers, longest part)");
console.log(`time: median of ${RUNS} runs after one warm-up run (the machine is shared; expect noise)`);
console.log("bounds:");
console.log("  area bound: per sharing group, ceil(footprint area / largest usable bed of a printer that takes it), summed;");
console.log("    it counts every plate at the largest bed, so it cannot see that small beds must share the work");
console.log("  finish bound: max(total minutes / printers, longest part + smallest start-up); per material: its minutes");
console.log("    over the printers that take it");
console.log("  plates for the finish goal (second bound, shown beside the first, never instead of it): the least plates");
console.log(`    any plan needs to finish within ${FINISH_SLACK} × the finish bound — each printer prints at most that many`);
console.log("    minutes and a plate holds at most its bed's area (parts grown by the gap); LP relaxation, parts split");
console.log("    freely, materials ignored (lib/plan/bounds.ts platesForFinishBound). When it exceeds 1.15 × the area");
console.log("    bound, no plan can meet both goals on that instance");
for (const hours of ["all", "workdays"] as const) {
  console.log(`\n== attendance: ${hours === "all" ? "all hours (the goal's setting)" : "Mon-Fri 08:00-18:00 Europe/Berlin (bounds assume all hours; ratio shown for reference)"}`);
  for (const seed of SEEDS) {
    const { ms, out, lb, errors, forFinish } = run(hours, seed);
    const m = out.metrics;
    console.log(
      `seed ${seed}: ${fmt(ms, 0)} ms | plates ${m.plates} vs bound ${lb.plates} → ratio ${fmt(m.plates / lb.plates, 3)} | ` +
        `finish ${fmt(m.makespan_minutes / 60, 1)} h vs bound ${fmt(lb.finishMinutes / 60, 1)} h → ratio ${fmt(m.makespan_minutes / lb.finishMinutes, 3)} ` +
        `(${fmt(m.makespan_minutes / lb.finishByMaterialMinutes, 3)} vs the per-material bound ${fmt(lb.finishByMaterialMinutes / 60, 1)} h) | ` +
        `fill ${fmt(m.mean_bed_fill * 100, 1)}% | late ${m.late_instances} | unplaced ${out.unplaced.length} | ` +
        `unattended ${out.plates.filter((p) => p.runs_unattended).length} | validator faults ${errors.length}`,
    );
    const need = Math.ceil(forFinish - 1e-9);
    console.log(
      `        plates for the finish goal: ≥ ${need} (${fmt(need / lb.plates, 3)} × the area bound${need > FINISH_SLACK * lb.plates ? ", so both goals together are out of reach" : ""}) → plates ratio ${fmt(m.plates / need, 3)}`,
    );
  }
}
