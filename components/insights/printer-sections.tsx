"use client";
import { Bars } from "@/components/charts/bars";
import { HeatMap } from "@/components/charts/heat-map";
import { Scatter } from "@/components/charts/scatter";
import { StackedBars, type Series } from "@/components/charts/stacked-bars";
import { Trend } from "@/components/charts/trend";
import { chartTable } from "@/lib/insights/tables";
import type { InsightsData } from "@/lib/insights/types";
import type { InsightChart } from "@/lib/validation/insights";
import { ChartCard } from "./chart-card";

const utilSeries: Series[] = [
  { key: "printingH", label: "Printing", colour: "var(--color-accent)" },
  { key: "idleOpenH", label: "Idle while open", colour: "var(--color-clay)" },
  { key: "idleClosedH", label: "Idle while closed", colour: "var(--color-rule)" },
  { key: "maintenanceH", label: "Down for maintenance", colour: "var(--color-warn)" },
];
const printerColours = ["var(--color-accent)", "var(--color-overhang)", "var(--color-warn)", "var(--color-fail)", "var(--color-contact)", "var(--color-clay)"];

type Card = (chart: InsightChart) => { table: ReturnType<typeof chartTable>; csvHref: string; id: string };

export function Section({ title, children }: { title: string; children: React.ReactNode }) {
  return (
    <section className="space-y-4">
      <h2 className="text-lg font-semibold">{title}</h2>
      <div className="grid gap-4 lg:grid-cols-2">{children}</div>
    </section>
  );
}

export function PrinterSections({ d, card }: { d: InsightsData; card: Card }) {
  const noPlates = (n: number) => (n === 0 ? "No plates ended in this period." : null);
  const ended = d.failures.byPrinter.reduce((s, r) => s + r.finished + r.failed, 0);
  const printers = d.utilisation.map((u, i) => ({ key: u.printer, label: u.printer, colour: printerColours[i % printerColours.length]! }));
  return (
    <>
      <Section title="Printer time">
        <ChartCard {...card("utilisation")} title="Utilisation per printer" lead={`${d.period.hours.toFixed(1)} h in the period, split four ways; the percentage is printing time.`} empty={d.utilisation.length ? null : "No printers yet."}>
          <StackedBars title="Hours per printer by state" unit="hours" series={utilSeries} rows={d.utilisation.map((u) => ({ label: `${u.printer} ${u.utilisationPct.toFixed(0)} %`, values: { printingH: u.printingH, idleOpenH: u.idleOpenH, idleClosedH: u.idleClosedH, maintenanceH: u.maintenanceH } }))} />
        </ChartCard>
        <ChartCard {...card("heatmap")} title="When the printers print" lead={`Printing hours of all printers by weekday and hour (${d.period.timezone}).`} empty={d.heatmap.some((c) => c.hours > 0) ? null : "Nothing printed in this period."}>
          <HeatMap cells={d.heatmap} title="Printing hours by weekday and hour" />
        </ChartCard>
      </Section>
      <Section title="Failures">
        <ChartCard {...card("failures-printer")} title="Failure rate per printer" lead="Failed plates as a share of plates that finished or failed." empty={noPlates(ended)}>
          <Bars title="Failure rate per printer" unit="%" max={100} colour="var(--color-fail)" rows={d.failures.byPrinter.map((r) => ({ label: r.label, value: r.ratePct }))} />
        </ChartCard>
        <ChartCard {...card("failures-material")} title="Failure rate per material" empty={noPlates(ended)}>
          <Bars title="Failure rate per material" unit="%" max={100} colour="var(--color-fail)" rows={d.failures.byMaterial.map((r) => ({ label: r.label, value: r.ratePct }))} />
        </ChartCard>
        <ChartCard {...card("failures-reason")} title="Reasons given for failures" empty={d.failures.byReason.length ? null : "No plate failed in this period."}>
          <Bars title="Failed plates per reason" unit="plates" digits={0} colour="var(--color-fail)" rows={d.failures.byReason.map((r) => ({ label: r.reason, value: r.failed }))} />
        </ChartCard>
        <ChartCard {...card("failures-trend")} title="Failure rate over time" lead={`Reprints: ${d.failures.reprints.reprints} of ${d.failures.reprints.prints} part copies printed (${d.failures.reprints.sharePct === null ? "–" : d.failures.reprints.sharePct.toFixed(1)} %).`} empty={noPlates(ended)}>
          <Trend title="Failure rate per time bucket" unit="%" max={100} points={d.failures.trend.map((t) => ({ label: t.label, value: t.ratePct }))} />
        </ChartCard>
        <ChartCard {...card("reprints")} title="Reprints" lead="Copies printed again after a failed plate, as a share of all copies on plates that ended." empty={d.failures.reprints.prints ? null : "No part copies ended in this period."}>
          <Bars title="Reprint share" unit="%" max={100} colour="var(--color-warn)" rows={[{ label: "Reprints", value: d.failures.reprints.sharePct }]} />
        </ChartCard>
      </Section>
      <Section title="Estimates against actuals">
        <ChartCard {...card("estimates")} title="Actual ÷ estimated, per printer" lead="Above 1 the printer ran longer (or used more) than estimated; calibration pulls this toward 1." empty={d.estimates.byPrinter.some((r) => r.plates > 0) ? null : "No finished plates recorded in this period."}>
          <Bars title="Actual to estimated minutes per printer" unit="× estimate (time)" digits={3} rows={d.estimates.byPrinter.map((r) => ({ label: r.printer, value: r.timeRatio }))} />
          <Bars title="Actual to estimated grams per printer" unit="× estimate (grams, weighed plates)" digits={3} colour="var(--color-clay)" rows={d.estimates.byPrinter.map((r) => ({ label: r.printer, value: r.gramsRatio }))} />
        </ChartCard>
        <ChartCard {...card("estimates-points")} title="Estimated vs actual minutes" lead={d.estimates.pointsCapped ? "The latest plates only; the table and CSV hold the same points." : "One dot per finished plate; the dashed line is a perfect estimate."} empty={d.estimates.points.length ? null : "No finished plates recorded in this period."}>
          <Scatter title="Estimated against actual minutes" unit="min" series={printers} points={d.estimates.points.map((p) => ({ group: p.printer, x: p.estimatedMin, y: p.actualMin }))} />
        </ChartCard>
      </Section>
      <Section title="Material">
        <ChartCard {...card("material-use")} title="Grams used per material and colour" lead="Finished plates: weighed grams, else the estimate." empty={d.material.use.length ? null : "No plates finished in this period."}>
          <Bars title="Grams used per material and colour" unit="g" digits={0} colour="var(--color-clay)" rows={d.material.use.map((u) => ({ label: `${u.material} ${u.colour}`, value: u.grams }))} />
        </ChartCard>
        <ChartCard {...card("stock")} title="Days of stock left" lead="Spool stock now, at the period's rate of use. Materials not used in the period have no rate." empty={d.material.stock.some((s) => s.daysLeft !== null) ? null : "No stock was used in this period."}>
          <Bars title="Days of stock left per material and colour" unit="days" digits={0} colour="var(--color-contact)" rows={d.material.stock.filter((s) => s.daysLeft !== null).map((s) => ({ label: `${s.material} ${s.colour}`, value: s.daysLeft }))} />
        </ChartCard>
      </Section>
    </>
  );
}
