import { afterAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db";
import { clearFailures, lockedFor, lockMsAfter, takeAttempt } from "@/lib/server/throttle";

afterAll(closeDb);

describe("sign-in throttle", () => {
  it("lets five attempts through, then locks for growing spells", async () => {
    const key = `account:throttle-${Date.now()}@example.org`;
    const t0 = new Date("2026-12-01T10:00:00Z");
    for (let i = 0; i < 4; i++) expect(await takeAttempt(key, t0)).toBe(0);
    expect(await lockedFor(key, t0)).toBe(0);
    expect(await takeAttempt(key, t0)).toBe(0); // the fifth still goes on, and locks the key for 1 s
    expect(await lockedFor(key, t0)).toBe(1);
    expect(await takeAttempt(key, t0)).toBe(1); // refused while locked, and not counted
    const t1 = new Date(t0.getTime() + 1_500);
    expect(await takeAttempt(key, t1)).toBe(0); // the sixth doubles the lock
    expect(await lockedFor(key, t1)).toBe(2);
    expect(await lockedFor(key, new Date(t1.getTime() + 2_500))).toBe(0);
    await clearFailures(key);
    expect(await lockedFor(key, t1)).toBe(0);
  });

  it("forgets failures older than the window", async () => {
    const key = `address:203.0.113.${Date.now() % 250}`;
    const t0 = new Date("2026-12-01T10:00:00Z");
    for (let i = 0; i < 5; i++) await takeAttempt(key, t0);
    const later = new Date(t0.getTime() + 16 * 60_000);
    expect(await takeAttempt(key, later)).toBe(0);
    expect(await lockedFor(key, later)).toBe(0);
  });

  it("caps the lock at fifteen minutes", () => {
    expect(lockMsAfter(4)).toBe(0);
    expect(lockMsAfter(50)).toBe(15 * 60_000);
  });
});
