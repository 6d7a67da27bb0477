// Charges: one per idempotency key, balances as charges less paid payments, admin-only views, and
// CSV per RFC 4180 (§2: CRLF record ends, fields with comma/quote/line break quoted, quotes doubled).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db";
import { payments, users, workshopSettings } from "@/db/schema";
import { addCharge, balances, exportCsv, memberBalance, myLedger, toCsv } from "@/lib/server/ledger";
import type { SessionUser } from "@/lib/server/session";

let member: SessionUser;
let admin: SessionUser;

beforeAll(async () => {
  await db().insert(workshopSettings).ignore().values({ id: 1, name: "Kettle Lane Workshop", currency: "EUR" });
  const stamp = Date.now();
  const [m] = await db().insert(users).values({ email: `ledger-m-${stamp}@kettlelane.example`, name: "Otto Ledger", passwordHash: "x", role: "member" }).$returningId();
  const [a] = await db().insert(users).values({ email: `ledger-a-${stamp}@kettlelane.example`, name: "Wen Admin", passwordHash: "x", role: "admin" }).$returningId();
  member = { id: m!.id, email: `ledger-m-${stamp}@kettlelane.example`, name: "Otto Ledger", role: "member" };
  admin = { id: a!.id, email: `ledger-a-${stamp}@kettlelane.example`, name: "Wen Admin", role: "admin" };
});

afterAll(async () => {
  await closeDb();
});

describe("ledger", () => {
  it("records one charge per idempotency key, also inside a transaction", async () => {
    const key = `plate:77:member:${member.id}`;
    const first = await addCharge(db(), { memberId: member.id, plateId: 77, amountCents: 999, description: "Plate 77", idempotencyKey: key });
    const again = await db().transaction((tx) => addCharge(tx, { memberId: member.id, plateId: 77, amountCents: 999, description: "Plate 77", idempotencyKey: key }));
    expect(first.created).toBe(true);
    expect(again).toEqual({ id: first.id, created: false });
    await expect(addCharge(db(), { memberId: member.id, amountCents: 1.5, description: "x", idempotencyKey: "bad" })).rejects.toThrow(/whole/);
    expect((await memberBalance(member.id)).balanceCents).toBe(999);
  });

  it("subtracts only paid payments from the balance", async () => {
    await addCharge(db(), { memberId: member.id, amountCents: 1, description: 'He said "hi", then left\nearly', idempotencyKey: `odd:${member.id}` });
    await db().insert(payments).values([
      { memberId: member.id, amountCents: 500, currency: "EUR", providerSessionId: `cs_test_a_${member.id}`, status: "paid", paidAt: new Date() },
      { memberId: member.id, amountCents: 400, currency: "EUR", providerSessionId: `cs_test_b_${member.id}`, status: "pending" },
    ]);
    // 999 + 1 charged, 500 paid; the pending 400 does not count.
    expect(await memberBalance(member.id)).toEqual({ chargedCents: 1000, paidCents: 500, balanceCents: 500, currency: "EUR" });
    const mine = await myLedger(member);
    expect(mine.charges).toHaveLength(2);
    expect(mine.payments).toHaveLength(2);
    const all = await balances(admin);
    expect(all.rows.find((r) => r.memberId === member.id)).toMatchObject({ chargedCents: 1000, paidCents: 500, balanceCents: 500 });
  });

  it("keeps each member to their own ledger and the overview to admins", async () => {
    await expect(balances(member)).rejects.toMatchObject({ code: "forbidden" });
    await expect(exportCsv(member, "charges")).rejects.toMatchObject({ code: "forbidden" });
    await expect(myLedger(admin)).rejects.toMatchObject({ code: "forbidden" });
  });

  it("writes CSV as RFC 4180 describes", async () => {
    // RFC 4180 §2 rules 6 and 7 (worked by hand): "aaa","b""bb","ccc" style quoting.
    expect(toCsv(["a", "b"], [["x,y", 'say "hi"'], ["line\nbreak", 3]])).toBe('a,b\r\n"x,y","say ""hi"""\r\n"line\nbreak",3\r\n');
    // A formula-looking text gets an apostrophe (common practice against CSV injection, no source).
    expect(toCsv(["d"], [["=1+1"]])).toBe("d\r\n'=1+1\r\n");
    const csv = await exportCsv(admin, "charges");
    expect(csv.endsWith("\r\n")).toBe(true);
    expect(csv.split("\r\n")[0]).toBe("charge_id,created_at,member_email,member_name,plate_id,amount_minor_units,currency,description");
    expect(csv).toContain(`,${member.email},Otto Ledger,77,999,EUR,Plate 77\r\n`);
    expect(csv).toContain('"He said ""hi"", then left\nearly"');
  });
});
