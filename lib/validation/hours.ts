import { z } from "zod";

const hhmm = /^([01]\d|2[0-3]):[0-5]\d$|^24:00$/;

// One window per weekday (1 = Monday … 7 = Sunday); a weekday left out is closed. A closing time
// before the opening time runs past midnight; equal times mean the whole day.
export const attendedWindowInput = z.strictObject({
  weekday: z.coerce.number().int().min(1, "Weekday 1 (Monday) to 7 (Sunday).").max(7, "Weekday 1 (Monday) to 7 (Sunday)."),
  open: z.string().regex(hhmm, "Use HH:MM, e.g. 09:00.").refine((s) => s !== "24:00", "Opening is before 24:00."),
  close: z.string().regex(hhmm, "Use HH:MM, e.g. 21:00."),
});

export const attendedHoursInput = z.strictObject({
  windows: z
    .array(attendedWindowInput)
    .max(7)
    .superRefine((ws, ctx) => {
      const seen = new Set<number>();
      ws.forEach((w, i) => {
        if (seen.has(w.weekday)) ctx.addIssue({ code: "custom", path: [i, "weekday"], message: "Each weekday once." });
        seen.add(w.weekday);
      });
    }),
});
export type AttendedHoursInput = z.infer<typeof attendedHoursInput>;
export type AttendedWindowInput = z.infer<typeof attendedWindowInput>;
