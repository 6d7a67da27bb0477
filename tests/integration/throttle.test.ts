import { afterAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db";
import { clientAddress } from "@/lib/server/client-address";
import { clearFailures, lockedFor, lockMsAfter, recordFailure } from "@/lib/server/throttle";

afterAll(closeDb);

describe("sign-in throttle", () => {
  it("lets five failures through, then locks for growing spells", async () => {
    const key = `account:throttle-${Date.now()}@example.org`;
    const t0 = new Date("2026-12-01T10:00:00Z");
    for (let i = 0; i < 4; i++) await recordFailure(key, t0);
    expect(await lockedFor(key, t0)).toBe(0);
    await recordFailure(key, t0); // the fifth
    expect(await lockedFor(key, t0)).toBe(1);
    await recordFailure(key, t0); // the sixth doubles it
    expect(await lockedFor(key, t0)).toBe(2);
    expect(await lockedFor(key, new Date(t0.getTime() + 2_500))).toBe(0);
    await clearFailures(key);
    expect(await lockedFor(key, t0)).toBe(0);
  });

  it("forgets failures older than the window", async () => {
    const key = `address:203.0.113.${Date.now() % 250}`;
    const t0 = new Date("2026-12-01T10:00:00Z");
    for (let i = 0; i < 5; i++) await recordFailure(key, t0);
    const later = new Date(t0.getTime() + 16 * 60_000);
    await recordFailure(key, later);
    expect(await lockedFor(key, later)).toBe(0);
  });

  it("caps the lock at fifteen minutes", () => {
    expect(lockMsAfter(4)).toBe(0);
    expect(lockMsAfter(50)).toBe(15 * 60_000);
  });

  it("takes the address the server appended, not one the client wrote", () => {
    expect(clientAddress({ "x-forwarded-for": "1.2.3.4, 127.0.0.1" })).toBe("127.0.0.1");
    expect(clientAddress({ "x-forwarded-for": "1.2.3.4, 10.0.0.5, 127.0.0.1" }, 1)).toBe("10.0.0.5");
    expect(clientAddress({})).toBe("unknown");
  });
});
