"use client";

import { useMutation, useQuery } from "@tanstack/react-query";
import { Button } from "@/components/ui/button";
import { EmptyState, Notice } from "@/components/ui/notice";
import { fetchJson } from "@/lib/queries/client";
import { myLedgerQuery, type LedgerView } from "@/lib/queries/ledger";
import { formatMoney } from "./money";

const paymentState = { pending: "started, not paid", paid: "✓ paid", expired: "expired" } as const;

export function MemberLedger({ initial }: { initial: LedgerView }) {
  const ledger = useQuery({ ...myLedgerQuery(), initialData: initial });
  const { balance, charges, payments } = ledger.data;
  const pay = useMutation({
    mutationFn: () => fetchJson<{ url: string }>("/api/payments/checkout", { method: "POST" }),
    // Off to the provider's checkout page; it sends the member back to /ledger.
    onSuccess: ({ url }) => window.location.assign(url),
  });
  const owes = balance.balanceCents > 0;
  return (
    <div className="flex flex-col gap-8">
      <section aria-labelledby="balance-h" className="flex flex-wrap items-end justify-between gap-4 rounded-lg border border-rule bg-sheet px-5 py-4">
        <div>
          <h2 id="balance-h" className="text-sm font-medium text-ink-soft">Balance</h2>
          <p className="text-2xl font-semibold tabular-nums" data-testid="balance">
            {formatMoney(balance.balanceCents, balance.currency)}
          </p>
          <p className="text-xs text-ink-soft tabular-nums">
            {formatMoney(balance.chargedCents, balance.currency)} charged · {formatMoney(balance.paidCents, balance.currency)} paid
          </p>
        </div>
        {owes ? (
          <Button onClick={() => pay.mutate()} disabled={pay.isPending || pay.isSuccess}>
            {pay.isPending || pay.isSuccess ? "Opening the checkout…" : `Pay ${formatMoney(balance.balanceCents, balance.currency)}`}
          </Button>
        ) : (
          <span className="text-sm text-ink-soft">✓ Nothing to pay</span>
        )}
      </section>
      {pay.isError ? <Notice tone="fail" title={pay.error.message} /> : null}

      <section aria-labelledby="charges-h">
        <h2 id="charges-h" className="mb-3 text-base font-semibold">Charges</h2>
        {charges.length === 0 ? (
          <EmptyState title="No charges yet.">Each finished plate with your parts adds its share here.</EmptyState>
        ) : (
          <table className="w-full text-sm">
            <thead className="border-b border-rule text-left text-ink-soft">
              <tr>
                <th className="py-2 font-medium">Date</th>
                <th className="py-2 font-medium">What</th>
                <th className="py-2 text-right font-medium">Amount</th>
              </tr>
            </thead>
            <tbody>
              {charges.map((c) => (
                <tr key={c.id} className="border-b border-rule/60">
                  <td className="py-2 tabular-nums">{new Date(c.createdAt).toLocaleDateString()}</td>
                  <td className="py-2">{c.description}</td>
                  <td className="py-2 text-right tabular-nums">{formatMoney(c.amountCents, c.currency)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>

      <section aria-labelledby="payments-h">
        <h2 id="payments-h" className="mb-3 text-base font-semibold">Payments</h2>
        {payments.length === 0 ? (
          <EmptyState title="No payments yet." />
        ) : (
          <table className="w-full text-sm">
            <thead className="border-b border-rule text-left text-ink-soft">
              <tr>
                <th className="py-2 font-medium">Date</th>
                <th className="py-2 font-medium">State</th>
                <th className="py-2 text-right font-medium">Amount</th>
              </tr>
            </thead>
            <tbody>
              {payments.map((p) => (
                <tr key={p.id} className="border-b border-rule/60">
                  <td className="py-2 tabular-nums">{new Date(p.paidAt ?? p.createdAt).toLocaleDateString()}</td>
                  <td className="py-2">{paymentState[p.status]}</td>
                  <td className="py-2 text-right tabular-nums">{formatMoney(p.amountCents, p.currency)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
    </div>
  );
}
