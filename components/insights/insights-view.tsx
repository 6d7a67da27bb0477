"use client";
import { useQuery } from "@tanstack/react-query";
import { useState } from "react";
import { Notice } from "@/components/ui/notice";
import { chartTable } from "@/lib/insights/tables";
import type { InsightsData } from "@/lib/insights/types";
import { chartCsvUrl, insightsQueryOptions, periodSearch, type PeriodParams } from "@/lib/queries/insights";
import type { InsightChart } from "@/lib/validation/insights";
import { MemberSection } from "./member-section";
import { PeriodPicker } from "./period-picker";
import { PrinterSections } from "./printer-sections";

/** The insights page body: the period switch, then every chart; the first period arrives with the page. */
export function InsightsView({ initial, initialParams }: { initial: InsightsData; initialParams: PeriodParams }) {
  const [params, setParams] = useState<PeriodParams>(initialParams);
  const same = periodSearch(params) === periodSearch(initialParams);
  const q = useQuery({ ...insightsQueryOptions(params), initialData: same ? initial : undefined, placeholderData: (prev) => prev });
  const change = (p: PeriodParams) => {
    setParams(p);
    // Keep the address in step so a reload or a shared link shows the same period.
    window.history.replaceState(null, "", `/insights?${periodSearch(p)}`);
  };
  const d = q.data;
  const card = (chart: InsightChart) => ({ id: chart, table: d ? chartTable(d, chart) : { columns: [], rows: [] }, csvHref: chartCsvUrl(chart, params) });
  return (
    <div className="space-y-8">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <PeriodPicker value={params} onChange={change} />
        <p className="text-sm text-ink-soft" aria-live="polite">
          {q.isFetching ? "Loading the period…" : d ? `${d.period.from} to ${d.period.to} (${d.period.timezone})` : null}
        </p>
      </div>
      {q.isError ? <Notice tone="fail" title="The insights could not be loaded.">{q.error.message}</Notice> : null}
      {d ? (
        <div className={`space-y-10 ${q.isFetching ? "opacity-60" : ""}`}>
          <PrinterSections d={d} card={card} />
          <MemberSection d={d} card={card} />
        </div>
      ) : q.isPending ? (
        <p role="status" className="py-10 text-sm text-ink-soft">
          Loading…
        </p>
      ) : null}
    </div>
  );
}
