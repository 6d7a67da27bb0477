import type { InsightChart } from "../validation/insights";
import type { Column, Table } from "./csv";
import { weekdayNames, type InsightsData, type RateRow } from "./types";

/**
 * Each chart's numbers as one table: the page's table view and the CSV download both come from
 * here, so they show the same figures rounded the same way.
 */
const rateColumns: Column[] = [
  { key: "finished", label: "Finished plates" },
  { key: "failed", label: "Failed plates" },
  { key: "ratePct", label: "Failure rate %", digits: 1 },
];
const rateRows = (rows: RateRow[], key: string) => rows.map((r) => ({ [key]: r.label, finished: r.finished, failed: r.failed, ratePct: r.ratePct }));

export function chartTable(d: InsightsData, chart: InsightChart): Table {
  switch (chart) {
    case "utilisation":
      return {
        columns: [
          { key: "printer", label: "Printer" },
          { key: "printingH", label: "Printing h", digits: 2 },
          { key: "idleOpenH", label: "Idle while open h", digits: 2 },
          { key: "idleClosedH", label: "Idle while closed h", digits: 2 },
          { key: "maintenanceH", label: "Maintenance h", digits: 2 },
          { key: "utilisationPct", label: "Utilisation %", digits: 1 },
        ],
        rows: d.utilisation.map((r) => ({ ...r })),
      };
    case "heatmap":
      return {
        columns: [{ key: "weekday", label: "Weekday" }, { key: "hour", label: "Hour" }, { key: "hours", label: "Printing h", digits: 2 }],
        rows: d.heatmap.map((c) => ({ weekday: weekdayNames[c.weekday - 1] ?? String(c.weekday), hour: c.hour, hours: c.hours })),
      };
    case "failures-printer":
      return { columns: [{ key: "printer", label: "Printer" }, ...rateColumns], rows: rateRows(d.failures.byPrinter, "printer") };
    case "failures-material":
      return { columns: [{ key: "material", label: "Material" }, ...rateColumns], rows: rateRows(d.failures.byMaterial, "material") };
    case "failures-trend":
      return { columns: [{ key: "bucket", label: "From" }, ...rateColumns], rows: rateRows(d.failures.trend, "bucket") };
    case "failures-reason":
      return {
        columns: [{ key: "reason", label: "Reason" }, { key: "failed", label: "Failed plates" }, { key: "sharePct", label: "Share of failures %", digits: 1 }],
        rows: d.failures.byReason.map((r) => ({ ...r })),
      };
    case "reprints":
      return {
        columns: [{ key: "prints", label: "Parts printed or failed" }, { key: "reprints", label: "Of which reprints" }, { key: "sharePct", label: "Reprint share %", digits: 1 }],
        rows: [{ ...d.failures.reprints }],
      };
    case "estimates":
      return {
        columns: [
          { key: "printer", label: "Printer" },
          { key: "plates", label: "Finished plates" },
          { key: "estimatedMin", label: "Estimated min", digits: 0 },
          { key: "actualMin", label: "Actual min", digits: 0 },
          { key: "timeRatio", label: "Time actual/estimate", digits: 3 },
          { key: "weighedPlates", label: "Weighed plates" },
          { key: "estimatedG", label: "Estimated g", digits: 0 },
          { key: "actualG", label: "Weighed g", digits: 0 },
          { key: "gramsRatio", label: "Grams actual/estimate", digits: 3 },
        ],
        rows: d.estimates.byPrinter.map((r) => ({ ...r })),
      };
    case "estimates-points":
      return {
        columns: [{ key: "printer", label: "Printer" }, { key: "estimatedMin", label: "Estimated min", digits: 1 }, { key: "actualMin", label: "Actual min", digits: 1 }],
        rows: d.estimates.points.map((p) => ({ ...p })),
      };
    case "material-use":
      return {
        columns: [{ key: "material", label: "Material" }, { key: "colour", label: "Colour" }, { key: "plates", label: "Finished plates" }, { key: "grams", label: "Grams used", digits: 0 }],
        rows: d.material.use.map((r) => ({ ...r })),
      };
    case "stock":
      return {
        columns: [
          { key: "material", label: "Material" },
          { key: "colour", label: "Colour" },
          { key: "spools", label: "Spools" },
          { key: "stockG", label: "Stock g", digits: 0 },
          { key: "gramsPerDay", label: "Use g/day", digits: 1 },
          { key: "daysLeft", label: "Days of stock", digits: 0 },
        ],
        rows: d.material.stock.map((r) => ({ ...r })),
      };
    case "members": {
      const money = d.currency !== undefined;
      const columns: Column[] = [
        { key: "name", label: "Member" },
        { key: "parts", label: "Parts printed" },
        { key: "grams", label: "Grams", digits: 0 },
        ...(money ? [{ key: "charges", label: `Charges ${d.currency}`, digits: 2 }] : []),
        { key: "waits", label: "Parts timed" },
        { key: "waitMedianH", label: "Wait median h", digits: 1 },
        { key: "waitP90H", label: "Wait 90th pct h", digits: 1 },
      ];
      const rows = d.members.rows.map((r) => ({
        name: r.name,
        parts: r.parts,
        grams: r.grams,
        ...(money ? { charges: (r.chargesCents ?? 0) / 100 } : {}),
        waits: r.waits,
        waitMedianH: r.waitMedianH,
        waitP90H: r.waitP90H,
      }));
      return { columns, rows };
    }
  }
}
