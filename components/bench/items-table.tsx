"use client";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { EmptyState, Notice } from "@/components/ui/notice";
import { sendJson, type AssemblyDetailWire } from "@/lib/queries/assemblies";
import { queryKeys } from "@/lib/queries/keys";
import { itemStatuses, itemStatusLabel, type ItemStatus } from "@/lib/status";
import { Select } from "./form-bits";
import { ItemStatusBadge } from "./status-badge";

type Item = AssemblyDetailWire["items"][number];

const money = (c: number | null) => (c === null ? "—" : (c / 100).toFixed(2));

export function ItemsTable({ assemblyId, items, canEdit, where }: { assemblyId: number; items: Item[]; canEdit: boolean; where: Map<number, string> }) {
  const qc = useQueryClient();
  const key = queryKeys.assemblies.detail(assemblyId);
  // Optimistic: the select shows the new status at once and rolls back if the server refuses.
  const setStatus = useMutation({
    mutationFn: (v: { id: number; status: ItemStatus; version: number }) => sendJson(`/api/items/${v.id}`, "PATCH", { status: v.status, version: v.version }),
    onMutate: async (v) => {
      await qc.cancelQueries({ queryKey: key });
      const before = qc.getQueryData<AssemblyDetailWire>(key);
      qc.setQueryData<AssemblyDetailWire>(key, (d) => (d ? { ...d, items: d.items.map((i) => (i.id === v.id ? { ...i, status: v.status } : i)) } : d));
      return { before };
    },
    onError: (_e, _v, ctx) => ctx?.before && qc.setQueryData(key, ctx.before),
    onSettled: () => qc.invalidateQueries({ queryKey: queryKeys.assemblies.all }),
  });
  if (items.length === 0) return <EmptyState title="No hardware or outside parts yet">Screws, bearings, magnets, laser-cut plates: list them so the bill of materials is complete.</EmptyState>;
  return (
    <div className="flex flex-col gap-2">
      {setStatus.isError ? <Notice tone="fail" title={setStatus.error.message} /> : null}
      <div className="overflow-x-auto rounded-lg border border-rule bg-sheet">
        <table className="w-full text-sm">
          <thead className="border-b border-rule text-left text-xs text-ink-soft">
            <tr>
              <th className="px-3 py-2">Item</th>
              <th className="px-3 py-2">Kind</th>
              <th className="px-3 py-2">In</th>
              <th className="px-3 py-2 text-right">Qty</th>
              <th className="px-3 py-2">Where / supplier</th>
              <th className="px-3 py-2 text-right">Unit price</th>
              <th className="px-3 py-2">Due</th>
              <th className="px-3 py-2">Status</th>
            </tr>
          </thead>
          <tbody className="divide-y divide-rule">
            {items.map((i) => (
              <tr key={i.id}>
                <td className="px-3 py-2 font-medium">{i.name}</td>
                <td className="px-3 py-2">{i.kind === "hardware" ? "Bought" : "Made elsewhere"}</td>
                <td className="px-3 py-2 text-ink-soft">{where.get(i.assemblyId)}</td>
                <td className="num px-3 py-2">{i.quantity}</td>
                <td className="px-3 py-2">{i.source || "—"}</td>
                <td className="num px-3 py-2">{money(i.unitPriceCents)}</td>
                <td className="px-3 py-2">{i.dueDate ?? "—"}</td>
                <td className="px-3 py-2">
                  {canEdit ? (
                    <Select aria-label={`Status of ${i.name}`} value={i.status} onChange={(e) => setStatus.mutate({ id: i.id, status: e.target.value as ItemStatus, version: i.version })}>
                      {itemStatuses.map((s) => (
                        <option key={s} value={s}>
                          {itemStatusLabel[s]}
                        </option>
                      ))}
                    </Select>
                  ) : (
                    <ItemStatusBadge status={i.status} />
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}
