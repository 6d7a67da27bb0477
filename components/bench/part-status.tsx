"use client";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import { sendJson } from "@/lib/queries/assemblies";
import { queryKeys } from "@/lib/queries/keys";
import type { PartDetailWire } from "@/lib/queries/parts";
import { needsReason, partStatusLabel, type PartStatus } from "@/lib/status";
import { PartStatusBadge } from "./status-badge";

type Inst = PartDetailWire["instances"][number];

function InstanceRow({ partId, inst }: { partId: number; inst: Inst }) {
  const qc = useQueryClient();
  const [reason, setReason] = useState("");
  const move = useMutation({
    mutationFn: (to: PartStatus) => sendJson(`/api/parts/${partId}/status`, "POST", { instanceId: inst.id, to, reason, version: inst.version }),
    onSuccess: () => setReason(""),
    onSettled: () => Promise.all([qc.invalidateQueries({ queryKey: queryKeys.parts.all }), qc.invalidateQueries({ queryKey: queryKeys.assemblies.all })]),
  });
  const wantsReason = inst.next.some((to) => needsReason(inst.status, to));
  return (
    <li className="flex flex-col gap-2 px-3 py-2" data-copy={inst.copyNo}>
      <div className="flex flex-wrap items-center gap-3">
        <span className="num w-16 text-sm">Copy {inst.copyNo}</span>
        <PartStatusBadge status={inst.status} />
        {inst.reprints ? <span className="text-xs text-ink-soft">{inst.reprints} reprint{inst.reprints > 1 ? "s" : ""}</span> : null}
        <span className="flex flex-wrap gap-2">
          {inst.next.map((to) => (
            <Button key={to} variant={to === "failed" ? "danger" : "secondary"} className="px-2.5 py-1 text-xs" disabled={move.isPending || (needsReason(inst.status, to) && !reason.trim())} onClick={() => move.mutate(to)}>
              {to === "failed" ? "Mark failed" : to === "queued" && needsReason(inst.status, to) ? "Cancel to queue" : `Mark ${partStatusLabel[to].toLowerCase()}`}
            </Button>
          ))}
        </span>
      </div>
      {wantsReason ? (
        <input aria-label={`Reason for copy ${inst.copyNo}`} placeholder="Why (needed for a failure or a cancel)" value={reason} onChange={(e) => setReason(e.target.value)} className="rounded-md border border-rule bg-sheet px-2 py-1 text-xs" />
      ) : null}
      {move.isError ? <Notice tone="fail" title={move.error.message} /> : null}
    </li>
  );
}

export function PartStatusPanel({ d }: { d: PartDetailWire }) {
  const copy = new Map(d.instances.map((i) => [i.id, i.copyNo]));
  return (
    <section aria-labelledby="status-h" className="flex flex-col gap-3">
      <h2 id="status-h">Copies and status</h2>
      <ul className="divide-y divide-rule rounded-lg border border-rule bg-sheet">
        {d.instances.map((i) => (
          <InstanceRow key={`${i.id}-${i.version}`} partId={d.part.id} inst={i} />
        ))}
      </ul>
      <details>
        <summary className="cursor-pointer text-sm font-medium">Status history ({d.events.length})</summary>
        <ol className="mt-2 flex flex-col gap-1 text-xs">
          {d.events.map((e) => (
            <li key={e.id}>
              <span className="num">{new Date(e.at).toLocaleString("en-GB")}</span> · copy {copy.get(e.instanceId)} · {e.from ? `${partStatusLabel[e.from]} → ` : ""}
              {partStatusLabel[e.to]} · {e.by}
              {e.reason ? ` · “${e.reason}”` : ""}
            </li>
          ))}
        </ol>
      </details>
    </section>
  );
}
