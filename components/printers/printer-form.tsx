"use client";

import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useState, type FormEvent } from "react";
import { z } from "zod";
import { Button } from "@/components/ui/button";
import { Field, TextInput } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { MATERIALS } from "@/lib/estimate/materials";
import { ApiError, fetchJson } from "@/lib/queries/client";
import { queryKeys } from "@/lib/queries/keys";
import type { PrinterDto } from "@/lib/queries/printers";
import { materialTypes, printerInput, type MaterialType } from "@/lib/validation/printers";

type Values = {
  name: string;
  bedXMm: string;
  bedYMm: string;
  heightMm: string;
  nozzleMm: string;
  enclosed: boolean;
  hourlyRateCents: string;
  materials: MaterialType[];
  volumetricFlowMm3s: string;
  perLayerSeconds: string;
  startupMinutes: string;
};

const numberFields: { name: Exclude<keyof Values, "name" | "enclosed" | "materials">; label: string; step: string; hint?: string }[] = [
  { name: "bedXMm", label: "Bed width (mm)", step: "1" },
  { name: "bedYMm", label: "Bed depth (mm)", step: "1" },
  { name: "heightMm", label: "Build height (mm)", step: "1" },
  { name: "nozzleMm", label: "Nozzle diameter (mm)", step: "0.05" },
  { name: "hourlyRateCents", label: "Hourly machine rate (cents)", step: "1", hint: "Charged per hour of printing, start-up included." },
  { name: "volumetricFlowMm3s", label: "Average flow (mm³/s)", step: "0.1", hint: "Over a whole print; 5 is a fair start." },
  { name: "perLayerSeconds", label: "Seconds per layer", step: "0.5", hint: "Z move, travel and retraction." },
  { name: "startupMinutes", label: "Start-up (min)", step: "1", hint: "Heating, levelling, priming." },
];

function toValues(p?: PrinterDto): Values {
  return {
    name: p?.name ?? "",
    bedXMm: String(p?.bedXMm ?? ""),
    bedYMm: String(p?.bedYMm ?? ""),
    heightMm: String(p?.heightMm ?? ""),
    nozzleMm: String(p?.nozzleMm ?? 0.4),
    enclosed: p?.enclosed ?? false,
    hourlyRateCents: String(p?.hourlyRateCents ?? ""),
    materials: p?.materials ?? ["pla"],
    volumetricFlowMm3s: String(p?.volumetricFlowMm3s ?? 5),
    perLayerSeconds: String(p?.perLayerSeconds ?? 3),
    startupMinutes: String(p?.startupMinutes ?? 6),
  };
}

/** Adds a printer, or edits one (rate included) when `printer` is given. Admins only; the server checks. */
export function PrinterForm({ printer, onDone }: { printer?: PrinterDto; onDone?: (saved?: boolean) => void }) {
  const qc = useQueryClient();
  const [values, setValues] = useState<Values>(() => toValues(printer));
  const [fieldErrors, setFieldErrors] = useState<Record<string, string[]>>({});
  const save = useMutation({
    mutationFn: (body: unknown) =>
      printer
        ? fetchJson<PrinterDto>(`/api/printers/${printer.id}`, { method: "PATCH", body: JSON.stringify(body) })
        : fetchJson<PrinterDto>("/api/printers", { method: "POST", body: JSON.stringify(body) }),
    onSuccess: async () => {
      setFieldErrors({});
      if (!printer) setValues(toValues());
      await qc.invalidateQueries({ queryKey: queryKeys.printers.all });
      await qc.invalidateQueries({ queryKey: queryKeys.quotes.all });
      onDone?.(true);
    },
    onError: (e) => setFieldErrors(e instanceof ApiError && e.fieldErrors ? e.fieldErrors : {}),
  });

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    const parsed = printerInput.safeParse(values);
    if (!parsed.success) {
      setFieldErrors(z.flattenError(parsed.error).fieldErrors);
      return;
    }
    save.mutate(printer ? { ...values, version: printer.version } : values);
  }

  const id = (n: string) => `${printer ? `p${printer.id}-` : "new-"}${n}`;
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label={printer ? `Edit ${printer.name}` : "Add a printer"}>
      {save.isError ? <Notice tone="fail" title={save.error.message} /> : null}
      {save.isSuccess && !printer ? <Notice tone="ok" title="Printer added." /> : null}
      <Field label="Name" name={id("name")} errors={fieldErrors.name}>
        <TextInput id={id("name")} name={id("name")} value={values.name} invalid={!!fieldErrors.name} onChange={(e) => setValues((v) => ({ ...v, name: e.target.value }))} />
      </Field>
      <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
        {numberFields.map((f) => (
          <Field key={f.name} label={f.label} name={id(f.name)} errors={fieldErrors[f.name]} hint={f.hint}>
            <TextInput
              id={id(f.name)}
              name={id(f.name)}
              type="number"
              step={f.step}
              inputMode="decimal"
              className="tabular-nums"
              value={values[f.name]}
              invalid={!!fieldErrors[f.name]}
              onChange={(e) => setValues((v) => ({ ...v, [f.name]: e.target.value }))}
            />
          </Field>
        ))}
      </div>
      <fieldset className="flex flex-col gap-2">
        <legend className="text-sm font-medium">Materials it may print</legend>
        <div className="flex flex-wrap gap-3">
          {materialTypes.map((m) => (
            <label key={m} className="flex items-center gap-1.5 text-sm">
              <input
                type="checkbox"
                checked={values.materials.includes(m)}
                onChange={(e) =>
                  setValues((v) => ({ ...v, materials: e.target.checked ? [...v.materials, m] : v.materials.filter((x) => x !== m) }))
                }
              />
              {MATERIALS[m].name}
            </label>
          ))}
        </div>
        {fieldErrors.materials ? (
          <p role="alert" className="text-xs text-fail">
            {fieldErrors.materials.join(" ")}
          </p>
        ) : null}
      </fieldset>
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" checked={values.enclosed} onChange={(e) => setValues((v) => ({ ...v, enclosed: e.target.checked }))} />
        Enclosed build chamber
        <span className="text-xs text-ink-soft">(ABS and ASA are planned only on enclosed printers: fumes and warping)</span>
      </label>
      <div className="flex gap-3">
        <Button type="submit" disabled={save.isPending}>
          {save.isPending ? "Saving…" : printer ? "Save printer" : "Add printer"}
        </Button>
        {onDone ? (
          <Button type="button" variant="secondary" onClick={() => onDone(false)}>
            Cancel
          </Button>
        ) : null}
      </div>
    </form>
  );
}
