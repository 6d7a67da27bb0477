import { createAttendedCalendar, type AttendedCalendar } from "@/lib/calendar/attended-hours";
import { checkPartInstance } from "./check-part";
import { rankInstances, type PartInstance } from "./fair-share";
import { centreLayout } from "./layout";
import { touchMinutes } from "./objective";
import { packPlates, type PackedPlate } from "./pack";
import { footprintWithBrim, housingAllows, needsEnclosure, spoolAtHand } from "./rules";
import { plateLateness, schedulePlates, type Timed } from "./schedule";
import type { AssemblyCompletion, Plate, PlanInstance, PlanMetrics, PlanOutput, Printer, Unplaced } from "./schema";

const MIN = 60_000;

export type PlanOptions = { balanceTail?: boolean; loadShare?: number | null; maxImprovements?: number };

/** Caps on plate time tried, as shares of the average printer load (see planWorkshop). */
export const LOAD_SHARES: readonly (number | null)[] = [null, 1, 1 / 2, 1 / 3];

export const UNATTENDED_CAUTION =
  "This plate is still printing at closing time and runs unattended. Unattended and overnight printing is a fire risk: " +
  "follow the workshop's rules (and local codes) for leaving printers running, or start it when it can finish attended.";
export const FUMES_CAUTION =
  "ABS and ASA give off fumes while printing: keep the enclosure closed and the room ventilated, as the workshop's rules say.";

