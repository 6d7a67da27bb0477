import { boolean, datetime, index, int, mediumtext, mysqlEnum, mysqlTable, text, varchar } from "drizzle-orm/mysql-core";
import { sql } from "drizzle-orm";
import { users } from "./users";

export const messageKinds = ["invitation", "password_reset", "part_printed", "plate_failed", "operator_digest"] as const;
export type MessageKind = (typeof messageKinds)[number];

export const outboxStatuses = ["pending", "sending", "sent", "failed"] as const;
export type OutboxStatus = (typeof outboxStatuses)[number];

/**
 * Messages waiting to go out. Requests only insert here; a worker in the server process claims due
 * rows, sends them and backs off on failure, so a mail server that is down loses nothing.
 */
export const mailOutbox = mysqlTable(
  "mail_outbox",
  {
    id: int("id").autoincrement().primaryKey(),
    kind: mysqlEnum("kind", messageKinds).notNull(),
    userId: int("user_id").references(() => users.id, { onDelete: "set null" }),
    toAddress: varchar("to_address", { length: 254 }).notNull(),
    subject: varchar("subject", { length: 250 }).notNull(),
    textBody: text("text_body").notNull(),
    htmlBody: mediumtext("html_body").notNull(),
    status: mysqlEnum("status", outboxStatuses).notNull().default("pending"),
    attempts: int("attempts").notNull().default(0),
    nextAttemptAt: datetime("next_attempt_at", { mode: "date", fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
    /** Set while a worker holds the row; a claim that outlives its time is taken over. */
    claimToken: varchar("claim_token", { length: 40 }),
    claimedUntil: datetime("claimed_until", { mode: "date", fsp: 3 }),
    lastError: varchar("last_error", { length: 500 }),
    createdAt: datetime("created_at", { mode: "date", fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
    sentAt: datetime("sent_at", { mode: "date", fsp: 3 }),
  },
  (t) => [index("mail_outbox_due_idx").on(t.status, t.nextAttemptAt), index("mail_outbox_claim_idx").on(t.claimToken)],
);

/** Which optional messages a person wants. No row means the defaults. */
export const mailPreferences = mysqlTable("mail_preferences", {
  userId: int("user_id")
    .primaryKey()
    .references(() => users.id, { onDelete: "cascade" }),
  partPrinted: boolean("part_printed").notNull().default(true),
  plateFailed: boolean("plate_failed").notNull().default(true),
  operatorDigest: boolean("operator_digest").notNull().default(false),
  updatedAt: datetime("updated_at", { mode: "date", fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
});

/** An admin's invitation to join as a member. Only the SHA-256 of the token is kept. */
export const invitations = mysqlTable(
  "invitations",
  {
    id: int("id").autoincrement().primaryKey(),
    email: varchar("email", { length: 254 }).notNull(),
    tokenHash: varchar("token_hash", { length: 64 }).notNull().unique(),
    invitedBy: int("invited_by").references(() => users.id, { onDelete: "set null" }),
    expiresAt: datetime("expires_at", { mode: "date", fsp: 3 }).notNull(),
    usedAt: datetime("used_at", { mode: "date", fsp: 3 }),
    userId: int("user_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: datetime("created_at", { mode: "date", fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
  },
  (t) => [index("invitations_email_idx").on(t.email)],
);

/** A password-reset link; single use, short-lived, stored as a SHA-256 hash. */
export const passwordResets = mysqlTable("password_resets", {
  id: int("id").autoincrement().primaryKey(),
  userId: int("user_id")
    .notNull()
    .references(() => users.id, { onDelete: "cascade" }),
  tokenHash: varchar("token_hash", { length: 64 }).notNull().unique(),
  expiresAt: datetime("expires_at", { mode: "date", fsp: 3 }).notNull(),
  usedAt: datetime("used_at", { mode: "date", fsp: 3 }),
  createdAt: datetime("created_at", { mode: "date", fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
});
