// The insights payload: plain data, shared by the server (which builds it), the page and the CSV.

export interface UtilisationRow {
  printerId: number;
  printer: string;
  printingH: number;
  idleOpenH: number;
  idleClosedH: number;
  maintenanceH: number;
  /** Printing hours as a share of the period's hours, percent. */
  utilisationPct: number;
}
export interface HeatCell {
  weekday: number;
  hour: number;
  hours: number;
}
export interface RateRow {
  label: string;
  finished: number;
  failed: number;
  /** failed / (finished + failed), percent; null when nothing ended. */
  ratePct: number | null;
}
export interface ReasonRow {
  reason: string;
  failed: number;
  sharePct: number;
}
export interface Reprints {
  prints: number;
  reprints: number;
  sharePct: number | null;
}
export interface EstimateRow {
  printer: string;
  plates: number;
  estimatedMin: number;
  actualMin: number;
  /** Σ actual / Σ estimated minutes; null without plates. */
  timeRatio: number | null;
  weighedPlates: number;
  estimatedG: number;
  actualG: number;
  gramsRatio: number | null;
}
export interface EstimatePoint {
  printer: string;
  estimatedMin: number;
  actualMin: number;
}
export interface MaterialUseRow {
  material: string;
  colour: string;
  plates: number;
  grams: number;
}
export interface StockRow {
  material: string;
  colour: string;
  spools: number;
  stockG: number;
  gramsPerDay: number;
  /** Stock over the period's daily use; null when nothing was used. */
  daysLeft: number | null;
}
export interface MemberRow {
  memberId: number;
  name: string;
  parts: number;
  grams: number;
  /** Only for those who may see money. */
  chargesCents?: number;
  waits: number;
  waitMedianH: number | null;
  waitP90H: number | null;
}

export interface InsightsData {
  period: { kind: string; from: string; to: string; timezone: string; start: string; end: string; hours: number };
  /** Present only for those who may see money. */
  currency?: string;
  utilisation: UtilisationRow[];
  heatmap: HeatCell[];
  failures: { byPrinter: RateRow[]; byMaterial: RateRow[]; byReason: ReasonRow[]; trend: RateRow[]; reprints: Reprints };
  estimates: { byPrinter: EstimateRow[]; points: EstimatePoint[]; pointsCapped: boolean };
  material: { use: MaterialUseRow[]; stock: StockRow[] };
  members: { rows: MemberRow[]; overall: { waits: number; waitMedianH: number | null; waitP90H: number | null } };
}

export const weekdayNames = ["Mon", "Tue", "Wed", "Thu", "Fri", "Sat", "Sun"] as const;
