import { datetime, index, int, mysqlEnum, mysqlTable, varchar } from "drizzle-orm/mysql-core";
import { sql } from "drizzle-orm";
import { users } from "./users";

/**
 * What a member owes: one row per finished plate's share (or any other fee). Amounts are integers
 * in the currency's smallest unit. The idempotency key makes "charge this plate" safe to repeat.
 * plate_id has no foreign key yet: the plates table arrives later.
 */
export const charges = mysqlTable(
  "charges",
  {
    id: int("id").autoincrement().primaryKey(),
    memberId: int("member_id")
      .notNull()
      .references(() => users.id),
    plateId: int("plate_id"),
    amountCents: int("amount_cents").notNull(),
    currency: varchar("currency", { length: 3 }).notNull(),
    description: varchar("description", { length: 200 }).notNull(),
    idempotencyKey: varchar("idempotency_key", { length: 120 }).notNull().unique(),
    createdAt: datetime("created_at", { mode: "date", fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
  },
  (t) => [index("charges_member_idx").on(t.memberId), index("charges_plate_idx").on(t.plateId)],
);

export const paymentStatuses = ["pending", "paid", "expired"] as const;
export type PaymentStatus = (typeof paymentStatuses)[number];

/**
 * Money received through the payment provider. A row starts pending when the checkout session is
 * made; the signed webhook (or the member's return) marks it paid. Session and event ids are unique,
 * so a replayed event finds the row already paid and changes nothing.
 */
export const payments = mysqlTable(
  "payments",
  {
    id: int("id").autoincrement().primaryKey(),
    memberId: int("member_id")
      .notNull()
      .references(() => users.id),
    amountCents: int("amount_cents").notNull(),
    currency: varchar("currency", { length: 3 }).notNull(),
    providerSessionId: varchar("provider_session_id", { length: 255 }).notNull().unique(),
    providerEventId: varchar("provider_event_id", { length: 255 }).unique(),
    status: mysqlEnum("status", paymentStatuses).notNull().default("pending"),
    createdAt: datetime("created_at", { mode: "date", fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
    paidAt: datetime("paid_at", { mode: "date", fsp: 3 }),
  },
  (t) => [index("payments_member_idx").on(t.memberId, t.status)],
);
