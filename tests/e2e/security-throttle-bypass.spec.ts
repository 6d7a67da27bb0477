// Finding 6 (issue 17) against the running server: the per-address sign-in key trusted a
// client-written X-Forwarded-For, so each guess could claim a fresh address. The address now comes
// from the socket (lib/server/client-address.ts, installed by instrumentation.ts).
import { expect, test } from "@playwright/test";
import { httpSignIn, PASSWORD, throwawayAccounts } from "./sign-in-http";

const accounts = throwawayAccounts();

test("a forged X-Forwarded-For does not give each guess a fresh address", async () => {
  test.setTimeout(60_000);
  // Five failures from this address on five accounts, each claiming another address.
  for (let i = 0; i < 5; i++) {
    const r = await httpSignIn(await accounts.make("fwd"), "wrong password", `203.0.113.${i + 1}`);
    expect(r.url).toMatch(/error=/);
    expect(r.url).not.toContain("Too many");
  }
  // The sixth, with the right password and yet another claimed address, is still this address: locked.
  const email = await accounts.make("fwd");
  const sixth = await httpSignIn(email, PASSWORD, "198.51.100.77");
  expect(sixth.url).toContain("Too many failed attempts");
  expect(sixth.session).toBeUndefined();
  // Once the lock has run out the right password works again and clears this address's count.
  await new Promise((r) => setTimeout(r, 2_500));
  expect((await httpSignIn(email, PASSWORD)).session).toBeDefined();
});
