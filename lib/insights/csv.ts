/**
 * CSV as RFC 4180 describes it: comma-separated fields, CRLF line ends, a field quoted when it
 * holds a comma, quote, CR or LF, with quotes doubled inside. Numbers are written with a dot
 * decimal separator and no thousands separator, rounded the same way the table view shows them.
 */
export type Cell = string | number | null;
export interface Column {
  key: string;
  label: string;
  /** Decimal places for numbers; 0 for counts. */
  digits?: number;
}
export interface Table {
  columns: Column[];
  rows: Record<string, Cell>[];
}

/** A number as text, fixed to the column's digits; null and non-finite values are empty. */
export function formatNumber(v: number | null, digits = 0): string {
  if (v === null || !Number.isFinite(v)) return "";
  const s = v.toFixed(digits);
  // toFixed never groups thousands and always uses a dot; "-0" and "-0.00" read as zero.
  return /^-0(\.0+)?$/.test(s) ? s.slice(1) : s;
}

export function cellText(v: Cell, col: Column): string {
  if (v === null) return "";
  return typeof v === "number" ? formatNumber(v, col.digits ?? 0) : v;
}

function quote(field: string): string {
  return /[",\r\n]/.test(field) ? `"${field.replace(/"/g, '""')}"` : field;
}

export function toCsv(t: Table): string {
  const lines = [t.columns.map((c) => quote(c.label)).join(",")];
  for (const r of t.rows) lines.push(t.columns.map((c) => quote(cellText(r[c.key] ?? null, c))).join(","));
  return lines.join("\r\n") + "\r\n";
}
