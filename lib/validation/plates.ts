import { z } from "zod";

/** Plate statuses, beside the zod schemas so client code need not import drizzle. */
export const plateStatuses = ["planned", "printing", "finished", "failed", "cancelled"] as const;
export type PlateStatus = (typeof plateStatuses)[number];

export const plateStatusLabel: Record<PlateStatus, string> = {
  planned: "Planned",
  printing: "Printing",
  finished: "Finished",
  failed: "Failed",
  cancelled: "Cancelled",
};

const version = z.coerce.number({ error: "The plate's version is missing." }).int().positive("The plate's version is missing.");

// Every plate action carries the version the operator saw: a second operator acting on the same
// plate gets a conflict instead of a silent double action.
// Start may carry the spool the operator picked for the plate's spool change: the server loads it
// (the old one back on the shelf) and starts, in one transaction. Empty = the spool already on.
export const plateStartInput = z.strictObject({
  version,
  spoolId: z
    .union([z.literal(""), z.null(), z.coerce.number({ error: "Pick a spool." }).int().positive("Pick a spool.")])
    .optional()
    .transform((v) => (v === "" || v === undefined ? null : v)),
});

export const plateFinishInput = z.strictObject({
  version,
  actualMinutes: z.coerce.number({ error: "Enter the minutes it took." }).positive("More than 0 minutes.").max(100_000, "At most 100000 minutes."),
  actualGrams: z
    .union([z.literal(""), z.null(), z.coerce.number({ error: "Enter grams as a number." }).min(0, "Not below 0 g.").max(100_000, "At most 100000 g.")])
    .default(null)
    .transform((v) => (v === "" ? null : v)),
  shelfLabel: z.string().trim().min(1, "Say where the parts now wait (a shelf or bin label).").max(60, "At most 60 characters."),
});

export const plateFailInput = z.strictObject({
  version,
  reason: z.string().trim().min(3, "Say what went wrong (at least 3 characters).").max(500, "At most 500 characters."),
  /** Filament the failed run used, grams, when weighed; empty = estimated from the share of the run done. */
  usedGrams: z
    .union([z.literal(""), z.null(), z.coerce.number({ error: "Enter grams as a number." }).min(0, "Not below 0 g.").max(100_000, "At most 100000 g.")])
    .optional()
    .transform((v) => (v === "" || v === undefined ? null : v)),
});

export const plateCancelInput = z.strictObject({
  version,
  reason: z.string().trim().min(3, "Say why the plate is cancelled (at least 3 characters).").max(500, "At most 500 characters."),
});

export const plateMoveInput = z.strictObject({
  version,
  printerId: z.coerce.number({ error: "Pick a printer." }).int().positive("Pick a printer."),
});

/** What startPlate takes (callers inside the server may leave the spool out). */
export type PlateStartInput = Omit<z.infer<typeof plateStartInput>, "spoolId"> & { spoolId?: number | null };
export type PlateFinishInput = z.infer<typeof plateFinishInput>;
export type PlateFailInput = Omit<z.infer<typeof plateFailInput>, "usedGrams"> & { usedGrams?: number | null };
export type PlateCancelInput = z.infer<typeof plateCancelInput>;
export type PlateMoveInput = z.infer<typeof plateMoveInput>;

export const plateActions = ["start", "finish", "fail", "cancel", "move"] as const;
export type PlateAction = (typeof plateActions)[number];
