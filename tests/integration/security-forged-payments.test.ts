// Finding 5 (issue 17): with the fake's public signing secret kept in real mode anyone could sign
// events, and the webhook recorded unknown checkouts and any amount (−50,000 cents for a member).
// Signatures are made with the stripe package's own test helper (generateTestHeaderString).
import { eq } from "drizzle-orm";
import Stripe from "stripe";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db";
import { payments, users } from "@/db/schema";
import { FAKE_PAYMENTS_SECRET_KEY, FAKE_PAYMENTS_WEBHOOK_SECRET, parseEnv } from "@/lib/env";
import { dbErrorKind } from "@/lib/server/errors";
import { memberBalance } from "@/lib/server/ledger";
import { handleWebhook } from "@/lib/server/payments";

const SECRET = "whsec_forged_payments_test";
process.env.PAYMENTS_MODE = "fake";
process.env.PAYMENTS_WEBHOOK_SECRET = SECRET;

let memberId = 0;
let otherId = 0;
let n = 0;

function signedEvent(session: { id: string; amount_total: number; currency?: string; member?: number }) {
  const payload = JSON.stringify({
    id: `evt_forged_${++n}`,
    object: "event",
    type: "checkout.session.completed",
    data: { object: { id: session.id, object: "checkout.session", amount_total: session.amount_total, currency: session.currency ?? "eur", payment_status: "paid", metadata: { member_id: String(session.member ?? memberId) }, client_reference_id: String(session.member ?? memberId) } },
  });
  return { payload, header: Stripe.webhooks.generateTestHeaderString({ payload, secret: SECRET }) };
}

const rowOf = async (sessionId: string) => (await db().select({ status: payments.status, amount: payments.amountCents }).from(payments).where(eq(payments.providerSessionId, sessionId)))[0];

beforeAll(async () => {
  const [m] = await db().insert(users).values({ email: "forge-m@test.example", name: "Forge Member", passwordHash: "x", role: "member" }).$returningId();
  const [o] = await db().insert(users).values({ email: "forge-o@test.example", name: "Forge Other", passwordHash: "x", role: "member" }).$returningId();
  memberId = m!.id;
  otherId = o!.id;
  await db().insert(payments).values({ memberId, amountCents: 1625, currency: "EUR", providerSessionId: "cs_known_1", status: "pending" });
});
afterAll(closeDb);

describe("settings", () => {
  it("real mode needs both secrets and refuses the fake's public values", () => {
    expect(() => parseEnv({ PAYMENTS_MODE: "stripe" })).toThrow(/PAYMENTS_SECRET_KEY: required.*PAYMENTS_WEBHOOK_SECRET: required/);
    expect(() => parseEnv({ PAYMENTS_MODE: "stripe", PAYMENTS_SECRET_KEY: "sk_live_own", PAYMENTS_WEBHOOK_SECRET: FAKE_PAYMENTS_WEBHOOK_SECRET })).toThrow(/PAYMENTS_WEBHOOK_SECRET: is the local fake's public value/);
    expect(() => parseEnv({ PAYMENTS_MODE: "stripe", PAYMENTS_SECRET_KEY: FAKE_PAYMENTS_SECRET_KEY, PAYMENTS_WEBHOOK_SECRET: "whsec_own" })).toThrow(/PAYMENTS_SECRET_KEY/);
    expect(parseEnv({ PAYMENTS_MODE: "stripe", PAYMENTS_SECRET_KEY: "sk_live_own", PAYMENTS_WEBHOOK_SECRET: "whsec_own" }).PAYMENTS_WEBHOOK_SECRET).toBe("whsec_own");
    // Fake mode keeps working with nothing set.
    expect(parseEnv({}).PAYMENTS_WEBHOOK_SECRET).toBe(FAKE_PAYMENTS_WEBHOOK_SECRET);
  });
});

describe("signed events are checked against what was created", () => {
  it("records nothing for a checkout this app never started, whatever the amount", async () => {
    const e = signedEvent({ id: "cs_never_started", amount_total: -50_000 });
    expect(await handleWebhook(e.payload, e.header)).toMatchObject({ recorded: false });
    const e2 = signedEvent({ id: "cs_never_started_2", amount_total: 500 });
    expect(await handleWebhook(e2.payload, e2.header)).toMatchObject({ recorded: false, refused: expect.stringMatching(/no checkout/) });
    expect(await rowOf("cs_never_started")).toBeUndefined();
    expect(await rowOf("cs_never_started_2")).toBeUndefined();
    expect((await memberBalance(memberId)).paidCents).toBe(0);
  });

  it("refuses a known checkout with another amount, currency or member", async () => {
    for (const bad of [{ amount_total: -50_000 }, { amount_total: 1 }, { amount_total: 1625, currency: "usd" }, { amount_total: 1625, member: otherId }]) {
      const e = signedEvent({ id: "cs_known_1", ...bad });
      expect(await handleWebhook(e.payload, e.header), JSON.stringify(bad)).toMatchObject({ recorded: false, refused: expect.any(String) });
      expect(await rowOf("cs_known_1")).toEqual({ status: "pending", amount: 1625 });
    }
  });

  it("records the checkout as created, once", async () => {
    const e = signedEvent({ id: "cs_known_1", amount_total: 1625 });
    expect(await handleWebhook(e.payload, e.header)).toMatchObject({ recorded: true });
    expect(await handleWebhook(e.payload, e.header)).toMatchObject({ recorded: false });
    expect(await rowOf("cs_known_1")).toEqual({ status: "paid", amount: 1625 });
  });

  it("finds the duplicate-key code where drizzle puts it (the error's cause)", async () => {
    const dup = await db().insert(payments).values({ memberId, amountCents: 1, currency: "EUR", providerSessionId: "cs_known_1", status: "pending" }).then(() => null, (e: unknown) => e);
    expect((dup as { code?: string }).code).toBeUndefined();
    expect(dbErrorKind(dup)).toBe("duplicate");
  });
});
