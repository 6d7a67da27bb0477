"use client";
// The actions on one plate, each behind a confirmation with its own fields; a conflict (someone
// else acted first) shows the server's message and the board reloads.
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useState, type FormEvent } from "react";
import { fieldErrorsOf, formValues, Select } from "@/components/bench/form-bits";
import { Button } from "@/components/ui/button";
import { Field, TextInput } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { queryKeys } from "@/lib/queries/keys";
import { sendJsonTo } from "@/lib/queries/queue";
import type { PlateAction, PlateStatus } from "@/lib/validation/plates";

export interface ActionPlate {
  id: number;
  status: PlateStatus;
  version: number;
  printerId: number;
  estimatedMinutes: number;
  estimatedGrams: number;
}

const offered: Record<PlateStatus, PlateAction[]> = { planned: ["start", "move", "cancel"], printing: ["finish", "fail", "cancel"], finished: [], failed: [], cancelled: [] };
const verb: Record<PlateAction, string> = { start: "Start", finish: "Mark finished", fail: "Mark failed", cancel: "Cancel plate", move: "Move" };

export function PlateActions({ plate, printers }: { plate: ActionPlate; printers: { id: number; name: string }[] }) {
  const qc = useQueryClient();
  const [open, setOpen] = useState<PlateAction | null>(null);
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const act = useMutation({
    mutationFn: ({ action, values }: { action: PlateAction; values: Record<string, string> }) => sendJsonTo(`/api/plates/${plate.id}/${action}`, { ...values, version: plate.version }),
    onSuccess: () => {
      setErrors({});
      setOpen(null);
    },
    onError: (e) => setErrors(fieldErrorsOf(e)),
    onSettled: () => Promise.all([qc.invalidateQueries({ queryKey: queryKeys.queue.all }), qc.invalidateQueries({ queryKey: queryKeys.plates.all })]),
  });
  const actions = offered[plate.status];
  if (!actions.length) return null;
  const submit = (action: PlateAction) => (e: FormEvent<HTMLFormElement>) => {
    e.preventDefault();
    act.mutate({ action, values: formValues(e.currentTarget) });
  };
  const f = (k: string) => `p${plate.id}-${k}`;
  return (
    <div className="flex flex-col gap-2">
      <div className="flex flex-wrap gap-2">
        {actions.map((a) => (
          <Button key={a} type="button" variant={a === "fail" || a === "cancel" ? "secondary" : a === "move" ? "ghost" : "primary"} aria-expanded={open === a} onClick={() => { setOpen(open === a ? null : a); setErrors({}); act.reset(); }}>
            {verb[a]}
          </Button>
        ))}
      </div>
      {act.isError && !Object.keys(errors).length ? <Notice tone="fail" title={act.error.message} /> : null}
      {open ? (
        <form noValidate aria-label={`${verb[open]} plate ${plate.id}`} onSubmit={submit(open)} className="flex flex-col gap-3 rounded-md border border-rule bg-paper p-3">
          {open === "start" ? <p className="text-sm">Start plate {plate.id} now? Check the bed is clear and the spool is the plate&apos;s material.</p> : null}
          {open === "finish" ? (
            <div className="grid gap-3 sm:grid-cols-3">
              <Field label="Actual time (minutes)" name={f("actualMinutes")} errors={errors.actualMinutes}>
                <TextInput id={f("actualMinutes")} name="actualMinutes" type="number" min={1} defaultValue={Math.round(plate.estimatedMinutes)} invalid={!!errors.actualMinutes} />
              </Field>
              <Field label="Weighed grams (optional)" name={f("actualGrams")} errors={errors.actualGrams} hint={`Estimate ${plate.estimatedGrams.toFixed(1)} g`}>
                <TextInput id={f("actualGrams")} name="actualGrams" type="number" min={0} step="0.1" invalid={!!errors.actualGrams} />
              </Field>
              <Field label="Where the parts wait" name={f("shelfLabel")} errors={errors.shelfLabel} hint="Shelf or bin label the member sees">
                <TextInput id={f("shelfLabel")} name="shelfLabel" placeholder="Shelf B2" invalid={!!errors.shelfLabel} />
              </Field>
            </div>
          ) : null}
          {open === "fail" || open === "cancel" ? (
            <Field label={open === "fail" ? "What went wrong" : "Why cancel"} name={f("reason")} errors={errors.reason} hint={open === "fail" ? "Its parts go back to the queue with a reprint counted." : "Its parts go back to the queue."}>
              <TextInput id={f("reason")} name="reason" invalid={!!errors.reason} />
            </Field>
          ) : null}
          {open === "move" ? (
            <Field label="Move to printer" name={f("printerId")} errors={errors.printerId}>
              <Select id={f("printerId")} name="printerId" defaultValue="" invalid={!!errors.printerId}>
                <option value="" disabled>Pick a printer</option>
                {printers.filter((p) => p.id !== plate.printerId).map((p) => <option key={p.id} value={p.id}>{p.name}</option>)}
              </Select>
            </Field>
          ) : null}
          <div className="flex gap-2">
            <Button type="submit" variant={open === "fail" || open === "cancel" ? "danger" : "primary"} disabled={act.isPending}>{act.isPending ? "Working…" : `Confirm: ${verb[open].toLowerCase()}`}</Button>
            <Button type="button" variant="ghost" onClick={() => setOpen(null)}>Back</Button>
          </div>
        </form>
      ) : null}
    </div>
  );
}
