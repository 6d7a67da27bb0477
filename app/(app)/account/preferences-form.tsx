"use client";

import { useMutation } from "@tanstack/react-query";
import { useState, type FormEvent } from "react";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import { fetchJson } from "@/lib/queries/client";
import type { PreferencesInput } from "@/lib/validation/mail";

const options: { key: keyof PreferencesInput; label: string; hint: string; staffOnly?: boolean }[] = [
  { key: "partPrinted", label: "A part of mine is printed and ready to collect", hint: "One message per part." },
  { key: "plateFailed", label: "A plate with my parts failed and they are back in the queue", hint: "Nothing to do; just so you know." },
  { key: "operatorDigest", label: "Weekly digest of the Floor", hint: "For operators and admins: the week's plates, failures and materials.", staffOnly: true },
];

export function PreferencesForm({ initial, staff }: { initial: PreferencesInput; staff: boolean }) {
  const [values, setValues] = useState(initial);
  const save = useMutation({
    mutationFn: (input: PreferencesInput) => fetchJson<PreferencesInput>("/api/mail/preferences", { method: "PUT", body: JSON.stringify(input) }),
    onSuccess: (saved) => setValues(saved),
  });

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    save.mutate(values);
  }

  return (
    <form onSubmit={onSubmit} className="flex max-w-xl flex-col gap-4">
      {save.isError ? <Notice tone="fail" title={save.error.message} /> : null}
      {save.isSuccess ? <Notice tone="ok" title="Message settings saved." /> : null}
      <fieldset className="flex flex-col gap-3">
        <legend className="mb-2 text-sm font-medium">Send me an e-mail when…</legend>
        {options
          .filter((o) => staff || !o.staffOnly)
          .map((o) => (
            <label key={o.key} className="flex items-start gap-3 text-sm">
              <input type="checkbox" className="mt-1" name={o.key} checked={values[o.key]} onChange={(e) => setValues((v) => ({ ...v, [o.key]: e.target.checked }))} />
              <span>
                {o.label}
                <span className="block text-xs text-ink-soft">{o.hint}</span>
              </span>
            </label>
          ))}
      </fieldset>
      <p className="text-xs text-ink-soft">Invitations and password-reset links always go out.</p>
      <div>
        <Button type="submit" disabled={save.isPending}>
          {save.isPending ? "Saving…" : "Save message settings"}
        </Button>
      </div>
    </form>
  );
}
