import "server-only";
import { eq } from "drizzle-orm";
import Stripe from "stripe";
import { db } from "@/db";
import { payments, workshopSettings } from "@/db/schema";
import { env } from "@/lib/env";
import { can } from "@/lib/permissions";
import { AppError, dbErrorKind } from "./errors";
import { memberBalance } from "./ledger";
import { appUrl } from "./mail";
import type { SessionUser } from "./session";

const g = globalThis as unknown as { __pwStripe?: { key: string; client: Stripe } };

/** The official SDK; in fake mode pointed at the local fake on 127.0.0.1 over plain HTTP. */
export function paymentsClient(): Stripe {
  const e = env();
  const fake = e.PAYMENTS_MODE === "fake";
  const config: Stripe.StripeConfig = fake
    ? { host: "127.0.0.1", port: e.PAYMENTS_FAKE_PORT, protocol: "http", telemetry: false, maxNetworkRetries: 1, timeout: 10_000 }
    : { telemetry: false, maxNetworkRetries: 2, timeout: 20_000 };
  const key = JSON.stringify([e.PAYMENTS_SECRET_KEY, config]);
  if (!g.__pwStripe || g.__pwStripe.key !== key) g.__pwStripe = { key, client: new Stripe(e.PAYMENTS_SECRET_KEY, config) };
  return g.__pwStripe.client;
}

/** Starts a checkout for the member's whole balance and returns the provider's page to send them to. */
export async function createCheckout(user: SessionUser): Promise<{ url: string; sessionId: string }> {
  if (!can(user.role, "ledger:own")) throw new AppError("forbidden", "Only members pay balances.");
  const balance = await memberBalance(user.id);
  if (balance.balanceCents <= 0) throw new AppError("conflict", "There is nothing to pay.");
  const [ws] = await db().select({ name: workshopSettings.name }).from(workshopSettings).limit(1);
  const base = appUrl();
  const metadata: Record<string, string> = { member_id: String(user.id) };
  // The fake posts its event to the URL the app names, so a second app (the e2e server) gets its own.
  if (env().PAYMENTS_MODE === "fake") metadata.pw_fake_webhook_url = `${base}/api/webhooks/payments`;
  let session: Stripe.Checkout.Session;
  try {
    session = await paymentsClient().checkout.sessions.create({
      mode: "payment",
      line_items: [{ quantity: 1, price_data: { currency: balance.currency.toLowerCase(), unit_amount: balance.balanceCents, product_data: { name: `Balance at ${ws?.name ?? "the workshop"}` } } }],
      success_url: `${base}/ledger?checkout={CHECKOUT_SESSION_ID}`,
      cancel_url: `${base}/ledger?checkout=cancelled`,
      client_reference_id: String(user.id),
      customer_email: user.email,
      metadata,
    });
  } catch (e) {
    console.error("[platewright] checkout session:", e instanceof Error ? e.message : e);
    throw new AppError("unavailable", "The payment service is not reachable right now. Try again in a minute.");
  }
  if (!session.url) throw new AppError("unavailable", "The payment service gave no checkout page.");
  await db()
    .insert(payments)
    .values({ memberId: user.id, amountCents: session.amount_total ?? balance.balanceCents, currency: (session.currency ?? balance.currency).toUpperCase(), providerSessionId: session.id, status: "pending" });
  return { url: session.url, sessionId: session.id };
}

type SessionLike = Pick<Stripe.Checkout.Session, "id" | "amount_total" | "currency" | "payment_status" | "metadata" | "client_reference_id">;

/**
 * Marks the session's payment paid, once, when it is one this app created and its figures are the
 * ones created: same member, same amount, same currency. The row is locked; a replayed event, or the
 * webhook and the member's return arriving together, find it paid and change nothing. A session this
 * app never created, or one whose figures differ, is recorded nowhere (it is logged for an admin):
 * a signed event is trusted for what happened to a checkout, never for who owes what.
 */
export async function recordPaid(session: SessionLike, eventId: string | null): Promise<{ recorded: boolean; refused?: string }> {
  if (session.payment_status !== "paid") return { recorded: false };
  const refuse = (why: string) => {
    console.error(`[platewright] payment event ${eventId ?? "(return)"} for checkout ${session.id} not recorded: ${why}`);
    return { recorded: false, refused: why };
  };
  const amount = session.amount_total;
  if (typeof amount !== "number" || !Number.isSafeInteger(amount) || amount <= 0) return refuse(`the amount ${String(amount)} is not a positive whole number`);
  try {
    return await db().transaction(async (tx) => {
      const [row] = await tx
        .select({ id: payments.id, status: payments.status, memberId: payments.memberId, amountCents: payments.amountCents, currency: payments.currency })
        .from(payments)
        .where(eq(payments.providerSessionId, session.id))
        .for("update")
        .limit(1);
      if (!row) return refuse("no checkout with this id was started here");
      if (row.status === "paid") return { recorded: false };
      const named = session.metadata?.member_id ?? session.client_reference_id;
      if (named != null && Number(named) !== row.memberId) return refuse(`it names member ${named}, the checkout was for member ${row.memberId}`);
      if (amount !== row.amountCents) return refuse(`it says ${amount}, the checkout was for ${row.amountCents}`);
      if ((session.currency ?? "").toUpperCase() !== row.currency.toUpperCase()) return refuse(`it is in ${session.currency ?? "no currency"}, the checkout was in ${row.currency}`);
      await tx.update(payments).set({ status: "paid", paidAt: new Date(), providerEventId: eventId }).where(eq(payments.id, row.id));
      return { recorded: true };
    });
  } catch (e) {
    // Two deliveries raced (drizzle wraps the driver's error: the code is on its cause).
    if (dbErrorKind(e) === "duplicate") return { recorded: false };
    throw e;
  }
}

/** Verifies the signature with the signing secret, then records completed checkouts. */
export async function handleWebhook(rawBody: string, signature: string | null): Promise<{ type: string; recorded: boolean; refused?: string }> {
  if (!signature) throw new AppError("bad_request", "Missing signature header.");
  let event: Stripe.Event;
  try {
    event = Stripe.webhooks.constructEvent(rawBody, signature, env().PAYMENTS_WEBHOOK_SECRET);
  } catch {
    throw new AppError("bad_request", "The signature does not match.");
  }
  if (event.type === "checkout.session.completed" || event.type === "checkout.session.async_payment_succeeded") {
    return { type: event.type, ...(await recordPaid(event.data.object, event.id)) };
  }
  return { type: event.type, recorded: false };
}

/** On the member's return: read the session from the provider, so the page is right even before the webhook. */
export async function reconcileReturn(user: SessionUser, sessionId: string): Promise<"paid" | "open" | "unknown"> {
  const [row] = await db()
    .select({ memberId: payments.memberId, status: payments.status })
    .from(payments)
    .where(eq(payments.providerSessionId, sessionId))
    .limit(1);
  if (!row || row.memberId !== user.id) return "unknown";
  if (row.status === "paid") return "paid";
  try {
    const s = await paymentsClient().checkout.sessions.retrieve(sessionId);
    if (s.payment_status === "paid") {
      await recordPaid(s, null);
      return "paid";
    }
    return "open";
  } catch {
    return "open";
  }
}
