import { z } from "zod";

/** The charts the insights API can return one at a time (JSON or CSV). */
export const insightCharts = [
  "utilisation",
  "heatmap",
  "failures-printer",
  "failures-material",
  "failures-reason",
  "failures-trend",
  "reprints",
  "estimates",
  "estimates-points",
  "material-use",
  "stock",
  "members",
] as const;
export type InsightChart = (typeof insightCharts)[number];

const localDate = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, "Use a date as YYYY-MM-DD.")
  .refine((s) => {
    const d = new Date(`${s}T00:00:00Z`);
    return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === s;
  }, "This is not a calendar date.");

/** Longest custom period, days: a year and a day covers any calendar year. */
export const MAX_PERIOD_DAYS = 366;

// Shared by the page's period picker and the route handlers: ?period=week|month|custom&from&to.
export const insightsQuery = z
  .strictObject({
    period: z.enum(["week", "month", "custom"], { error: "Choose week, month or custom." }).default("month"),
    from: localDate.optional(),
    to: localDate.optional(),
    format: z.enum(["json", "csv"], { error: "Use format json or csv." }).default("json"),
  })
  .superRefine((q, ctx) => {
    if (q.period !== "custom") return;
    if (!q.from) ctx.addIssue({ code: "custom", path: ["from"], message: "Pick the first day of the period." });
    if (!q.to) ctx.addIssue({ code: "custom", path: ["to"], message: "Pick the last day of the period." });
    if (!q.from || !q.to) return;
    const days = (Date.parse(`${q.to}T00:00:00Z`) - Date.parse(`${q.from}T00:00:00Z`)) / 86_400_000 + 1;
    if (days < 1) ctx.addIssue({ code: "custom", path: ["to"], message: "The last day must not be before the first." });
    else if (days > MAX_PERIOD_DAYS) ctx.addIssue({ code: "custom", path: ["to"], message: `At most ${MAX_PERIOD_DAYS} days.` });
  });
export type InsightsQuery = z.infer<typeof insightsQuery>;

/** Reads URLSearchParams into the shape the schema expects (empty values count as absent). */
export function searchToObject(params: URLSearchParams): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [k, v] of params) if (v !== "") out[k] = v;
  return out;
}
