import { queryOptions } from "@tanstack/react-query";
import type { InsightsData } from "@/lib/insights/types";
import { fetchJson } from "./client";
import { queryKeys } from "./keys";

export interface PeriodParams {
  period: "week" | "month" | "custom";
  from?: string;
  to?: string;
}

/** The query string the API and the CSV links share. */
export function periodSearch(p: PeriodParams): string {
  const s = new URLSearchParams({ period: p.period });
  if (p.period === "custom") {
    if (p.from) s.set("from", p.from);
    if (p.to) s.set("to", p.to);
  }
  return s.toString();
}

export const insightsQueryOptions = (p: PeriodParams) =>
  queryOptions({ queryKey: queryKeys.insights.period(periodSearch(p)), queryFn: () => fetchJson<InsightsData>(`/api/insights?${periodSearch(p)}`) });

export const chartCsvUrl = (chart: string, p: PeriodParams) => `/api/insights/${chart}?${periodSearch(p)}&format=csv`;
