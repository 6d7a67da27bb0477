import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { EmptyState } from "@/components/ui/notice";
import { PageHeader } from "@/components/ui/page-header";
import { listOutbox } from "@/lib/server/mail";
import { listMailbox, mailboxEnabled } from "@/lib/server/mail/mailbox";
import { requirePageUser } from "@/lib/server/session";
import { MailboxActions, RetryButton } from "./mailbox-client";

export const metadata: Metadata = { title: "Test mailbox" };
export const dynamic = "force-dynamic";

const stateLabel = { pending: "waiting", sending: "sending", sent: "✓ sent", failed: "✕ failed" } as const;

export default async function MailboxPage() {
  // Exists only while mail goes to the local fake: with a real mail server there is nothing to read.
  if (!mailboxEnabled()) notFound();
  const user = await requirePageUser("mail:admin", "/workshop/mailbox");
  const [messages, outbox] = await Promise.all([listMailbox(user, { limit: 50 }), listOutbox(user, 30)]);
  return (
    <>
      <PageHeader
        title="Test mailbox"
        lead="Every message the app sent to the local fake mail server (MAIL_MODE=fake). Nothing here left this machine."
        actions={<MailboxActions />}
      />
      <section aria-labelledby="outbox-h" className="mb-8">
        <h2 id="outbox-h" className="mb-3 text-base font-semibold">Outbox</h2>
        {outbox.length === 0 ? (
          <EmptyState title="Nothing has been queued yet." />
        ) : (
          <table className="w-full text-sm">
            <thead className="border-b border-rule text-left text-ink-soft">
              <tr>
                <th className="py-2 font-medium">To</th>
                <th className="py-2 font-medium">Subject</th>
                <th className="py-2 font-medium">State</th>
                <th className="py-2 text-right font-medium">Tries</th>
                <th className="py-2" />
              </tr>
            </thead>
            <tbody>
              {outbox.map((m) => (
                <tr key={m.id} className="border-b border-rule/60 align-top">
                  <td className="py-2">{m.toAddress}</td>
                  <td className="py-2">{m.subject}</td>
                  <td className={`py-2 ${m.status === "failed" ? "text-fail" : ""}`}>
                    {stateLabel[m.status]}
                    {m.status === "pending" && m.attempts > 0 ? <span className="block text-xs text-ink-soft">next try {m.nextAttemptAt.toLocaleString()}</span> : null}
                    {m.lastError && m.status !== "sent" ? <span className="block text-xs text-ink-soft">{m.lastError}</span> : null}
                  </td>
                  <td className="py-2 text-right tabular-nums">{m.attempts}</td>
                  <td className="py-2 text-right">{m.status === "failed" ? <RetryButton id={m.id} /> : null}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
      <section aria-labelledby="inbox-h">
        <h2 id="inbox-h" className="mb-3 text-base font-semibold">Received by the fake server</h2>
        {messages.length === 0 ? (
          <EmptyState title="The mailbox is empty.">Invite someone from People, or ask for a password reset, and the message appears here.</EmptyState>
        ) : (
          <ul className="flex flex-col gap-3">
            {messages.map((m) => (
              <li key={m.id} className="rounded-md border border-rule bg-sheet" data-testid="mailbox-message">
                <details>
                  <summary className="cursor-pointer px-4 py-3 text-sm">
                    <span className="font-medium">{m.subject}</span>
                    <span className="ml-2 text-ink-soft">to {m.to.join(", ")} · {new Date(m.receivedAt).toLocaleString()}</span>
                  </summary>
                  <pre className="overflow-x-auto whitespace-pre-wrap border-t border-rule px-4 py-3 text-xs">{m.text}</pre>
                </details>
              </li>
            ))}
          </ul>
        )}
      </section>
    </>
  );
}
