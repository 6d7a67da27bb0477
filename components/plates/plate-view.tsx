"use client";
// A plate's page: its figures and caution, the bed from above, a 3D view of the exported plate (staff), the list and actions.
import { useQuery } from "@tanstack/react-query";
import Link from "next/link";
import { useEffect, useState } from "react";
import { PlateActions, type ActionPlate } from "@/components/floor/plate-actions";
import { hmm, spoolChangeWords, timeIn } from "@/components/floor/format";
import { useMeshWorker } from "@/components/mesh/use-mesh-worker";
import { Notice } from "@/components/ui/notice";
import { PageHeader } from "@/components/ui/page-header";
import { Viewer } from "@/components/viewer/viewer";
import type { ViewerArrays } from "@/lib/mesh/worker-protocol";
import { plateQuery, type PlateDetailWire } from "@/lib/queries/plates";
import { floorBoardQuery } from "@/lib/queries/queue";
import { plateStatusLabel } from "@/lib/validation/plates";
import { BedLayout } from "./bed-layout";

function Plate3d({ id, bed, version }: { id: number; bed: { x: number; y: number; name: string }; version: number }) {
  const { analyze } = useMeshWorker();
  const [state, setState] = useState<{ arrays?: ViewerArrays; error?: string } | null>(null);
  useEffect(() => {
    let stop = false;
    let cancel = () => {};
    fetch(`/api/plates/${id}/3mf`)
      .then((r) => (r.ok ? r.arrayBuffer() : Promise.reject(new Error(`the plate could not be fetched (${r.status})`))))
      .then((buf) => {
        if (stop) return;
        const call = analyze(buf, {});
        cancel = call.cancel;
        return call.promise.then((res) => !stop && setState({ arrays: res.arrays }));
      })
      .catch((e: Error) => !stop && setState({ error: e.message }));
    return () => {
      stop = true;
      cancel();
    };
  }, [id, version, analyze]);
  if (state?.error) return <Notice tone="fail" title="The 3D view could not be built.">{state.error}</Notice>;
  if (!state?.arrays) return <div role="status" className="flex h-80 items-center justify-center rounded-lg border border-rule text-sm text-ink-soft">Building the 3D view…</div>;
  return (
    <div className="h-96 overflow-hidden rounded-lg border border-rule">
      <Viewer positions={state.arrays.positions} overhangMask={state.arrays.overhangMask} bed={bed} edges={new Float32Array(0)} showProblems={false} onBed />
    </div>
  );
}

/** The plate's actions with what the Floor knows of it (spool change, move targets, spools), from the same board query. */
function StaffActions({ plate }: { plate: Omit<ActionPlate, "change" | "startChange" | "moveTo"> }) {
  const board = useQuery(floorBoardQuery());
  const onBoard = board.data?.lanes.flatMap((l) => l.plates).find((x) => x.id === plate.id);
  const names = new Map((board.data?.lanes ?? []).map((l) => [l.id, l.name]));
  return (
    <div className="flex flex-col gap-2">
      {onBoard && plate.status === "planned" ? <p className="text-sm" data-testid="plate-spool">{spoolChangeWords(onBoard.change)}</p> : null}
      <PlateActions plate={{ ...plate, change: onBoard?.change ?? null, startChange: onBoard?.startChange ?? null, moveTo: onBoard?.moveTo ?? [] }} spools={board.data?.spools ?? []} printerNames={names} />
    </div>
  );
}

