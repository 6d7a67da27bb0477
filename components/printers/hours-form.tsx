"use client";

import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useState, type FormEvent } from "react";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import { ApiError, fetchJson } from "@/lib/queries/client";
import { queryKeys } from "@/lib/queries/keys";
import { hoursQuery, type HoursDto } from "@/lib/queries/printers";
import { attendedHoursInput } from "@/lib/validation/hours";

const DAYS = ["Monday", "Tuesday", "Wednesday", "Thursday", "Friday", "Saturday", "Sunday"];

type Row = { weekday: number; open: boolean; from: string; to: string };

function rowsOf(h: HoursDto): Row[] {
  return DAYS.map((_, i) => {
    const w = h.windows.find((x) => x.weekday === i + 1);
    return { weekday: i + 1, open: !!w, from: w?.open ?? "09:00", to: w?.close ?? "17:00" };
  });
}

/** The week's attended hours: one opening per weekday, or closed. */
export function HoursForm({ initial }: { initial: HoursDto }) {
  const qc = useQueryClient();
  const q = useQuery({ ...hoursQuery(), initialData: initial });
  const [rows, setRows] = useState<Row[]>(() => rowsOf(initial));
  const [fieldErrors, setFieldErrors] = useState<Record<string, string[]>>({});
  const save = useMutation({
    mutationFn: (body: unknown) => fetchJson<HoursDto>("/api/workshop/hours", { method: "PUT", body: JSON.stringify(body) }),
    onSuccess: async (saved) => {
      setFieldErrors({});
      qc.setQueryData(queryKeys.hours.all, saved);
      setRows(rowsOf(saved));
    },
    onError: (e) => setFieldErrors(e instanceof ApiError && e.fieldErrors ? e.fieldErrors : {}),
  });

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    const body = { windows: rows.filter((r) => r.open).map((r) => ({ weekday: r.weekday, open: r.from, close: r.to })) };
    const parsed = attendedHoursInput.safeParse(body);
    if (!parsed.success) {
      const errs: Record<string, string[]> = {};
      for (const issue of parsed.error.issues) {
        const [, index, field] = issue.path;
        const row = body.windows[Number(index)];
        const key = row ? `${row.weekday}.${String(field)}` : "_";
        (errs[key] ??= []).push(issue.message);
      }
      setFieldErrors(errs);
      return;
    }
    save.mutate(body);
  }

  const set = (i: number, patch: Partial<Row>) => setRows((rs) => rs.map((r, j) => (j === i ? { ...r, ...patch } : r)));
  const h = q.data;
  return (
    <div className="flex max-w-2xl flex-col gap-5">
      <Notice tone="info" title={h.openNow ? "Attended now" : "Closed now"}>
        {h.nextOpeningLocal && !h.openNow ? `Next opening: ${h.nextOpeningLocal} (${h.timezone}).` : `Times are in the workshop's zone, ${h.timezone}.`}
      </Notice>
      <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Opening hours">
        {save.isError && !Object.keys(fieldErrors).length ? <Notice tone="fail" title={save.error.message} /> : null}
        {save.isSuccess ? <Notice tone="ok" title="Opening hours saved." /> : null}
        <table className="text-sm">
          <thead>
            <tr className="text-left text-ink-soft">
              <th className="py-1 pr-4 font-normal">Day</th>
              <th className="py-1 pr-4 font-normal">Open</th>
              <th className="py-1 pr-4 font-normal">From</th>
              <th className="py-1 font-normal">To</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r, i) => {
              const errs = [...(fieldErrors[`${r.weekday}.open`] ?? []), ...(fieldErrors[`${r.weekday}.close`] ?? [])];
              return (
                <tr key={r.weekday} className="border-t border-rule">
                  <td className="py-2 pr-4 font-medium">{DAYS[i]}</td>
                  <td className="py-2 pr-4">
                    <label className="flex items-center gap-1.5">
                      <input type="checkbox" checked={r.open} onChange={(e) => set(i, { open: e.target.checked })} aria-label={`${DAYS[i]} open`} />
                      {r.open ? "open" : "closed"}
                    </label>
                  </td>
                  <td className="py-2 pr-4">
                    <input type="time" aria-label={`${DAYS[i]} opens`} value={r.from} disabled={!r.open} onChange={(e) => set(i, { from: e.target.value })} className="rounded-md border border-rule bg-sheet px-2 py-1 tabular-nums" />
                  </td>
                  <td className="py-2">
                    <input type="time" aria-label={`${DAYS[i]} closes`} value={r.to} disabled={!r.open} onChange={(e) => set(i, { to: e.target.value })} className="rounded-md border border-rule bg-sheet px-2 py-1 tabular-nums" />
                    {errs.length ? (
                      <p role="alert" className="text-xs text-fail">
                        {errs.join(" ")}
                      </p>
                    ) : null}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
        <p className="text-xs text-ink-soft">A closing time before the opening time runs past midnight. Plates that run past closing are unattended: follow the workshop&apos;s rules on overnight printing.</p>
        <div>
          <Button type="submit" disabled={save.isPending}>
            {save.isPending ? "Saving…" : "Save opening hours"}
          </Button>
        </div>
      </form>
    </div>
  );
}
