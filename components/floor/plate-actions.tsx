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
import { sendJsonTo, type FloorBoardWire } from "@/lib/queries/queue";
import { spoolChangeWords } from "./format";
import type { PlateAction, PlateStatus } from "@/lib/validation/plates";

export interface ActionPlate {
  id: number;
  status: PlateStatus;
  version: number;
  printerId: number;
  material: string;
  colour: string;
  estimatedMinutes: number;
  estimatedGrams: number;
  change: FloorBoardWire["lanes"][number]["plates"][number]["change"];
  /** The change Start needs against the spool loaded now. */
  startChange: FloorBoardWire["lanes"][number]["plates"][number]["startChange"];
  moveTo: { id: number; name: string }[];
}

type BoardSpools = FloorBoardWire["spools"];
/** The server's rule (lib/server/materials.ts SPOOL_MARGIN): a spool must hold the plate's grams plus 10 %. */
const SPOOL_MARGIN = 1.1;
const norm = (c: string) => c.trim().toLowerCase() || "any";

/** The spools that could feed this plate: its material and colour (any colour when it has none). */
function spoolsFor(plate: ActionPlate, spools: BoardSpools) {
  return spools.filter((s) => s.type === plate.material && (norm(plate.colour) === "any" || norm(s.colour) === norm(plate.colour)));
}

const offered: Record<PlateStatus, PlateAction[]> = { planned: ["start", "move", "cancel"], printing: ["finish", "fail", "cancel"], finished: [], failed: [], cancelled: [] };
const verb: Record<PlateAction, string> = { start: "Start", finish: "Mark finished", fail: "Mark failed", cancel: "Cancel plate", move: "Move" };

export function PlateActions({ plate, spools, printerNames }: { plate: ActionPlate; spools: BoardSpools; printerNames: Map<number, string> }) {
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
  const need = plate.estimatedGrams * SPOOL_MARGIN;
  const blocked = (a: PlateAction) => (a === "move" && !plate.moveTo.length) || (a === "start" && !!plate.startChange && !spoolsFor(plate, spools).some((s) => s.grams >= need));
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
          {open === "start" ? <StartFields plate={plate} spools={spools} printerNames={printerNames} errors={errors.spoolId} id={f("spoolId")} /> : null}
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
          {open === "fail" ? (
            <Field label="Filament used, weighed (optional)" name={f("usedGrams")} errors={errors.usedGrams} hint="Taken off the spool. Empty: estimated from the share of the run done.">
              <TextInput id={f("usedGrams")} name="usedGrams" type="number" min={0} step="0.1" invalid={!!errors.usedGrams} />
            </Field>
          ) : null}
          {open === "move" ? (
            plate.moveTo.length ? (
              <Field label="Move to printer" name={f("printerId")} errors={errors.printerId} hint="Only printers that take the material (ABS/ASA: enclosed) and hold this layout and its height are listed.">
                <Select id={f("printerId")} name="printerId" defaultValue={String(plate.moveTo[0]!.id)} invalid={!!errors.printerId}>
                  {plate.moveTo.map((p) => <option key={p.id} value={p.id}>{p.name}</option>)}
                </Select>
              </Field>
            ) : (
              <p className="text-sm">No other printer can take this plate: none prints its material with room for its layout and height. Re-plan or cancel it instead.</p>
            )
          ) : null}
          <div className="flex gap-2">
            <Button type="submit" variant={open === "fail" || open === "cancel" ? "danger" : "primary"} disabled={act.isPending || blocked(open)}>
              {act.isPending ? "Working…" : open === "start" && plate.startChange ? "Confirm: load the spool and start" : `Confirm: ${verb[open].toLowerCase()}`}
            </Button>
            <Button type="button" variant="ghost" onClick={() => setOpen(null)}>Back</Button>
          </div>
        </form>
      ) : null}
    </div>
  );
}

/** Start: when the plate needs a spool change, the operator picks the spool to load; the server loads it and starts in one go. */
function StartFields({ plate, spools, printerNames, errors, id }: { plate: ActionPlate; spools: BoardSpools; printerNames: Map<number, string>; errors?: string[]; id: string }) {
  const change = plate.startChange;
  if (!change) return <p className="text-sm">Start plate {plate.id} now? Spool already on. Check the bed is clear and the nozzle and bed are at temperature before you leave it.</p>;
  const need = plate.estimatedGrams * SPOOL_MARGIN;
  const fit = spoolsFor(plate, spools);
  const enough = fit.filter((s) => s.grams >= need);
  return (
    <div className="flex flex-col gap-2 text-sm">
      <p className="font-medium">Spool change first: {spoolChangeWords(change)}.</p>
      {enough.length ? (
        <Field label="Spool to load" name={id} errors={errors} hint={`Needs about ${Math.ceil(need)} g with spare. The spool now on goes back on the shelf.`}>
          <Select id={id} name="spoolId" defaultValue={String(enough[0]!.id)} invalid={!!errors}>
            {fit.map((s) => (
              <option key={s.id} value={s.id} disabled={s.grams < need}>
                {s.label} · {s.type.toUpperCase()} {s.colour} · {Math.floor(s.grams)} g · {s.printerId === null ? "on the shelf" : s.printerId === plate.printerId ? "on this printer" : `on ${printerNames.get(s.printerId) ?? "another printer"}`}
                {s.grams < need ? " (too little left)" : ""}
              </option>
            ))}
          </Select>
        </Field>
      ) : (
        <p>The workshop has no {change.to.material.toUpperCase()}{change.to.colour === "any" ? "" : ` ${change.to.colour}`} spool holding {Math.ceil(need)} g. Stock one under Materials, or move or cancel the plate.</p>
      )}
      <p className="text-ink-soft">Hot nozzle: unload and load the filament as the workshop&apos;s rules say.</p>
    </div>
  );
}
