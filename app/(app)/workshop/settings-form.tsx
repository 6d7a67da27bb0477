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
      {save.isSuccess ? (
        <Notice tone="ok" title="Settings saved.">
          {values.unattendedAllowed === false ? "Plates must now end by closing time." : `Plates may run unattended${values.unattendedMaxHours ? ` for up to ${values.unattendedMaxHours} h past closing` : ", with no cap"}.`} Re-plan on the Floor to apply it to plates not yet started.
        </Notice>
      ) : null}
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
      <fieldset className="flex flex-col gap-3 rounded-md border border-rule p-3">
        <legend className="px-1 text-sm font-semibold">Unattended printing</legend>
        <Notice tone="warn" title="Unattended and overnight printing is a fire risk">
          Printers are hot and move. Allow plates to run while nobody is there only where the workshop&apos;s own rules and local codes permit it
          (smoke detection, a clear area around the printer, someone who can be called).
        </Notice>
        <label className="flex items-center gap-2 text-sm">
          <input
            type="checkbox"
            name="unattendedAllowed"
            checked={values.unattendedAllowed !== false}
            onChange={(e) => setValues((v) => ({ ...v, unattendedAllowed: e.target.checked }))}
          />
          Plates may run past closing (nights and weekends)
        </label>
        <Field
          label="Longest unattended run (hours)"
          name="unattendedMaxHours"
          errors={fieldErrors.unattendedMaxHours}
          hint="How long a plate may keep printing after closing. Leave empty for no cap. Ignored when plates must end by closing."
        >
          <TextInput
            id="unattendedMaxHours"
            name="unattendedMaxHours"
            type="number"
            step="0.5"
            min={0.5}
            disabled={values.unattendedAllowed === false}
            value={values.unattendedMaxHours === null || values.unattendedMaxHours === undefined ? "" : String(values.unattendedMaxHours)}
            invalid={!!fieldErrors.unattendedMaxHours}
            onChange={(e) => setValues((v) => ({ ...v, unattendedMaxHours: e.target.value }))}
          />
        </Field>
      </fieldset>
      <div className="flex items-center gap-3">
        <Button type="submit" disabled={save.isPending}>
          {save.isPending ? "Saving…" : "Save settings"}
        </Button>
        <span className="text-xs text-ink-soft">Version {values.version}</span>
      </div>
    </form>
  );
}
