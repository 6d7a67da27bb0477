"use client";

import { TZDate } from "@date-fns/tz";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useState, type FormEvent } from "react";
import { Button } from "@/components/ui/button";
import { Field, TextInput } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { ApiError, fetchJson } from "@/lib/queries/client";
import { queryKeys } from "@/lib/queries/keys";
import type { PrinterDto } from "@/lib/queries/printers";
import { printerStates, type PrinterState } from "@/lib/validation/printers";
import { stateLabel } from "./format";

/** "YYYY-MM-DDTHH:MM" typed as wall-clock time in the workshop's zone → ISO instant. */
function wallToIso(local: string, timezone: string): string | null {
  const m = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})$/.exec(local);
  if (!m) return null;
  const [, y, mo, d, h, mi] = m.map(Number) as [number, number, number, number, number, number];
  return new TZDate(y, mo - 1, d, h, mi, timezone).toISOString();
}

function isoToWall(iso: string | null, timezone: string): string {
  if (!iso) return "";
  const t = new TZDate(new Date(iso).getTime(), timezone);
  const p = (n: number) => String(n).padStart(2, "0");
  return `${t.getFullYear()}-${p(t.getMonth() + 1)}-${p(t.getDate())}T${p(t.getHours())}:${p(t.getMinutes())}`;
}

/** Operators and admins: available, busy, or under maintenance with a note and an expected return. */
export function StateForm({ printer, timezone }: { printer: PrinterDto; timezone: string }) {
  const qc = useQueryClient();
  const [state, setState] = useState<PrinterState>(printer.state);
  const [note, setNote] = useState(printer.maintenanceNote);
  const [back, setBack] = useState(isoToWall(printer.expectedBackAt, timezone));
  const [fieldErrors, setFieldErrors] = useState<Record<string, string[]>>({});
  const save = useMutation({
    mutationFn: (body: unknown) => fetchJson<PrinterDto>(`/api/printers/${printer.id}/state`, { method: "PATCH", body: JSON.stringify(body) }),
    onSuccess: async () => {
      setFieldErrors({});
      await qc.invalidateQueries({ queryKey: queryKeys.printers.all });
    },
    onError: (e) => setFieldErrors(e instanceof ApiError && e.fieldErrors ? e.fieldErrors : {}),
  });

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    const maintenance = state === "maintenance";
    if (maintenance && note.trim().length < 3) {
      setFieldErrors({ maintenanceNote: ["Say what is being done (at least 3 characters)."] });
      return;
    }
    save.mutate({ state, maintenanceNote: maintenance ? note : "", expectedBackAt: maintenance && back ? wallToIso(back, timezone) : null });
  }

  const id = (n: string) => `p${printer.id}-${n}`;
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3" aria-label={`State of ${printer.name}`}>
      <fieldset className="flex flex-wrap gap-3">
        <legend className="sr-only">State</legend>
        {printerStates.map((s) => (
          <label key={s} className="flex items-center gap-1.5 text-sm">
            <input type="radio" name={id("state")} value={s} checked={state === s} onChange={() => setState(s)} />
            {stateLabel[s]}
          </label>
        ))}
      </fieldset>
      {state === "maintenance" ? (
        <div className="grid gap-3 sm:grid-cols-2">
          <Field label="Maintenance note" name={id("maintenanceNote")} errors={fieldErrors.maintenanceNote}>
            <TextInput id={id("maintenanceNote")} name={id("maintenanceNote")} value={note} invalid={!!fieldErrors.maintenanceNote} onChange={(e) => setNote(e.target.value)} />
          </Field>
          <Field label="Expected back" name={id("expectedBackAt")} errors={fieldErrors.expectedBackAt} hint={`Workshop time (${timezone}).`}>
            <TextInput id={id("expectedBackAt")} name={id("expectedBackAt")} type="datetime-local" value={back} onChange={(e) => setBack(e.target.value)} />
          </Field>
        </div>
      ) : null}
      {save.isError && !Object.keys(fieldErrors).length ? <Notice tone="fail" title={save.error.message} /> : null}
      <div>
        <Button type="submit" variant="secondary" disabled={save.isPending}>
          {save.isPending ? "Saving…" : "Set state"}
        </Button>
      </div>
    </form>
  );
}
