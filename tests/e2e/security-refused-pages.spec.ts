// Finding 11 (issue 17): member pages for staff areas answered 200 with a refusal inside. A refused
// page now answers with its real status (RFC 9110 §15.5.4 403 Forbidden, §15.5.5 404 Not Found), and
// still shows the app's own refusal page.
import { expect, test, type APIRequestContext } from "@playwright/test";
import type mysql from "mysql2/promise";
import { apiClients, disposeAll, e2eDb, loadFixtures, type Caller, type Fixtures } from "./security-fixtures";

let api: Record<Caller, APIRequestContext>;
let conn: mysql.Connection;
let fx: Fixtures;

test.beforeAll(async () => {
  api = await apiClients();
  conn = await e2eDb();
  fx = await loadFixtures(api.owner, conn);
});
test.afterAll(async () => {
  await disposeAll(api);
  await conn.end();
});

const page = (c: APIRequestContext, path: string) => c.get(path, { maxRedirects: 0 });

test("a member opening staff pages gets 403 with the refusal page", async () => {
  for (const path of ["/floor", "/materials", "/insights", "/workshop", "/workshop/people", "/workshop/billing"]) {
    const res = await page(api.owner, path);
    expect(res.status(), path).toBe(403);
    expect(await res.text(), path).toContain("This page belongs to another role");
  }
});

test("staff opening member pages get 403; an admin opening the admin's pages gets 200", async () => {
  expect((await page(api.operator, "/bench")).status()).toBe(403);
  expect((await page(api.operator, "/ledger")).status()).toBe(403);
  expect((await page(api.operator, "/workshop/people")).status()).toBe(403);
  expect((await page(api.admin, "/workshop/people")).status()).toBe(200);
});

test("another member's assembly and part pages answer 404; the owner's 200", async () => {
  const hidden = await page(api.other, `/bench/assemblies/${fx.assemblyId}`);
  expect(hidden.status()).toBe(404);
  expect(await hidden.text()).toContain("No such assembly, or it is not shared with you");
  expect((await page(api.other, `/bench/parts/${fx.partId}`)).status()).toBe(404);
  expect((await page(api.owner, "/bench/assemblies/not-a-number")).status()).toBe(404);
  expect((await page(api.owner, `/bench/assemblies/${fx.assemblyId}`)).status()).toBe(200);
  expect((await page(api.owner, `/bench/parts/${fx.partId}`)).status()).toBe(200);
});

test("signed out, a page still sends the visitor to sign in and back", async () => {
  const res = await page(api.anon, "/floor");
  expect([303, 307]).toContain(res.status());
  expect(res.headers().location).toContain("/sign-in?callbackUrl=%2Ffloor");
});
