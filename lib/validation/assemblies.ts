import { z } from "zod";
import { itemStatuses, partStatuses } from "@/lib/status";
import { calendarDate } from "./dates";

// Shared by the Bench forms and the route handlers.
const isoDate = z.union([
  z.literal("").transform(() => null),
  z.null(),
  calendarDate(),
]);

const name = z.string().trim().min(1, "Give it a name.").max(120, "At most 120 characters.");

export const assemblyInput = z.strictObject({
  name,
  description: z.string().trim().max(2000, "At most 2000 characters.").default(""),
  targetDate: isoDate.optional(),
  parentId: z.coerce.number().int().positive().optional(),
});
export type AssemblyInput = z.infer<typeof assemblyInput>;

export const assemblyPatch = z.strictObject({
  name: name.optional(),
  description: z.string().trim().max(2000, "At most 2000 characters.").optional(),
  targetDate: isoDate.optional(),
  version: z.coerce.number().int().positive(),
});
export type AssemblyPatch = z.infer<typeof assemblyPatch>;

export const shareInput = z.strictObject({
  email: z.string().trim().toLowerCase().email("Enter the member's e-mail address."),
  access: z.enum(["read", "edit"], "Choose read or edit."),
});
export type ShareInput = z.infer<typeof shareInput>;

const settings = {
  layerHeightMm: z.coerce.number().min(0.04, "At least 0.04 mm.").max(1.2, "At most 1.2 mm."),
  walls: z.coerce.number().int("A whole number.").min(1, "At least 1.").max(20, "At most 20."),
  infillPercent: z.coerce.number().int("A whole number.").min(0, "At least 0 %.").max(100, "At most 100 %."),
};

export const partInput = z.strictObject({
  name,
  quantity: z.coerce.number().int("A whole number.").min(1, "At least 1.").max(500, "At most 500 copies."),
  material: z.string().trim().min(1, "Say which material.").max(40),
  colour: z.string().trim().max(40).default(""),
  notes: z.string().trim().max(2000).default(""),
  // Left out, these start from the workshop's defaults.
  layerHeightMm: settings.layerHeightMm.optional(),
  walls: settings.walls.optional(),
  infillPercent: settings.infillPercent.optional(),
});
export type PartInput = z.infer<typeof partInput>;

export const partPatch = z.strictObject({
  name: name.optional(),
  quantity: z.coerce.number().int("A whole number.").min(1, "At least 1.").max(500, "At most 500 copies.").optional(),
  material: z.string().trim().min(1, "Say which material.").max(40).optional(),
  colour: z.string().trim().max(40).optional(),
  notes: z.string().trim().max(2000).optional(),
  layerHeightMm: settings.layerHeightMm.optional(),
  walls: settings.walls.optional(),
  infillPercent: settings.infillPercent.optional(),
  version: z.coerce.number().int().positive(),
});
export type PartPatch = z.infer<typeof partPatch>;

export const statusChangeInput = z.strictObject({
  instanceId: z.coerce.number().int().positive(),
  to: z.enum(partStatuses, "Choose a status."),
  reason: z.string().trim().max(500, "At most 500 characters.").default(""),
  version: z.coerce.number().int().positive(),
});
export type StatusChangeInput = z.infer<typeof statusChangeInput>;

const cents = z.union([z.literal("").transform(() => null), z.null(), z.coerce.number().int("Whole cents.").min(0, "Not negative.").max(100_000_000)]);

export const itemInput = z.strictObject({
  kind: z.enum(["hardware", "made"], "Choose bought hardware or made elsewhere."),
  name,
  quantity: z.coerce.number().int("A whole number.").min(1, "At least 1.").max(100_000),
  source: z.string().trim().max(500).default(""),
  unitPriceCents: cents.optional(),
  dueDate: isoDate.optional(),
  status: z.enum(itemStatuses).default("to_order"),
  notes: z.string().trim().max(1000).default(""),
});
export type ItemInput = z.infer<typeof itemInput>;

export const itemPatch = z.strictObject({
  name: name.optional(),
  quantity: z.coerce.number().int("A whole number.").min(1, "At least 1.").max(100_000).optional(),
  source: z.string().trim().max(500).optional(),
  unitPriceCents: cents.optional(),
  dueDate: isoDate.optional(),
  status: z.enum(itemStatuses).optional(),
  notes: z.string().trim().max(1000).optional(),
  version: z.coerce.number().int().positive(),
});
export type ItemPatch = z.infer<typeof itemPatch>;

export const uploadQuery = z.strictObject({
  name: z
    .string()
    .trim()
    .min(1, "The file needs a name.")
    .max(255)
    .refine((n) => /\.(stl|3mf|step|stp)$/i.test(n), "Only .stl, .3mf and .step (.stp) files can be uploaded."),
  units: z.enum(["mm", "in"], "Units are mm or in.").default("mm"),
});
export type UploadQuery = z.infer<typeof uploadQuery>;

export const myPartsQuery = z.strictObject({
  status: z.enum(partStatuses).optional(),
  material: z.string().trim().max(40).optional(),
  assemblyId: z.coerce.number().int().positive().optional(),
});