/** Plan an instance (already validated by planInstanceSchema): pack, then schedule. Deterministic. */
export function planWorkshop(inst: PlanInstance, options: PlanOptions = {}): PlanOutput {
  const nowMs = Date.parse(inst.now);
  const calendar = createAttendedCalendar(inst.timezone, inst.attended);
  const unplaced: Unplaced[] = [];
  const totalMinutes = inst.parts.reduce((s, p) => s + p.minutes * p.quantity, 0);
  const ranked = rankInstances(inst.parts, nowMs, totalMinutes / inst.printers.length, inst.printers.length);

  // Which printers can take each part: the member's upload check on the footprint with its brim,
  // then the printer's housing; and a spool of its material and colour must be in the workshop.
  const allowed = new Map<string, Set<string>>();
  const reasons = new Map<string, string>();
  const accepted: PartInstance[] = [];
  const neverOpen = calendar.nextOpening(nowMs) === null;
  for (const x of ranked) {
    let ok = allowed.get(x.part.id);
    if (!ok) {
      const housed = inst.printers.filter((p) => housingAllows(p, x.part.material));
      const check = checkPartInstance({ ...x.part, footprint: footprintWithBrim(x.part) }, housed, inst.margin_mm);
      ok = new Set(check.ok ? check.printers : []);
      allowed.set(x.part.id, ok);
      if (housed.length === 0 && needsEnclosure(x.part.material)) reasons.set(x.part.id, `${x.part.material} needs an enclosed printer and none is marked enclosed`);
      else if (!check.ok) reasons.set(x.part.id, check.reason);
      else if (!spoolAtHand(inst, { material: x.part.material, color: x.part.color })) {
        allowed.set(x.part.id, (ok = new Set()));
        reasons.set(x.part.id, `waiting for a ${x.part.material} ${x.part.color} spool: the workshop has none`);
      }
    }
    if (neverOpen) unplaced.push({ part: x.part.id, instance: x.instance, reason: "the workshop has no opening hours, so nobody can start a plate" });
    else if (ok.size === 0) unplaced.push({ part: x.part.id, instance: x.instance, reason: reasons.get(x.part.id)! });
    else accepted.push(x);
  }

  // The unattended policy: when plates may not run past closing (or only so long), a plate is no
  // longer than the longest open spell (plus the allowance), and the scheduler ends it in time.
  const unattended = inst.unattended ? { allowed: inst.unattended.allowed, maxHours: inst.unattended.max_hours } : { allowed: true, maxHours: null };
  const spell = calendar.longestSpellMinutes();
  const alwaysOpen = calendar.closingAfter(nowMs) === null && !neverOpen;
  const spellCap = alwaysOpen || (unattended.allowed && unattended.maxHours === null) ? null : spell + (unattended.allowed ? unattended.maxHours! * 60 : 0);
  const ctx = { printers: inst.printers, calendar, nowMs, marginMm: inst.margin_mm, gapMm: inst.gap_mm, unattended, touchMinutes: touchMinutes(inst) };
  // The cap on plate time (none, or a share of the average printer load) is a trade: long plates
  // are fuller, short ones spread the work better. Unless the caller fixes it, each share in
  // LOAD_SHARES is packed and given a quick schedule (no local search), and the objective decides.
  const share = accepted.reduce((s, x) => s + x.part.minutes, 0) / inst.printers.length;
  type Trial = { packed: PackedPlate[]; unscheduled: number; lateness: number; span: number; longest: number; changes: number };
  let previous: Trial | null = null;
  const trials = (options.loadShare !== undefined ? [options.loadShare] : LOAD_SHARES).map((loadShare): Trial => {
    // A cap no plate of the previous (looser) trial reached would pack the same plates again.
    if (previous && loadShare !== null && previous.longest <= loadShare * share) return previous;
    const packed = packPlates(accepted, inst.printers, (x, p) => allowed.get(x.part.id)!.has(p.id), {
      marginMm: inst.margin_mm,
      gapMm: inst.gap_mm,
      spellCapMinutes: spellCap,
      balanceTail: options.balanceTail ?? false,
      loadShare,
      chunkFill: 0.92,
      nowMs,
      balanceRounds: 4,
    });
    const quick = schedulePlates(packed, ctx, 0);
    let lateness = 0;
    let finish = nowMs;
    let changes = 0;
    for (const t of quick.timed) {
      lateness += plateLateness(t.plate, t.end);
      finish = Math.max(finish, t.end);
      if (t.spoolChange) changes += 1;
    }
    const byId = new Map(inst.printers.map((p) => [p.id, p]));
    const longest = Math.max(0, ...packed.map((p) => byId.get(p.packedFor)!.startup_minutes + p.partMinutes));
    previous = { packed, unscheduled: quick.unscheduled.length, lateness, span: finish - nowMs, longest, changes };
    return previous;
  });
  // The objective (objective.ts) picks among them: fewest unscheduled, least lateness (within 5 %),
  // then touches × touch minutes + finish.
  const fewestUnscheduled = Math.min(...trials.map((t) => t.unscheduled));
  const pool = trials.filter((t) => t.unscheduled === fewestUnscheduled);
  const leastLate = Math.min(...pool.map((t) => t.lateness));
  const cost = (t: Trial) => (2 * t.packed.length + t.changes) * ctx.touchMinutes + t.span / MIN;
  const packed = pool.filter((t) => t.lateness <= leastLate * 1.05 + 1).reduce((best, t) => (cost(t) < cost(best) ? t : best)).packed;
  const { timed, unscheduled } = schedulePlates(packed, ctx, options.maxImprovements, (x, p) => allowed.get(x.part.id)!.has(p.id));
  for (const plate of unscheduled) {
    for (const it of plate.items) {
      unplaced.push({ part: it.inst.part.id, instance: it.inst.instance, reason: "no attended start time clear of the printers' unavailable windows was found" });
    }
  }
  const plates = toPlates(timed, calendar, inst);
  unplaced.sort((a, b) => (a.part < b.part ? -1 : a.part > b.part ? 1 : a.instance - b.instance));
  return { plates, unplaced, metrics: computeMetrics(inst, plates), assemblies: assemblyCompletions(inst, plates, unplaced) };
}

