// Screenshots of each role's home for review (kept in test-results/); the assertions are the page's own.
import { expect, test } from "@playwright/test";
import { authFile } from "./helpers";

test("the sign-in page renders with its fonts and colours", async ({ page }) => {
  await page.goto("/sign-in");
  await expect(page.getByRole("heading", { name: "Sign in to your workshop" })).toBeVisible();
  const family = await page.evaluate(() => getComputedStyle(document.body).fontFamily);
  expect(family).toMatch(/Inter|__inter|font-inter/i);
  await page.screenshot({ path: "test-results/look-sign-in.png" });
});

test.describe("admin", () => {
  test.use({ storageState: authFile("admin") });
  test("workshop settings page", async ({ page }) => {
    await page.goto("/workshop");
    await expect(page.getByRole("button", { name: "Save settings" })).toBeVisible();
    await page.screenshot({ path: "test-results/look-workshop.png", fullPage: true });
  });
});
