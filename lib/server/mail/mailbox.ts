import "server-only";
import { readFile } from "node:fs/promises";
import path from "node:path";
import { env } from "@/lib/env";
import { can } from "@/lib/permissions";
import { AppError } from "../errors";
import type { SessionUser } from "../session";

export interface MailboxMessage {
  id: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string;
  receivedAt: string;
}

/** The mailbox page exists only while mail goes to the local fake. */
export function mailboxEnabled(): boolean {
  return env().MAIL_MODE === "fake";
}

/** Messages the fake SMTP server received, newest first. Lines that do not parse are skipped. */
export async function readFakeMailbox(opts: { to?: string; limit?: number } = {}): Promise<MailboxMessage[]> {
  const file = path.join(env().MAILBOX_DIR, "messages.jsonl");
  const raw = await readFile(file, "utf8").catch((e: NodeJS.ErrnoException) => {
    if (e.code === "ENOENT") return "";
    throw e;
  });
  const out: MailboxMessage[] = [];
  for (const line of raw.split("\n")) {
    if (!line.trim()) continue;
    try {
      const m = JSON.parse(line) as MailboxMessage;
      if (opts.to && !m.to.some((t) => t.toLowerCase() === opts.to?.toLowerCase())) continue;
      out.push(m);
    } catch {
      // A half-written last line while the fake appends: ignore it this time.
    }
  }
  out.reverse();
  return out.slice(0, opts.limit ?? 200);
}

export async function listMailbox(user: SessionUser, opts: { to?: string; limit?: number } = {}): Promise<MailboxMessage[]> {
  if (!mailboxEnabled()) throw new AppError("not_found", "The mailbox exists only when MAIL_MODE is fake.");
  if (!can(user.role, "mail:admin")) throw new AppError("forbidden", "Only an admin reads the test mailbox.");
  return readFakeMailbox(opts);
}
