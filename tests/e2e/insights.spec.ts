// Insights end to end on the seeded archive history: the admin switches the period, sees drawn
// charts, opens a table view and downloads its CSV, whose numbers match the table; a member is
// refused; an operator gets the printers' figures without money.
import { readFileSync } from "node:fs";
import { expect, test } from "@playwright/test";
import { authFile } from "./helpers";

/** A local date n days before today (UTC is close enough to the workshop's day for a range of weeks). */
const daysAgo = (n: number) => new Date(Date.now() - n * 86_400_000).toISOString().slice(0, 10);

/** RFC 4180 records, for the simple fields these tables hold (names without commas or quotes). */
const parseCsv = (text: string) => text.trimEnd().split("\r\n").map((line) => line.split(","));

test.describe("as admin", () => {
  test.use({ storageState: authFile("admin") });

  test("switches the period, sees the charts, and the CSV matches the table", async ({ page }) => {
    await page.goto("/insights");
    await expect(page.getByRole("heading", { level: 1, name: "Insights" })).toBeVisible();
    await expect(page.getByRole("button", { name: "This month" })).toHaveAttribute("aria-pressed", "true");

    await page.getByRole("button", { name: "This week" }).click();
    await expect(page.getByRole("button", { name: "This week" })).toHaveAttribute("aria-pressed", "true");
    await expect(page).toHaveURL(/period=week/);

    // Eight weeks of the archive history.
    const from = daysAgo(56);
    const to = daysAgo(1);
    await page.getByRole("button", { name: "Custom" }).click();
    await page.getByLabel("From", { exact: true }).fill(from);
    await page.getByLabel("To", { exact: true }).fill(to);
    await page.getByRole("button", { name: "Show" }).click();
    await expect(page.getByText(`${from} to ${to}`)).toBeVisible();
    await expect(page).toHaveURL(new RegExp(`period=custom&from=${from}&to=${to}`));

    // Drawn, not empty: stacked segments, a full heat grid, scatter dots.
    const util = page.locator('section[data-chart="utilisation"]');
    await expect(util.locator("svg rect").first()).toBeVisible();
    expect(await util.locator("svg rect").count()).toBeGreaterThanOrEqual(4);
    expect(await page.locator('section[data-chart="heatmap"] svg rect').count()).toBe(7 * 24);
    expect(await page.locator('section[data-chart="estimates-points"] svg circle').count()).toBeGreaterThan(20);
    await expect(page.locator('section[data-chart="failures-reason"] svg rect').first()).toBeVisible();

    // The table view and the CSV of the same chart hold the same numbers.
    await util.getByRole("button", { name: "Table" }).click();
    const table = util.getByRole("table");
    await expect(table).toBeVisible();
    const head = await table.locator("thead th").allInnerTexts();
    const body = await table.locator("tbody tr").evaluateAll((trs) => trs.map((tr) => [...tr.querySelectorAll("td")].map((td) => (td.textContent ?? "").trim())));
    expect(body.length).toBeGreaterThanOrEqual(4);
    const [download] = await Promise.all([page.waitForEvent("download"), util.getByRole("link", { name: /as CSV/ }).click()]);
    expect(download.suggestedFilename()).toBe(`platewright-utilisation-${from}-to-${to}.csv`);
    const csv = parseCsv(readFileSync((await download.path())!, "utf8"));
    expect(csv[0]).toEqual(head.map((h) => h.trim()));
    expect(csv.slice(1)).toEqual(body);
    // Some printer printed in those weeks, and the four states add up to the period for each.
    const hours = body.map((r) => r.slice(1, 5).map(Number));
    expect(hours.some((h) => h[0]! > 0)).toBe(true);
    const spans = hours.map((h) => h.reduce((s, x) => s + x, 0));
    for (const s of spans) expect(Math.abs(s - spans[0]!)).toBeLessThan(0.05);

    // The members' table carries charges for the admin.
    const members = await page.request.get(`/api/insights/members?period=custom&from=${from}&to=${to}&format=csv`);
    expect(members.status()).toBe(200);
    expect(members.headers()["content-disposition"]).toMatch(/^attachment; filename="platewright-members-/);
    expect((await members.text()).split("\r\n")[0]).toMatch(/Charges EUR/);
  });
});

test.describe("as member", () => {
  test.use({ storageState: authFile("member") });

  test("is refused the page and the API", async ({ page, request }) => {
    expect((await request.get("/api/insights")).status()).toBe(403);
    expect((await request.get("/api/insights/utilisation?format=csv")).status()).toBe(403);
    // The page streams, so its status is already sent: the refusal shows as the 403 page, with no charts.
    await page.goto("/insights");
    await expect(page.getByRole("heading", { name: "This page belongs to another role" })).toBeVisible();
    await expect(page.locator("section[data-chart]")).toHaveCount(0);
    await expect(page.getByRole("navigation").getByRole("link", { name: "Insights" })).toHaveCount(0);
  });
});

test.describe("as operator", () => {
  test.use({ storageState: authFile("operator") });

  test("sees the printers but no money", async ({ page, request }) => {
    const res = await request.get(`/api/insights?period=custom&from=${daysAgo(30)}&to=${daysAgo(1)}`);
    expect(res.status()).toBe(200);
    const body = (await res.json()) as { currency?: string; utilisation: unknown[]; members: { rows: Record<string, unknown>[] } };
    expect(body.utilisation.length).toBeGreaterThanOrEqual(4);
    expect(body.currency).toBeUndefined();
    expect(body.members.rows.length).toBeGreaterThan(0);
    for (const r of body.members.rows) expect(r).not.toHaveProperty("chargesCents");
    const csv = await (await request.get(`/api/insights/members?period=custom&from=${daysAgo(30)}&to=${daysAgo(1)}&format=csv`)).text();
    expect(csv.split("\r\n")[0]).not.toMatch(/Charges/);
    expect((await request.get("/api/insights?period=custom&from=2026-02-30&to=2026-03-01")).status()).toBe(422);
    await page.goto("/insights");
    await expect(page.getByRole("navigation").getByRole("link", { name: "Insights" })).toBeVisible();
    await expect(page.locator('section[data-chart="utilisation"] svg rect').first()).toBeVisible();
  });
});
