// Finding 2 (issue 17) in the browser: /sign-in?callbackUrl=/\127.0.0.1:4252/ (and /<tab>/…) sent
// the browser to another origin after sign-in. Browsers read "/\host" and "/<tab>/host" like "//host"
// (WHATWG URL Standard); the callback is now parsed and must be on our origin.
import { expect, test } from "@playwright/test";
import type mysql from "mysql2/promise";
import { baseURL, e2eDb } from "./security-fixtures";
import { PASSWORD, throwawayAccount } from "./sign-in-http";

let conn: mysql.Connection;
const made: string[] = [];

test.beforeAll(async () => {
  conn = await e2eDb();
});
test.afterAll(async () => {
  for (const e of made) await conn.query("DELETE FROM users WHERE email = ?", [e]);
  await conn.end();
});

test("the callback after sign-in never leaves our origin", async ({ page }) => {
  const email = await throwawayAccount(conn, made, "redirect");
  for (const cb of ["/\\127.0.0.1:4252/", "/\t/127.0.0.1:4252/", "//127.0.0.1:4252/", "http://127.0.0.1:4252/"]) {
    await page.context().clearCookies();
    await page.goto(`/sign-in?callbackUrl=${encodeURIComponent(cb)}`);
    await page.getByLabel("E-mail").fill(email);
    await page.getByLabel("Password").fill(PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect(page.getByTestId("whoami")).toBeVisible();
    expect(new URL(page.url()).origin, JSON.stringify(cb)).toBe(baseURL);
  }
});

test("a callback on our own origin is still followed", async ({ page }) => {
  const email = await throwawayAccount(conn, made, "redirect-ok");
  await page.goto(`/sign-in?callbackUrl=${encodeURIComponent("/ledger")}`);
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page).toHaveURL(`${baseURL}/ledger`);
});
