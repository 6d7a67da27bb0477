"use client";

import { keepPreviousData, useQuery } from "@tanstack/react-query";
import { grams, hmm, money } from "@/components/printers/format";
import { Notice } from "@/components/ui/notice";
import { cautionsFor } from "@/lib/estimate/materials";
import { fetchJson } from "@/lib/queries/client";
import { queryKeys } from "@/lib/queries/keys";
import type { MaterialType } from "@/lib/validation/printers";

/** What the panel needs of a part: geometry from the stored analysis and the print settings. */
export interface QuotePanelInput {
  volumeMm3: number;
  areaMm2: number;
  heightMm: number;
  widthMm?: number;
  depthMm?: number;
  footprintAreaMm2?: number;
  supportVolumeMm3?: number;
  layerHeightMm: number;
  wallCount: number;
  infillPercent: number;
  supports?: boolean;
  material: MaterialType;
  materialId?: number;
}

interface Option {
  printerId: number;
  printerName: string;
  state: "available" | "busy" | "maintenance";
  fits: boolean;
  hourlyRateCents: number;
  grams: number;
  minutes: number;
  timeFactor: number;
  samples: number;
  cost: { materialCents: number; machineCents: number; feeCents: number; totalCents: number };
}
interface Quote {
  currency: string;
  material: { id: number; name: string; pricePerKgCents: number; densityGcm3: number; densitySource: string };
  fee: { plateFeeCents: number; membersPerPlate: number; platesSeen: number; shareCents: number };
  options: Option[];
  quotedAt: string;
}

/** The price of a part on each printer that takes its material, cheapest first, before it is submitted. */
export function QuotePanel({ input, title = "Quote" }: { input: QuotePanelInput; title?: string }) {
  const q = useQuery({
    queryKey: queryKeys.quotes.part(input),
    queryFn: () => fetchJson<Quote>("/api/quotes", { method: "POST", body: JSON.stringify(input) }),
    placeholderData: keepPreviousData,
    retry: false,
  });
  const cautions = cautionsFor(input.material);
  return (
    <section className="rounded-lg border border-rule bg-sheet p-4" aria-labelledby="quote-title" aria-busy={q.isFetching}>
      <h2 id="quote-title" className="mb-3 text-lg font-semibold">
        {title}
      </h2>
      {q.isPending ? (
        <p role="status" className="text-sm text-ink-soft">
          Working out the price…
        </p>
      ) : q.isError ? (
        <Notice tone="fail" title="No quote for these figures.">
          {q.error.message}
        </Notice>
      ) : (
        <QuoteTable quote={q.data} withSupport={!!input.supports} />
      )}
      {cautions.length ? (
        <div className="mt-3">
          <Notice tone="warn" title="Cautions for this material">
            {cautions.map((c) => c.message).join(" ")} The workshop&apos;s own rules and local codes come first.
          </Notice>
        </div>
      ) : null}
    </section>
  );
}

function QuoteTable({ quote, withSupport }: { quote: Quote; withSupport: boolean }) {
  const m = (c: number) => money(c, quote.currency);
  const best = quote.options.find((o) => o.fits);
  return (
    <div className="flex flex-col gap-3">
      {best ? (
        <p className="text-sm" data-testid="quote-best">
          From <strong className="tabular-nums">{m(best.cost.totalCents)}</strong> on {best.printerName}
        </p>
      ) : (
        <Notice tone="warn" title="This part fits on none of the printers that take this material." />
      )}
      <p className="text-xs text-ink-soft">
        {quote.material.name} at {m(quote.material.pricePerKgCents)} per kg, {quote.material.densityGcm3} g/cm³ ({quote.material.densitySource}).
        {" "}
        <span data-testid="quote-fee-share">
          Fee: your share of the {m(quote.fee.plateFeeCents)} plate fee, which is split evenly between the members on a plate
          {quote.fee.platesSeen
            ? ` (${quote.fee.membersPerPlate.toFixed(1)} members a plate on average over the last ${quote.fee.platesSeen} plates); the Ledger charges the actual split.`
            : " (no plates finished yet, so the whole fee); the Ledger charges the actual split."}
        </span>
        {withSupport ? " Grams and time include the support the chosen orientation needs." : ""}
      </p>
      <div className="overflow-x-auto">
        <table className="w-full text-sm">
          <thead>
            <tr className="text-left text-ink-soft">
              <th className="py-1 pr-3 font-normal">Printer</th>
              <th className="py-1 pr-3 text-right font-normal">Filament</th>
              <th className="py-1 pr-3 text-right font-normal">Time</th>
              <th className="py-1 pr-3 text-right font-normal">Material</th>
              <th className="py-1 pr-3 text-right font-normal">Machine</th>
              <th className="py-1 pr-3 text-right font-normal">Fee</th>
              <th className="py-1 text-right font-normal">Total</th>
            </tr>
          </thead>
          <tbody>
            {quote.options.map((o) => (
              <tr key={o.printerId} className={`border-t border-rule ${o.fits ? "" : "text-ink-soft"}`} aria-label={`Quote on ${o.printerName}`}>
                <td className="py-2 pr-3">
                  {o.printerName}
                  <span className="block text-xs text-ink-soft">
                    {!o.fits ? "does not fit · " : ""}
                    {m(o.hourlyRateCents)}/h · {o.samples ? `time × ${o.timeFactor.toFixed(2)} from ${o.samples} plate${o.samples === 1 ? "" : "s"}` : "uncalibrated"}
                  </span>
                </td>
                <td className="py-2 pr-3 text-right tabular-nums">{grams(o.grams)}</td>
                <td className="py-2 pr-3 text-right tabular-nums">{hmm(o.minutes)}</td>
                <td className="py-2 pr-3 text-right tabular-nums">{m(o.cost.materialCents)}</td>
                <td className="py-2 pr-3 text-right tabular-nums">{m(o.cost.machineCents)}</td>
                <td className="py-2 pr-3 text-right tabular-nums">{m(o.cost.feeCents)}</td>
                <td className="py-2 text-right font-medium tabular-nums" data-testid="quote-total">
                  {m(o.cost.totalCents)}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <p className="text-xs text-ink-soft">An estimate from the part&apos;s geometry, corrected by each printer&apos;s finished plates. The price is fixed when the plate prints.</p>
    </div>
  );
}
