"use client";
// On the part page: send copies to the workshop (members who may edit the part), and each copy's
// place in the workshop: plate, expected finish, or the shelf where it waits. Polled every 10 s.
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import Link from "next/link";
import { useState, type FormEvent } from "react";
import { fieldErrorsOf, formValues, Select } from "@/components/bench/form-bits";
import { Button } from "@/components/ui/button";
import { Field, TextInput } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { queryKeys } from "@/lib/queries/keys";
import { partScheduleQuery, sendJsonTo } from "@/lib/queries/queue";
import { partStatusLabel } from "@/lib/status";
import { MEMBER_MAX_PRIORITY, priorityLabel } from "@/lib/validation/queue";

interface SendResult { queued: number; printers: string[]; gramsEach: number; minutesEach: number; waitingFor: string | null }

const when = (iso: string | null) => (iso ? new Date(iso).toLocaleString("en-GB", { weekday: "short", day: "numeric", month: "short", hour: "2-digit", minute: "2-digit" }) : "—");

export function SendToWorkshop({ partId, canEdit }: { partId: number; canEdit: boolean }) {
  const qc = useQueryClient();
  const sched = useQuery(partScheduleQuery(partId));
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const send = useMutation({
    mutationFn: (v: Record<string, string>) => sendJsonTo<SendResult>("/api/queue", { ...v, partId }),
    onSuccess: () => setErrors({}),
    onError: (e) => setErrors(fieldErrorsOf(e)),
    onSettled: () => Promise.all([qc.invalidateQueries({ queryKey: queryKeys.queue.all }), qc.invalidateQueries({ queryKey: queryKeys.parts.all }), qc.invalidateQueries({ queryKey: queryKeys.assemblies.all })]),
  });
  const rows = sched.data ?? [];
  const free = rows.filter((r) => r.status === "drafted" || r.status === "ready").length;
  return (
    <section aria-labelledby="workshop-h" className="flex flex-col gap-3">
      <h2 id="workshop-h">In the workshop</h2>
      {/* Outside the form: sending the last free copies hides the form, the confirmation stays. */}
      {send.isSuccess ? <Notice tone="ok" title={`Sent ${send.data.queued} ${send.data.queued === 1 ? "copy" : "copies"}.`}>Fits {send.data.printers.join(", ")}; about {send.data.gramsEach.toFixed(0)} g each.{send.data.waitingFor ? ` ${send.data.waitingFor}` : ""}</Notice> : null}
      {canEdit && free > 0 ? (
        <form noValidate aria-label="Send to the workshop" className="flex flex-col gap-3 rounded-lg border border-rule bg-sheet p-4" onSubmit={(e: FormEvent<HTMLFormElement>) => { e.preventDefault(); send.mutate(formValues(e.currentTarget)); }}>
          <h3 className="font-semibold">Send to the workshop</h3>
          {send.isError && !Object.keys(errors).length ? <Notice tone="fail" title={send.error.message} /> : null}
          {errors.partId ? <Notice tone="fail" title="The workshop cannot take this part.">{errors.partId.join(" ")}</Notice> : null}
          <div className="grid gap-3 sm:grid-cols-3">
            <Field label="Copies" name="send-quantity" errors={errors.quantity} hint={`${free} not yet sent`}>
              <TextInput id="send-quantity" name="quantity" type="number" min={1} max={free} defaultValue={free} invalid={!!errors.quantity} />
            </Field>
            <Field label="Wished by (optional)" name="send-wishedDate" errors={errors.wishedDate}>
              <TextInput id="send-wishedDate" name="wishedDate" type="date" invalid={!!errors.wishedDate} />
            </Field>
            <Field label="Priority" name="send-priority" errors={errors.priority} hint="The workshop may change it.">
              <Select id="send-priority" name="priority" defaultValue="0" invalid={!!errors.priority}>
                {Array.from({ length: MEMBER_MAX_PRIORITY + 1 }, (_, p) => <option key={p} value={p}>{priorityLabel(p)}</option>)}
              </Select>
            </Field>
          </div>
          <div><Button type="submit" disabled={send.isPending}>{send.isPending ? "Checking and sending…" : "Send to the workshop"}</Button></div>
        </form>
      ) : null}
      {sched.isError ? <Notice tone="fail" title="The workshop's view could not be loaded.">{sched.error.message}</Notice> : null}
      {sched.isPending ? <p role="status" className="text-sm text-ink-soft">Loading…</p> : (
        <table className="w-full text-sm" aria-label="Copies in the workshop">
          <thead className="text-left text-xs text-ink-soft"><tr><th className="py-1 pr-3">Copy</th><th className="pr-3">Status</th><th className="pr-3">Plate</th><th className="pr-3">Expected finish</th><th>Where it waits</th></tr></thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.instanceId} className="border-t border-rule" data-testid={`copy-${r.copyNo}`}>
                <td className="num py-1.5 pr-3">#{r.copyNo}{r.reprints ? <span className="ml-1 text-xs text-fail">reprint {r.reprints}</span> : null}</td>
                <td className="pr-3">{partStatusLabel[r.status]}</td>
                <td className="pr-3">{r.plateId ? <Link className="underline" href={`/plates/${r.plateId}`}>Plate {r.plateId}</Link> : "—"}{r.printer ? ` on ${r.printer}` : ""}</td>
                <td className="num pr-3">{when(r.expectedFinish)}{r.runsUnattended ? " ☾" : ""}</td>
                <td>{r.shelfLabel ?? "—"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {rows.some((r) => r.runsUnattended) ? <p className="text-xs text-ink-soft">☾ The plate runs past closing unattended, under the workshop&apos;s rules for overnight printing.</p> : null}
    </section>
  );
}
