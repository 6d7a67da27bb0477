import { z } from "zod";

/** Material families the workshop may stock; the keys of lib/estimate's MATERIALS. */
export const materialTypes = ["pla", "petg", "abs", "asa", "tpu", "nylon", "pc"] as const;
export type MaterialType = (typeof materialTypes)[number];

export const printerStates = ["available", "busy", "maintenance"] as const;
export type PrinterState = (typeof printerStates)[number];

// Shared by the admin forms and the route handlers. Messages are shown next to their field.
const mm = (label: string, max: number) =>
  z.coerce.number({ error: `${label} must be a number.` }).positive(`${label} must be more than 0 mm.`).max(max, `${label} is at most ${max} mm.`);

export const printerInput = z.strictObject({
  name: z.string().trim().min(2, "Give the printer a name of at least 2 characters.").max(80, "At most 80 characters."),
  bedXMm: mm("Bed width", 2000),
  bedYMm: mm("Bed depth", 2000),
  heightMm: mm("Build height", 2000),
  nozzleMm: z.coerce.number().min(0.1, "At least 0.1 mm.").max(2, "At most 2 mm."),
  enclosed: z.boolean(),
  hourlyRateCents: z.coerce.number().int("A whole number of cents.").min(0, "Not below 0.").max(100_000, "At most 100000 cents an hour."),
  materials: z.array(z.enum(materialTypes, "Pick from the listed materials.")).min(1, "Pick at least one material it may print.").max(materialTypes.length),
  volumetricFlowMm3s: z.coerce.number().positive("More than 0.").max(100, "At most 100 mm³/s.").default(5),
  perLayerSeconds: z.coerce.number().min(0, "Not below 0.").max(120, "At most 120 s.").default(3),
  startupMinutes: z.coerce.number().min(0, "Not below 0.").max(120, "At most 120 min.").default(6),
});
export type PrinterInput = z.infer<typeof printerInput>;

/** Editing replaces every field; the version guards against overwriting someone else's save. */
export const printerUpdateInput = printerInput.extend({ version: z.coerce.number().int().positive() });
export type PrinterUpdateInput = z.infer<typeof printerUpdateInput>;

export const printerStateInput = z
  .strictObject({
    state: z.enum(printerStates, "Choose available, busy or under maintenance."),
    maintenanceNote: z.string().trim().max(500, "At most 500 characters.").default(""),
    /** ISO 8601 instant; empty or null when not under maintenance or not known. */
    expectedBackAt: z
      .union([z.literal(""), z.null(), z.iso.datetime({ offset: true, error: "Enter a date and time." })])
      .default(null)
      .transform((v) => (v ? new Date(v) : null)),
  })
  .superRefine((v, ctx) => {
    if (v.state === "maintenance" && v.maintenanceNote.length < 3) {
      ctx.addIssue({ code: "custom", path: ["maintenanceNote"], message: "Say what is being done (at least 3 characters)." });
    }
  });
export type PrinterStateInput = z.infer<typeof printerStateInput>;

/** A finished plate's actual figures against its estimate, for the printer's calibration. */
export const finishedPlateInput = z.strictObject({
  plateId: z.coerce.number().int().positive().nullable().default(null),
  estimatedMinutes: z.coerce.number().positive("More than 0 minutes.").max(100_000),
  actualMinutes: z.coerce.number().positive("More than 0 minutes.").max(100_000),
  estimatedGrams: z.coerce.number().min(0, "Not below 0.").max(100_000),
  actualGrams: z.coerce.number().min(0, "Not below 0.").max(100_000).nullable().default(null),
});
export type FinishedPlateInput = z.infer<typeof finishedPlateInput>;

/** What the quote needs of one part: measured geometry (printing orientation) and print settings. */
export const quotePartInput = z.strictObject({
  volumeMm3: z.coerce.number().positive("The volume must be more than 0 mm³.").max(1e10),
  areaMm2: z.coerce.number().positive("The surface area must be more than 0 mm².").max(1e9),
  heightMm: z.coerce.number().positive("The height must be more than 0 mm.").max(2000),
  /** Extents across the bed, for the fit check; optional. */
  widthMm: z.coerce.number().positive("More than 0 mm.").max(2000).optional(),
  depthMm: z.coerce.number().positive("More than 0 mm.").max(2000).optional(),
  footprintAreaMm2: z.coerce.number().positive("More than 0 mm².").max(1e8).optional(),
  supportVolumeMm3: z.coerce.number().min(0, "Not below 0.").max(1e10).optional(),
  layerHeightMm: z.coerce.number().min(0.04, "At least 0.04 mm.").max(1.2, "At most 1.2 mm."),
  wallCount: z.coerce.number().int("A whole number.").min(1, "At least 1.").max(20, "At most 20."),
  infillPercent: z.coerce.number().min(0, "Not below 0 %.").max(100, "At most 100 %."),
  supports: z.boolean().default(false),
  material: z.enum(materialTypes, "Pick a material."),
  /** A particular material (price) of that type; otherwise the cheapest in stock of the type. */
  materialId: z.coerce.number().int().positive().optional(),
});
export type QuotePartInput = z.infer<typeof quotePartInput>;

export const quoteAssemblyInput = z.strictObject({
  parts: z
    .array(quotePartInput.extend({ label: z.string().trim().max(120).optional(), quantity: z.coerce.number().int().min(1).max(1000).default(1) }))
    .min(1, "Add at least one part.")
    .max(500),
});
export type QuoteAssemblyInput = z.infer<typeof quoteAssemblyInput>;

/** A material as parts store it ("PLA", "Nylon (PA6)", "nylon" …) → its family key, or null: the workshop's rule in lib/rules. */
export { materialKeyOf } from "../rules/materials";
