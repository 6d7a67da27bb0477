import { queryOptions } from "@tanstack/react-query";
import { fetchJson } from "./client";
import { queryKeys } from "./keys";

export interface LedgerView {
  balance: { chargedCents: number; paidCents: number; balanceCents: number; currency: string };
  charges: { id: number; plateId: number | null; amountCents: number; currency: string; description: string; createdAt: string }[];
  payments: { id: number; amountCents: number; currency: string; status: "pending" | "paid" | "expired"; createdAt: string; paidAt: string | null }[];
}

export interface BalancesView {
  currency: string;
  rows: { memberId: number; name: string; email: string; chargedCents: number; paidCents: number; balanceCents: number }[];
}

export const myLedgerQuery = () => queryOptions({ queryKey: queryKeys.ledger.mine(), queryFn: () => fetchJson<LedgerView>("/api/ledger") });
export const balancesQuery = () => queryOptions({ queryKey: queryKeys.ledger.balances(), queryFn: () => fetchJson<BalancesView>("/api/ledger/balances") });
