// Checkout through the official stripe SDK against the local payment fake, and the webhook:
// a forged signature is refused, a replayed event records one payment, the balance drops to zero.
// Source for the signature scheme: the stripe package itself (Stripe.webhooks.generateTestHeaderString
// signs, constructEvent verifies: HMAC-SHA256 over "<timestamp>.<payload>"; described in the
// provider's webhook documentation, from memory).
import { createHmac } from "node:crypto";
import { eq } from "drizzle-orm";
import Stripe from "stripe";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db";
import { payments, users, workshopSettings } from "@/db/schema";
import { AppError } from "@/lib/server/errors";
import { addCharge, memberBalance } from "@/lib/server/ledger";
import { createCheckout, handleWebhook, reconcileReturn } from "@/lib/server/payments";
import type { SessionUser } from "@/lib/server/session";
import { startPaymentsFake, type PaymentsFake } from "../../scripts/fakes/payments";

const SECRET = "whsec_integration_test_secret";
process.env.PAYMENTS_MODE = "fake";
process.env.PAYMENTS_WEBHOOK_SECRET = SECRET;

let fake: PaymentsFake;
let member: SessionUser;

beforeAll(async () => {
  // Nothing listens on the default target: these tests hand the signed events to the handler directly.
  fake = await startPaymentsFake({ port: 0, webhookSecret: SECRET, defaultWebhookUrl: "http://127.0.0.1:9/none" });
  process.env.PAYMENTS_FAKE_PORT = String(fake.port);
  await db().insert(workshopSettings).ignore().values({ id: 1, name: "Kettle Lane Workshop", currency: "EUR" });
  const email = `payer-${Date.now()}@kettlelane.example`;
  const [u] = await db().insert(users).values({ email, name: "Iris Payer", passwordHash: "x", role: "member" }).$returningId();
  member = { id: u!.id, email, name: "Iris Payer", role: "member" };
  await addCharge(db(), { memberId: member.id, amountCents: 1240, description: "Plate 3 share", idempotencyKey: `test:${member.id}:a` });
  await addCharge(db(), { memberId: member.id, amountCents: 385, description: "Plate 5 share", idempotencyKey: `test:${member.id}:b` });
});

afterAll(async () => {
  await fake.close();
  await closeDb();
});

const paidRows = async () => db().select({ id: payments.id, status: payments.status, amount: payments.amountCents, eventId: payments.providerEventId }).from(payments).where(eq(payments.memberId, member.id));

describe("payments", () => {
  it("creates a checkout session through the SDK for the whole balance", async () => {
    expect((await memberBalance(member.id)).balanceCents).toBe(1625);
    const { url, sessionId } = await createCheckout(member);
    expect(url).toBe(`http://127.0.0.1:${fake.port}/pay/${sessionId}`);
    const s = fake.sessions.get(sessionId);
    expect(s?.amount_total).toBe(1625);
    expect(s?.currency).toBe("eur");
    expect(s?.metadata.member_id).toBe(String(member.id));
    const rows = await paidRows();
    expect(rows).toEqual([expect.objectContaining({ status: "pending", amount: 1625 })]);
  });

  it("refuses a webhook with a forged or missing signature", async () => {
    const [sessionId] = [...fake.sessions.keys()];
    const signed = await fake.complete(sessionId!, { deliver: false });
    // Signed with another secret.
    const forged = Stripe.webhooks.generateTestHeaderString({ payload: signed.payload, secret: "whsec_someone_else" });
    await expect(handleWebhook(signed.payload, forged)).rejects.toThrow(AppError);
    // The right header on a changed body.
    const tampered = signed.payload.replace('"amount_total":1625', '"amount_total":1');
    expect(tampered).not.toBe(signed.payload);
    await expect(handleWebhook(tampered, signed.header)).rejects.toThrow(/signature/);
    await expect(handleWebhook(signed.payload, null)).rejects.toThrow(/signature/);
    // A header made by hand with the same secret and HMAC-SHA256 is accepted: the scheme is the documented one.
    const t = Math.floor(Date.now() / 1000);
    const v1 = createHmac("sha256", SECRET).update(`${t}.${signed.payload}`).digest("hex");
    expect(Stripe.webhooks.constructEvent(signed.payload, `t=${t},v1=${v1}`, SECRET).id).toBe(signed.eventId);
    expect((await paidRows())[0]?.status).toBe("pending");
  });

  it("records one payment when the same event arrives twice, and the balance drops to zero", async () => {
    const [sessionId] = [...fake.sessions.keys()];
    const signed = await fake.complete(sessionId!, { deliver: false });
    const first = await handleWebhook(signed.payload, signed.header);
    expect(first).toEqual({ type: "checkout.session.completed", recorded: true });
    const again = await handleWebhook(signed.payload, Stripe.webhooks.generateTestHeaderString({ payload: signed.payload, secret: SECRET }));
    expect(again.recorded).toBe(false);
    const rows = await paidRows();
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ status: "paid", amount: 1625, eventId: signed.eventId });
    expect(await memberBalance(member.id)).toMatchObject({ chargedCents: 1625, paidCents: 1625, balanceCents: 0 });
    // The member's return reads the session and finds it paid, without a second payment.
    expect(await reconcileReturn(member, sessionId!)).toBe("paid");
    expect(await paidRows()).toHaveLength(1);
  });

  it("has nothing to pay at a zero balance", async () => {
    await expect(createCheckout(member)).rejects.toMatchObject({ code: "conflict" });
  });

  it("records a paid session from the return alone when the webhook is late, and the late webhook adds nothing", async () => {
    await addCharge(db(), { memberId: member.id, amountCents: 500, description: "Plate 9 share", idempotencyKey: `test:${member.id}:c` });
    const { sessionId } = await createCheckout(member);
    const signed = await fake.complete(sessionId, { deliver: false });
    expect(await reconcileReturn(member, sessionId)).toBe("paid");
    expect((await handleWebhook(signed.payload, signed.header)).recorded).toBe(false);
    expect((await memberBalance(member.id)).balanceCents).toBe(0);
    // Another member cannot learn anything from someone else's session id.
    expect(await reconcileReturn({ ...member, id: member.id + 999 }, sessionId)).toBe("unknown");
  });
});
