import type { Metadata } from "next";
import { formatMoney } from "@/components/ledger/money";
import { EmptyState } from "@/components/ui/notice";
import { PageHeader } from "@/components/ui/page-header";
import { balances } from "@/lib/server/ledger";
import { requirePageUser } from "@/lib/server/session";

export const metadata: Metadata = { title: "Billing" };
export const dynamic = "force-dynamic";

export default async function BillingPage() {
  const user = await requirePageUser("ledger:admin", "/workshop/billing");
  const { currency, rows } = await balances(user);
  const owed = rows.reduce((s, r) => s + Math.max(0, r.balanceCents), 0);
  return (
    <>
      <PageHeader
        title="Billing"
        lead={`Who owes what. Charges come from finished plates; payments arrive through the checkout. ${formatMoney(owed, currency)} outstanding.`}
        actions={
          <div className="flex gap-3 text-sm">
            <a className="text-accent underline" href="/api/ledger/export?kind=charges" download>
              Export charges (CSV)
            </a>
            <a className="text-accent underline" href="/api/ledger/export?kind=payments" download>
              Export payments (CSV)
            </a>
          </div>
        }
      />
      {rows.length === 0 ? (
        <EmptyState title="No charges or payments yet." />
      ) : (
        <table className="w-full text-sm">
          <thead className="border-b border-rule text-left text-ink-soft">
            <tr>
              <th className="py-2 font-medium">Member</th>
              <th className="py-2 text-right font-medium">Charged</th>
              <th className="py-2 text-right font-medium">Paid</th>
              <th className="py-2 text-right font-medium">Balance</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.memberId} className="border-b border-rule/60" data-testid={`balance-${r.email}`}>
                <td className="py-2">
                  {r.name} <span className="text-ink-soft">{r.email}</span>
                </td>
                <td className="py-2 text-right tabular-nums">{formatMoney(r.chargedCents, currency)}</td>
                <td className="py-2 text-right tabular-nums">{formatMoney(r.paidCents, currency)}</td>
                <td className={`py-2 text-right font-medium tabular-nums ${r.balanceCents > 0 ? "text-ink" : "text-ink-soft"}`}>{formatMoney(r.balanceCents, currency)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </>
  );
}
