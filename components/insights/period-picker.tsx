"use client";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Field, TextInput } from "@/components/ui/field";
import type { PeriodParams } from "@/lib/queries/insights";
import { insightsQuery } from "@/lib/validation/insights";

/** Week, month or a custom range of local dates; custom dates are checked with the server's schema before they are sent. */
export function PeriodPicker({ value, onChange }: { value: PeriodParams; onChange: (p: PeriodParams) => void }) {
  const [from, setFrom] = useState(value.from ?? "");
  const [to, setTo] = useState(value.to ?? "");
  const [custom, setCustom] = useState(value.period === "custom");
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const pick = (period: "week" | "month") => {
    setCustom(false);
    setErrors({});
    onChange({ period });
  };
  const apply = () => {
    const r = insightsQuery.safeParse({ period: "custom", from: from || undefined, to: to || undefined });
    if (!r.success) {
      const e: Record<string, string[]> = {};
      for (const i of r.error.issues) (e[i.path.join(".") || "_"] ??= []).push(i.message);
      setErrors(e);
      return;
    }
    setErrors({});
    onChange({ period: "custom", from: r.data.from, to: r.data.to });
  };
  const tab = (active: boolean) => `px-3 py-1.5 text-sm ${active ? "bg-accent text-white" : "bg-sheet text-ink-soft hover:text-ink"}`;
  return (
    <div className="flex flex-wrap items-end gap-4">
      <div role="group" aria-label="Period" className="inline-flex overflow-hidden rounded-md border border-rule">
        <button type="button" aria-pressed={!custom && value.period === "week"} className={tab(!custom && value.period === "week")} onClick={() => pick("week")}>
          This week
        </button>
        <button type="button" aria-pressed={!custom && value.period === "month"} className={tab(!custom && value.period === "month")} onClick={() => pick("month")}>
          This month
        </button>
        <button type="button" aria-pressed={custom} className={tab(custom)} onClick={() => setCustom(true)}>
          Custom
        </button>
      </div>
      {custom ? (
        <form
          className="flex flex-wrap items-end gap-3"
          onSubmit={(e) => {
            e.preventDefault();
            apply();
          }}
        >
          <Field label="From" name="from" errors={errors.from}>
            <TextInput id="from" name="from" type="date" value={from} onChange={(e) => setFrom(e.target.value)} invalid={!!errors.from} />
          </Field>
          <Field label="To" name="to" errors={errors.to}>
            <TextInput id="to" name="to" type="date" value={to} onChange={(e) => setTo(e.target.value)} invalid={!!errors.to} />
          </Field>
          <Button type="submit" variant="secondary">
            Show
          </Button>
        </form>
      ) : null}
    </div>
  );
}
