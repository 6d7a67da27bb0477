import "server-only";
import { and, desc, eq, sql } from "drizzle-orm";
import { db } from "@/db";
import { charges, payments, users, workshopSettings } from "@/db/schema";
import { can } from "@/lib/permissions";
import { AppError } from "./errors";
import type { Executor } from "./mail/outbox";
import type { SessionUser } from "./session";

export interface ChargeInput {
  memberId: number;
  plateId?: number | null;
  amountCents: number;
  description: string;
  /** The same key twice records one charge, e.g. `plate:<id>:member:<id>`. */
  idempotencyKey: string;
  currency?: string;
}

export async function workshopCurrency(d: Executor = db()): Promise<string> {
  const [ws] = await d.select({ currency: workshopSettings.currency }).from(workshopSettings).limit(1);
  return ws?.currency ?? "EUR";
}

/**
 * Records what a member owes, once per idempotency key; callable inside the caller's transaction
 * (a plate's finish). Returns the charge id and whether this call created it.
 */
export async function addCharge(d: Executor, input: ChargeInput): Promise<{ id: number; created: boolean }> {
  if (!Number.isInteger(input.amountCents) || input.amountCents < 0) throw new AppError("invalid", "A charge is a whole, non-negative number of cents.");
  const currency = (input.currency ?? (await workshopCurrency(d))).toUpperCase();
  const [res] = await d
    .insert(charges)
    .ignore()
    .values({
      memberId: input.memberId,
      plateId: input.plateId ?? null,
      amountCents: input.amountCents,
      currency,
      description: input.description.slice(0, 200),
      idempotencyKey: input.idempotencyKey,
    });
  const [row] = await d.select({ id: charges.id }).from(charges).where(eq(charges.idempotencyKey, input.idempotencyKey)).limit(1);
  if (!row) throw new Error("charge vanished after insert");
  return { id: row.id, created: res.affectedRows === 1 };
}

export interface Balance {
  chargedCents: number;
  paidCents: number;
  balanceCents: number;
  currency: string;
}

/** Charges less payments received, in the smallest currency unit. Pending checkouts do not count. */
export async function memberBalance(memberId: number, d: Executor = db()): Promise<Balance> {
  const [c] = await d.select({ total: sql<string | null>`SUM(${charges.amountCents})` }).from(charges).where(eq(charges.memberId, memberId));
  const [p] = await d
    .select({ total: sql<string | null>`SUM(${payments.amountCents})` })
    .from(payments)
    .where(and(eq(payments.memberId, memberId), eq(payments.status, "paid")));
  const chargedCents = Number(c?.total ?? 0);
  const paidCents = Number(p?.total ?? 0);
  return { chargedCents, paidCents, balanceCents: chargedCents - paidCents, currency: await workshopCurrency(d) };
}

export interface ChargeRow {
  id: number;
  plateId: number | null;
  amountCents: number;
  currency: string;
  description: string;
  createdAt: Date;
}

export interface PaymentRow {
  id: number;
  amountCents: number;
  currency: string;
  status: "pending" | "paid" | "expired";
  createdAt: Date;
  paidAt: Date | null;
}

/** The signed-in member's own ledger. */
export async function myLedger(user: SessionUser): Promise<{ balance: Balance; charges: ChargeRow[]; payments: PaymentRow[] }> {
  if (!can(user.role, "ledger:own")) throw new AppError("forbidden", "The Ledger is for members.");
  const [balance, chargeRows, paymentRows] = await Promise.all([
    memberBalance(user.id),
    db()
      .select({ id: charges.id, plateId: charges.plateId, amountCents: charges.amountCents, currency: charges.currency, description: charges.description, createdAt: charges.createdAt })
      .from(charges)
      .where(eq(charges.memberId, user.id))
      .orderBy(desc(charges.createdAt), desc(charges.id)),
    db()
      .select({ id: payments.id, amountCents: payments.amountCents, currency: payments.currency, status: payments.status, createdAt: payments.createdAt, paidAt: payments.paidAt })
      .from(payments)
      .where(eq(payments.memberId, user.id))
      .orderBy(desc(payments.createdAt), desc(payments.id)),
  ]);
  return { balance, charges: chargeRows, payments: paymentRows };
}

