// The outbox against a real fake SMTP server (smtp-server) and a real MariaDB: messages wait while
// the mail server is down and go out when it is back; a message's words arrive intact; choices hold.
// Sources: the SMTP exchange and MIME parsing are done by general-purpose libraries (smtp-server,
// mailparser) acting as the receiving side, per RFC 5321/5322; back-off rules are common practice.
import { mkdtemp, rm } from "node:fs/promises";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import path from "node:path";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db";
import { mailOutbox, users } from "@/db/schema";
import { BACKOFF_MS, drainOutbox, MAX_ATTEMPTS, notify } from "@/lib/server/mail";
import { readFakeMailbox } from "@/lib/server/mail/mailbox";
import { updateMyPreferences } from "@/lib/server/mail/preferences";
import { startSmtpFake, type SmtpFake } from "../../scripts/fakes/smtp";

async function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const s = createServer().listen(0, "127.0.0.1", () => {
      const a = s.address();
      s.close(() => resolve(typeof a === "object" && a ? a.port : 0));
    });
  });
}

const dir = await mkdtemp(path.join(tmpdir(), "pw-mailbox-"));
const port = await freePort();
// Read lazily by lib/env on first use, so setting them here points the app code at this test's fake.
process.env.MAIL_MODE = "fake";
process.env.SMTP_PORT = String(port);
process.env.MAILBOX_DIR = dir;

let smtp: SmtpFake | null = null;
let member: { id: number; email: string; name: string; role: "member" };

async function outboxRow(id: number) {
  const [r] = await db().select({ status: mailOutbox.status, attempts: mailOutbox.attempts, nextAttemptAt: mailOutbox.nextAttemptAt, lastError: mailOutbox.lastError }).from(mailOutbox).where(eq(mailOutbox.id, id));
  if (!r) throw new Error(`no outbox row ${id}`);
  return r;
}

beforeAll(async () => {
  const email = `outbox-${Date.now()}@kettlelane.example`;
  const [row] = await db().insert(users).values({ email, name: "Ada Outbox", passwordHash: "x", role: "member" }).$returningId();
  member = { id: row!.id, email, name: "Ada Outbox", role: "member" };
});

afterAll(async () => {
  await smtp?.close();
  await closeDb();
  await rm(dir, { recursive: true, force: true });
});

describe("outbox", () => {
  it("keeps messages while the SMTP server is down and sends them when it is back", async () => {
    const q = await notify("part_printed", { userId: member.id, partName: "Hinge bracket", assemblyName: "Tide clock" });
    expect(q.queued).toBe(true);
    const id = q.queued ? q.id : 0;

    // Server down: nothing is lost, the row waits with the first back-off.
    const t0 = new Date();
    // Other files' messages may share this database, so count at least ours.
    const down = await drainOutbox({ now: t0 });
    expect(down.sent).toBe(0);
    expect(down.retrying).toBeGreaterThanOrEqual(1);
    const waiting = await outboxRow(id);
    expect(waiting.status).toBe("pending");
    expect(waiting.attempts).toBe(1);
    expect(waiting.lastError).toMatch(/ECONNREFUSED|connect/i);
    expect(waiting.nextAttemptAt.getTime() - t0.getTime()).toBeGreaterThanOrEqual(BACKOFF_MS[0] - 5);

    // Not due yet: a drain right away leaves it alone even with the server up.
    smtp = await startSmtpFake({ port, mailboxDir: dir });
    expect((await drainOutbox({ now: new Date(t0.getTime() + 1000) })).sent).toBe(0);

    // After the back-off it goes out, and the fake holds it (parsed by mailparser).
    const later = new Date(t0.getTime() + BACKOFF_MS[0] + 1000);
    expect((await drainOutbox({ now: later })).sent).toBeGreaterThanOrEqual(1);
    expect((await outboxRow(id)).status).toBe("sent");
    const inbox = await readFakeMailbox({ to: member.email });
    expect(inbox).toHaveLength(1);
    expect(inbox[0]?.subject).toBe("Printed and ready to collect: Hinge bracket");
    expect(inbox[0]?.text).toContain("Hinge bracket (Tide clock) has been printed");
    expect(inbox[0]?.html).toContain("<strong>Hinge bracket (Tide clock)</strong>");
    // A second drain sends nothing twice.
    expect((await drainOutbox({ now: later })).sent).toBe(0);
    expect(await readFakeMailbox({ to: member.email })).toHaveLength(1);
  });

  it("gives up after the last attempt and marks the message failed", async () => {
    await smtp?.close();
    smtp = null;
    const q = await notify("plate_failed", { userId: member.id, plateLabel: "Plate 14", partNames: ["Gear A", "Gear B"], reason: "lifted corner" });
    const id = q.queued ? q.id : 0;
    let now = new Date();
    for (let i = 0; i < MAX_ATTEMPTS; i++) {
      await drainOutbox({ now });
      now = new Date(now.getTime() + 7 * 3_600_000);
    }
    const r = await outboxRow(id);
    expect(r.status).toBe("failed");
    expect(r.attempts).toBe(MAX_ATTEMPTS);
  });

  it("escapes what people typed in the HTML part", async () => {
    smtp = await startSmtpFake({ port, mailboxDir: dir });
    const q = await notify("part_printed", { userId: member.id, partName: '<img src=x onerror="alert(1)">' });
    expect(q.queued).toBe(true);
    await drainOutbox({ now: new Date(Date.now() + 1000) });
    const [m] = await readFakeMailbox({ to: member.email });
    expect(m?.html).not.toContain("<img");
    expect(m?.html).toContain("&lt;img");
  });

  it("respects a member's choice not to get a kind of message", async () => {
    await updateMyPreferences(member, { partPrinted: false, plateFailed: true, operatorDigest: false });
    expect(await notify("part_printed", { userId: member.id, partName: "Lid" })).toEqual({ queued: false, reason: "opted_out" });
    expect((await notify("plate_failed", { userId: member.id, plateLabel: "Plate 2", partNames: ["Lid"] })).queued).toBe(true);
    // The digest is for staff only, whatever the switch says.
    await updateMyPreferences(member, { partPrinted: true, plateFailed: true, operatorDigest: true });
    expect(await notify("operator_digest", { userId: member.id, periodLabel: "Week 48", lines: [] })).toEqual({ queued: false, reason: "not_staff" });
  });
});
