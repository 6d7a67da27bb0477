import { z } from "zod";

function isTimeZone(tz: string): boolean {
  try {
    new Intl.DateTimeFormat("en", { timeZone: tz });
    return true;
  } catch {
    return false;
  }
}

// Shared by the admin form and the route handler.
export const workshopSettingsInput = z.strictObject({
  name: z.string().trim().min(2, "Give the workshop a name of at least 2 characters.").max(120),
  timezone: z.string().trim().max(64).refine(isTimeZone, "Use an IANA time zone such as Europe/Berlin."),
  currency: z
    .string()
    .trim()
    .toUpperCase()
    .regex(/^[A-Z]{3}$/, "Use a three-letter ISO 4217 code such as EUR."),
  contactEmail: z.union([z.literal(""), z.string().trim().email("Enter an e-mail address or leave it empty.").max(254)]),
  defaultLayerHeightMm: z.coerce.number().min(0.04, "At least 0.04 mm.").max(1.2, "At most 1.2 mm."),
  defaultWalls: z.coerce.number().int("A whole number.").min(1, "At least 1.").max(20, "At most 20."),
  defaultInfillPercent: z.coerce.number().int("A whole number.").min(0).max(100, "At most 100 %."),
  plateFeeCents: z.coerce.number().int("A whole number of cents.").min(0).max(1_000_000),
  safetyNote: z.string().trim().max(1000),
  // The unattended-printing policy (absent = unchanged, so older clients keep working).
  unattendedAllowed: z.boolean({ error: "Say whether plates may run unattended." }).optional(),
  unattendedMaxHours: z
    .union([z.literal(""), z.null(), z.coerce.number({ error: "Enter hours as a number, or leave it empty for no cap." }).positive("More than 0 hours, or leave it empty for no cap.").max(168, "At most 168 hours (a week).")])
    .optional()
    .transform((v) => (v === "" ? null : v)),
  version: z.coerce.number().int().positive(),
});

export type WorkshopSettingsInput = z.infer<typeof workshopSettingsInput>;