export interface MemberBalanceRow {
  memberId: number;
  name: string;
  email: string;
  chargedCents: number;
  paidCents: number;
  balanceCents: number;
}

/** Who owes what (admins): every member with any charge or payment, largest balance first. */
export async function balances(user: SessionUser): Promise<{ currency: string; rows: MemberBalanceRow[] }> {
  if (!can(user.role, "ledger:admin")) throw new AppError("forbidden", "Only an admin sees everyone's balance.");
  const charged = db()
    .select({ memberId: charges.memberId, total: sql<string>`SUM(${charges.amountCents})`.as("charged") })
    .from(charges)
    .groupBy(charges.memberId)
    .as("c");
  const paid = db()
    .select({ memberId: payments.memberId, total: sql<string>`SUM(${payments.amountCents})`.as("paid") })
    .from(payments)
    .where(eq(payments.status, "paid"))
    .groupBy(payments.memberId)
    .as("p");
  const rows = await db()
    .select({ memberId: users.id, name: users.name, email: users.email, charged: charged.total, paid: paid.total })
    .from(users)
    .leftJoin(charged, eq(charged.memberId, users.id))
    .leftJoin(paid, eq(paid.memberId, users.id))
    .where(sql`${charged.total} IS NOT NULL OR ${paid.total} IS NOT NULL`);
  const out = rows.map((r) => {
    const chargedCents = Number(r.charged ?? 0);
    const paidCents = Number(r.paid ?? 0);
    return { memberId: r.memberId, name: r.name, email: r.email, chargedCents, paidCents, balanceCents: chargedCents - paidCents };
  });
  out.sort((a, b) => b.balanceCents - a.balanceCents || a.name.localeCompare(b.name));
  return { currency: await workshopCurrency(), rows: out };
}

/**
 * One CSV field per RFC 4180 §2: quoted when it holds a comma, quote or line break, quotes doubled.
 * Text that a spreadsheet would run as a formula (= + - @ at the start) gets a leading apostrophe
 * (common practice against CSV formula injection, no normative source).
 */
export function csvField(v: string | number | null): string {
  if (v === null) return "";
  let s = String(v);
  if (typeof v === "string" && /^[=+\-@\t\r]/.test(s)) s = `'${s}`;
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

export function toCsv(header: string[], rows: (string | number | null)[][]): string {
  // RFC 4180 §2: records end with CRLF.
  return [header, ...rows].map((r) => r.map(csvField).join(",")).join("\r\n") + "\r\n";
}

/** Every charge or every payment as CSV, amounts in the smallest currency unit (admins). */
export async function exportCsv(user: SessionUser, kind: "charges" | "payments"): Promise<string> {
  if (!can(user.role, "ledger:admin")) throw new AppError("forbidden", "Only an admin exports the ledger.");
  if (kind === "charges") {
    const rows = await db()
      .select({ id: charges.id, at: charges.createdAt, email: users.email, name: users.name, plateId: charges.plateId, amount: charges.amountCents, currency: charges.currency, description: charges.description })
      .from(charges)
      .innerJoin(users, eq(users.id, charges.memberId))
      .orderBy(charges.id);
    return toCsv(
      ["charge_id", "created_at", "member_email", "member_name", "plate_id", "amount_minor_units", "currency", "description"],
      rows.map((r) => [r.id, r.at.toISOString(), r.email, r.name, r.plateId, r.amount, r.currency, r.description]),
    );
  }
  const rows = await db()
    .select({ id: payments.id, at: payments.createdAt, paidAt: payments.paidAt, email: users.email, name: users.name, amount: payments.amountCents, currency: payments.currency, status: payments.status, session: payments.providerSessionId })
    .from(payments)
    .innerJoin(users, eq(users.id, payments.memberId))
    .orderBy(payments.id);
  return toCsv(
    ["payment_id", "created_at", "paid_at", "member_email", "member_name", "amount_minor_units", "currency", "status", "provider_session_id"],
    rows.map((r) => [r.id, r.at.toISOString(), r.paidAt ? r.paidAt.toISOString() : null, r.email, r.name, r.amount, r.currency, r.status, r.session]),
  );
}
