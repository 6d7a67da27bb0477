"use client";

import { useMutation } from "@tanstack/react-query";
import { useState, type FormEvent } from "react";
import { z } from "zod";
import { Button } from "@/components/ui/button";
import { Field, TextInput } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { ApiError, fetchJson } from "@/lib/queries/client";
import { workshopSettingsInput } from "@/lib/validation/workshop";

type Values = z.input<typeof workshopSettingsInput>;
type Saved = Values & { version: number; updatedAt: string };

const fields: { name: keyof Values; label: string; type?: string; hint?: string; step?: string }[] = [
  { name: "name", label: "Workshop name" },
  { name: "timezone", label: "Time zone", hint: "IANA name, e.g. Europe/Berlin. Opening hours and schedules use it." },
  { name: "currency", label: "Currency", hint: "ISO 4217 code. Prices are kept in its smallest unit." },
  { name: "contactEmail", label: "Contact e-mail", type: "email" },
  { name: "defaultLayerHeightMm", label: "Default layer height (mm)", type: "number", step: "0.01" },
  { name: "defaultWalls", label: "Default walls", type: "number", step: "1" },
  { name: "defaultInfillPercent", label: "Default infill (%)", type: "number", step: "1" },
  { name: "plateFeeCents", label: "Fee per plate (cents)", type: "number", step: "1", hint: "Added to every plate's charge; 0 for none." },
];

export function SettingsForm({ initial }: { initial: Saved }) {
  const [values, setValues] = useState<Saved>(initial);
  const [fieldErrors, setFieldErrors] = useState<Record<string, string[]>>({});
  const save = useMutation({
    mutationFn: (input: Values) => fetchJson<Saved>("/api/workshop/settings", { method: "PATCH", body: JSON.stringify(input) }),
    onSuccess: (saved) => {
      setValues(saved);
      setFieldErrors({});
    },
    onError: (e) => setFieldErrors(e instanceof ApiError && e.fieldErrors ? e.fieldErrors : {}),
  });

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    const { updatedAt: _u, ...input } = values;
    const parsed = workshopSettingsInput.safeParse(input);
    if (!parsed.success) {
      setFieldErrors(z.flattenError(parsed.error).fieldErrors);
      return;
    }
    save.mutate(input);
  }

  return (
    <form onSubmit={onSubmit} noValidate className="flex max-w-2xl flex-col gap-5">
      {save.isError ? <Notice tone="fail" title={save.error.message} /> : null}
      {save.isSuccess ? <Notice tone="ok" title="Settings saved." /> : null}
      <div className="grid gap-5 sm:grid-cols-2">
        {fields.map((f) => (
          <Field key={f.name} label={f.label} name={f.name} errors={fieldErrors[f.name]} hint={f.hint}>
            <TextInput
              id={f.name}
              name={f.name}
              type={f.type ?? "text"}
              step={f.step}
              value={String(values[f.name] ?? "")}
              invalid={!!fieldErrors[f.name]}
              onChange={(e) => setValues((v) => ({ ...v, [f.name]: e.target.value }))}
            />
          </Field>
        ))}
      </div>
      <Field label="Safety note shown on the Floor" name="safetyNote" errors={fieldErrors.safetyNote} hint="Your house rules for hot beds, fumes and unattended printing.">
        <textarea
          id="safetyNote"
          name="safetyNote"
          rows={3}
          value={values.safetyNote}
          onChange={(e) => setValues((v) => ({ ...v, safetyNote: e.target.value }))}
          className="rounded-md border border-rule bg-sheet px-3 py-2 text-sm"
        />
      </Field>
      <div className="flex items-center gap-3">
        <Button type="submit" disabled={save.isPending}>
          {save.isPending ? "Saving…" : "Save settings"}
        </Button>
        <span className="text-xs text-ink-soft">Version {values.version}</span>
      </div>
    </form>
  );
}
