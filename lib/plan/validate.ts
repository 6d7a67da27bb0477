import { createAttendedCalendar } from "@/lib/calendar/attended-hours";
import { computeMetrics } from "./plan";
import { brimOf, housingAllows, spoolAtHand } from "./rules";
import type { Part, PlanInstance, PlanOutput, Printer } from "./schema";

const EPS = 1e-6;
const MIN = 60_000;

/**
 * Check a plan against its instance, independently of how it was made. Returns one message per
 * fault; an empty list means the plan is valid. Used by the tests and by the server before it
 * accepts a plan from anywhere.
 */
export function validatePlan(inst: PlanInstance, out: PlanOutput): string[] {
  const errors: string[] = [];
  const parts = new Map<string, Part>(inst.parts.map((p) => [p.id, p]));
  const printers = new Map<string, Printer>(inst.printers.map((p) => [p.id, p]));
  const cal = createAttendedCalendar(inst.timezone, inst.attended);
  const nowMs = Date.parse(inst.now);
  const m = inst.margin_mm;
  const seen = new Map<string, string>();
  const mark = (part: string, instance: number, where: string) => {
    const p = parts.get(part);
    if (!p) return errors.push(`${where}: unknown part "${part}"`);
    if (!Number.isInteger(instance) || instance < 1 || instance > p.quantity) return errors.push(`${where}: ${part} has no instance ${instance}`);
    const key = `${part}#${instance}`;
    const prev = seen.get(key);
    if (prev) errors.push(`${key} appears twice (${prev} and ${where})`);
    else seen.set(key, where);
  };

  const plateIds = new Set<string>();
  const minutesOf = new Map<PlanOutput["plates"][number], number>();
  for (const plate of out.plates) {
    const where = `plate ${plate.id}`;
    if (plateIds.has(plate.id)) errors.push(`${where}: duplicate plate id`);
    plateIds.add(plate.id);
    const pr = printers.get(plate.printer);
    if (!pr) {
      errors.push(`${where}: unknown printer "${plate.printer}"`);
      continue;
    }
    if (plate.items.length === 0) errors.push(`${where}: no items`);
    if (!pr.materials.includes(plate.material)) errors.push(`${where}: printer ${pr.id} does not take ${plate.material}`);
    if (!housingAllows(pr, plate.material)) errors.push(`${where}: ${plate.material} needs an enclosed printer, ${pr.id} is not`);
    if (!spoolAtHand(inst, { material: plate.material, color: plate.color })) errors.push(`${where}: the workshop has no ${plate.material} ${plate.color} spool`);
    const rects: { x0: number; y0: number; x1: number; y1: number; label: string }[] = [];
    let partMinutes = 0;
    let groupOf: string | null = null;
    for (const it of plate.items) {
      const label = `${it.part}#${it.instance}`;
      mark(it.part, it.instance, where);
      const part = parts.get(it.part);
      if (!part) continue;
      partMinutes += part.minutes;
      if (part.material !== plate.material || part.color !== plate.color) errors.push(`${where}: ${label} is ${part.material}/${part.color}, plate is ${plate.material}/${plate.color}`);
      const g = `${part.layer_height}/${part.nozzle}`;
      if (groupOf !== null && g !== groupOf) errors.push(`${where}: ${label} has layer height/nozzle ${g}, others ${groupOf}`);
      groupOf ??= g;
      if (Math.abs(part.nozzle - pr.nozzle) > 1e-9) errors.push(`${where}: ${label} needs a ${part.nozzle} mm nozzle, ${pr.id} has ${pr.nozzle} mm`);
      if (part.height > pr.height + EPS) errors.push(`${where}: ${label} is ${part.height} mm tall, ${pr.id} builds ${pr.height} mm`);
      const [w, d] = it.rotated ? [part.footprint[1], part.footprint[0]] : part.footprint;
      // The brim (rules.ts) is part of what must stay on the bed and apart from the others.
      const b = brimOf(part);
      const r = { x0: it.x - b, y0: it.y - b, x1: it.x + w + b, y1: it.y + d + b, label };
      if (r.x0 < m - EPS || r.y0 < m - EPS || r.x1 > pr.bed[0] - m + EPS || r.y1 > pr.bed[1] - m + EPS) {
        errors.push(`${where}: ${label} at (${it.x}, ${it.y}) size ${w} × ${d} leaves the bed less the ${m} mm margin${b ? ` (with its ${b} mm brim)` : ""}`);
      }
      for (const o of rects) {
        // Clearance between axis-aligned rectangles: Euclidean distance between their closest points.
        const dx = Math.max(0, o.x0 - r.x1, r.x0 - o.x1);
        const dy = Math.max(0, o.y0 - r.y1, r.y0 - o.y1);
        if (dx === 0 && dy === 0) errors.push(`${where}: ${label} overlaps ${o.label}`);
        else if (Math.hypot(dx, dy) < inst.gap_mm - EPS) errors.push(`${where}: ${label} is closer than ${inst.gap_mm} mm to ${o.label}`);
      }
      rects.push(r);
    }
    minutesOf.set(plate, partMinutes);
  }
  for (const u of out.unplaced) {
    mark(u.part, u.instance, "unplaced");
    if (!u.reason || !u.reason.trim()) errors.push(`unplaced ${u.part}#${u.instance}: no reason given`);
  }
  for (const p of inst.parts) {
    for (let k = 1; k <= p.quantity; k++) if (!seen.has(`${p.id}#${k}`)) errors.push(`${p.id}#${k} is neither on a plate nor unplaced`);
  }

  // Time: per printer, in start order.
  for (const pr of inst.printers) {
    const lane = out.plates.filter((p) => p.printer === pr.id).sort((a, b) => Date.parse(a.start) - Date.parse(b.start));
    let loaded = pr.loaded;
    let held = pr.loaded ?? null;
    let prevEnd: number | null = null;
    let prevId = "";
    for (const plate of lane) {
      const where = `plate ${plate.id}`;
      const s = Date.parse(plate.start);
      const e = Date.parse(plate.end);
      if (Number.isNaN(s) || Number.isNaN(e)) {
        errors.push(`${where}: start or end is not a time`);
        continue;
      }
      if (s < nowMs) errors.push(`${where}: starts before now`);
      if (!cal.isOpen(s)) errors.push(`${where}: starts at ${plate.start}, outside attended hours`);
      const change = (!loaded || loaded.material !== plate.material || loaded.color !== plate.color) && pr.changeover_minutes > 0;
      const need = (change ? pr.changeover_minutes : 0) + pr.startup_minutes + (minutesOf.get(plate) ?? 0);
      if (e - s < need * MIN - 1) errors.push(`${where}: lasts ${(e - s) / MIN} min, needs ${need} min${change ? " (with changeover)" : ""}`);
      const differs = !held || held.material !== plate.material || held.color !== plate.color;
      if (differs !== (plate.spool_change !== null)) errors.push(`${where}: spool_change is ${plate.spool_change ? "set" : "missing"}, the spool ${differs ? "changes" : "stays"}`);
      held = { material: plate.material, color: plate.color };
      const closing = cal.closingAfter(s);
      if (closing !== null && (e > closing) !== plate.runs_unattended) errors.push(`${where}: runs_unattended is ${plate.runs_unattended}, it ends ${e > closing ? "after" : "by"} closing`);
      if (closing !== null && inst.unattended && e > closing) {
        const allowance = inst.unattended.allowed ? (inst.unattended.max_hours ?? Infinity) * 60 * MIN : 0;
        if (e > closing + allowance + 1) errors.push(`${where}: runs ${((e - closing) / 3_600_000).toFixed(1)} h past closing; the workshop allows ${inst.unattended.allowed ? `${inst.unattended.max_hours} h` : "none"}`);
      }
      for (const w of pr.unavailable) {
        if (s < Date.parse(w.to) && Date.parse(w.from) < e) errors.push(`${where}: overlaps ${pr.id}'s unavailable window ${w.from}–${w.to}`);
      }
      if (prevEnd !== null) {
        if (s < prevEnd) errors.push(`${where}: overlaps ${prevId} on ${pr.id}`);
        else if (!cal.isOpen(prevEnd)) {
          const pickup = cal.nextOpening(prevEnd);
          if (pickup !== null && s < pickup) errors.push(`${where}: starts before ${prevId} (ended after closing) can be taken off`);
        }
      }
      prevEnd = e;
      prevId = plate.id;
      loaded = { material: plate.material, color: plate.color };
    }
  }

  const expect = computeMetrics(inst, out.plates);
  for (const k of Object.keys(expect) as (keyof typeof expect)[]) {
    if (Math.abs(expect[k] - out.metrics[k]) > 1e-3) errors.push(`metrics.${k} is ${out.metrics[k]}, the plates give ${expect[k]}`);
  }
  return errors;
}
