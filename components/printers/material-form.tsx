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
import type { MaterialDto } from "@/lib/queries/materials";
import { materialInput } from "@/lib/validation/materials";
import { materialTypes, type MaterialType } from "@/lib/validation/printers";

type Values = { name: string; type: MaterialType; densityGcm3: string; densitySource: string; pricePerKgCents: string; lowStockGrams: string };

function toValues(m?: MaterialDto): Values {
  const type = m?.type ?? "pla";
  return {
    name: m?.name ?? "",
    type,
    densityGcm3: String(m?.densityGcm3 ?? MATERIALS[type].densityGcm3),
    densitySource: m?.densitySource ?? MATERIALS[type].densitySource,
    pricePerKgCents: String(m?.pricePerKgCents ?? ""),
    lowStockGrams: String(m?.lowStockGrams ?? 200),
  };
}

/** Admins add a material or change one (its price included). New materials start from the reference density and its source. */
export function MaterialForm({ material, onDone }: { material?: MaterialDto; onDone?: () => void }) {
  const qc = useQueryClient();
  const [values, setValues] = useState<Values>(() => toValues(material));
  const [fieldErrors, setFieldErrors] = useState<Record<string, string[]>>({});
  const save = useMutation({
    mutationFn: (body: unknown) =>
      material
        ? fetchJson<MaterialDto>(`/api/materials/${material.id}`, { method: "PATCH", body: JSON.stringify(body) })
        : fetchJson<MaterialDto>("/api/materials", { method: "POST", body: JSON.stringify(body) }),
    onSuccess: async () => {
      setFieldErrors({});
      if (!material) setValues(toValues());
      await qc.invalidateQueries({ queryKey: queryKeys.materials.all });
      await qc.invalidateQueries({ queryKey: queryKeys.quotes.all });
      onDone?.();
    },
    onError: (e) => setFieldErrors(e instanceof ApiError && e.fieldErrors ? e.fieldErrors : {}),
  });

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    const parsed = materialInput.safeParse(values);
    if (!parsed.success) {
      setFieldErrors(z.flattenError(parsed.error).fieldErrors);
      return;
    }
    save.mutate(material ? { ...values, version: material.version } : values);
  }

  function pickType(type: MaterialType) {
    // A new material takes the reference density and its source; the admin may overwrite both.
    setValues((v) => (material ? { ...v, type } : { ...v, type, densityGcm3: String(MATERIALS[type].densityGcm3), densitySource: MATERIALS[type].densitySource }));
  }

  const id = (n: string) => `${material ? `m${material.id}-` : "new-material-"}${n}`;
  const text = (n: keyof Values, label: string, opts: { type?: string; step?: string; hint?: string } = {}) => (
    <Field label={label} name={id(n)} errors={fieldErrors[n]} hint={opts.hint}>
      <TextInput
        id={id(n)}
        name={id(n)}
        type={opts.type ?? "text"}
        step={opts.step}
        value={values[n]}
        invalid={!!fieldErrors[n]}
        onChange={(e) => setValues((v) => ({ ...v, [n]: e.target.value }))}
      />
    </Field>
  );
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label={material ? `Edit ${material.name}` : "Add a material"}>
      {save.isError ? <Notice tone="fail" title={save.error.message} /> : null}
      <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
        {text("name", "Name")}
        <Field label="Material type" name={id("type")} errors={fieldErrors.type}>
          <select id={id("type")} value={values.type} onChange={(e) => pickType(e.target.value as MaterialType)} className="rounded-md border border-rule bg-sheet px-3 py-2 text-sm">
            {materialTypes.map((t) => (
              <option key={t} value={t}>
                {MATERIALS[t].name}
              </option>
            ))}
          </select>
        </Field>
        {text("pricePerKgCents", "Price per kg (cents)", { type: "number", step: "1" })}
        {text("densityGcm3", "Density (g/cm³)", { type: "number", step: "0.01" })}
        {text("densitySource", "Density source", { hint: "Datasheet or your own measurement." })}
        {text("lowStockGrams", "Low stock below (g)", { type: "number", step: "10" })}
      </div>
      <div className="flex gap-3">
        <Button type="submit" disabled={save.isPending}>
          {save.isPending ? "Saving…" : material ? "Save material" : "Add material"}
        </Button>
        {onDone ? (
          <Button type="button" variant="secondary" onClick={onDone}>
            Cancel
          </Button>
        ) : null}
      </div>
    </form>
  );
}
