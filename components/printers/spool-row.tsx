"use client";

import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { fetchJson } from "@/lib/queries/client";
import { queryKeys } from "@/lib/queries/keys";
import type { SpoolDto } from "@/lib/queries/materials";
import type { PrinterDto } from "@/lib/queries/printers";

/** One spool: grams left (weighed by the operator), where it is loaded, load and unload. */
export function SpoolRow({ spool, printers, canManage }: { spool: SpoolDto; printers: PrinterDto[]; canManage: boolean }) {
  const qc = useQueryClient();
  const [target, setTarget] = useState<string>(printers[0] ? String(printers[0].id) : "");
  const [weight, setWeight] = useState(String(Math.round(spool.gramsRemaining)));
  const done = async () => {
    await qc.invalidateQueries({ queryKey: queryKeys.materials.all });
    await qc.invalidateQueries({ queryKey: queryKeys.printers.all });
  };
  const load = useMutation({
    mutationFn: (printerId: number | null) => fetchJson(`/api/spools/${spool.id}/load`, { method: "PUT", body: JSON.stringify({ printerId }) }),
    onSuccess: done,
  });
  const weigh = useMutation({
    mutationFn: () => fetchJson(`/api/spools/${spool.id}`, { method: "PATCH", body: JSON.stringify({ gramsRemaining: weight, version: spool.version }) }),
    onSuccess: done,
  });
  const error = load.error ?? weigh.error;
  const pct = spool.gramsInitial > 0 ? Math.round((spool.gramsRemaining / spool.gramsInitial) * 100) : 0;
  return (
    <tr className="border-t border-rule align-top" aria-label={`Spool ${spool.label}`}>
      <td className="py-2 pr-3 font-medium">{spool.label}</td>
      <td className="py-2 pr-3">{spool.colour}</td>
      <td className="py-2 pr-3 text-right tabular-nums">
        {Math.round(spool.gramsRemaining)} g <span className="text-ink-soft">({pct} %)</span>
        {spool.low ? (
          <span className="ml-2 rounded border border-warn/40 bg-warn-wash px-1.5 text-xs">
            <span aria-hidden>⚠ </span>Low stock
          </span>
        ) : null}
      </td>
      <td className="py-2 pr-3">{spool.loadedPrinterName ?? <span className="text-ink-soft">on the shelf</span>}</td>
      {canManage ? (
        <td className="py-2">
          <div className="flex flex-wrap items-center gap-2">
            {spool.loadedPrinterId ? (
              <Button variant="secondary" onClick={() => load.mutate(null)} disabled={load.isPending}>
                Unload
              </Button>
            ) : (
              <>
                <label className="sr-only" htmlFor={`s${spool.id}-printer`}>
                  Printer for {spool.label}
                </label>
                <select id={`s${spool.id}-printer`} value={target} onChange={(e) => setTarget(e.target.value)} className="rounded-md border border-rule bg-sheet px-2 py-1.5 text-sm">
                  {printers.map((p) => (
                    <option key={p.id} value={p.id}>
                      {p.name}
                    </option>
                  ))}
                </select>
                <Button variant="secondary" onClick={() => load.mutate(Number(target))} disabled={load.isPending || !target}>
                  Load
                </Button>
              </>
            )}
            <label className="sr-only" htmlFor={`s${spool.id}-grams`}>
              Grams left on {spool.label}
            </label>
            <input
              id={`s${spool.id}-grams`}
              type="number"
              min={0}
              step={1}
              value={weight}
              onChange={(e) => setWeight(e.target.value)}
              className="w-24 rounded-md border border-rule bg-sheet px-2 py-1.5 text-right text-sm tabular-nums"
            />
            <Button variant="ghost" onClick={() => weigh.mutate()} disabled={weigh.isPending}>
              Save weight
            </Button>
          </div>
          {error ? (
            <p role="alert" className="mt-1 text-xs text-fail">
              {error.message}
            </p>
          ) : null}
        </td>
      ) : null}
    </tr>
  );
}