export function PlateView({ id, initial, timezone, caution }: { id: number; initial: PlateDetailWire; timezone: string; caution: string }) {
  const q = useQuery({ ...plateQuery(id), initialData: initial });
  const { plate: p, items, staff } = q.data;
  return (
    <>
      <nav aria-label="Breadcrumb" className="mb-2 text-xs text-ink-soft">
        {staff ? <Link href="/floor" className="hover:underline">Floor</Link> : <Link href="/bench/parts" className="hover:underline">My parts</Link>}
      </nav>
      <PageHeader
        title={p.label}
        lead={`${plateStatusLabel[p.status]} · ${p.material.toUpperCase()} ${p.colour} · ${timeIn(p.startedAt ?? p.plannedStart, timezone)} → ${timeIn(p.endedAt ?? p.plannedEnd, timezone)} · ${hmm(p.estimatedMinutes)} · ${p.estimatedGrams.toFixed(1)} g`}
        actions={staff ? <a className="rounded-md border border-rule bg-sheet px-3.5 py-2 text-sm font-medium hover:bg-paper" href={`/api/plates/${id}/3mf`} download>Download 3MF</a> : null}
      />
      {q.isError ? <Notice tone="fail" title="The latest state could not be loaded.">{q.error.message}</Notice> : null}
      <div className="flex flex-col gap-6">
        {p.runsUnattended ? <Notice tone="warn" title="☾ Runs unattended past closing">{caution}</Notice> : null}
        {p.status === "finished" && p.shelfLabel ? <Notice tone="ok" title={`Finished: the parts wait at ${p.shelfLabel}`}>{p.actualMinutes ? `Took ${hmm(p.actualMinutes)}` : null}{p.actualGrams !== null ? `, ${p.actualGrams} g` : ""}</Notice> : null}
        {p.status === "failed" || p.status === "cancelled" ? <Notice tone="fail" title={`${plateStatusLabel[p.status]}${p.reason ? `: ${p.reason}` : ""}`}>Its parts went back to the queue.</Notice> : null}
        {staff ? <StaffActions plate={{ id: p.id, status: p.status, version: p.version, printerId: p.printerId, material: p.material, colour: p.colour, estimatedMinutes: p.estimatedMinutes, estimatedGrams: p.estimatedGrams }} /> : null}
        <div className="grid gap-6 lg:grid-cols-2">
          <section aria-labelledby="bed-h" className="flex flex-col gap-2">
            <h2 id="bed-h">Bed from above</h2>
            <BedLayout d={q.data} />
          </section>
          {staff ? (
            <section aria-labelledby="three-h" className="flex flex-col gap-2">
              <h2 id="three-h">3D view</h2>
              <Plate3d id={id} version={p.version} bed={{ x: p.bedX, y: p.bedY, name: p.printerName }} />
            </section>
          ) : null}
        </div>
        <section aria-labelledby="items-h" className="flex flex-col gap-2">
          <h2 id="items-h">Parts on the plate ({items.length})</h2>
          <table className="w-full text-sm">
            <thead className="text-left text-xs text-ink-soft"><tr><th className="py-1 pr-3">#</th><th className="pr-3">Part</th>{staff ? <th className="pr-3">Member</th> : null}<th className="pr-3 text-right">Size (mm)</th><th className="pr-3 text-right">At (mm)</th><th className="pr-3 text-right">Time</th><th className="text-right">Grams</th></tr></thead>
            <tbody>
              {items.map((it, k) => (
                <tr key={it.itemId} className="border-t border-rule">
                  <td className="num py-1.5 pr-3">{k + 1}</td>
                  <td className="pr-3">{it.partId ? <Link className="underline" href={`/bench/parts/${it.partId}`}>{it.label}</Link> : it.label}{it.rotated ? " (turned 90°)" : ""}</td>
                  {staff ? <td className="pr-3">{it.member}</td> : null}
                  <td className="num pr-3 text-right">{it.w.toFixed(1)} × {it.d.toFixed(1)} × {it.h.toFixed(1)}</td>
                  <td className="num pr-3 text-right">{it.x.toFixed(1)}, {it.y.toFixed(1)}</td>
                  <td className="num pr-3 text-right">{hmm(it.minutes)}</td>
                  <td className="num text-right">{it.grams.toFixed(1)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      </div>
    </>
  );
}
