"use client";
// The operator's Floor: re-plan, the timeline, the live plates with their actions, the waiting list. Polls every 10 s.
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import Link from "next/link";
import { Button } from "@/components/ui/button";
import { EmptyState, Notice } from "@/components/ui/notice";
import { queryKeys } from "@/lib/queries/keys";
import { floorBoardQuery, sendJsonTo, type FloorBoardWire } from "@/lib/queries/queue";
import { plateStatusLabel } from "@/lib/validation/plates";
import { hmm, spoolChangeWords, timeIn } from "./format";
import { Gantt } from "./gantt";
import { PlateActions } from "./plate-actions";
import { WaitingList } from "./waiting-list";

interface ReplanResult { plates: number; placed: number; unplaced: { instanceId: number; reason: string }[] }

export function FloorBoard({ initial, caution }: { initial: FloorBoardWire; caution: string }) {
  const qc = useQueryClient();
  const q = useQuery({ ...floorBoardQuery(), initialData: initial });
  const b = q.data;
  const plan = useMutation({
    mutationFn: () => sendJsonTo<ReplanResult>("/api/plan", {}),
    onSettled: () => Promise.all([qc.invalidateQueries({ queryKey: queryKeys.queue.all }), qc.invalidateQueries({ queryKey: queryKeys.plates.all })]),
  });
  const live = b.lanes.flatMap((l) => l.plates.filter((p) => p.status === "planned" || p.status === "printing").map((p) => ({ ...p, printerName: l.name })));
  const names = new Map(b.lanes.map((l) => [l.id, l.name]));
  const overnight = live.filter((p) => p.runsUnattended);
  const planned = live.filter((p) => p.status === "planned").length;
  const printing = live.length - planned;
  return (
    <div className="flex flex-col gap-6">
      <div className="flex flex-wrap items-center gap-3">
        <Button type="button" onClick={() => plan.mutate()} disabled={plan.isPending}>{plan.isPending ? "Planning…" : "Re-plan"}</Button>
        {plan.isPending ? <progress aria-label="Planning" className="h-2 w-40" /> : null}
        <p className="text-sm text-ink-soft" data-testid="plan-status">
          {live.length ? `${printing} printing, ${planned} planned` : "No plates lined up"}
          {b.lastRunAt ? ` · last re-plan ${timeIn(b.lastRunAt, b.timezone)}` : live.length ? " · not re-planned here yet" : ""}
          {b.metrics && b.lastRunAt
            ? ` (${b.metrics.plates} plates, mean bed fill of the plates ${Math.round(b.metrics.mean_bed_fill * 100)} %, ${b.metrics.spool_changes ?? 0} spool changes, ${b.metrics.late_instances} late)`
            : ""}
          . Re-planning replaces every plate not yet started.
        </p>
      </div>
      {plan.isError ? <Notice tone="fail" title={plan.error.message} /> : null}
      {plan.isSuccess ? <Notice tone="ok" title={`Planned ${plan.data.placed} copies on ${plan.data.plates} plates.`}>{plan.data.unplaced.length ? `${plan.data.unplaced.length} could not be placed; see the waiting list for why.` : null}</Notice> : null}
      {q.isError ? <Notice tone="fail" title="The Floor could not be refreshed.">{q.error.message}</Notice> : null}
      {overnight.length ? (
        <Notice tone="warn" title={`☾ ${overnight.length} plate${overnight.length > 1 ? "s" : ""} would run unattended past closing`}>{caution}</Notice>
      ) : null}
      {b.lanes.length ? <Gantt board={b} /> : <EmptyState title="No printers yet">An admin adds printers under Printers.</EmptyState>}
      <section aria-labelledby="live-h" className="flex flex-col gap-3">
        <h2 id="live-h">Plates planned and printing</h2>
        {live.length === 0 ? <EmptyState title="No plates lined up">Re-plan to put the waiting copies on plates.</EmptyState> : (
          <ul className="flex flex-col gap-3">
            {live.map((p) => (
              <li key={p.id} className="flex flex-col gap-2 rounded-lg border border-rule bg-sheet p-3" data-testid={`plate-${p.id}`}>
                <div className="flex flex-wrap items-baseline gap-x-3 text-sm">
                  <Link href={`/plates/${p.id}`} className="font-semibold underline">Plate {p.id}</Link>
                  <span>{plateStatusLabel[p.status]} on {p.printerName}</span>
                  <span className="num text-ink-soft">{timeIn(p.startedAt ?? p.plannedStart, b.timezone)} → {timeIn(p.plannedEnd, b.timezone)} · {hmm(p.estimatedMinutes)} · {p.estimatedGrams.toFixed(0)} g · {p.items} parts · {p.material.toUpperCase()} {p.colour}</span>
                  {p.runsUnattended ? <span className="rounded border border-warn/40 bg-warn-wash px-1.5 text-xs">☾ runs past closing</span> : null}
                </div>
                {p.status === "planned" ? (
                  <p className={`text-sm ${p.change ? "font-medium" : "text-ink-soft"}`} data-testid={`spool-${p.id}`}>
                    <span aria-hidden>{p.change ? "⇄ " : "✓ "}</span>
                    {spoolChangeWords(p.change)}
                  </p>
                ) : null}
                <PlateActions plate={p} spools={b.spools} printerNames={names} />
              </li>
            ))}
          </ul>
        )}
      </section>
      <section aria-labelledby="waiting-h" className="flex flex-col gap-3">
        <h2 id="waiting-h">Waiting ({b.waiting.length})</h2>
        <WaitingList rows={b.waiting} timezone={b.timezone} />
      </section>
    </div>
  );
}
