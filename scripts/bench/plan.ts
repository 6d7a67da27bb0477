// Planner benchmark: 1,000 copies, 12 printers of 3 bed sizes, 4 materials, two calendars; ours
// against a plain baseline on the same instances. Prints figures and ratios against lower bounds;
// it is not a test and asserts nothing. The last two lines are the summary (worst seed of each).
import { baselinePlan } from "@/lib/plan/baseline";
import { calendarFinishBound, planLowerBounds, platesForFinishBound } from "@/lib/plan/bounds";
import { fairnessInstance, generateInstance, lastCopyMinutes } from "@/lib/plan/generate-instance";
import { planWorkshop } from "@/lib/plan/plan";
import { validatePlan } from "@/lib/plan/validate";
import { planScore } from "@/lib/plan/objective";
import { objectiveLowerBound, smallInstance } from "../../tests/support/objective-bound";

const SEEDS = [1, 2, 3];
/** Each plan is timed this many times (it is deterministic); the median is printed. */
const RUNS = 3;
const fmt = (v: number, d = 2) => v.toFixed(d);
const h = (minutes: number) => `${fmt(minutes / 60, 1)} h`;

type Hours = "all" | "workdays";
function run(hours: Hours, seed: number) {
  const inst = generateInstance({ seed, printers: 12, instances: 1000, hours, owners: 8, dueFraction: 0.15 });
  const times: number[] = [];
  let out = planWorkshop(inst);
  for (let i = 0; i < RUNS; i++) {
    const t0 = performance.now();
    out = planWorkshop(inst);
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  const base = baselinePlan(inst);
  const calendar = hours !== "all";
  const finishBound = calendarFinishBound(inst);
  const feasible = Math.ceil(platesForFinishBound(inst, out.metrics.makespan_minutes, { calendar }) - 1e-9);
  return { inst, ms: times[Math.floor(times.length / 2)]!, out, base, finishBound, feasible, errors: validatePlan(inst, out), baseErrors: validatePlan(inst, base), lb: planLowerBounds(inst) };
}

console.log("plan benchmark: 1,000 copies, 12 printers (beds 180², 220², 256² mm), 4 materials, margin 5 mm, gap 3 mm, ABS/ASA with a 5 mm brim");
console.log(`time: median of ${RUNS} runs after one warm-up run (the machine is shared; expect noise). Goal: each plan ≤ 2 s`);
console.log("ours: lib/plan (objective.ts: lateness, fair share, touches × 30 min + finish)");
console.log("baseline: shelf packing on each group's largest bed, longest plate first onto the printer that can start it earliest");
console.log("bounds (lib/plan/bounds.ts):");
console.log("  finish bound: least F whose printer capacities hold all the work (and each material's), calendar-aware:");
console.log("    plates start only while open and each printer runs at most one plate across each closed stretch");
console.log("  feasible plates: fewest plates any plan needs to finish by OUR finish (LP, flattest parts to the largest beds),");
console.log("    with the same calendar capacities on the attended line");
console.log("  touches: a start and a take-off per plate, plus one per spool change (nothing loaded counts as a change)");
const summary: Record<Hours, { x: number; y: number; z: number }> = { all: { x: 0, y: 0, z: 0 }, workdays: { x: 0, y: 0, z: 0 } };
for (const hours of ["all", "workdays"] as const) {
  console.log(`\n== ${hours === "all" ? "always open" : "attended Mon-Fri 08:00-18:00 Europe/Berlin, unattended runs allowed"}`);
  for (const seed of SEEDS) {
    const r = run(hours, seed);
    const m = r.out.metrics;
    const b = r.base.metrics;
    const x = m.plates / r.feasible;
    const y = m.makespan_minutes / r.finishBound;
    const z = m.touches / b.touches;
    const s = summary[hours];
    s.x = Math.max(s.x, x);
    s.y = Math.max(s.y, y);
    s.z = Math.max(s.z, z);
    console.log(
      `seed ${seed}: ${fmt(r.ms, 0)} ms | ours: plates ${m.plates} (feasible bound ${r.feasible}, area bound ${r.lb.plates}) finish ${h(m.makespan_minutes)} ` +
        `(bound ${h(r.finishBound)}) fill ${fmt(m.mean_bed_fill * 100, 1)}% touches ${m.touches} (changes ${m.spool_changes}) late ${m.late_instances} ` +
        `(${fmt(m.total_lateness_minutes / 60, 1)} h) unattended ${m.unattended_plates} unplaced ${r.out.unplaced.length} faults ${r.errors.length}`,
    );
    console.log(
      `        baseline: plates ${b.plates} finish ${h(b.makespan_minutes)} fill ${fmt(b.mean_bed_fill * 100, 1)}% touches ${b.touches} (changes ${b.spool_changes}) ` +
        `late ${b.late_instances} (${fmt(b.total_lateness_minutes / 60, 1)} h) faults ${r.baseErrors.length} | ratios: plates/feasible ${fmt(x, 3)} finish/bound ${fmt(y, 3)} touches/baseline ${fmt(z, 3)}`,
    );
  }
}
console.log("\n== fairness: one member sends 120 copies first, five members then send 3 small copies each (PLA black, 4 printers)");
for (const seed of SEEDS) {
  const inst = fairnessInstance(seed);
  const out = planWorkshop(inst);
  const last = lastCopyMinutes(inst, out.plates);
  const heavy = last.get("heavy")!;
  const light = Math.max(...[...last].filter(([o]) => o !== "heavy").map(([, t]) => t));
  console.log(`seed ${seed}: light members' last copy ${h(light)}, heavy member's ${h(heavy)} → ratio ${fmt(light / heavy, 3)} (goal ≤ 0.25)`);
}
console.log("\n== small instances (3 printers, Mon-Fri hours, a loaded spool, no unattended runs): cost = touches × 30 min + finish");
console.log("   against a HiGHS lower bound on that cost (tests/support/objective-bound.ts); goal ≤ 1.10");
for (const seed of [401, 402, 403, 404, 405, 406]) {
  const inst = smallInstance(seed);
  const out = planWorkshop(inst);
  const ours = planScore(inst, out.plates, 0);
  const lb = await objectiveLowerBound(inst, ours.finish);
  console.log(`seed ${seed}: ours ${fmt(ours.cost, 0)} (touches ${ours.touches}, finish ${h(ours.finish)}) vs bound ${fmt(lb, 0)} → ratio ${fmt(ours.cost / lb, 3)}`);
}
console.log("\nsummary: the worst seed of each figure; goals always-open X ≤ 1.15, Y ≤ 1.15; attended X ≤ 1.30, Y ≤ 1.35; Z ≤ 0.8");
for (const hours of ["all", "workdays"] as const) {
  const s = summary[hours];
  console.log(`summary ${hours === "all" ? "always-open" : "attended"}: plates/feasible-bound ${fmt(s.x, 3)}, finish/bound ${fmt(s.y, 3)}, touches/baseline ${fmt(s.z, 3)}`);
}
