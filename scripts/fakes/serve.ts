// Runs the local fakes: SMTP on SMTP_PORT and the payment API on PAYMENTS_FAKE_PORT, on 127.0.0.1
// only. Started by scripts/fakes.sh (npm start, npm test); stops on SIGTERM/SIGINT.
import { startPaymentsFake } from "./payments";
import { startSmtpFake } from "./smtp";

const smtpPort = Number(process.env.SMTP_PORT ?? 2525);
const payPort = Number(process.env.PAYMENTS_FAKE_PORT ?? 4242);
const mailboxDir = process.env.MAILBOX_DIR ?? ".data/mailbox";
const appUrl = process.env.NEXTAUTH_URL ?? "http://127.0.0.1:3000";
// Default target; the app names its own webhook URL in each session's metadata, so an app on another
// port (the e2e server) gets its events without restarting the fake.
const webhookUrl = process.env.PAYMENTS_WEBHOOK_URL ?? `${appUrl}/api/webhooks/payments`;
const webhookSecret = process.env.PAYMENTS_WEBHOOK_SECRET ?? "whsec_platewright_fake_signing_secret";

async function main() {
  const smtp = await startSmtpFake({ port: smtpPort, mailboxDir });
  const pay = await startPaymentsFake({ port: payPort, webhookSecret, defaultWebhookUrl: webhookUrl });
  console.log(`fakes: SMTP on 127.0.0.1:${smtp.port} (mailbox ${mailboxDir}), payments on http://127.0.0.1:${pay.port}`);
  const stop = () => {
    void Promise.all([smtp.close(), pay.close()]).finally(() => process.exit(0));
    setTimeout(() => process.exit(0), 2000).unref();
  };
  process.on("SIGTERM", stop);
  process.on("SIGINT", stop);
}

main().catch((e: unknown) => {
  console.error("fakes: failed to start:", e instanceof Error ? e.message : e);
  process.exit(1);
});