function toPlates(timed: readonly Timed[], calendar: AttendedCalendar, inst: PlanInstance): Plate[] {
  const printers = new Map(inst.printers.map((p) => [p.id, p]));
  const sorted = [...timed].sort((a, b) => a.start - b.start || (a.printer < b.printer ? -1 : 1));
  return sorted.map((t, i) => {
    const closing = calendar.closingAfter(t.start);
    const unattended = closing !== null && t.end > closing;
    const cautions = [unattended ? UNATTENDED_CAUTION : null, needsEnclosure(t.plate.material) ? FUMES_CAUTION : null].filter(Boolean);
    const items = centreLayout(t.plate.items, printers.get(t.printer)!.bed);
    return {
      id: `plate-${String(i + 1).padStart(3, "0")}`,
      printer: t.printer,
      material: t.plate.material,
      color: t.plate.color,
      start: new Date(t.start).toISOString(),
      end: new Date(t.end).toISOString(),
      items: items
        .sort((a, b) => a.inst.rank - b.inst.rank)
        .map((it) => ({ part: it.inst.part.id, instance: it.inst.instance, x: round(it.x), y: round(it.y), rotated: it.rotated })),
      runs_unattended: unattended,
      caution: cautions.length ? cautions.join(" ") : null,
      spool_change: t.spoolChange,
    };
  });
}

/** Per member's assembly: its copies, when the last one prints, and how many could not be planned. */
export function assemblyCompletions(inst: PlanInstance, plates: readonly Plate[], unplaced: readonly Unplaced[]): AssemblyCompletion[] {
  const parts = new Map(inst.parts.map((p) => [p.id, p]));
  const out = new Map<string, AssemblyCompletion>();
  const entry = (partId: string) => {
    const part = parts.get(partId);
    if (!part?.assembly) return null;
    const owner = part.owner ?? "(no owner)";
    const key = `${owner}\u0000${part.assembly}`;
    let e = out.get(key);
    if (!e) out.set(key, (e = { owner, assembly: part.assembly, copies: 0, last_end: null, unplaced: 0 }));
    return e;
  };
  for (const plate of plates) {
    for (const it of plate.items) {
      const e = entry(it.part);
      if (!e) continue;
      e.copies += 1;
      if (e.last_end === null || Date.parse(plate.end) > Date.parse(e.last_end)) e.last_end = plate.end;
    }
  }
  for (const u of unplaced) {
    const e = entry(u.part);
    if (e) {
      e.copies += 1;
      e.unplaced += 1;
    }
  }
  return [...out.values()].sort((a, b) => (a.owner < b.owner ? -1 : a.owner > b.owner ? 1 : a.assembly < b.assembly ? -1 : a.assembly > b.assembly ? 1 : 0));
}

const round = (v: number) => Math.round(v * 1000) / 1000;

/**
 * Metrics (README.md, "Scoring"): makespan from `now` to the last plate's end; lateness per
 * instance against its part's due time; bed fill = footprint area / bed area less the margins
 * (of the plates, never of empty beds); touches = a start and a take-off per plate plus one per
 * spool change (the printer's spool, or its previous plate's, differs; nothing loaded counts).
 */
export function computeMetrics(inst: PlanInstance, plates: readonly Plate[]): PlanMetrics {
  const nowMs = Date.parse(inst.now);
  const parts = new Map(inst.parts.map((p) => [p.id, p]));
  const printers = new Map<string, Printer>(inst.printers.map((p) => [p.id, p]));
  let makespan = 0;
  let late = 0;
  let lateness = 0;
  let fillSum = 0;
  let changes = 0;
  const held = new Map<string, { material: string; color: string } | undefined>(inst.printers.map((p) => [p.id, p.loaded]));
  const byStart = [...plates].sort((a, b) => Date.parse(a.start) - Date.parse(b.start));
  for (const plate of byStart) {
    const h = held.get(plate.printer);
    if (!h || h.material !== plate.material || h.color !== plate.color) changes += 1;
    held.set(plate.printer, { material: plate.material, color: plate.color });
  }
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
    touches: 2 * plates.length + changes,
    spool_changes: changes,
    unattended_plates: plates.filter((p) => p.runs_unattended).length,
  };
}
