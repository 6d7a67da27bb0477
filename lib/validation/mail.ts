import { z } from "zod";
import { roles } from "@/db/schema/users";

// Shared by the forms and the route handlers.
const email = z.string().trim().toLowerCase().email("Enter an e-mail address such as name@example.org.").max(254);
const password = z
  .string()
  .min(12, "Use at least 12 characters.")
  .max(200, "Use at most 200 characters.");
const token = z.string().regex(/^[A-Za-z0-9_-]{43}$/, "This link is not complete. Copy the whole link from the message.");

export const preferencesInput = z.strictObject({
  partPrinted: z.boolean(),
  plateFailed: z.boolean(),
  operatorDigest: z.boolean(),
});
export type PreferencesInput = z.infer<typeof preferencesInput>;

export const inviteInput = z.strictObject({ email });
export type InviteInput = z.infer<typeof inviteInput>;

export const acceptInviteInput = z.strictObject({
  token,
  name: z.string().trim().min(2, "Enter your name (at least 2 characters).").max(120, "At most 120 characters."),
  password,
});
export type AcceptInviteInput = z.infer<typeof acceptInviteInput>;

export const resetRequestInput = z.strictObject({ email });
export const resetConfirmInput = z.strictObject({ token, password });
export type ResetConfirmInput = z.infer<typeof resetConfirmInput>;

export const personUpdateInput = z
  .strictObject({
    role: z.enum(roles, "Choose member, operator or admin.").optional(),
    active: z.boolean().optional(),
  })
  .refine((v) => v.role !== undefined || v.active !== undefined, { message: "Change the role or the active state.", path: ["role"] });
export type PersonUpdateInput = z.infer<typeof personUpdateInput>;
