"use client";
import { useQuery } from "@tanstack/react-query";
import Link from "next/link";
import { useMemo, useState } from "react";
import { EmptyState, Notice } from "@/components/ui/notice";
import { myPartsQuery, type MyPartWire } from "@/lib/queries/parts";
import { countStatuses, partStatuses, partStatusLabel, type PartStatus } from "@/lib/status";
import { Select } from "./form-bits";
import { StatusSummary } from "./status-badge";

type SortKey = "name" | "assemblyName" | "material" | "quantity";

export function MyPartsTable({ initial }: { initial: MyPartWire[] }) {
  const q = useQuery({ ...myPartsQuery(), initialData: initial });
  const [status, setStatus] = useState<PartStatus | "">("");
  const [material, setMaterial] = useState("");
  const [assembly, setAssembly] = useState("");
  const [sort, setSort] = useState<{ key: SortKey; dir: 1 | -1 }>({ key: "name", dir: 1 });
  const rows = q.data;
  const counts = useMemo(() => countStatuses(rows.flatMap((r) => r.statuses)), [rows]);
  const materials = [...new Set(rows.map((r) => r.material))].sort();
  const assemblies = [...new Map(rows.map((r) => [r.assemblyId, r.assemblyName])).entries()].sort((a, b) => a[1].localeCompare(b[1]));
  const shown = rows
    .filter((r) => (!status || r.statuses.includes(status)) && (!material || r.material === material) && (!assembly || String(r.assemblyId) === assembly))
    .sort((a, b) => {
      const x = a[sort.key], y = b[sort.key];
      return (typeof x === "number" && typeof y === "number" ? x - y : String(x).localeCompare(String(y))) * sort.dir;
    });
  const head = (key: SortKey, label: string, right = false) => (
    <th className={`px-3 py-2 ${right ? "text-right" : ""}`} aria-sort={sort.key === key ? (sort.dir === 1 ? "ascending" : "descending") : "none"}>
      <button type="button" className="font-medium hover:text-ink" onClick={() => setSort((s) => ({ key, dir: s.key === key ? (-s.dir as 1 | -1) : 1 }))}>
        {label} {sort.key === key ? (sort.dir === 1 ? "↑" : "↓") : ""}
      </button>
    </th>
  );
  if (rows.length === 0) return <EmptyState title="No parts yet">Parts you add to your assemblies, or that others share with you, are listed here. <Link href="/bench" className="underline">Go to the Bench</Link>.</EmptyState>;
  return (
    <div className="flex flex-col gap-4">
      {q.isError ? <Notice tone="fail" title="The list could not be refreshed.">{q.error.message}</Notice> : null}
      <ul className="flex flex-wrap gap-2" aria-label="Copies by status">
        {partStatuses.filter((s) => s !== "failed").map((s) => (
          <li key={s}>
            <button type="button" onClick={() => setStatus(status === s ? "" : s)} aria-pressed={status === s} className={`rounded-md border px-3 py-1.5 text-left ${status === s ? "border-accent bg-accent-wash" : "border-rule bg-sheet"}`}>
              <span className="num block text-lg font-semibold">{counts[s]}</span>
              <span className="text-xs text-ink-soft">{partStatusLabel[s]}</span>
            </button>
          </li>
        ))}
      </ul>
      <div className="flex flex-wrap gap-3 text-sm">
        <label className="flex items-center gap-2">Status
          <Select value={status} onChange={(e) => setStatus(e.target.value as PartStatus | "")}>
            <option value="">Any</option>
            {partStatuses.map((s) => <option key={s} value={s}>{partStatusLabel[s]}</option>)}
          </Select>
        </label>
        <label className="flex items-center gap-2">Material
          <Select value={material} onChange={(e) => setMaterial(e.target.value)}>
            <option value="">Any</option>
            {materials.map((m) => <option key={m}>{m}</option>)}
          </Select>
        </label>
        <label className="flex items-center gap-2">Assembly
          <Select value={assembly} onChange={(e) => setAssembly(e.target.value)}>
            <option value="">Any</option>
            {assemblies.map(([id, name]) => <option key={id} value={id}>{name}</option>)}
          </Select>
        </label>
      </div>
      {shown.length === 0 ? <EmptyState title="No parts match these filters" /> : (
        <div className="overflow-x-auto rounded-lg border border-rule bg-sheet">
          <table className="w-full text-sm">
            <thead className="border-b border-rule text-left text-xs text-ink-soft">
              <tr>{head("name", "Part")}{head("assemblyName", "Assembly")}{head("material", "Material")}{head("quantity", "Qty", true)}<th className="px-3 py-2">Copies</th><th className="px-3 py-2">Mesh</th></tr>
            </thead>
            <tbody className="divide-y divide-rule">
              {shown.map((r) => (
                <tr key={r.id}>
                  <td className="px-3 py-2"><Link className="font-medium text-accent-ink hover:underline" href={`/bench/parts/${r.id}`}>{r.name}</Link></td>
                  <td className="px-3 py-2"><Link className="hover:underline" href={`/bench/assemblies/${r.assemblyId}`}>{r.assemblyName}</Link></td>
                  <td className="px-3 py-2">{r.material}{r.colour ? `, ${r.colour}` : ""}</td>
                  <td className="num px-3 py-2">{r.quantity}</td>
                  <td className="px-3 py-2"><StatusSummary statuses={r.statuses} />{r.reprints ? <span className="ml-1 text-xs text-ink-soft">{r.reprints} reprinted</span> : null}</td>
                  <td className="px-3 py-2 text-ink-soft">{r.currentFileId ? "uploaded" : "⚠ not uploaded"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}
