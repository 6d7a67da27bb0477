import type { Metadata } from "next";
import { MemberLedger } from "@/components/ledger/member-ledger";
import { Notice } from "@/components/ui/notice";
import { PageHeader } from "@/components/ui/page-header";
import { myLedger } from "@/lib/server/ledger";
import { reconcileReturn } from "@/lib/server/payments";
import { requirePageUser } from "@/lib/server/session";
import { checkoutReturn } from "@/lib/validation/ledger";

export const metadata: Metadata = { title: "Ledger" };
export const dynamic = "force-dynamic";

export default async function LedgerPage({ searchParams }: { searchParams: Promise<{ checkout?: string }> }) {
  const user = await requirePageUser("ledger:own", "/ledger");
  const back = checkoutReturn.safeParse((await searchParams).checkout);
  // Coming back from the checkout: ask the provider, so the balance is right even if the webhook is late.
  const returned = back.success ? (back.data === "cancelled" ? "cancelled" : await reconcileReturn(user, back.data)) : null;
  const ledger = await myLedger(user);
  const initial = {
    balance: ledger.balance,
    charges: ledger.charges.map((c) => ({ ...c, createdAt: c.createdAt.toISOString() })),
    payments: ledger.payments.map((p) => ({ ...p, createdAt: p.createdAt.toISOString(), paidAt: p.paidAt ? p.paidAt.toISOString() : null })),
  };
  return (
    <>
      <PageHeader title="Ledger" lead="What your finished plates cost, what you have paid, and what is left." />
      <div className="mb-6 empty:hidden">
        {returned === "paid" ? <Notice tone="ok" title="Payment received. Thank you." /> : null}
        {returned === "open" ? <Notice tone="info" title="Your payment is not confirmed yet.">If you paid, it shows here within a minute.</Notice> : null}
        {returned === "cancelled" ? <Notice tone="info" title="Checkout cancelled. Nothing was charged." /> : null}
      </div>
      <MemberLedger initial={initial} />
    </>
  );
}
