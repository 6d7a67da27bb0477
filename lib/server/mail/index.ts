import "server-only";
import { eq } from "drizzle-orm";
import { db } from "@/db";
import { users, workshopSettings } from "@/db/schema";
import type { MessageKind } from "@/db/schema/mail";
import { env } from "@/lib/env";
import { enqueue, type Executor } from "./outbox";
import { preferencesOf, type Preferences } from "./preferences";
import { render, type MessageData } from "./templates";
import { kickOutbox } from "./worker";

export { drainOutbox, listOutbox, retryMessage, BACKOFF_MS, MAX_ATTEMPTS, type Executor, type Tx } from "./outbox";
export { startOutboxWorker, stopOutboxWorker } from "./worker";
export type { MessageData } from "./templates";

/** Which preference switch governs a kind; invitations and resets always go out. */
const optional: Partial<Record<MessageKind, keyof Preferences>> = {
  part_printed: "partPrinted",
  plate_failed: "plateFailed",
  operator_digest: "operatorDigest",
};

export type NotifyResult = { queued: true; id: number } | { queued: false; reason: "opted_out" | "no_recipient" | "not_staff" };

export function appUrl(): string {
  return (env().NEXTAUTH_URL ?? "http://localhost:3000").replace(/\/$/, "");
}

/**
 * Queues one message of `kind` for a person (by userId) or, for invitations, an address. Respects
 * the person's choices, never sends inside the request, and may run inside the caller's transaction
 * (pass `d`), so a message goes out only if the change that caused it was committed.
 */
export async function notify<K extends MessageKind>(kind: K, data: MessageData[K], d: Executor = db()): Promise<NotifyResult> {
  let to: string;
  let recipientName = "";
  let userId: number | null = null;
  if ("userId" in data) {
    const [u] = await d
      .select({ email: users.email, name: users.name, role: users.role, active: users.active })
      .from(users)
      .where(eq(users.id, data.userId))
      .limit(1);
    if (!u || !u.active) return { queued: false, reason: "no_recipient" };
    if (kind === "operator_digest" && u.role === "member") return { queued: false, reason: "not_staff" };
    const pref = optional[kind];
    if (pref && !(await preferencesOf(data.userId, d))[pref]) return { queued: false, reason: "opted_out" };
    to = u.email;
    recipientName = u.name;
    userId = data.userId;
  } else {
    to = (data as MessageData["invitation"]).to;
  }
  const [ws] = await d.select({ name: workshopSettings.name }).from(workshopSettings).limit(1);
  const msg = render(kind, data, { recipientName, workshopName: ws?.name ?? "Platewright", appUrl: appUrl() });
  const id = await enqueue({ kind, userId, to, ...msg }, d);
  kickOutbox();
  return { queued: true, id };
}
