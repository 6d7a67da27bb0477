// Finding 3 (issue 17) against the running server: after sign-out an old session cookie kept working
// for its 12 hours. Now every session of the account ends (lib/server/session-version.ts).
import { expect, test } from "@playwright/test";
import { baseURL } from "./security-fixtures";
import { httpSignIn, PASSWORD, throwawayAccounts } from "./sign-in-http";

const accounts = throwawayAccounts();

test("an old session cookie stops working after sign-out, on every device", async () => {
  const email = await accounts.make("revoke");
  const laptop = await httpSignIn(email, PASSWORD);
  const phone = await httpSignIn(email, PASSWORD);
  expect((await fetch(`${baseURL}/api/me`, { headers: { cookie: laptop.cookie } })).status).toBe(200);
  expect((await fetch(`${baseURL}/api/me`, { headers: { cookie: phone.cookie } })).status).toBe(200);
  // Sign out on the laptop the way the app's button does (next-auth's POST /api/auth/signout with the CSRF token).
  const out = await fetch(`${baseURL}/api/auth/signout`, { method: "POST", headers: { "content-type": "application/x-www-form-urlencoded", cookie: laptop.cookie }, body: new URLSearchParams({ csrfToken: laptop.csrfToken, json: "true" }), redirect: "manual" });
  expect(out.status).toBeLessThan(400);
  // A kept copy of either cookie is refused, including at next-auth's own session endpoint.
  for (const c of [laptop.cookie, phone.cookie]) {
    expect((await fetch(`${baseURL}/api/me`, { headers: { cookie: c } })).status).toBe(401);
    expect(await (await fetch(`${baseURL}/api/auth/session`, { headers: { cookie: c } })).json()).toEqual({});
  }
  // Signing in again works.
  expect((await fetch(`${baseURL}/api/me`, { headers: { cookie: (await httpSignIn(email, PASSWORD)).cookie } })).status).toBe(200);
});
