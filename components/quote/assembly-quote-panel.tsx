"use client";

import { useQuery } from "@tanstack/react-query";
import { grams, hmm, money } from "@/components/printers/format";
import { Notice } from "@/components/ui/notice";
import { fetchJson } from "@/lib/queries/client";
import { queryKeys } from "@/lib/queries/keys";

interface AssemblyQuoteDto {
  priced: {
    currency: string;
    lines: { label?: string; quantity: number; materialCents: number; machineCents: number; totalCents: number }[];
    choices: { label?: string; printerName: string; materialName: string; grams: number; minutes: number }[];
    materialCents: number;
    machineCents: number;
    feeCents: number;
    totalCents: number;
  } | null;
  unpriced: { name: string; reason: string }[];
}

/** The whole assembly's price: each part on its cheapest fitting printer × quantity, the fee once. */
export function AssemblyQuotePanel({ assemblyId }: { assemblyId: number }) {
  const q = useQuery({
    queryKey: [...queryKeys.quotes.all, "assembly", assemblyId],
    queryFn: () => fetchJson<AssemblyQuoteDto>(`/api/quotes/assembly/${assemblyId}`),
  });
  return (
    <section className="mt-6 rounded-lg border border-rule bg-sheet p-4" aria-labelledby="assembly-quote" aria-busy={q.isFetching}>
      <h2 id="assembly-quote" className="mb-3 text-lg font-semibold">
        Quote for the whole assembly
      </h2>
      {q.isPending ? (
        <p role="status" className="text-sm text-ink-soft">
          Working out the price…
        </p>
      ) : q.isError ? (
        <Notice tone="fail" title="The quote could not be worked out.">
          {q.error.message}
        </Notice>
      ) : (
        <Body data={q.data} />
      )}
    </section>
  );
}

function Body({ data }: { data: AssemblyQuoteDto }) {
  const p = data.priced;
  return (
    <div className="flex flex-col gap-3">
      {p ? (
        <>
          <div className="overflow-x-auto">
            <table className="w-full text-sm">
              <thead>
                <tr className="text-left text-ink-soft">
                  <th className="py-1 pr-3 font-normal">Part</th>
                  <th className="py-1 pr-3 text-right font-normal">Qty</th>
                  <th className="py-1 pr-3 font-normal">Printer</th>
                  <th className="py-1 pr-3 text-right font-normal">Filament each</th>
                  <th className="py-1 pr-3 text-right font-normal">Time each</th>
                  <th className="py-1 pr-3 text-right font-normal">Material</th>
                  <th className="py-1 pr-3 text-right font-normal">Machine</th>
                  <th className="py-1 text-right font-normal">Line</th>
                </tr>
              </thead>
              <tbody>
                {p.lines.map((l, i) => {
                  const c = p.choices[i];
                  return (
                    <tr key={`${l.label}-${i}`} className="border-t border-rule">
                      <td className="py-2 pr-3">{l.label}</td>
                      <td className="py-2 pr-3 text-right tabular-nums">{l.quantity}</td>
                      <td className="py-2 pr-3">{c ? `${c.printerName} · ${c.materialName}` : ""}</td>
                      <td className="py-2 pr-3 text-right tabular-nums">{c ? grams(c.grams) : ""}</td>
                      <td className="py-2 pr-3 text-right tabular-nums">{c ? hmm(c.minutes) : ""}</td>
                      <td className="py-2 pr-3 text-right tabular-nums">{money(l.materialCents, p.currency)}</td>
                      <td className="py-2 pr-3 text-right tabular-nums">{money(l.machineCents, p.currency)}</td>
                      <td className="py-2 text-right tabular-nums">{money(l.totalCents, p.currency)}</td>
                    </tr>
                  );
                })}
              </tbody>
              <tfoot>
                <tr className="border-t border-rule">
                  <td colSpan={7} className="py-2 pr-3 text-right text-ink-soft">
                    Workshop fee
                  </td>
                  <td className="py-2 text-right tabular-nums">{money(p.feeCents, p.currency)}</td>
                </tr>
                <tr className="border-t border-rule font-medium">
                  <td colSpan={7} className="py-2 pr-3 text-right">
                    Total
                  </td>
                  <td className="py-2 text-right tabular-nums" data-testid="assembly-quote-total">
                    {money(p.totalCents, p.currency)}
                  </td>
                </tr>
              </tfoot>
            </table>
          </div>
          <p className="text-xs text-ink-soft">An estimate; the price is fixed when each plate prints.</p>
        </>
      ) : (
        <p className="text-sm text-ink-soft">Nothing can be priced yet.</p>
      )}
      {data.unpriced.length ? (
        <Notice tone="info" title="Not in the price">
          {data.unpriced.map((u) => `${u.name}: ${u.reason}`).join("; ")}.
        </Notice>
      ) : null}
    </div>
  );
}
