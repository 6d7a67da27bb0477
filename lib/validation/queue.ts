import { z } from "zod";
import { calendarDate } from "./dates";

/** Members pick normal or soon; the workshop may set any level up to the top. */
export const MEMBER_MAX_PRIORITY = 1;
export const MAX_PRIORITY = 5;

export const priorityLabel = (p: number): string => (p <= 0 ? "Normal" : p === 1 ? "Soon" : `Rush ${p}`);

const isoDate = z
  .union([z.literal(""), z.null(), calendarDate("Enter a date (YYYY-MM-DD).")])
  .default(null)
  .transform((v) => (v ? v : null));

export const queueSendInput = z.strictObject({
  partId: z.coerce.number({ error: "Pick a part." }).int().positive("Pick a part."),
  quantity: z.coerce.number({ error: "Enter how many copies." }).int("A whole number of copies.").min(1, "Send at least 1 copy.").max(500, "At most 500 copies at once."),
  wishedDate: isoDate,
  priority: z.coerce.number({ error: "Pick a priority." }).int().min(0, "Pick a priority.").max(MAX_PRIORITY, `At most ${MAX_PRIORITY}.`).default(0),
});
export type QueueSendInput = z.infer<typeof queueSendInput>;

export const queuePriorityInput = z.strictObject({
  version: z.coerce.number().int().positive("The entry's version is missing."),
  priority: z.coerce.number({ error: "Pick a priority." }).int().min(0, "Not below 0.").max(MAX_PRIORITY, `At most ${MAX_PRIORITY}.`),
});
export type QueuePriorityInput = z.infer<typeof queuePriorityInput>;
