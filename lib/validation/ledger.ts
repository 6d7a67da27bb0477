import { z } from "zod";

export const exportQuery = z.strictObject({
  kind: z.enum(["charges", "payments"], "Choose charges or payments."),
});

/** The id the provider gives a checkout session, as it comes back on the member's return. */
export const checkoutReturn = z.union([z.literal("cancelled"), z.string().regex(/^cs_[A-Za-z0-9_]{8,250}$/)]);
