import "server-only";
import { randomUUID } from "node:crypto";
import { desc, eq, sql } from "drizzle-orm";
import { db, type Db } from "@/db";
import { mailOutbox, type MessageKind, type OutboxStatus } from "@/db/schema/mail";
import { env } from "@/lib/env";
import { can } from "@/lib/permissions";
import { AppError } from "../errors";
import type { SessionUser } from "../session";
import { mailTransport } from "./transport";

export type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];
export type Executor = Db | Tx;

/** Waits after the 1st, 2nd, … failed attempt; after the last one the message is marked failed. */
export const BACKOFF_MS = [60_000, 5 * 60_000, 30 * 60_000, 2 * 3_600_000, 6 * 3_600_000] as const;
export const MAX_ATTEMPTS = BACKOFF_MS.length + 1;
const CLAIM_MS = 2 * 60_000;

export interface OutgoingMessage {
  kind: MessageKind;
  userId: number | null;
  to: string;
  subject: string;
  text: string;
  html: string;
}

/** Queues a message; nothing is sent inside the caller's request. */
export async function enqueue(msg: OutgoingMessage, d: Executor = db()): Promise<number> {
  const [row] = await d
    .insert(mailOutbox)
    .values({ kind: msg.kind, userId: msg.userId, toAddress: msg.to, subject: msg.subject.slice(0, 250), textBody: msg.text, htmlBody: msg.html })
    .$returningId();
  if (!row) throw new Error("outbox insert returned no id");
  return row.id;
}

export interface DrainResult {
  sent: number;
  retrying: number;
  failed: number;
}

/**
 * Claims due messages with one atomic UPDATE (so two workers never take the same row), sends them,
 * and reschedules failures with back-off. `now` lets tests step over the waiting time.
 */
export async function drainOutbox(opts: { now?: Date; limit?: number } = {}): Promise<DrainResult> {
  const now = opts.now ?? new Date();
  const token = randomUUID();
  const limit = opts.limit ?? 25;
  await db().execute(sql`
    UPDATE ${mailOutbox}
    SET status = 'sending', claim_token = ${token}, claimed_until = ${new Date(now.getTime() + CLAIM_MS)}
    WHERE (status = 'pending' AND next_attempt_at <= ${now}) OR (status = 'sending' AND claimed_until < ${now})
    ORDER BY id
    LIMIT ${limit}`);
  const rows = await db()
    .select({ id: mailOutbox.id, to: mailOutbox.toAddress, subject: mailOutbox.subject, text: mailOutbox.textBody, html: mailOutbox.htmlBody, attempts: mailOutbox.attempts })
    .from(mailOutbox)
    .where(eq(mailOutbox.claimToken, token))
    .orderBy(mailOutbox.id);
  const result: DrainResult = { sent: 0, retrying: 0, failed: 0 };
  if (!rows.length) return result;
  const transport = mailTransport();
  const from = env().MAIL_FROM;
  for (const r of rows) {
    const attempts = r.attempts + 1;
    try {
      await transport.sendMail({ from, to: r.to, subject: r.subject, text: r.text, html: r.html });
      await db()
        .update(mailOutbox)
        .set({ status: "sent", attempts, sentAt: new Date(), claimToken: null, claimedUntil: null, lastError: null })
        .where(eq(mailOutbox.id, r.id));
      result.sent++;
    } catch (e) {
      const message = (e instanceof Error ? e.message : String(e)).slice(0, 500);
      const giveUp = attempts >= MAX_ATTEMPTS;
      const wait = BACKOFF_MS[Math.min(attempts - 1, BACKOFF_MS.length - 1)] ?? 0;
      await db()
        .update(mailOutbox)
        .set({
          status: giveUp ? "failed" : "pending",
          attempts,
          nextAttemptAt: new Date(now.getTime() + wait),
          claimToken: null,
          claimedUntil: null,
          lastError: message,
        })
        .where(eq(mailOutbox.id, r.id));
      if (giveUp) result.failed++;
      else result.retrying++;
    }
  }
  return result;
}

export interface OutboxRow {
  id: number;
  kind: MessageKind;
  toAddress: string;
  subject: string;
  status: OutboxStatus;
  attempts: number;
  nextAttemptAt: Date;
  lastError: string | null;
  createdAt: Date;
  sentAt: Date | null;
}

/** The newest messages in the outbox, with their delivery state (admins). */
export async function listOutbox(user: SessionUser, limit = 50): Promise<OutboxRow[]> {
  if (!can(user.role, "mail:admin")) throw new AppError("forbidden", "Only an admin sees the outbox.");
  return db()
    .select({
      id: mailOutbox.id,
      kind: mailOutbox.kind,
      toAddress: mailOutbox.toAddress,
      subject: mailOutbox.subject,
      status: mailOutbox.status,
      attempts: mailOutbox.attempts,
      nextAttemptAt: mailOutbox.nextAttemptAt,
      lastError: mailOutbox.lastError,
      createdAt: mailOutbox.createdAt,
      sentAt: mailOutbox.sentAt,
    })
    .from(mailOutbox)
    .orderBy(desc(mailOutbox.id))
    .limit(limit);
}

/** Puts a failed message back in line for one more round of attempts (admins). */
export async function retryMessage(user: SessionUser, id: number): Promise<void> {
  if (!can(user.role, "mail:admin")) throw new AppError("forbidden", "Only an admin retries messages.");
  const [res] = await db()
    .update(mailOutbox)
    .set({ status: "pending", attempts: 0, nextAttemptAt: new Date(), lastError: null })
    .where(sql`${mailOutbox.id} = ${id} AND ${mailOutbox.status} = 'failed'`);
  if (res.affectedRows === 0) throw new AppError("not_found", "No failed message with that number.");
}
