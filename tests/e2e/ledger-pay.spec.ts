// A member pays their balance through the local fake checkout and comes back to a zero balance; the
// admin sees it on Billing and exports CSV. Every browser request must stay on 127.0.0.1, and the
// server's loopback guard must have refused nothing.
import { existsSync, statSync } from "node:fs";
import { test as base, expect } from "@playwright/test";
import { authFile } from "./helpers";

const guardLog = `${process.cwd()}/.data/loopback-guard-e2e.log`;
const logSize = () => (existsSync(guardLog) ? statSync(guardLog).size : 0);

const test = base.extend<{ loopbackOnly: void }>({
  loopbackOnly: [
    async ({ context }, use) => {
      const leaks: string[] = [];
      await context.route("**/*", (route) => {
        const host = new URL(route.request().url()).hostname;
        if (host === "127.0.0.1" || host === "localhost" || host === "[::1]") return route.continue();
        leaks.push(route.request().url());
        return route.abort("blockedbyclient");
      });
      const before = logSize();
      await use();
      expect(leaks, "requests that left 127.0.0.1").toEqual([]);
      expect(logSize(), `the server's loopback guard refused something; see ${guardLog}`).toBe(before);
    },
    { auto: true },
  ],
});

test.describe.configure({ mode: "serial" });

test.describe("a member pays", () => {
  test.use({ storageState: authFile("member") });

  test("the balance through the fake checkout and it drops to zero", async ({ page }) => {
    await page.goto("/ledger");
    // Seeded demo charges for Jun are 12.40 + 3.85 (db/seed/ledger.ts); other specs may have
    // finished plates of Jun's since, so pay whatever the page says is owed.
    const balance = page.getByTestId("balance");
    await expect(balance).toHaveText(/^€\d+\.\d\d$/);
    const owed = (await balance.textContent())!.trim();
    expect(Number(owed.slice(1))).toBeGreaterThanOrEqual(16.25);
    await page.getByRole("button", { name: `Pay ${owed}` }).click();
    await expect(page).toHaveURL(/127\.0\.0\.1:4242\/pay\/cs_test_/);
    await expect(page.getByRole("heading", { name: `Pay ${owed.slice(1)} EUR` })).toBeVisible();
    await page.getByRole("button", { name: "Pay", exact: true }).click();
    await expect(page).toHaveURL(/\/ledger\?checkout=cs_test_/);
    await expect(page.getByText("Payment received. Thank you.")).toBeVisible();
    await expect(page.getByTestId("balance")).toHaveText("€0.00");
    await expect(page.getByText("✓ Nothing to pay")).toBeVisible();
    await expect(page.getByRole("cell", { name: "✓ paid" })).toBeVisible();
    // A replay of the provider's last event changes nothing.
    const resent = await page.request.post("http://127.0.0.1:4242/_fake/resend-last");
    expect(resent.status()).toBe(200);
    await page.reload();
    await expect(page.getByTestId("balance")).toHaveText("€0.00");
    await expect(page.getByRole("cell", { name: "✓ paid" })).toHaveCount(1);
  });

  test("cannot see billing or export", async ({ page }) => {
    expect((await page.request.get("/api/ledger/balances")).status()).toBe(403);
    expect((await page.request.get("/api/ledger/export?kind=charges")).status()).toBe(403);
  });
});

test.describe("the admin", () => {
  test.use({ storageState: authFile("admin") });

  test("sees who owes what and exports CSV", async ({ page }) => {
    await page.goto("/workshop/billing");
    await expect(page.getByTestId("balance-jun@kettlelane.example")).toContainText("€0.00");
    // Priya's balance is her seeded charges plus any demo plates finished for her: the page must
    // show what the ledger API computes, and she has paid nothing, so it is at least her 11.70.
    const api = (await (await page.request.get("/api/ledger/balances")).json()) as { rows: { email: string; balanceCents: number }[] };
    const priya = api.rows.find((r) => r.email === "priya@kettlelane.example")!;
    expect(priya.balanceCents).toBeGreaterThanOrEqual(1170);
    await expect(page.getByTestId("balance-priya@kettlelane.example")).toContainText(`€${(priya.balanceCents / 100).toFixed(2)}`);
    const csv = await page.request.get("/api/ledger/export?kind=payments");
    expect(csv.headers()["content-type"]).toContain("text/csv");
    const lines = (await csv.text()).split("\r\n");
    expect(lines[0]).toBe("payment_id,created_at,paid_at,member_email,member_name,amount_minor_units,currency,status,provider_session_id");
    expect(lines.some((l) => l.includes("jun@kettlelane.example") && /,\d+,EUR,paid,/.test(l))).toBe(true);
    expect((await page.request.post("/api/payments/checkout")).status()).toBe(403);
  });

  test("a webhook without a valid signature is refused", async ({ request }) => {
    const res = await request.post("/api/webhooks/payments", { data: { id: "evt_forged", type: "checkout.session.completed" }, headers: { "stripe-signature": "t=1,v1=00" } });
    expect(res.status()).toBe(400);
  });
});
