// Finding 2 (issue 17) in the browser: /sign-in?callbackUrl=/\127.0.0.1:4252/ (and /<tab>/…) sent
// the browser to another origin after sign-in. Browsers read "/\host" and "/<tab>/host" like "//host"
// (WHATWG URL Standard); the callback is now parsed and must be on our origin.
import { expect, test } from "@playwright/test";
import { baseURL } from "./security-fixtures";
import { PASSWORD, throwawayAccounts } from "./sign-in-http";

const accounts = throwawayAccounts();

test("the callback after sign-in never leaves our origin", async ({ page }) => {
  const email = await accounts.make("redirect");
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
  const email = await accounts.make("redirect-ok");
  await page.goto(`/sign-in?callbackUrl=${encodeURIComponent("/ledger")}`);
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page).toHaveURL(`${baseURL}/ledger`);
});
