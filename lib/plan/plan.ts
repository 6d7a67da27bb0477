import { createAttendedCalendar, type AttendedCalendar } from "@/lib/calendar/attended-hours";
import { checkPartInstance } from "./check-part";
import { rankInstances, type PartInstance } from "./fair-share";
import { packPlates } from "./pack";
import { schedulePlates, type Timed } from "./schedule";
import type { Plate, PlanInstance, PlanMetrics, PlanOutput, Printer, Unplaced } from "./schema";

const MIN = 60_000;

export type PlanOptions = { balanceTail?: boolean; loadShare?: number | null; maxImprovements?: number };

export const UNATTENDED_CAUTION =
  "This plate is still printing at closing time and runs unattended. Unattended and overnight printing is a fire risk: " +
  "follow the workshop's rules (and local codes) for leaving printers running, or start it when it can finish attended.";

/** Plan an instance (already validated by planInstanceSchema): pack, then schedule. Deterministic. */
export function planWorkshop(inst: PlanInstance, options: PlanOptions = {}): PlanOutput {
  const nowMs = Date.parse(inst.now);
  const calendar = createAttendedCalendar(inst.timezone, inst.attended);
  const unplaced: Unplaced[] = [];
  const totalMinutes = inst.parts.reduce((s, p) => s + p.minutes * p.quantity, 0);
  const ranked = rankInstances(inst.parts, nowMs, totalMinutes / inst.printers.length);

  // Which printers can take each part (the same check a member's upload goes through).
  const allowed = new Map<string, Set<string>>();
  const reasons = new Map<string, string>();
  const accepted: PartInstance[] = [];
  const neverOpen = calendar.nextOpening(nowMs) === null;
  for (const x of ranked) {
    let ok = allowed.get(x.part.id);
    if (!ok) {
      const check = checkPartInstance(x.part, inst.printers, inst.margin_mm);
      ok = new Set(check.ok ? check.printers : []);
      allowed.set(x.part.id, ok);
      if (!check.ok) reasons.set(x.part.id, check.reason);
    }
    if (neverOpen) unplaced.push({ part: x.part.id, instance: x.instance, reason: "the workshop has no attended hours, so nobody can start a plate" });
    else if (ok.size === 0) unplaced.push({ part: x.part.id, instance: x.instance, reason: reasons.get(x.part.id)! });
    else accepted.push(x);
  }

  const spell = calendar.longestSpellMinutes();
  const alwaysOpen = calendar.closingAfter(nowMs) === null && !neverOpen;
  const packed = packPlates(accepted, inst.printers, (x, p) => allowed.get(x.part.id)!.has(p.id), {
    marginMm: inst.margin_mm,
    gapMm: inst.gap_mm,
    spellCapMinutes: alwaysOpen ? null : spell,
    balanceTail: options.balanceTail ?? false,
    loadShare: options.loadShare === undefined ? 1 / 3 : options.loadShare,
  });
  const { timed, unscheduled } = schedulePlates(packed, { printers: inst.printers, calendar, nowMs, marginMm: inst.margin_mm }, options.maxImprovements);
  for (const plate of unscheduled) {
    for (const it of plate.items) {
      unplaced.push({ part: it.inst.part.id, instance: it.inst.instance, reason: "no attended start time clear of the printers' unavailable windows was found" });
    }
  }
  const plates = toPlates(timed, calendar);
  unplaced.sort((a, b) => (a.part < b.part ? -1 : a.part > b.part ? 1 : a.instance - b.instance));
  return { plates, unplaced, metrics: computeMetrics(inst, plates) };
}

function toPlates(timed: readonly Timed[], calendar: AttendedCalendar): Plate[] {
  const sorted = [...timed].sort((a, b) => a.start - b.start || (a.printer < b.printer ? -1 : 1));
  return sorted.map((t, i) => {
    const closing = calendar.closingAfter(t.start);
    const unattended = closing !== null && t.end > closing;
    return {
      id: `plate-${String(i + 1).padStart(3, "0")}`,
      printer: t.printer,
      material: t.plate.material,
      color: t.plate.color,
      start: new Date(t.start).toISOString(),
      end: new Date(t.end).toISOString(),
      items: [...t.plate.items]
        .sort((a, b) => a.inst.rank - b.inst.rank)
        .map((it) => ({ part: it.inst.part.id, instance: it.inst.instance, x: round(it.x), y: round(it.y), rotated: it.rotated })),
      runs_unattended: unattended,
      caution: unattended ? UNATTENDED_CAUTION : null,
    };
  });
}

const round = (v: number) => Math.round(v * 1000) / 1000;

/**
 * Metrics (README.md, "Scoring"): makespan from `now` to the last plate's end; lateness per
 * instance against its part's due time; bed fill = footprint area / bed area less the margins.
 */
export function computeMetrics(inst: PlanInstance, plates: readonly Plate[]): PlanMetrics {
  const nowMs = Date.parse(inst.now);
  const parts = new Map(inst.parts.map((p) => [p.id, p]));
  const printers = new Map<string, Printer>(inst.printers.map((p) => [p.id, p]));
  let makespan = 0;
  let late = 0;
  let lateness = 0;
  let fillSum = 0;
  for (const plate of plates) {
    const end = Date.parse(plate.end);
    makespan = Math.max(makespan, (end - nowMs) / MIN);
    const printer = printers.get(plate.printer);
    let area = 0;
    for (const it of plate.items) {
      const part = parts.get(it.part);
      if (!part) continue;
      area += part.footprint[0] * part.footprint[1];
      if (part.due !== null && end > Date.parse(part.due)) {
        late += 1;
        lateness += (end - Date.parse(part.due)) / MIN;
      }
    }
    if (printer) fillSum += area / ((printer.bed[0] - 2 * inst.margin_mm) * (printer.bed[1] - 2 * inst.margin_mm));
  }
  return {
    plates: plates.length,
    makespan_minutes: round(makespan),
    late_instances: late,
    total_lateness_minutes: round(lateness),
    mean_bed_fill: plates.length ? round(fillSum / plates.length) : 0,
  };
}
