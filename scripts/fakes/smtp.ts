// A fake SMTP server for development and tests: accepts every message on loopback, parses it and
// appends it to a JSON-lines file that the admin mailbox page reads. Never relays anything.
import { appendFile, mkdir } from "node:fs/promises";
import path from "node:path";
import { simpleParser, type AddressObject } from "mailparser";
import { SMTPServer } from "smtp-server";

export interface StoredMessage {
  id: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string;
  receivedAt: string;
}

export interface SmtpFake {
  port: number;
  close(): Promise<void>;
}

function addresses(a: AddressObject | AddressObject[] | undefined): string[] {
  const list = Array.isArray(a) ? a : a ? [a] : [];
  return list.flatMap((o) => o.value.map((v) => v.address ?? "")).filter(Boolean);
}

export function mailboxFile(dir: string): string {
  return path.join(dir, "messages.jsonl");
}

export async function startSmtpFake(opts: { port: number; mailboxDir: string; host?: string }): Promise<SmtpFake> {
  const file = mailboxFile(opts.mailboxDir);
  await mkdir(opts.mailboxDir, { recursive: true });
  let seq = 0;
  const server = new SMTPServer({
    authOptional: true,
    // Plain SMTP on loopback: no certificates to manage in a fake.
    disabledCommands: ["STARTTLS"],
    logger: false,
    banner: "Platewright fake SMTP",
    onData(stream, session, callback) {
      simpleParser(stream)
        .then(async (parsed) => {
          const envelopeTo = session.envelope.rcptTo.map((r) => r.address);
          const msg: StoredMessage = {
            id: `${Date.now().toString(36)}-${(seq++).toString(36)}`,
            from: addresses(parsed.from)[0] ?? (session.envelope.mailFrom ? session.envelope.mailFrom.address : ""),
            to: envelopeTo.length ? envelopeTo : addresses(parsed.to),
            subject: parsed.subject ?? "",
            text: parsed.text ?? "",
            html: typeof parsed.html === "string" ? parsed.html : "",
            receivedAt: new Date().toISOString(),
          };
          await appendFile(file, JSON.stringify(msg) + "\n", "utf8");
          callback();
        })
        .catch((e: unknown) => callback(e instanceof Error ? e : new Error(String(e))));
    },
  });
  const host = opts.host ?? "127.0.0.1";
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(opts.port, host, () => resolve());
  });
  const addr = server.server.address();
  const port = typeof addr === "object" && addr ? addr.port : opts.port;
  return {
    port,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
