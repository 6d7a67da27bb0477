"use client";

import { useQuery } from "@tanstack/react-query";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { EmptyState, Notice } from "@/components/ui/notice";
import { MATERIALS } from "@/lib/estimate/materials";
import { printersQuery, type PrinterDto } from "@/lib/queries/printers";
import { inZone, money, stateIcon, stateLabel, stateTone } from "./format";
import { PrinterForm } from "./printer-form";
import { StateForm } from "./state-form";

interface Props {
  initial: PrinterDto[];
  currency: string;
  timezone: string;
  canManage: boolean;
  canSetState: boolean;
}

function Calibration({ c }: { c: PrinterDto["calibration"] }) {
  if (c.samples === 0) return <span>No finished plates yet: estimates uncorrected.</span>;
  return (
    <span>
      Time × <span className="tabular-nums">{c.timeFactor.toFixed(2)}</span>, based on {c.samples} plate{c.samples === 1 ? "" : "s"}
      {c.gramsSamples ? (
        <>
          ; grams × <span className="tabular-nums">{c.gramsFactor.toFixed(2)}</span>, based on {c.gramsSamples}
        </>
      ) : null}
    </span>
  );
}

function PrinterCard({ p, currency, timezone, canManage, canSetState }: Omit<Props, "initial"> & { p: PrinterDto }) {
  const [editing, setEditing] = useState(false);
  const [saved, setSaved] = useState(false);
  return (
    <li className="rounded-lg border border-rule bg-sheet p-4" aria-label={p.name}>
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <h2 className="text-lg font-semibold">{p.name}</h2>
          <p className="text-sm text-ink-soft tabular-nums">
            Bed {p.bedXMm} × {p.bedYMm} mm, height {p.heightMm} mm · nozzle {p.nozzleMm} mm · {p.enclosed ? "enclosed" : "open frame"}
          </p>
        </div>
        <span className={`inline-flex items-center gap-1.5 rounded-full border px-2.5 py-0.5 text-sm ${stateTone[p.state]}`} data-testid="printer-state">
          <span aria-hidden>{stateIcon[p.state]}</span>
          {stateLabel[p.state]}
        </span>
      </div>
      {p.state === "maintenance" ? (
        <p className="mt-2 text-sm">
          {p.maintenanceNote}
          {p.expectedBackAt ? <span className="text-ink-soft"> · expected back {inZone(p.expectedBackAt, timezone)}</span> : null}
        </p>
      ) : null}
      <dl className="mt-3 grid gap-x-6 gap-y-1 text-sm sm:grid-cols-2">
        <dt className="text-ink-soft">Materials</dt>
        <dd>{p.materials.map((m) => MATERIALS[m].name).join(", ") || "none"}</dd>
        <dt className="text-ink-soft">Machine rate</dt>
        <dd className="tabular-nums">{money(p.hourlyRateCents, currency)} / h</dd>
        <dt className="text-ink-soft">Loaded spool</dt>
        <dd>{p.loadedSpool ? `${p.loadedSpool.label}: ${p.loadedSpool.materialName}, ${p.loadedSpool.colour}, ${Math.round(p.loadedSpool.gramsRemaining)} g left` : "none"}</dd>
        <dt className="text-ink-soft">Calibration</dt>
        <dd>
          <Calibration c={p.calibration} />
        </dd>
      </dl>
      {canSetState ? (
        <div className="mt-4 border-t border-rule pt-3">
          <StateForm key={`${p.id}-${p.version}`} printer={p} timezone={timezone} />
        </div>
      ) : null}
      {canManage ? (
        <div className="mt-3 border-t border-rule pt-3">
          {editing ? (
            <PrinterForm key={p.version} printer={p} onDone={(ok) => { setEditing(false); setSaved(!!ok); }} />
          ) : (
            <div className="flex flex-col gap-2">
              {saved ? <Notice tone="ok" title={`${p.name} saved.`} /> : null}
              <Button variant="ghost" onClick={() => { setEditing(true); setSaved(false); }} aria-label={`Edit ${p.name}`}>
                Edit printer and rate
              </Button>
            </div>
          )}
        </div>
      ) : null}
    </li>
  );
}

export function PrinterBoard({ initial, ...rest }: Props) {
  const q = useQuery({ ...printersQuery(), initialData: initial });
  return (
    <div className="flex flex-col gap-6">
      {q.isError ? <Notice tone="fail" title="The printers could not be refreshed.">{q.error.message}</Notice> : null}
      {q.data.length === 0 ? (
        <EmptyState title="No printers yet">{rest.canManage ? "Add the workshop's first printer below." : "An admin adds the workshop's printers."}</EmptyState>
      ) : (
        <ul className="grid gap-4 lg:grid-cols-2">
          {q.data.map((p) => (
            <PrinterCard key={p.id} p={p} {...rest} />
          ))}
        </ul>
      )}
      {rest.canManage ? (
        <section className="rounded-lg border border-rule bg-sheet p-4" aria-labelledby="add-printer">
          <h2 id="add-printer" className="mb-3 text-lg font-semibold">
            Add a printer
          </h2>
          <PrinterForm />
        </section>
      ) : null}
    </div>
  );
}
