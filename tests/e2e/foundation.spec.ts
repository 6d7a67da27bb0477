import { expect, test } from "@playwright/test";
import { authFile, demo, signIn } from "./helpers";

test.describe("signed out", () => {
  test("a protected page redirects to sign-in", async ({ page }) => {
    await page.goto("/floor");
    await expect(page).toHaveURL(/\/sign-in/);
    await expect(page.getByRole("heading", { name: "Sign in to your workshop" })).toBeVisible();
  });

  test("a wrong password shows a clear error and keeps the e-mail", async ({ page }) => {
    const u = demo("member2");
    await signIn(page, u.email, "not-the-password");
    await expect(page.getByRole("alert").filter({ hasText: "do not match an account" })).toBeVisible();
    await expect(page.getByLabel("E-mail")).toHaveValue(u.email);
    await expect(page).toHaveURL(/\/sign-in/);
  });

  test("an empty form is refused before it is sent", async ({ page }) => {
    await page.goto("/sign-in");
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect(page.getByText("Enter an e-mail address")).toBeVisible();
  });

  test("the API answers 401 without a session", async ({ request }) => {
    const res = await request.get("/api/me");
    expect(res.status()).toBe(401);
  });
});

const homes = [
  { role: "member", home: "/bench", heading: "Bench", nav: ["Bench"], notNav: ["Floor", "Workshop settings"] },
  { role: "operator", home: "/floor", heading: "Floor", nav: ["Floor"], notNav: ["Bench", "Workshop settings"] },
  { role: "admin", home: "/workshop", heading: "Workshop settings", nav: ["Workshop settings", "Floor"], notNav: ["Bench"] },
] as const;

for (const h of homes) {
  test.describe(`as ${h.role}`, () => {
    test.use({ storageState: authFile(h.role) });

    test(`lands on ${h.home} with its own navigation`, async ({ page }) => {
      await page.goto("/");
      await expect(page).toHaveURL(new RegExp(`${h.home}$`));
      await expect(page.getByRole("heading", { level: 1, name: h.heading })).toBeVisible();
      const nav = page.getByRole("list", { name: "Main" });
      for (const label of h.nav) await expect(nav.getByRole("link", { name: label })).toBeVisible();
      for (const label of h.notNav) await expect(nav.getByRole("link", { name: label })).toHaveCount(0);
    });
  });
}

test.describe("roles are enforced on the server", () => {
  test.use({ storageState: authFile("member") });

  test("a member calling an operator-only API route gets 403", async ({ request }) => {
    const res = await request.get("/api/workshop/settings");
    expect(res.status()).toBe(403);
    const write = await request.patch("/api/workshop/settings", { data: { name: "Taken over" } });
    expect(write.status()).toBe(403);
  });

  test("a member opening the admin page is refused", async ({ page }) => {
    // The shell streams first, so the refusal is shown in the page rather than as the HTTP status.
    await page.goto("/workshop");
    await expect(page.getByText("This page belongs to another role")).toBeVisible();
    await expect(page.getByRole("button", { name: "Save settings" })).toHaveCount(0);
  });
});

test.describe("workshop settings", () => {
  test.use({ storageState: authFile("admin") });

  test("an admin sees field errors for bad values and saves good ones", async ({ page }) => {
    await page.goto("/workshop");
    await page.getByLabel("Time zone").fill("Mars/Olympus");
    await page.getByRole("button", { name: "Save settings" }).click();
    await expect(page.getByText("Use an IANA time zone")).toBeVisible();
    await page.getByLabel("Time zone").fill("Europe/Lisbon");
    await page.getByRole("button", { name: "Save settings" }).click();
    await expect(page.getByText("Settings saved.")).toBeVisible();
    await page.reload();
    await expect(page.getByLabel("Time zone")).toHaveValue("Europe/Lisbon");
  });

  test("an operator may read the settings but not change them", async ({ browser }) => {
    const ctx = await browser.newContext({ storageState: authFile("operator") });
    const read = await ctx.request.get("/api/workshop/settings");
    expect(read.status()).toBe(200);
    const body = await read.json();
    const write = await ctx.request.patch("/api/workshop/settings", { data: { ...body, name: "Renamed" } });
    expect(write.status()).toBe(403);
    await ctx.close();
  });
});

test("pages carry the security headers", async ({ request }) => {
  const res = await request.get("/sign-in");
  const h = res.headers();
  expect(h["x-content-type-options"]).toBe("nosniff");
  expect(h["x-frame-options"]).toBe("DENY");
  const csp = h["content-security-policy"] ?? "";
  // The policy must still let the mesh worker and WebAssembly run.
  expect(csp).toContain("worker-src 'self' blob:");
  expect(csp).toContain("'wasm-unsafe-eval'");
  expect(csp).toContain("frame-ancestors 'none'");
  expect(h["x-powered-by"]).toBeUndefined();
});
