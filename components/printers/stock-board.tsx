"use client";

import { useQuery } from "@tanstack/react-query";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { EmptyState, Notice } from "@/components/ui/notice";
import { MATERIALS } from "@/lib/estimate/materials";
import { materialsQuery, type MaterialDto } from "@/lib/queries/materials";
import { printersQuery, type PrinterDto } from "@/lib/queries/printers";
import { money } from "./format";
import { MaterialForm } from "./material-form";
import { SpoolForm } from "./spool-form";
import { SpoolRow } from "./spool-row";

interface Props {
  initial: MaterialDto[];
  printers: PrinterDto[];
  currency: string;
  canManage: boolean;
  canSpools: boolean;
}

function MaterialCard({ m, printers, currency, canManage, canSpools }: Omit<Props, "initial"> & { m: MaterialDto }) {
  const [editing, setEditing] = useState(false);
  // Only printers allowed this material are offered for loading.
  const able = printers.filter((p) => p.materials.includes(m.type));
  return (
    <li className="rounded-lg border border-rule bg-sheet p-4" aria-label={m.name}>
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <h2 className="text-lg font-semibold">{m.name}</h2>
          <p className="text-sm text-ink-soft">
            {MATERIALS[m.type].name} · <span className="tabular-nums">{m.densityGcm3} g/cm³</span> (source: {m.densitySource}) ·{" "}
            <span className="tabular-nums">{money(m.pricePerKgCents, currency)}</span> per kg
          </p>
          <p className="text-sm tabular-nums">
            {Math.round(m.gramsInStock).toLocaleString("en-GB")} g in stock{m.colours.length ? ` · ${m.colours.join(", ")}` : ""}
          </p>
        </div>
        {m.lowStock ? (
          <span className="rounded-full border border-warn/40 bg-warn-wash px-2.5 py-0.5 text-sm">
            <span aria-hidden>⚠ </span>Low stock
          </span>
        ) : null}
      </div>
      {m.cautions.length ? (
        <div className="mt-3">
          <Notice tone="warn" title={`Cautions for ${MATERIALS[m.type].name}`}>
            <ul className="list-disc pl-4">
              {m.cautions.map((c) => (
                <li key={c.key}>{c.message}</li>
              ))}
            </ul>
            <p className="mt-1">The workshop&apos;s own rules and local codes come first.</p>
          </Notice>
        </div>
      ) : null}
      {m.spools.length ? (
        <table className="mt-3 w-full text-sm">
          <thead>
            <tr className="text-left text-ink-soft">
              <th className="py-1 pr-3 font-normal">Spool</th>
              <th className="py-1 pr-3 font-normal">Colour</th>
              <th className="py-1 pr-3 text-right font-normal">Left</th>
              <th className="py-1 pr-3 font-normal">Loaded on</th>
              {canSpools ? <th className="py-1 font-normal">Actions</th> : null}
            </tr>
          </thead>
          <tbody>
            {m.spools.map((s) => (
              <SpoolRow key={`${s.id}-${s.version}-${s.loadedPrinterId}`} spool={s} printers={able} canManage={canSpools} />
            ))}
          </tbody>
        </table>
      ) : (
        <p className="mt-3 text-sm text-ink-soft">No spools of this material in stock.</p>
      )}
      {canManage ? (
        <div className="mt-3 border-t border-rule pt-3">
          {editing ? (
            <MaterialForm key={m.version} material={m} onDone={() => setEditing(false)} />
          ) : (
            <Button variant="ghost" onClick={() => setEditing(true)} aria-label={`Edit ${m.name}`}>
              Edit material and price
            </Button>
          )}
        </div>
      ) : null}
    </li>
  );
}

export function StockBoard({ initial, printers, ...rest }: Props) {
  const q = useQuery({ ...materialsQuery(), initialData: initial });
  const p = useQuery({ ...printersQuery(), initialData: printers });
  return (
    <div className="flex flex-col gap-6">
      {q.isError ? <Notice tone="fail" title="The stock could not be refreshed.">{q.error.message}</Notice> : null}
      {q.data.length === 0 ? (
        <EmptyState title="No materials yet">{rest.canManage ? "Add the first material below." : "An admin adds the materials and their prices."}</EmptyState>
      ) : (
        <ul className="flex flex-col gap-4">
          {q.data.map((m) => (
            <MaterialCard key={m.id} m={m} printers={p.data} {...rest} />
          ))}
        </ul>
      )}
      {rest.canSpools ? (
        <section className="rounded-lg border border-rule bg-sheet p-4" aria-labelledby="add-spool">
          <h2 id="add-spool" className="mb-3 text-lg font-semibold">
            Add a spool
          </h2>
          <SpoolForm materials={q.data} />
        </section>
      ) : null}
      {rest.canManage ? (
        <section className="rounded-lg border border-rule bg-sheet p-4" aria-labelledby="add-material">
          <h2 id="add-material" className="mb-3 text-lg font-semibold">
            Add a material
          </h2>
          <MaterialForm />
        </section>
      ) : null}
    </div>
  );
}
