import { z } from "zod";
import { materialTypes } from "./printers";

// Shared by the forms and the route handlers.
export const materialInput = z.strictObject({
  name: z.string().trim().min(2, "Give the material a name of at least 2 characters.").max(80, "At most 80 characters."),
  type: z.enum(materialTypes, "Pick a material type."),
  densityGcm3: z.coerce.number().min(0.5, "At least 0.5 g/cm³.").max(3, "At most 3 g/cm³."),
  densitySource: z.string().trim().min(2, "Say where the density comes from (datasheet, own measurement…).").max(200),
  pricePerKgCents: z.coerce.number().int("A whole number of cents.").min(0, "Not below 0.").max(1_000_000),
  lowStockGrams: z.coerce.number().int("A whole number of grams.").min(0).max(100_000).default(200),
});
export type MaterialInput = z.infer<typeof materialInput>;

export const materialUpdateInput = materialInput.extend({ version: z.coerce.number().int().positive() });
export type MaterialUpdateInput = z.infer<typeof materialUpdateInput>;

export const spoolInput = z
  .strictObject({
    materialId: z.coerce.number().int().positive("Pick a material."),
    label: z.string().trim().min(1, "Give the spool a label.").max(80),
    colour: z.string().trim().min(1, "Name the colour.").max(40),
    gramsInitial: z.coerce.number().positive("More than 0 g.").max(50_000, "At most 50000 g."),
    gramsRemaining: z.coerce.number().min(0, "Not below 0 g.").max(50_000, "At most 50000 g."),
  })
  .refine((v) => v.gramsRemaining <= v.gramsInitial, { path: ["gramsRemaining"], message: "Cannot hold more than it started with." });
export type SpoolInput = z.infer<typeof spoolInput>;

/** The operator weighs a spool (or corrects its count). */
export const spoolGramsInput = z.strictObject({
  gramsRemaining: z.coerce.number().min(0, "Not below 0 g.").max(50_000, "At most 50000 g."),
  version: z.coerce.number().int().positive(),
});
export type SpoolGramsInput = z.infer<typeof spoolGramsInput>;

/** Load onto a printer (printerId) or take it off (null). */
export const spoolLoadInput = z.strictObject({
  printerId: z.coerce.number().int().positive().nullable(),
});
export type SpoolLoadInput = z.infer<typeof spoolLoadInput>;
