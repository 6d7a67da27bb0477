"use client";

import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useState, type FormEvent } from "react";
import { z } from "zod";
import { Button } from "@/components/ui/button";
import { Field, TextInput } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { ApiError, fetchJson } from "@/lib/queries/client";
import { queryKeys } from "@/lib/queries/keys";
import type { MaterialDto } from "@/lib/queries/materials";
import { spoolInput } from "@/lib/validation/materials";

/** Operators and admins put a new spool into stock. */
export function SpoolForm({ materials }: { materials: MaterialDto[] }) {
  const qc = useQueryClient();
  const empty = { materialId: String(materials[0]?.id ?? ""), label: "", colour: "", gramsInitial: "1000", gramsRemaining: "1000" };
  const [values, setValues] = useState(empty);
  const [fieldErrors, setFieldErrors] = useState<Record<string, string[]>>({});
  const save = useMutation({
    mutationFn: (body: unknown) => fetchJson("/api/spools", { method: "POST", body: JSON.stringify(body) }),
    onSuccess: async () => {
      setFieldErrors({});
      setValues((v) => ({ ...empty, materialId: v.materialId }));
      await qc.invalidateQueries({ queryKey: queryKeys.materials.all });
    },
    onError: (e) => setFieldErrors(e instanceof ApiError && e.fieldErrors ? e.fieldErrors : {}),
  });
  function onSubmit(e: FormEvent) {
    e.preventDefault();
    const parsed = spoolInput.safeParse(values);
    if (!parsed.success) {
      setFieldErrors(z.flattenError(parsed.error).fieldErrors);
      return;
    }
    save.mutate(values);
  }
  const field = (n: keyof typeof values, label: string, type = "text") => (
    <Field label={label} name={`spool-${n}`} errors={fieldErrors[n]}>
      <TextInput id={`spool-${n}`} name={`spool-${n}`} type={type} value={values[n]} invalid={!!fieldErrors[n]} onChange={(e) => setValues((v) => ({ ...v, [n]: e.target.value }))} />
    </Field>
  );
  if (!materials.length) return <p className="text-sm text-ink-soft">Add a material first.</p>;
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Add a spool">
      {save.isError ? <Notice tone="fail" title={save.error.message} /> : null}
      <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-5">
        <Field label="Material" name="spool-materialId" errors={fieldErrors.materialId}>
          <select id="spool-materialId" value={values.materialId} onChange={(e) => setValues((v) => ({ ...v, materialId: e.target.value }))} className="rounded-md border border-rule bg-sheet px-3 py-2 text-sm">
            {materials.map((m) => (
              <option key={m.id} value={m.id}>
                {m.name}
              </option>
            ))}
          </select>
        </Field>
        {field("label", "Label")}
        {field("colour", "Colour")}
        {field("gramsInitial", "Net grams when new", "number")}
        {field("gramsRemaining", "Grams left", "number")}
      </div>
      <div>
        <Button type="submit" disabled={save.isPending}>
          {save.isPending ? "Adding…" : "Add spool"}
        </Button>
      </div>
    </form>
  );
}
