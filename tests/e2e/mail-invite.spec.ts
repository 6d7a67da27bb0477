// An admin invites a person; the message lands in the fake mailbox; its link sets name and password
// and signs the new member in; the used link and an expired link are refused. Every request of the
// browser must stay on 127.0.0.1, and the server's loopback guard must have refused nothing.
import { createHash, randomBytes } from "node:crypto";
import { existsSync, statSync } from "node:fs";
import { test as base, expect, type Page } from "@playwright/test";
import mysql from "mysql2/promise";
import { targetFromEnv } from "../../db/migrate";
import { authFile, signIn } from "./helpers";

const guardLog = `${process.cwd()}/.data/loopback-guard-e2e.log`;
const logSize = () => (existsSync(guardLog) ? statSync(guardLog).size : 0);

// Fails the test if the page asks for anything off this machine, and aborts that request.
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

async function linkFromMailbox(page: Page, to: string): Promise<string> {
  await page.goto("/workshop/mailbox");
  const message = page.getByTestId("mailbox-message").filter({ hasText: `to ${to}` }).first();
  // The outbox worker sends within a second or two; reload until the fake has it.
  await expect(async () => {
    await page.reload();
    await expect(message).toBeVisible({ timeout: 1000 });
  }).toPass({ timeout: 20_000 });
  await message.locator("summary").click();
  const text = await message.locator("pre").innerText();
  const link = /https?:\/\/\S+\/invite\/[A-Za-z0-9_-]{43}/.exec(text)?.[0];
  if (!link) throw new Error(`no invitation link in: ${text}`);
  return link;
}

test.describe("invitations", () => {
  test.use({ storageState: authFile("admin") });

  test("an invited person joins with the e-mailed link, once", async ({ page, browser }) => {
    const email = `newcomer-${Date.now()}@kettlelane.example`;
    await page.goto("/workshop/people");
    await page.getByLabel("E-mail address to invite").fill(email);
    await page.getByRole("button", { name: "Send invitation" }).click();
    await expect(page.getByText(`Invitation queued for ${email}.`)).toBeVisible();

    const link = await linkFromMailbox(page, email);
    await expect(page.getByTestId("mailbox-message").filter({ hasText: `to ${email}` }).first()).toContainText("You are invited to Kettle Lane Workshop");

    const guest = await browser.newContext({ storageState: { cookies: [], origins: [] } });
    const p = await guest.newPage();
    await p.goto(link);
    await expect(p.getByText(email)).toBeVisible();
    await p.getByLabel("Your name").fill("Noor Castellan");
    await p.getByLabel("Password").fill("short");
    await p.getByRole("button", { name: "Join and sign in" }).click();
    await expect(p.getByText("Use at least 12 characters.")).toBeVisible();
    await p.getByLabel("Password").fill("a-long-enough-password");
    await p.getByRole("button", { name: "Join and sign in" }).click();
    await expect(p).toHaveURL(/\/bench/);
    await expect(p.getByTestId("whoami")).toContainText("Noor Castellan");

    // The same link a second time is refused, signed in or not.
    await p.goto(link);
    await expect(p.getByText("This invitation link was already used.")).toBeVisible();
    const replay = await p.request.post("/api/invitations/accept", { data: { token: link.split("/").pop(), name: "Someone Else", password: "another-long-password" } });
    expect(replay.status()).toBe(409);
    await guest.close();

    // The new member signs in through the ordinary form.
    const fresh = await browser.newContext({ storageState: { cookies: [], origins: [] } });
    const q = await fresh.newPage();
    await signIn(q, email, "a-long-enough-password");
    await expect(q.getByTestId("whoami")).toContainText("Noor Castellan");
    await fresh.close();

    // The admin sees the new account as a member.
    await page.goto("/workshop/people");
    await expect(page.getByTestId(`person-${email}`)).toContainText("Active");
  });

  test("an expired invitation link is refused", async ({ page }) => {
    const token = randomBytes(32).toString("base64url");
    const conn = await mysql.createConnection(targetFromEnv(process.env.DB_NAME ?? "platewright_e2e"));
    try {
      await conn.query("INSERT INTO invitations (email, token_hash, expires_at) VALUES (?, ?, ?)", [
        `late-${Date.now()}@kettlelane.example`,
        createHash("sha256").update(token).digest("hex"),
        new Date(Date.now() - 60_000),
      ]);
    } finally {
      await conn.end();
    }
    await page.goto(`/invite/${token}`);
    await expect(page.getByText("This invitation link has expired.")).toBeVisible();
    const res = await page.request.post("/api/invitations/accept", { data: { token, name: "Late Comer", password: "a-long-enough-password" } });
    expect(res.status()).toBe(409);
  });
});

test.describe("people as a member", () => {
  test.use({ storageState: authFile("member") });

  test("cannot list people, invite, or read the mailbox", async ({ page }) => {
    expect((await page.request.get("/api/people")).status()).toBe(403);
    expect((await page.request.post("/api/invitations", { data: { email: "x@kettlelane.example" } })).status()).toBe(403);
    expect((await page.request.get("/api/mail/mailbox")).status()).toBe(403);
    expect((await page.request.patch("/api/people/1", { data: { role: "admin" } })).status()).toBe(403);
  });
});
