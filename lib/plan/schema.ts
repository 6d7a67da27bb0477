import { z } from "zod";

/**
 * The planning instance and the plan it produces. Shared by the CLI and the server, so the same
 * validation (and the same field names in error messages) applies everywhere.
 */
const isoTime = z.string().refine((s) => !Number.isNaN(Date.parse(s)), { message: "must be an ISO 8601 time" });
const hhmm = z.string().regex(/^([01]\d|2[0-4]):[0-5]\d$/, "must be HH:MM");
const positive = z.number().finite().positive();
const nonNegative = z.number().finite().nonnegative();
const pair = z.tuple([positive, positive]);
const name = z.string().min(1);

const validZone = (tz: string) => {
  try {
    new Intl.DateTimeFormat("en", { timeZone: tz });
    return true;
  } catch {
    return false;
  }
};

export const attendedWindowSchema = z.object({
  weekday: z.number().int().min(1).max(7),
  open: hhmm,
  close: hhmm,
});

export const spoolSchema = z.object({ material: name, color: name });

export const printerSchema = z.object({
  id: name,
  bed: pair,
  height: positive,
  materials: z.array(name).min(1),
  nozzle: positive,
  startup_minutes: nonNegative,
  unavailable: z
    .array(z.object({ from: isoTime, to: isoTime }).refine((w) => Date.parse(w.to) > Date.parse(w.from), { message: "to must be after from" }))
    .default([]),
  loaded: spoolSchema.optional(),
  changeover_minutes: nonNegative.default(0),
  /** Enclosed (or ventilated) printer. Absent = no restriction; false keeps ABS/ASA off it. */
  enclosed: z.boolean().optional(),
});

export const partSchema = z.object({
  id: name,
  footprint: pair,
  height: positive,
  minutes: nonNegative,
  material: name,
  color: name,
  layer_height: positive,
  nozzle: positive,
  quantity: z.number().int().min(1),
  due: isoTime.nullable().default(null),
  priority: z.number().int().default(0),
  owner: name.optional(),
  /** The member's assembly the part belongs to: the plan reports when its last copy prints. */
  assembly: name.optional(),
  /** Brim width around the footprint, mm; absent = the material's default (rules.ts). */
  brim_mm: nonNegative.optional(),
});

/** Unattended printing: absent = allowed, no cap (as before this setting existed). */
export const unattendedSchema = z.object({
  allowed: z.boolean(),
  /** Longest stretch a plate may run while nobody is there, hours; null = no cap. */
  max_hours: positive.nullable().default(null),
});

export const planInstanceSchema = z
  .object({
    now: isoTime,
    timezone: z.string().refine(validZone, { message: "must be an IANA time zone name" }),
    attended: z.array(attendedWindowSchema),
    margin_mm: nonNegative,
    gap_mm: nonNegative,
    printers: z.array(printerSchema).min(1),
    parts: z.array(partSchema),
    unattended: unattendedSchema.optional(),
    /** Spools the workshop holds (material and colour). Absent = any material and colour is at hand. */
    spools: z.array(spoolSchema).optional(),
    /** Operator minutes one touch is worth against a later finish (objective.ts); default 30. */
    touch_minutes: nonNegative.optional(),
  })
  .superRefine((inst, ctx) => {
    const seen = new Set<string>();
    inst.printers.forEach((p, i) => {
      if (seen.has(p.id)) ctx.addIssue({ code: "custom", path: ["printers", i, "id"], message: `duplicate printer id "${p.id}"` });
      seen.add(p.id);
    });
    const parts = new Set<string>();
    inst.parts.forEach((p, i) => {
      if (parts.has(p.id)) ctx.addIssue({ code: "custom", path: ["parts", i, "id"], message: `duplicate part id "${p.id}"` });
      parts.add(p.id);
    });
  });

export type PlanInstanceInput = z.input<typeof planInstanceSchema>;
export type PlanInstance = z.output<typeof planInstanceSchema>;
export type Printer = PlanInstance["printers"][number];
export type Part = PlanInstance["parts"][number];

export type PlateItem = { part: string; instance: number; x: number; y: number; rotated: boolean };
export type Spool = { material: string; color: string };
/** A spool change before a plate: what is on the printer (null = nothing known) and what goes on. */
export type SpoolChange = { from: Spool | null; to: Spool };
export type Plate = {
  id: string;
  printer: string;
  material: string;
  color: string;
  start: string;
  end: string;
  items: PlateItem[];
  /** True when the plate is still printing at closing time: nobody is there to watch it. */
  runs_unattended: boolean;
  caution: string | null;
  /** Set when the operator must change the spool before starting this plate (one touch). */
  spool_change: SpoolChange | null;
};
export type Unplaced = { part: string; instance: number; reason: string };
export type PlanMetrics = {
  plates: number;
  makespan_minutes: number;
  late_instances: number;
  total_lateness_minutes: number;
  mean_bed_fill: number;
  /** Operator touches: a start and a take-off per plate, plus one per spool change. */
  touches: number;
  spool_changes: number;
  unattended_plates: number;
};
/** When the last copy of a member's assembly prints (parts without an assembly are left out). */
export type AssemblyCompletion = { owner: string; assembly: string; copies: number; last_end: string | null; unplaced: number };
export type PlanOutput = { plates: Plate[]; unplaced: Unplaced[]; metrics: PlanMetrics; assemblies: AssemblyCompletion[] };

/** Parse an instance; on failure, one line per problem, each naming the field path. */
export function parsePlanInstance(data: unknown): { ok: true; instance: PlanInstance } | { ok: false; errors: string[] } {
  const r = planInstanceSchema.safeParse(data);
  if (r.success) return { ok: true, instance: r.data };
  const errors = r.error.issues.map((issue) => {
    const path = issue.path.map((k) => (typeof k === "number" ? `[${k}]` : `.${String(k)}`)).join("").replace(/^\./, "");
    return `${path || "(instance)"}: ${issue.message}`;
  });
  return { ok: false, errors };
}
