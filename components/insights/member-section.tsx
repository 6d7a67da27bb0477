"use client";
import { Bars } from "@/components/charts/bars";
import { StackedBars } from "@/components/charts/stacked-bars";
import type { chartTable } from "@/lib/insights/tables";
import type { InsightsData } from "@/lib/insights/types";
import type { InsightChart } from "@/lib/validation/insights";
import { ChartCard } from "./chart-card";
import { Section } from "./printer-sections";

type Card = (chart: InsightChart) => { table: ReturnType<typeof chartTable>; csvHref: string; id: string };
const h = (v: number | null) => (v === null ? "–" : `${v.toFixed(1)} h`);

export function MemberSection({ d, card }: { d: InsightsData; card: Card }) {
  const rows = d.members.rows;
  const empty = rows.length ? null : "No member's parts finished in this period.";
  const o = d.members.overall;
  return (
    <Section title="Members">
      <ChartCard {...card("members")} title="Parts and grams per member" lead={d.currency ? `Charges in ${d.currency} are in the table and CSV.` : undefined} empty={empty}>
        <Bars title="Parts printed per member" unit="parts" digits={0} rows={rows.map((r) => ({ label: r.name, value: r.parts }))} />
        <Bars title="Grams per member" unit="g" digits={0} colour="var(--color-clay)" rows={rows.map((r) => ({ label: r.name, value: r.grams }))} />
        {d.currency ? <Bars title={`Charges per member (${d.currency})`} unit={d.currency} digits={2} colour="var(--color-overhang)" rows={rows.map((r) => ({ label: r.name, value: (r.chargesCents ?? 0) / 100 }))} /> : null}
      </ChartCard>
      <ChartCard {...card("members")} id="members-wait" title="Waiting time, sent to printed" lead={`All members: median ${h(o.waitMedianH)}, 90th percentile ${h(o.waitP90H)} over ${o.waits} copies (nearest rank).`} empty={o.waits ? null : "No copies were printed in this period."}>
        <StackedBars
          title="Median and 90th percentile wait per member"
          unit="hours"
          series={[
            { key: "median", label: "Median", colour: "var(--color-accent)" },
            { key: "extra", label: "To the 90th percentile", colour: "var(--color-accent-wash)" },
          ]}
          rows={rows.filter((r) => r.waits > 0).map((r) => ({ label: r.name, values: { median: r.waitMedianH ?? 0, extra: Math.max(0, (r.waitP90H ?? 0) - (r.waitMedianH ?? 0)) } }))}
        />
      </ChartCard>
    </Section>
  );
}
