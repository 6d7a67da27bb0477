"use client";
import { useState, type ReactNode } from "react";
import { cellText, type Table } from "@/lib/insights/csv";
import { EmptyState } from "@/components/ui/notice";

/**
 * One chart with its numbers: a switch between the picture and the table, and the CSV of the same
 * table (the server builds the CSV from the same table definition, so the figures match).
 */
export function ChartCard({ id, title, lead, table, csvHref, empty, children }: { id: string; title: string; lead?: ReactNode; table: Table; csvHref: string; empty?: string | null; children: ReactNode }) {
  const [view, setView] = useState<"chart" | "table">("chart");
  return (
    <section aria-labelledby={`${id}-title`} data-chart={id} className="rounded-lg border border-rule bg-sheet p-4">
      <header className="mb-3 flex flex-wrap items-start justify-between gap-2">
        <div>
          <h3 id={`${id}-title`} className="font-medium">
            {title}
          </h3>
          {lead ? <p className="text-xs text-ink-soft">{lead}</p> : null}
        </div>
        <div className="flex items-center gap-2 text-xs">
          <div role="group" aria-label={`${title}: view`} className="inline-flex overflow-hidden rounded-md border border-rule">
            {(["chart", "table"] as const).map((v) => (
              <button key={v} type="button" aria-pressed={view === v} onClick={() => setView(v)} className={`px-2.5 py-1 ${view === v ? "bg-accent text-white" : "bg-sheet text-ink-soft hover:text-ink"}`}>
                {v === "chart" ? "Chart" : "Table"}
              </button>
            ))}
          </div>
          <a href={csvHref} download className="rounded-md border border-rule px-2.5 py-1 text-ink-soft hover:text-ink" aria-label={`Download ${title} as CSV`}>
            CSV
          </a>
        </div>
      </header>
      {view === "table" ? <DataTable table={table} caption={title} /> : empty ? <EmptyState title={empty} /> : children}
    </section>
  );
}

export function DataTable({ table, caption }: { table: Table; caption: string }) {
  if (table.rows.length === 0) return <EmptyState title="No rows for this period." />;
  return (
    <div className="max-h-96 overflow-auto">
      <table className="w-full text-left text-sm tabular-nums">
        <caption className="sr-only">{caption}</caption>
        <thead className="sticky top-0 bg-sheet text-xs text-ink-soft">
          <tr>
            {table.columns.map((c) => (
              <th key={c.key} scope="col" className={`border-b border-rule px-2 py-1.5 font-medium ${c.digits !== undefined || typeof table.rows[0]?.[c.key] === "number" ? "text-right" : ""}`}>
                {c.label}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {table.rows.map((r, i) => (
            <tr key={i} className="border-b border-rule/60 last:border-0">
              {table.columns.map((c) => (
                <td key={c.key} className={`px-2 py-1 ${typeof r[c.key] === "number" || r[c.key] === null ? "text-right" : ""}`}>
                  {cellText(r[c.key] ?? null, c)}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
