"use client";
// Copies sent to the workshop and not yet on a plate, with the last plan's reason and a priority the workshop may change.
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { Select } from "@/components/bench/form-bits";
import { EmptyState, Notice } from "@/components/ui/notice";
import { fetchJson } from "@/lib/queries/client";
import { queryKeys } from "@/lib/queries/keys";
import type { FloorBoardWire } from "@/lib/queries/queue";
import { MAX_PRIORITY, priorityLabel } from "@/lib/validation/queue";

export function WaitingList({ rows, timezone }: { rows: FloorBoardWire["waiting"]; timezone: string }) {
  const qc = useQueryClient();
  const set = useMutation({
    mutationFn: ({ entryId, version, priority }: { entryId: number; version: number; priority: number }) => fetchJson(`/api/queue/${entryId}`, { method: "PATCH", body: JSON.stringify({ version, priority }) }),
    onSettled: () => qc.invalidateQueries({ queryKey: queryKeys.queue.all }),
  });
  if (!rows.length) return <EmptyState title="Nothing is waiting">Copies members send wait here until a plan puts them on a plate.</EmptyState>;
  return (
    <div className="flex flex-col gap-2">
      {set.isError ? <Notice tone="fail" title={set.error.message} /> : null}
      <div className="overflow-x-auto">
        <table className="w-full text-sm">
          <thead className="text-left text-xs text-ink-soft">
            <tr><th className="py-1 pr-3">Part</th><th className="pr-3">Member</th><th className="pr-3">Material</th><th className="pr-3">Wished by</th><th className="pr-3">Priority</th><th>Why not planned</th></tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.entryId} className="border-t border-rule">
                <td className="py-1.5 pr-3">{r.partName} #{r.copyNo}{r.reprints ? <span className="ml-1 text-xs text-fail">reprint {r.reprints}</span> : null}</td>
                <td className="pr-3">{r.member}</td>
                <td className="pr-3">{r.material}{r.colour ? `, ${r.colour}` : ""}</td>
                <td className="num pr-3">{r.wishedDate ?? "—"}</td>
                <td className="pr-3">
                  <label className="sr-only" htmlFor={`prio-${r.entryId}`}>Priority of {r.partName} #{r.copyNo}</label>
                  <Select id={`prio-${r.entryId}`} value={r.priority} disabled={set.isPending} onChange={(e) => set.mutate({ entryId: r.entryId, version: r.version, priority: Number(e.target.value) })}>
                    {Array.from({ length: MAX_PRIORITY + 1 }, (_, p) => <option key={p} value={p}>{priorityLabel(p)}</option>)}
                  </Select>
                </td>
                <td className="text-ink-soft">{r.reason ?? "Not planned yet: re-plan to place it."}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <p className="text-xs text-ink-soft">Times in {timezone}.</p>
    </div>
  );
}
